import type { ContentStamps } from "~/models/content-stamps.server";
import { BoundedCache } from "~/utils/bounded-cache";
import { etagListed, PUBLIC_CACHE_CONTROL, publicJson, serializedJson } from "~/utils/http.server";
import { keptDocument, NONCE_STAND_IN } from "./document-cache.server";

/**
 * For a request with no cookie and no credentials at all, a reader page's whole answer, and a
 * public API answer's, depends only on its address and the content stamps its loader read (nobody
 * is signed in, no message waits, no vehicle is picked). Each answer of that kind is noted here by
 * its address, with those stamps, and the next such GET of the same address under the same stamps
 * is answered from the note before React Router runs (app/cli/start.ts): a page with a fresh
 * nonce, an API answer with the same bytes. Any change to the content moves a stamp, so the next
 * request goes through React Router again. An address nothing is noted for costs no read of the stamps.
 *
 * Only the headers the answer's own code sets are noted; the ones every answer carries (the
 * security headers, compression's) are added on the way out as for any other answer.
 */
type Noted = {
  stamps: string;
  etag: string;
  /** As set by the app, with NONCE_STAND_IN where a page's nonce went. */
  headers: [string, string][];
  body: { document: string } | { bytes: Buffer };
};

/** Some 4,000 pages' notes (their markup is kept by document-cache.server.ts), or fewer with API bodies. */
const NOTED_BYTES = 24 * 1024 * 1024;
const NOTE_BYTES = 512;
const noted = new BoundedCache<string, Noted>(NOTED_BYTES, (note) =>
  "bytes" in note.body ? NOTE_BYTES + note.body.bytes.length : NOTE_BYTES,
);

const addressOf = (url: URL) => `${url.pathname}${url.search}`;
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
    headers: template,
    body: { document: kept.key },
  });
}

/**
 * `publicJson`'s answer for a body that depends only on the request's address and `stamps` (read
 * by the loader for this request), noted for the next anonymous GET of the same address.
 */
export function anonymousJson(request: Request, stamps: ContentStamps, body: object): Response {
  if (request.method === "GET" && isAnonymous(request.headers)) {
    const { text, etag } = serializedJson(body);
    noted.set(addressOf(new URL(request.url)), {
      stamps: stampsKey(stamps),
      etag,
      headers: [
        ["ETag", etag],
        ["Cache-Control", PUBLIC_CACHE_CONTROL],
        ["Content-Type", "application/json"],
      ],
      body: { bytes: Buffer.from(text) },
    });
  }
  return publicJson(request, body);
}

export type AnonymousAnswer = { status: 200 | 304; headers: [string, string][]; body: Uint8Array | null };

/**
 * The answer to an anonymous GET of `path` (with its query), if one was noted for it under the stamps
 * as they are now (`readStamps`, asked only then) and its body is still kept, with a nonce of its own
 * (`newNonce`) for a page; else undefined, and React Router answers.
 */
export async function anonymousAnswer(
  path: string,
  ifNoneMatch: string | undefined,
  readStamps: () => Promise<ContentStamps>,
  newNonce: () => string,
): Promise<AnonymousAnswer | undefined> {
  const note = noted.get(addressOf(new URL(path, "http://torqueleaf.invalid")));
  if (!note || note.stamps !== stampsKey(await readStamps())) return undefined;
  const nonce = "document" in note.body ? newNonce() : "";
  const withNonce = (value: string) => (nonce ? value.replaceAll(NONCE_STAND_IN, nonce) : value);
  if (etagListed(ifNoneMatch, note.etag)) {
    // As React Router's answer would be: the browser keeps the policy that came with its page.
    const headers = note.headers.filter(([name]) => !/^content-(security-policy|type)$/i.test(name));
    return { status: 304, headers: headers.map(([name, value]) => [name, withNonce(value)]), body: null };
  }
  const body = "document" in note.body ? keptDocument(note.body.document, nonce) : note.body.bytes;
  if (!body) return undefined;
  return { status: 200, headers: note.headers.map(([name, value]) => [name, withNonce(value)]), body };
}
