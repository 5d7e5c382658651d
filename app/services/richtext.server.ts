import { getSchema, type JSONContent } from "@tiptap/core";
import { Node as PMNode } from "@tiptap/pm/model";
import { renderToHTMLString } from "@tiptap/static-renderer/pm/html-string";
import { BoundedCache } from "~/utils/bounded-cache";
import { AppError } from "~/utils/errors";
import { ALLOWED_LINK, stepBodyExtensions } from "~/utils/rich-text";

const extensions = stepBodyExtensions;
// Built once per process: building the schema per render dominated guide page time.
const schema = getSchema(extensions);

/** A step body's size and nesting limits (issue 11 §4): past them the document is refused, not cut. */
export const BODY_MAX_BYTES = 200 * 1024;
export const BODY_MAX_DEPTH = 20;
const ATTR_MAX_CHARS = 2048;

const refuse = (message: string) => new AppError(400, "invalid-rich-text", message);

/** Named character references that spell the parts of a URL scheme (HTML Living Standard, named character references). */
const NAMED: Record<string, string> = {
  colon: ":",
  tab: "\t",
  newline: "\n",
  amp: "&",
  lt: "<",
  gt: ">",
  quot: '"',
  apos: "'",
  sol: "/",
  period: ".",
  nbsp: "\u00a0",
  lpar: "(",
  rpar: ")",
};

/** Decodes numeric and the URL-relevant named references, again and again, so "&amp;#106;" ends as "j". */
export function decodeEntities(text: string): string {
  let current = text;
  for (let round = 0; round < 5; round++) {
    const next = current
      .replace(/&#x0*([0-9a-f]{1,6});?/gi, (_, hex: string) => safeChar(Number.parseInt(hex, 16)))
      .replace(/&#0*([0-9]{1,7});?/g, (_, dec: string) => safeChar(Number.parseInt(dec, 10)))
      .replace(/&([a-z]+);?/gi, (whole, name: string) => NAMED[name.toLowerCase()] ?? whole);
    if (next === current) return next;
    current = next;
  }
  return current;
}

function safeChar(code: number): string {
  return code > 0 && code <= 0x10ffff ? String.fromCodePoint(code) : "";
}

/**
 * Whitespace and invisible characters a browser drops or skips while reading a URL's scheme
 * (WHATWG URL Standard: C0 controls and space are stripped, tab and newline removed anywhere),
 * with the other Unicode spaces and zero-width characters for good measure.
 */
// biome-ignore lint/suspicious/noControlCharactersInRegex: control characters are exactly what it must find
const INVISIBLE = /[\u0000-\u0020\u007f-\u00a0\u1680\u180e\u2000-\u200f\u2028\u2029\u202f\u205f\u3000\ufeff]/g;
const SCRIPT_SCHEME = /^(javascript|vbscript|data|livescript|mocha):/;

/** Why a link target is refused, or null when it is a plain web or mail address. */
export function linkProblem(href: unknown): string | null {
  const allowed = "Links in step text must be web addresses (http:// or https://) or mail addresses (mailto:).";
  if (typeof href !== "string" || href.trim() === "") return "A link in the step text has no address.";
  if (href.length > ATTR_MAX_CHARS) return `A link address must be under ${ATTR_MAX_CHARS} characters.`;
  const spelled = decodeEntities(href).replace(INVISIBLE, "").toLowerCase();
  if (SCRIPT_SCHEME.test(spelled)) {
    return "Links in step text may not run scripts or carry embedded data (javascript:, vbscript:, data:).";
  }
  if (href.replace(INVISIBLE, "") !== href) return "A link address may not contain spaces or invisible characters.";
  if (!ALLOWED_LINK.test(href)) return allowed;
  try {
    const url = new URL(href);
    if (!["http:", "https:", "mailto:"].includes(url.protocol)) return allowed;
  } catch {
    return "A link in the step text is not a valid address.";
  }
  return null;
}

/** Where photos are served from: the app's own media route, or the configured public bucket address. */
function isOwnImage(src: string): boolean {
  const publicUrl = process.env.S3_PUBLIC_URL?.replace(/\/$/, "");
  return src.startsWith("/media/photos/") || (!!publicUrl && src.startsWith(`${publicUrl}/`));
}

const isRecord = (value: unknown): value is Record<string, unknown> =>
  typeof value === "object" && value !== null && !Array.isArray(value);

function checkAttrs(attrs: unknown, what: string) {
  if (attrs === undefined || attrs === null) return;
  if (!isRecord(attrs)) throw refuse(`The step text has a ${what} whose settings are not a list of named values.`);
  for (const [name, value] of Object.entries(attrs)) {
    if (value === null || typeof value === "boolean" || (typeof value === "number" && Number.isFinite(value))) continue;
    if (typeof value === "string" && value.length <= ATTR_MAX_CHARS) continue;
    throw refuse(`The step text has a ${what} with a setting "${name.slice(0, 40)}" that is not a short plain value.`);
  }
  const src = attrs.src;
  if (typeof src === "string") {
    throw refuse(
      isOwnImage(src)
        ? "Photos go in the step's photo list, not inside its text."
        : "The step text points at an image outside this site's photo store: add photos to the step's photo list instead.",
    );
  }
}

/**
 * Walks the document without recursion (so no nesting can exhaust the stack) and refuses what the
 * schema cannot hold or must never hold, naming it: unknown nodes and marks, documents nested
 * deeper than BODY_MAX_DEPTH, settings that are not plain values, images, script-like links.
 */
function checkShape(content: unknown) {
  if (!isRecord(content) || content.type !== "doc") throw refuse("The step text must be a rich-text document.");
  const stack: { node: unknown; depth: number }[] = [{ node: content, depth: 1 }];
  while (stack.length) {
    const { node, depth } = stack.pop() as { node: unknown; depth: number };
    if (depth > BODY_MAX_DEPTH) throw refuse(`The step text is nested more than ${BODY_MAX_DEPTH} levels deep.`);
    if (!isRecord(node) || typeof node.type !== "string") throw refuse("The step text holds something that is not rich text.");
    checkAttrs(node.attrs, `"${node.type.slice(0, 40)}" element`);
    if (!schema.nodes[node.type]) {
      throw refuse(
        node.type === "image"
          ? "Photos go in the step's photo list, not inside its text."
          : `The step text holds an element the editor does not make ("${node.type.slice(0, 40)}").`,
      );
    }
    if (node.text !== undefined && typeof node.text !== "string") throw refuse("The step text holds text that is not text.");
    if (node.marks !== undefined) {
      if (!Array.isArray(node.marks)) throw refuse("The step text has formatting that is not a list.");
      for (const mark of node.marks) {
        if (!isRecord(mark) || typeof mark.type !== "string") throw refuse("The step text has formatting it cannot read.");
        if (!schema.marks[mark.type]) {
          throw refuse(`The step text uses formatting the editor does not make ("${mark.type.slice(0, 40)}").`);
        }
        checkAttrs(mark.attrs, `"${mark.type.slice(0, 40)}" mark`);
        if (mark.type === "link") {
          const problem = linkProblem(isRecord(mark.attrs) ? mark.attrs.href : undefined);
          if (problem) throw refuse(problem);
        }
      }
    }
    if (node.content !== undefined) {
      if (!Array.isArray(node.content)) throw refuse("The step text has a part whose content is not a list.");
      for (const child of node.content) stack.push({ node: child, depth: depth + 1 });
    }
  }
  if (Buffer.byteLength(JSON.stringify(content)) > BODY_MAX_BYTES) {
    throw refuse(`The step text is larger than ${BODY_MAX_BYTES / 1024} KB: split it over several steps.`);
  }
}

/**
 * Turns a step body (Tiptap JSON) into HTML and plain text, and gives back the document as the
 * schema reads it (`json`: settings it does not know dropped), which is what gets stored. Runs
 * when a draft is saved, so the reader's page serves stored HTML. Content that does not fit the
 * schema is refused with a 400 that says why.
 */
type RenderedBody = { html: string; text: string; json: JSONContent };

/**
 * Bodies already rendered, by their JSON: an autosave sends every step each time, and most steps
 * have not changed since the last save. About 8 MB of text at most; callers must not change what
 * they are given.
 */
const renderedBodies = new BoundedCache<string, RenderedBody>(8 * 1024 * 1024, (r) => 3 * r.html.length + r.text.length);

export function renderBody(content: unknown): RenderedBody {
  checkShape(content);
  const key = JSON.stringify(content);
  const known = renderedBodies.get(key);
  if (known) return known;
  const rendered = renderChecked(content);
  renderedBodies.set(key, rendered);
  return rendered;
}

function renderChecked(content: unknown): RenderedBody {
  let node: PMNode;
  try {
    node = PMNode.fromJSON(schema, content as JSONContent);
    node.check();
  } catch (error) {
    throw refuse(`The step text is not valid rich text: ${(error as Error).message}`);
  }
  const html = renderToHTMLString({ extensions, content: node });
  const text = node.textBetween(0, node.content.size, "\n", " ").replace(/\s+/g, " ").trim();
  return { html, text, json: node.toJSON() as JSONContent };
}
