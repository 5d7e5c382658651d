import { brotliCompressSync, constants as zlibConstants, deflateSync, gzipSync } from "node:zlib";
import type { ContentStamps } from "~/models/content-stamps.server";
import { BoundedCache } from "~/utils/bounded-cache";
import { etagListed, PUBLIC_CACHE_CONTROL, publicJson, serializedJson } from "~/utils/http.server";
import { type ContentCoding, chosenEncoding } from "~/utils/content-coding";
import { env } from "~/utils/env.server";
import { keptDocument, NONCE_STAND_IN } from "./document-cache.server";
import { fixedHeaders, securityHeaders } from "./security-headers.server";

/**
 * For a request with no cookie and no credentials at all, a reader page's whole answer, and a
 * public API answer's, depends only on its address and the content stamps its loader read (nobody
 * is signed in, no message waits, no vehicle is picked). Each answer of that kind is noted here by
 * its address, with those stamps, and the next such GET of the same address under the same stamps
 * is answered from the note before React Router runs (app/cli/start.ts): a page with a fresh
 * nonce, an API answer with the same bytes. Any change to the content moves a stamp, so the next
 * request goes through React Router again. An address nothing is noted for costs no read of the stamps.
 */
type Noted = { stamps: string; etag: string } & (
  | {
      /** A page: the key of its kept markup, and its headers as sent, with NONCE_STAND_IN where the nonce went. */
      document: string;
      headers: [string, string][];
    }
  | {
      /** An API answer: its JSON as UTF-8, and each content coding of it once made. */
      bytes: Buffer;
      encoded: Partial<Record<ContentCoding, Buffer>>;
    }
);

/** Some 4,000 pages' notes (their markup is kept by document-cache.server.ts), or fewer with API bodies. */
const NOTED_BYTES = 24 * 1024 * 1024;
const NOTE_BYTES = 512;
const noted = new BoundedCache<string, Noted>(NOTED_BYTES, (note) =>
  "bytes" in note ? NOTE_BYTES + note.bytes.length : NOTE_BYTES,
);

const addressOf = (url: URL) => `${url.pathname}${url.search}`;

/** The note for a request target as the server got it; a target that is no URL path has none. */
function noteFor(target: string): Noted | undefined {
  let url: URL;
  try {
    url = new URL(target, "http://torqueleaf.invalid");
  } catch {
    return undefined;
  }
  return noted.get(addressOf(url));
}
const stampsKey = (stamps: ContentStamps) => `${stamps.guides}.${stamps.catalogue}.${stamps.reports}`;

/** A request that carries nothing of anybody: its answer is the same for everyone. */
export const isAnonymous = (headers: { has(name: string): boolean }) => !headers.has("cookie") && !headers.has("authorization");

/** Notes a kept page's answer (its headers as sent, with the nonce stand-in) for anonymous requests. */
export function noteAnonymousPage(
  request: Request,
  stamps: ContentStamps | null,
  kept: { key: string; etag: string },
  headers: Headers,
  nonce: string,
): void {
  if (!stamps || !isAnonymous(request.headers)) return;
  const template: [string, string][] = [...headers].map(([name, value]) => [name, value.replaceAll(nonce, NONCE_STAND_IN)]);
  noted.set(addressOf(new URL(request.url)), {
    stamps: stampsKey(stamps),
    etag: kept.etag,
    document: kept.key,
    headers: template,
  });
}

/**
 * `publicJson`'s answer for a body that depends only on the request's address and `stamps` (read
 * by the loader for this request), noted for the next anonymous GET of the same address.
 */
export function anonymousJson(request: Request, stamps: ContentStamps, body: object): Response {
  if (request.method === "GET" && isAnonymous(request.headers)) {
    const { text, etag } = serializedJson(body);
    noted.set(addressOf(new URL(request.url)), { stamps: stampsKey(stamps), etag, bytes: Buffer.from(text), encoded: {} });
  }
  return publicJson(request, body);
}

export type AnonymousAnswer = { status: 200 | 304; headers: [string, string][]; body: Uint8Array | null };

/**
 * The answer to an anonymous GET of `path` (with its query), if a page was noted for it under the
 * stamps as they are now (`readStamps`, asked only then) and its markup is still kept, with a nonce
 * of its own (`newNonce`); else undefined, and React Router answers. Through Express: the markup
 * differs by its nonce, so it is compressed per answer.
 */
export async function anonymousAnswer(
  path: string,
  ifNoneMatch: string | undefined,
  readStamps: () => Promise<ContentStamps>,
  newNonce: () => string,
): Promise<AnonymousAnswer | undefined> {
  const note = noteFor(path);
  if (!note || !("document" in note) || note.stamps !== stampsKey(await readStamps())) return undefined;
  const nonce = newNonce();
  const withNonce = ([name, value]: [string, string]): [string, string] => [name, value.replaceAll(NONCE_STAND_IN, nonce)];
  if (etagListed(ifNoneMatch, note.etag)) {
    // As React Router's answer would be: the browser keeps the policy that came with its page.
    const headers = note.headers.filter(([name]) => name !== "content-security-policy" && name !== "content-type");
    return { status: 304, headers: headers.map(withNonce), body: null };
  }
  const body = keptDocument(note.document, nonce);
  if (!body) return undefined;
  return { status: 200, headers: note.headers.map(withNonce), body };
}

/**
 * A JSON answer's bytes are the same for every request, so the production server sends a noted one
 * straight from Node's HTTP server, before Express (app/cli/start.ts): no per-request middleware,
 * and each encoding made once per note instead of once per answer. Its headers are the ones the
 * Express path gives it: `publicJson`'s, the security headers (a fresh nonce in the policy, none on
 * a 304), `Vary: Accept-Encoding`, and the encoding the compression middleware would choose.
 */
export async function notedJsonAnswer(
  path: string,
  request: { ifNoneMatch: string | undefined; acceptEncoding: string | undefined },
  readStamps: () => Promise<ContentStamps>,
  newNonce: () => string,
): Promise<{ status: 200 | 304; headers: Record<string, string>; body: Buffer | null } | undefined> {
  const note = noteFor(path);
  if (!note || !("bytes" in note) || note.stamps !== stampsKey(await readStamps())) return undefined;
  const settings = env();
  const own = { ETag: note.etag, "Cache-Control": PUBLIC_CACHE_CONTROL };
  if (etagListed(request.ifNoneMatch, note.etag))
    return { status: 304, headers: { ...fixedHeaders(settings), ...own }, body: null };
  const encoding = note.bytes.length < COMPRESSION_THRESHOLD ? "identity" : chosenEncoding(request.acceptEncoding);
  let bytes = note.bytes;
  if (encoding !== "identity") {
    note.encoded[encoding] ??= ENCODERS[encoding](note.bytes);
    bytes = note.encoded[encoding];
  }
  return {
    status: 200,
    headers: {
      ...securityHeaders(settings, newNonce()),
      ...own,
      "Content-Type": "application/json; charset=utf-8",
      Vary: "Accept-Encoding",
      ...(encoding === "identity" ? {} : { "Content-Encoding": encoding }),
      "Content-Length": String(bytes.length),
    },
    body: bytes,
  };
}

/** The compression middleware's settings (compression 1.8): nothing under 1 KB, brotli at quality 4. */
const COMPRESSION_THRESHOLD = 1024;
const ENCODERS: Record<ContentCoding, (bytes: Buffer) => Buffer> = {
  br: (bytes) => brotliCompressSync(bytes, { params: { [zlibConstants.BROTLI_PARAM_QUALITY]: 4 } }),
  gzip: (bytes) => gzipSync(bytes),
  deflate: (bytes) => deflateSync(bytes),
};
