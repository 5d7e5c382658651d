import type { IncomingMessage } from "node:http";

/**
 * Whether React Router is answering with a document or with the data for a navigation in the
 * browser (an address ending in `.data`). Loaders see both as the same address, so our servers
 * (app/cli/start.ts and the dev server) overwrite this header on every request; a client cannot
 * choose it. A loader may leave out of a document's data what the markup already carries.
 */
const REQUEST_KIND_HEADER = "x-torqueleaf-request-kind";

export function stampRequestKind(req: IncomingMessage) {
  const path = (req.url ?? "").split("?", 1)[0] ?? "";
  req.headers[REQUEST_KIND_HEADER] = path.endsWith(".data") ? "data" : "document";
}

/** True only when our server said so: a request that reached the app otherwise counts as data. */
export const isDocumentRequest = (request: Request) => request.headers.get(REQUEST_KIND_HEADER) === "document";
