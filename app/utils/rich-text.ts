import type { Extensions } from "@tiptap/core";
import StarterKit from "@tiptap/starter-kit";

/**
 * The rich-text features a step body may use. The editor in the browser and the server that
 * checks and renders a saved body both build from this one list, so they can never disagree on
 * what a document may contain.
 */
export const stepBodyExtensions: Extensions = [StarterKit.configure({ link: { openOnClick: false } })];

/** Link targets a step body may point at: web pages and mail, never scripts or data. */
export const ALLOWED_LINK = /^(https?:|mailto:)/i;
