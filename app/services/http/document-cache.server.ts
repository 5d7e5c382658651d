import { createHash, randomBytes } from "node:crypto";
import type { EntryContext } from "react-router";
import { BoundedCache } from "~/utils/bounded-cache";

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
