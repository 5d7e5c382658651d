import { createHash, randomBytes } from "node:crypto";
import type { EntryContext } from "react-router";
import type { ContentStamps } from "~/models/content-stamps.server";
import { BoundedCache } from "~/utils/bounded-cache";
import { etagListed } from "~/utils/http.server";

/**
 * Rendered documents for readers who are not signed in, kept by what they were rendered from: the
 * address, the build, every loader's data and the HTML fragments rendered beside it. The same inputs render the same markup, so a page is
 * rendered once per published revision (and per Library answer) instead of once per reader; the
 * loaders still run for every request, so permissions, redirects and not-found answers are decided
 * afresh each time, and any change to the data is a different key.
 *
 * The stored markup carries a stand-in where the request's CSP nonce goes, replaced by a fresh
 * nonce on every answer. The stand-in is random per process, so no stored content can contain it.
 */
export const NONCE_STAND_IN = `nonce${randomBytes(12).toString("hex")}`;

/** Bytes of markup kept in all: some 250 long guide pages. */
const DOCUMENT_BYTES_KEPT = 32 * 1024 * 1024;
/** The markup as UTF-8 between the places its nonce goes: an answer is these joined by the nonce. */
type KeptDocument = { parts: Buffer[]; bytes: number };
const documents = new BoundedCache<string, KeptDocument>(DOCUMENT_BYTES_KEPT, (doc) => doc.bytes);

/** The root loader's data (app/root.tsx) says whether anybody is signed in or a message is waiting. */
type RootShape = { user?: unknown; flash?: unknown } | undefined;

function hasPromise(value: unknown): boolean {
  if (value instanceof Promise) return true;
  if (value && typeof value === "object" && !Array.isArray(value)) return Object.values(value).some((v) => v instanceof Promise);
  return false;
}

/** Whether the page's route is marked READER_PAGE (app/utils/reader-page.ts). */
const isReaderPage = (context: EntryContext) => {
  const matches = context.staticHandlerContext.matches;
  const leaf = matches.at(-1)?.route.id;
  const handle = leaf ? (context.routeModules[leaf]?.handle as { readerPage?: boolean } | undefined) : undefined;
  return handle?.readerPage === true;
};

/**
 * The key of a document that may be kept and shared, or null: only a reader page (READER_PAGE), a
 * plain successful GET for a reader who is not signed in, without a message for them, a cookie to
 * set, an action's result or streamed (deferred) data.
 */
export function documentKey(
  request: Request,
  status: number,
  headers: Headers,
  context: EntryContext,
  fragments?: ReadonlyMap<string, string>,
): { key: string; etag: string } | null {
  const state = context.staticHandlerContext;
  if (request.method !== "GET" || status !== 200 || context.isSpaMode || !isReaderPage(context)) return null;
  if (headers.has("set-cookie") || state.actionData || state.errors) return null;
  const root = state.loaderData.root as RootShape;
  if (!root || root.user || root.flash) return null;
  if (Object.values(state.loaderData).some(hasPromise)) return null;
  const hash = createHash("sha256")
    .update(context.manifest.version)
    .update("\n")
    .update(request.url)
    .update("\n")
    .update(JSON.stringify(state.loaderData, withLongStringsDigested));
  // What the markup carries beside the data (document-fragments.server.ts) decides it as much.
  for (const [id, html] of fragments ?? []) hash.update(`\n${id}\n`).update(digestOf(html));
  const digest = hash.digest("base64url").slice(0, 32);
  // Weak: the markup differs by its nonce from one answer to the next, and means the same.
  return { key: digest, etag: `W/"${digest}"` };
}

/**
 * Strings this long (a guide's JSON, a step's HTML) stand in the key by their own digest, made once
 * per string: they come from the caches that made them, the same string every time, so a page's key
 * costs a lookup instead of escaping and hashing some 100 KB on every request.
 */
const LONG_STRING = 2048;
const LONG_STRING_BYTES_KEPT = 16 * 1024 * 1024;
const longStringDigests = new BoundedCache<string, { digest: string; length: number }>(
  LONG_STRING_BYTES_KEPT,
  (kept) => kept.length,
);

function digestOf(text: string): string {
  if (text.length < LONG_STRING) return text;
  let kept = longStringDigests.get(text);
  if (!kept) {
    kept = { digest: `\u0000sha256:${createHash("sha256").update(text).digest("base64url")}`, length: text.length };
    longStringDigests.set(text, kept);
  }
  return kept.digest;
}

const withLongStringsDigested = (_key: string, value: unknown) => (typeof value === "string" ? digestOf(value) : value);

/** The kept markup for `key` with this answer's nonce in place of the stand-in, or undefined. */
export function keptDocument(key: string, nonce: string): Uint8Array<ArrayBuffer> | undefined {
  const kept = documents.get(key);
  if (!kept) return undefined;
  const between = Buffer.from(nonce);
  const pieces: Buffer[] = [];
  kept.parts.forEach((part, i) => {
    if (i > 0) pieces.push(between);
    pieces.push(part);
  });
  return Buffer.concat(pieces) as Uint8Array<ArrayBuffer>;
}

export function keepDocument(key: string, html: string): void {
  const parts = html.split(NONCE_STAND_IN).map((part) => Buffer.from(part));
  documents.set(key, { parts, bytes: parts.reduce((n, part) => n + part.length, 0) });
}

/**
 * For a request with no cookie and no credentials at all, a kept page's whole answer depends only
 * on its address and the content stamps its loader read (nobody is signed in, no message waits, no
 * vehicle is picked): each answer of that kind is noted here by its address, with those stamps, and
 * the next such request for the same address under the same stamps is answered from it before React
 * Router runs (app/cli/start.ts) with a fresh nonce. Any change to the content moves a stamp, so the
 * next request renders afresh. An address nothing is noted for costs no read of the stamps.
 */
type AnonymousPage = { stamps: string; key: string; etag: string; headers: [string, string][] };
const ANONYMOUS_PAGES_KEPT = 4096;
const anonymousPages = new BoundedCache<string, AnonymousPage>(ANONYMOUS_PAGES_KEPT);

const addressOf = (url: URL) => `${url.pathname}${url.search}`;
const stampsKey = (stamps: ContentStamps) => `${stamps.guides}.${stamps.catalogue}.${stamps.reports}`;

/** A request that carries nothing of anybody: its page is the same for everyone. */
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
  anonymousPages.set(addressOf(new URL(request.url)), {
    stamps: stampsKey(stamps),
    key: kept.key,
    etag: kept.etag,
    headers: template,
  });
}

export type AnonymousAnswer = { status: 200 | 304; headers: [string, string][]; body: Uint8Array | null };

/**
 * The answer to an anonymous GET of `path` (with its query), if one was noted for it under the stamps
 * as they are now (`readStamps`, asked only then) and its document is still kept, with a nonce of
 * its own (`newNonce`); else undefined, and React Router answers.
 */
export async function anonymousAnswer(
  path: string,
  ifNoneMatch: string | undefined,
  readStamps: () => Promise<ContentStamps>,
  newNonce: () => string,
): Promise<AnonymousAnswer | undefined> {
  const page = anonymousPages.get(addressOf(new URL(path, "http://torqueleaf.invalid")));
  if (!page || page.stamps !== stampsKey(await readStamps())) return undefined;
  const nonce = newNonce();
  const withNonce = (value: string) => value.replaceAll(NONCE_STAND_IN, nonce);
  if (etagListed(ifNoneMatch, page.etag)) {
    // As React Router's answer would be: the browser keeps the policy that came with its page.
    const headers = page.headers.filter(([name]) => name !== "content-security-policy" && name !== "content-type");
    return { status: 304, headers: headers.map(([name, value]) => [name, withNonce(value)]), body: null };
  }
  const body = keptDocument(page.key, nonce);
  if (!body) return undefined;
  return { status: 200, headers: page.headers.map(([name, value]) => [name, withNonce(value)]), body };
}
