import { createContext, useContext } from "react";
import { useCspNonce } from "~/services/http/csp";

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

/** The JSON a document carries in a data block (`DocumentJson`), under the element id it has there. */
export function useDocumentJson(id: string, json: string | null): string {
  const fragments = useContext(DocumentFragments);
  if (json !== null) return json;
  const kept = fragments?.get(id);
  if (kept !== undefined) return kept;
  return typeof document === "undefined" ? "null" : (document.getElementById(id)?.textContent ?? "null");
}

/** `value` as JSON for a data block (`DocumentJson`): every `<` written `\u003c`, still the same JSON. */
export const dataBlockJson = (value: unknown): string => JSON.stringify(value).replaceAll("<", "\\u003c");

/**
 * A page's data as a JSON data block, once in the document instead of inside React Router's
 * hand-off script (where it would be escaped twice and encoded again on every request). The JSON
 * is made by `dataBlockJson`, so no text in it can end the element. Browsers do not
 * run a data block; it carries the nonce all the same, as every script element of the page does.
 */
export function DocumentJson({ id }: { id: string }) {
  const json = useDocumentJson(id, null);
  const nonce = useCspNonce();
  // biome-ignore lint/security/noDangerouslySetInnerHtml: JSON with every "<" escaped (see above)
  return <script type="application/json" id={id} nonce={nonce} dangerouslySetInnerHTML={{ __html: json }} />;
}
