import { PassThrough } from "node:stream";
import { createReadableStreamFromReadable } from "@react-router/node";
import { isbot } from "isbot";
import type { RenderToPipeableStreamOptions } from "react-dom/server";
import { renderToPipeableStream } from "react-dom/server";
import type { EntryContext, RouterContextProvider } from "react-router";
import { isRouteErrorResponse, ServerRouter } from "react-router";
import { DocumentFragments } from "./components/document-html";
import { CspNonce } from "./services/http/csp";
import { getDb } from "./db/client.server";
import { readContentStamps, requestStampsOf } from "./models/content-stamps.server";
import {
  type AnonymousAnswer,
  anonymousAnswer,
  notedJsonAnswer,
  noteAnonymousPage,
} from "./services/http/anonymous-answers.server";
import { documentKey, keepDocument, keptDocument, NONCE_STAND_IN } from "./services/http/document-cache.server";
import { documentFragments } from "./services/http/document-fragments.server";
import { createNonce, documentNonce } from "./services/http/security-headers.server";
import { matchesEtag, PUBLIC_CACHE_CONTROL } from "./utils/http.server";

export const streamTimeout = 5_000;

/**
 * React Router's default error log, without refusals: a 4xx such as its own 405 for a write to a
 * route without an action is the client's mistake, and would otherwise fill the log on demand.
 */
export function handleError(error: unknown, { request }: { request: Request }) {
  if (request.signal.aborted) return;
  if (isRouteErrorResponse(error) && error.status < 500) return;
  console.error(error);
}

/**
 * React Router's default Node entry, plus the request's Content-Security-Policy nonce: on React's
 * own inline scripts, on React Router's hand-off scripts, and in the document's headers.
 */
export default function handleRequest(
  request: Request,
  responseStatusCode: number,
  responseHeaders: Headers,
  routerContext: EntryContext,
  loadContext: RouterContextProvider,
) {
  const nonce = documentNonce(loadContext, responseHeaders);

  // https://httpwg.org/specs/rfc9110.html#HEAD
  if (request.method.toUpperCase() === "HEAD") {
    return new Response(null, { status: responseStatusCode, headers: responseHeaders });
  }

  // A page that any reader who is not signed in sees alike is rendered once and kept (see
  // document-cache.server.ts); the browser or a shared cache may keep it too.
  const fragments = documentFragments(loadContext);
  const shared = documentKey(request, responseStatusCode, responseHeaders, routerContext, fragments);
  if (shared) {
    responseHeaders.set("ETag", shared.etag);
    // `Vary: Cookie` keeps a page kept for a reader who was not signed in from one who has since
    // signed in (RFC 9111 §4.1).
    responseHeaders.set("Cache-Control", PUBLIC_CACHE_CONTROL);
    responseHeaders.append("Vary", "Cookie");
    if (matchesEtag(request, shared.etag)) {
      // The browser keeps the page it has with the policy that came with it: a new nonce would block its scripts.
      responseHeaders.delete("Content-Security-Policy");
      return new Response(null, { status: 304, headers: responseHeaders });
    }
    responseHeaders.set("Content-Type", "text/html");
    const stamps = requestStampsOf(loadContext);
    const kept = keptDocument(shared.key, nonce);
    if (kept !== undefined) {
      noteAnonymousPage(request, stamps, shared, responseHeaders, nonce);
      return new Response(kept, { status: 200, headers: responseHeaders });
    }
    return renderWhole(routerContext, request.url, fragments).then(({ html, failed }) => {
      // A render that failed part-way is answered as the error it is: not kept, and no ETag to ask again by.
      if (failed) {
        responseHeaders.set("Cache-Control", "no-store");
        responseHeaders.delete("ETag");
      } else {
        keepDocument(shared.key, html);
        noteAnonymousPage(request, stamps, shared, responseHeaders, nonce);
      }
      return new Response(html.replaceAll(NONCE_STAND_IN, nonce), { status: failed ? 500 : 200, headers: responseHeaders });
    });
  }

  return new Promise<Response>((resolve, reject) => {
    let shellRendered = false;
    const userAgent = request.headers.get("user-agent");

    // Bots and SPA mode wait for all content; people get the shell as soon as it is ready.
    const readyOption: keyof RenderToPipeableStreamOptions =
      (userAgent && isbot(userAgent)) || routerContext.isSpaMode ? "onAllReady" : "onShellReady";

    // Abort after `streamTimeout`, leaving time to flush the rejected boundaries.
    let timeoutId: ReturnType<typeof setTimeout> | undefined = setTimeout(() => abort(), streamTimeout + 1000);

    const { pipe, abort } = renderToPipeableStream(documentTree(routerContext, request.url, nonce, fragments), {
      nonce,
      [readyOption]() {
        shellRendered = true;
        const body = new PassThrough({
          final(callback) {
            clearTimeout(timeoutId);
            timeoutId = undefined;
            callback();
          },
        });
        const stream = createReadableStreamFromReadable(body);
        responseHeaders.set("Content-Type", "text/html");
        pipe(body);
        resolve(new Response(stream, { headers: responseHeaders, status: responseStatusCode }));
      },
      onShellError(error: unknown) {
        reject(error);
      },
      onError(error: unknown) {
        responseStatusCode = 500;
        // Errors while the shell renders reject and are logged by React Router; later ones are logged here.
        if (shellRendered) console.error(error);
      },
    });
  });
}

/**
 * For the production server (app/cli/start.ts): the answer to a GET that carries no cookie and no
 * credentials, from a page noted for the same address under the content stamps as they are now,
 * or undefined (React Router answers it). See anonymous-answers.server.ts.
 */
export function notedAnswer(path: string, ifNoneMatch: string | undefined): Promise<AnonymousAnswer | undefined> {
  return anonymousAnswer(path, ifNoneMatch, stampsNow, createNonce);
}

/**
 * For the production server's Node listener (app/cli/start.ts), before Express: a public API answer
 * noted for the same address under the content stamps as they are now, or undefined.
 */
export function notedJson(path: string, request: { ifNoneMatch: string | undefined; acceptEncoding: string | undefined }) {
  return notedJsonAnswer(path, request, stampsNow, createNonce);
}

const stampsNow = async () => readContentStamps(await getDb());

/** The document: the router with this answer's nonce and the HTML fragments rendered beside the data. */
function documentTree(
  routerContext: EntryContext,
  url: string,
  nonce: string,
  fragments: ReadonlyMap<string, string> | undefined,
) {
  return (
    <CspNonce.Provider value={nonce}>
      <DocumentFragments.Provider value={fragments}>
        <ServerRouter context={routerContext} url={url} nonce={nonce} />
      </DocumentFragments.Provider>
    </CspNonce.Provider>
  );
}

/** The whole document as one string, rendered with the nonce stand-in, for keeping. */
function renderWhole(
  routerContext: EntryContext,
  url: string,
  fragments: ReadonlyMap<string, string> | undefined,
): Promise<{ html: string; failed: boolean }> {
  return new Promise((resolve, reject) => {
    const chunks: Buffer[] = [];
    let failed = false;
    const timeoutId = setTimeout(() => abort(), streamTimeout + 1000);
    const { pipe, abort } = renderToPipeableStream(documentTree(routerContext, url, NONCE_STAND_IN, fragments), {
      nonce: NONCE_STAND_IN,
      onAllReady() {
        const sink = new PassThrough();
        sink.on("data", (chunk: Buffer) => chunks.push(chunk));
        sink.on("end", () => {
          clearTimeout(timeoutId);
          resolve({ html: Buffer.concat(chunks).toString("utf8"), failed });
        });
        pipe(sink);
      },
      onShellError: reject,
      onError(error: unknown) {
        failed = true;
        console.error(error);
      },
    });
  });
}
