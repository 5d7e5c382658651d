import { createContext, useContext } from "react";

/**
 * HTML that a document's markup carries once, not twice: a loader puts it beside its data for the
 * server render only (app/services/http/document-fragments.server.ts), keyed by element id, and
 * leaves it out of the data the browser receives. On hydration the browser reads it back from the
 * element the server rendered; a navigation in the browser gets it in the data instead.
 */
export const DocumentFragments = createContext<ReadonlyMap<string, string> | undefined>(undefined);

function inDocument(id: string): string {
  if (typeof document === "undefined") return "";
  return document.getElementById(id)?.innerHTML ?? "";
}

/** A block of trusted HTML (rendered from validated rich text when its revision was saved). */
export function DocumentHtml({ id, html, className }: { id: string; html: string | undefined; className?: string }) {
  const fragments = useContext(DocumentFragments);
  const markup = html ?? fragments?.get(id) ?? inDocument(id);
  // biome-ignore lint/security/noDangerouslySetInnerHtml: rendered from validated rich-text JSON when the revision was saved
  return <div id={id} className={className} dangerouslySetInnerHTML={{ __html: markup }} />;
}
