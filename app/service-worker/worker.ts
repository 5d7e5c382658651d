/// <reference lib="webworker" />
import { BackgroundSyncQueue } from "serwist";
// zod's tree-shakable build: the worker is fetched by every visitor's browser.
import {
  array,
  boolean,
  discriminatedUnion,
  int,
  literal,
  maxLength,
  maximum,
  minimum,
  nullable,
  object,
  optional,
  positive,
  regex,
  string,
} from "zod/mini";
import {
  ASSETS_CACHE_PREFIX,
  KEEPABLE_PAGE,
  KEPT_CHECKLIST_PAGE,
  type OfflineReply,
  PHOTOS_CACHE,
  pagesCacheName,
  QUEUED_CHANGES,
  QUEUED_HEADER,
  QUEUED_ITEM_PATH,
  type QueuedItemChange,
  type ReaderId,
  type Refusal,
} from "../utils/offline-protocol";

/**
 * The service worker: keeps the guides a reader asked to keep (page, React Router data, photos at
 * one width, the app's assets) and queues their ticks made without signal. Bundled by
 * app/cli/build-offline.ts into build/client/sw.js, so it is served from the root with scope "/".
 *
 * What it never does: keep anything the reader did not ask to keep, answer from a cache while the
 * network answers, or hand one reader's pages or queued changes to another. Pages are kept per
 * reader (the page tells the worker who is signed in on every load); when that changes, the
 * previous reader's pages are deleted and their queued changes are dropped, never sent with the
 * next reader's session.
 */

const sw = self as unknown as ServiceWorkerGlobalScope;
/** Set by the build: the build's id, so each deploy installs a new worker. */
declare const __TL_BUILD__: string;

const readerSchema = nullable(int().check(positive()));

const META_CACHE = "tl-meta";
const READER_KEY = "/__offline/reader";
/** The changes the server refused when they were sent later, until a page of that reader has shown them. */
const REFUSED_KEY = "/__offline/refused";
const REFUSED_KEPT = 20;
const QUEUE_NAME = "tl-changes";

async function storedReader(): Promise<ReaderId> {
  const kept = await (await caches.open(META_CACHE)).match(READER_KEY);
  if (!kept) return null;
  const parsed = object({ reader: readerSchema }).safeParse(await kept.json());
  return parsed.success ? parsed.data.reader : null;
}

/** Records who is signed in; a different reader than before drops the previous one's kept pages. */
async function setReader(reader: ReaderId): Promise<void> {
  const previous = await storedReader();
  if (previous === reader) return;
  if (previous !== null) await caches.delete(pagesCacheName(previous));
  await (await caches.open(META_CACHE)).put(READER_KEY, Response.json({ reader }));
}

const queue = new BackgroundSyncQueue(QUEUE_NAME, {
  // A week: a guide is rarely worked through over a longer stretch without any signal.
  maxRetentionTime: 7 * 24 * 60,
  onSync: async () => {
    await replay();
  },
});

let replaying: Promise<number> | null = null;

const refusedSchema = object({
  reader: readerSchema,
  refused: array(object({ path: string(), status: int(), message: string() })).check(maxLength(REFUSED_KEPT)),
});

/** The refusals kept for this reader (none for another). */
async function storedRefusals(reader: ReaderId): Promise<Refusal[]> {
  const kept = await (await caches.open(META_CACHE)).match(REFUSED_KEY);
  const parsed = refusedSchema.safeParse(kept ? await kept.json().catch(() => null) : null);
  return parsed.success && parsed.data.reader === reader ? parsed.data.refused : [];
}

async function storeRefusals(reader: ReaderId, refused: Refusal[]): Promise<void> {
  const meta = await caches.open(META_CACHE);
  if (refused.length === 0) await meta.delete(REFUSED_KEY);
  else await meta.put(REFUSED_KEY, Response.json({ reader, refused: refused.slice(-REFUSED_KEPT) }));
}

/** What the server said when it refused a change: its error message (design/api.md's shape), else the status. */
async function refusalOf(request: Request, response: Response): Promise<Refusal> {
  const body = (await response.json().catch(() => null)) as { error?: { message?: unknown } } | null;
  const message =
    typeof body?.error?.message === "string" ? body.error.message.slice(0, 300) : `The server answered ${response.status}.`;
  return { path: new URL(request.url).pathname.slice(0, 300), status: response.status, message };
}

/**
 * Sends the queued changes in the order they were made. Any answer from the server ends an entry
 * (a 409 for a stale revision or a 404 for a removed checklist item cannot succeed later): a
 * refusal is kept, with the server's message, for the reader's next page to show. A network
 * failure or a server error (5xx) puts the entry back and stops. Changes queued by another reader
 * are dropped.
 */
function replay(): Promise<number> {
  replaying ??= (async () => {
    const reader = await storedReader();
    let sent = 0;
    const refused: Refusal[] = [];
    for (let entry = await queue.shiftRequest(); entry; entry = await queue.shiftRequest()) {
      if ((entry.metadata as { reader?: ReaderId } | undefined)?.reader !== reader) continue;
      let response: Response;
      try {
        response = await fetch(entry.request.clone());
      } catch {
        await queue.unshiftRequest(entry);
        break;
      }
      if (response.status >= 500) {
        await queue.unshiftRequest(entry);
        break;
      }
      if (response.ok) sent += 1;
      else refused.push(await refusalOf(entry.request, response));
    }
    if (refused.length) await storeRefusals(reader, [...(await storedRefusals(reader)), ...refused]);
    return sent;
  })().finally(() => {
    replaying = null;
  });
  return replaying;
}

async function sendOrQueue(request: Request): Promise<Response> {
  const copy = request.clone();
  try {
    return await fetch(request);
  } catch {
    await queue.pushRequest({ request: copy, metadata: { reader: await storedReader() } });
    return Response.json({ queued: true }, { status: 202, headers: { [QUEUED_HEADER]: "1", "Cache-Control": "no-store" } });
  }
}

/** The network first; without it, what this reader kept at that address. */
async function networkThenKept(request: Request, key: string): Promise<Response> {
  try {
    return await fetch(request);
  } catch (error) {
    const kept = await (await caches.open(pagesCacheName(await storedReader()))).match(key);
    if (kept) return kept;
    throw error;
  }
}

/** The photo's folder: its variants differ only by the file name (`…/<width>.<format>`). */
const photoFolder = (url: string) => url.slice(0, url.lastIndexOf("/") + 1);

/** The network first; without it, the kept variant of the same photo, whatever width the page asked for. */
async function networkThenKeptPhoto(request: Request): Promise<Response> {
  try {
    return await fetch(request);
  } catch (error) {
    const cache = await caches.open(PHOTOS_CACHE);
    const exact = await cache.match(request.url);
    if (exact) return exact;
    const folder = photoFolder(request.url);
    const sibling = (await cache.keys()).find((key) => photoFolder(key.url) === folder);
    const kept = sibling ? await cache.match(sibling) : undefined;
    if (kept) return kept;
    throw error;
  }
}

/** Assets have content-hashed names: a kept copy is the same file. Served from the cache only if kept. */
async function keptAssetOrNetwork(request: Request): Promise<Response> {
  for (const name of await caches.keys()) {
    if (!name.startsWith(ASSETS_CACHE_PREFIX)) continue;
    const kept = await (await caches.open(name)).match(request.url);
    if (kept) return kept;
  }
  return fetch(request);
}

/** The network first; without it, a kept copy (React Router's route discovery for a kept page). */
async function networkThenKeptAsset(request: Request, clientId: string): Promise<Response> {
  try {
    const response = await fetch(request);
    if (response.ok) await keepDiscoveryOfKeptPage(request, clientId, response.clone());
    return response;
  } catch (error) {
    for (const name of await caches.keys()) {
      if (!name.startsWith(ASSETS_CACHE_PREFIX)) continue;
      const kept = await (await caches.open(name)).match(request.url);
      if (kept) return kept;
    }
    throw error;
  }
}

/**
 * A route discovery answer (public: it describes the app's routes, not the reader) asked for by a
 * guide or checklist page while this reader keeps pages on the device: kept too, so the links of a
 * page kept a moment later (a checklist saved after its guide was kept) work without signal.
 */
async function keepDiscoveryOfKeptPage(request: Request, clientId: string, response: Response): Promise<void> {
  const client = clientId ? await sw.clients.get(clientId) : undefined;
  if (!client) return;
  const page = new URL(client.url);
  if (page.origin !== sw.location.origin || !(KEEPABLE_PAGE.test(page.pathname) || KEPT_CHECKLIST_PAGE.test(page.pathname)))
    return;
  if ((await (await caches.open(pagesCacheName(await storedReader()))).keys()).length === 0) return;
  await (await caches.open(`${ASSETS_CACHE_PREFIX}discovery`)).put(request.url, response);
}

const sameOrigin = (url: string) => new URL(url, sw.location.origin).origin === sw.location.origin;

async function fetchOk(url: string, init?: RequestInit): Promise<Response> {
  const response = await fetch(url, { credentials: "same-origin", cache: "no-store", ...init });
  if (!response.ok) throw new Error(`${url} answered ${response.status}`);
  return response;
}

/** The app's files a kept page's markup names (its route modules, their imports, its style sheets). */
const assetsIn = (html: string) => [...new Set(html.match(/\/assets\/[\w.-]+\.(?:js|css)/g) ?? [])].slice(0, 200);

/**
 * A signed-in reader's checklists copied from the guide: their pages and data, into this reader's
 * cache beside the guide, and the app's files those pages load.
 */
async function keepChecklists(reader: number, page: string, build: string): Promise<void> {
  const slug = decodeURIComponent(page.slice("/guides/".length));
  const listed = object({
    checklists: array(object({ id: int().check(positive()), guide: object({ slug: string() }) })).check(maxLength(500)),
  }).safeParse(await (await fetchOk("/api/checklists", { headers: { accept: "application/json" } })).json());
  if (!listed.success) return;
  const pages = await caches.open(pagesCacheName(reader));
  for (const checklist of listed.data.checklists.filter((c) => c.guide.slug === slug)) {
    await keepChecklistPage(pages, checklist.id, build);
  }
}

/** One checklist's page and data into the reader's cache, and the app's files the page loads. */
async function keepChecklistPage(pages: Cache, checklist: number, build: string): Promise<void> {
  const address = `/me/checklists/${checklist}`;
  const [html, data] = await Promise.all([fetchOk(address), fetchOk(`${address}.data`)]);
  const assets = assetsIn(await html.clone().text());
  await Promise.all([pages.put(address, html), pages.put(`${address}.data`, data)]);
  const assetCache = await caches.open(`${ASSETS_CACHE_PREFIX}${build}`);
  await Promise.all(
    assets.map(async (url) => {
      if (!(await assetCache.match(url))) await assetCache.put(url, await fetchOk(url, { cache: "default" }));
    }),
  );
}

/**
 * A checklist opened while the guide it was copied from is kept for this reader (saved after the
 * guide was kept, say): kept with it, fresh while there is signal. Whether it is kept now.
 */
async function keepWithKeptGuide(
  reader: ReaderId,
  checklist: number,
  guide: string,
  build: string,
  discovery: string[],
): Promise<boolean> {
  if (reader === null || (await storedReader()) !== reader) return false;
  const pages = await caches.open(pagesCacheName(reader));
  if (!(await pages.match(guide))) return false;
  try {
    await keepChecklistPage(pages, checklist, build);
    const assetCache = await caches.open(`${ASSETS_CACHE_PREFIX}${build}`);
    await Promise.all(discovery.map(async (url) => assetCache.put(url, await fetchOk(url))));
  } catch {
    // No signal (or the server refused): what was kept stays as it was.
  }
  return Boolean(await pages.match(`/me/checklists/${checklist}`));
}

async function keep(reader: ReaderId, page: string, photos: string[], assets: string[], build: string, discovery: string[]) {
  await setReader(reader);
  const [html, data] = await Promise.all([fetchOk(page), fetchOk(`${page}.data`)]);
  const pages = await caches.open(pagesCacheName(reader));
  await Promise.all([pages.put(page, html), pages.put(`${page}.data`, data)]);
  if (reader !== null) await keepChecklists(reader, page, build);
  const photoCache = await caches.open(PHOTOS_CACHE);
  await Promise.all(
    photos.map(async (url) => {
      const response = await fetch(url, sameOrigin(url) ? { cache: "no-store" } : { mode: "no-cors" });
      if (response.ok || response.type === "opaque") await photoCache.put(url, response);
    }),
  );
  const assetCache = await caches.open(`${ASSETS_CACHE_PREFIX}${build}`);
  await Promise.all(assets.filter(sameOrigin).map(async (url) => assetCache.put(url, await fetchOk(url, { cache: "default" }))));
  // The route discovery answers the page asked for (public: they describe the app's routes, not the reader).
  await Promise.all(discovery.map(async (url) => assetCache.put(url, await fetchOk(url))));
}

const address = string().check(maxLength(2000));
const messageSchema = discriminatedUnion("type", [
  object({ type: literal("reader"), reader: readerSchema }),
  object({
    type: literal("keep"),
    reader: readerSchema,
    page: string().check(maxLength(2000), regex(KEEPABLE_PAGE)),
    photos: array(address).check(maxLength(500)),
    assets: array(string().check(maxLength(2000), regex(/^\/[\w./-]+$/))).check(maxLength(500)),
    build: string().check(regex(/^[\w-]{1,64}$/)),
    discovery: array(string().check(maxLength(2000), regex(/^\/__manifest\?[\w%.,=&-]+$/))).check(maxLength(50)),
  }),
  object({ type: literal("is-kept"), reader: readerSchema, page: address }),
  object({ type: literal("replay"), reader: readerSchema }),
  object({
    type: literal("keep-checklist"),
    reader: readerSchema,
    checklist: int().check(positive()),
    guide: string().check(maxLength(2000), regex(KEEPABLE_PAGE)),
    build: string().check(regex(/^[\w-]{1,64}$/)),
    discovery: array(string().check(maxLength(2000), regex(/^\/__manifest\?[\w%.,=&-]+$/))).check(maxLength(50)),
  }),
  object({ type: literal("queued-items"), reader: readerSchema, checklist: int().check(positive()) }),
]);

const itemChangeSchema = object({
  checked: optional(boolean()),
  quantity: optional(int().check(minimum(1), maximum(1_000_000))),
  note: optional(nullable(string().check(maxLength(10_000)))),
});

/** This reader's item changes to one checklist still in the queue, oldest first (none while another reader is signed in). */
async function queuedItems(reader: ReaderId, checklist: number): Promise<QueuedItemChange[]> {
  if (reader === null || (await storedReader()) !== reader) return [];
  // A replay takes entries out while it sends them: wait, so a change is not missed while it is in flight.
  await replaying?.catch(() => 0);
  const changes: QueuedItemChange[] = [];
  for (const entry of await queue.getAll()) {
    if ((entry.metadata as { reader?: ReaderId } | undefined)?.reader !== reader || entry.request.method !== "PATCH") continue;
    const match = QUEUED_ITEM_PATH.exec(new URL(entry.request.url).pathname);
    if (!match || Number(match[1]) !== checklist) continue;
    let body: unknown;
    try {
      body = await entry.request.clone().json();
    } catch {
      continue;
    }
    const change = itemChangeSchema.safeParse(body);
    if (change.success) changes.push({ itemId: Number(match[2]), change: change.data });
  }
  return changes;
}

async function answer(data: unknown): Promise<OfflineReply> {
  const parsed = messageSchema.safeParse(data);
  if (!parsed.success) return { ok: false, message: "The worker did not understand the page's message." };
  const message = parsed.data;
  switch (message.type) {
    case "reader":
      await setReader(message.reader);
      return { ok: true };
    case "keep":
      await keep(message.reader, message.page, message.photos, message.assets, message.build, message.discovery);
      return { ok: true, kept: true };
    case "is-kept": {
      const same = (await storedReader()) === message.reader;
      return { ok: true, kept: same && Boolean(await (await caches.open(pagesCacheName(message.reader))).match(message.page)) };
    }
    case "replay": {
      await setReader(message.reader);
      const replayed = await replay();
      // The refusals go to the page that asked, once.
      const refused = await storedRefusals(message.reader);
      if (refused.length) await storeRefusals(message.reader, []);
      return { ok: true, replayed, refused };
    }
    case "keep-checklist":
      return {
        ok: true,
        kept: await keepWithKeptGuide(message.reader, message.checklist, message.guide, message.build, message.discovery),
      };
    case "queued-items":
      return { ok: true, changes: await queuedItems(message.reader, message.checklist) };
  }
}

sw.addEventListener("message", (event) => {
  const port = event.ports[0];
  event.waitUntil(
    answer(event.data).then(
      (reply) => port?.postMessage(reply),
      (error: unknown) => port?.postMessage({ ok: false, message: error instanceof Error ? error.message : String(error) }),
    ),
  );
});

sw.addEventListener("fetch", (event) => {
  const request = event.request;
  const url = new URL(request.url);
  if (url.origin === sw.location.origin) {
    if (QUEUED_CHANGES.some((change) => change.method === request.method && change.path.test(url.pathname))) {
      event.respondWith(sendOrQueue(request));
      return;
    }
    if (request.method !== "GET") return;
    if (url.pathname === "/__manifest") {
      event.respondWith(networkThenKeptAsset(request, event.clientId));
      return;
    }
    if (url.pathname.startsWith("/assets/")) {
      event.respondWith(keptAssetOrNetwork(request));
      return;
    }
    // A kept page is the guide as it reads without a query (not its print view); its data whatever the query.
    if (request.mode === "navigate" && url.search === "" && KEEPABLE_PAGE.test(url.pathname)) {
      event.respondWith(networkThenKept(request, url.pathname));
      return;
    }
    // A reader's checklist kept with a guide: in their cache only, so another reader finds nothing there.
    if (request.mode === "navigate" && url.search === "" && KEPT_CHECKLIST_PAGE.test(url.pathname)) {
      event.respondWith(networkThenKept(request, url.pathname));
      return;
    }
    const dataOf = url.pathname.endsWith(".data") ? url.pathname.slice(0, -".data".length) : null;
    if (dataOf !== null && (KEEPABLE_PAGE.test(dataOf) || KEPT_CHECKLIST_PAGE.test(dataOf))) {
      event.respondWith(networkThenKept(request, url.pathname));
      return;
    }
  }
  if (request.method === "GET" && request.destination === "image") event.respondWith(networkThenKeptPhoto(request));
});

sw.addEventListener("install", () => {
  void sw.skipWaiting();
});

sw.addEventListener("activate", (event) => {
  // Control the open pages at once, so a tick made on the page that installed the worker is queued too.
  event.waitUntil(sw.clients.claim());
});

// The build id only makes each deploy's worker a different file; nothing else depends on it.
void __TL_BUILD__;
