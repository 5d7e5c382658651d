/**
 * What the pages and the service worker (app/service-worker/worker.ts) say to each other, and the
 * names both use. No DOM or worker types here: both programs include this file.
 */

/** Who the page says is signed in: a user id, or null for a reader who is not. */
export type ReaderId = number | null;

export type OfflineMessage =
  /** Sent on every page load: the worker keeps pages per reader and drops a reader's when another signs in or out. */
  | { type: "reader"; reader: ReaderId }
  /**
   * Keep a page, its React Router data and these photos for this reader, and the app's assets and
   * route discovery answers the page loaded (for everyone: they are the same for all), under the build's id.
   */
  | { type: "keep"; reader: ReaderId; page: string; photos: string[]; assets: string[]; build: string; discovery: string[] }
  /** Whether this reader has kept the page. */
  | { type: "is-kept"; reader: ReaderId; page: string }
  /** Send the queued changes now (the page saw the signal come back, or just loaded). */
  | { type: "replay"; reader: ReaderId }
  /** Keep this checklist page with the guide it was copied from, if this reader kept that guide. */
  | { type: "keep-checklist"; reader: ReaderId; checklist: number; guide: string; build: string; discovery: string[] }
  /** This reader's changes to one checklist's items still waiting for the server, oldest first. */
  | { type: "queued-items"; reader: ReaderId; checklist: number };

/** A checklist item change as `PATCH /api/checklists/:id/items/:itemId` sends it (design/api.md). */
export type ItemChange = { checked?: boolean; quantity?: number; note?: string | null };
export type QueuedItemChange = { itemId: number; change: ItemChange };

/** A queued change the server refused when it was sent later: where it went, the status and the server's message. */
export type Refusal = { path: string; status: number; message: string };

export type OfflineReply =
  | { ok: true; kept?: boolean; replayed?: number; refused?: Refusal[]; changes?: QueuedItemChange[] }
  | { ok: false; message: string };

/** The header on the worker's answer to a change it queued for later (HTTP 202). */
export const QUEUED_HEADER = "X-Torqueleaf-Queued";

/** The changes a reader may make offline, replayed in order when the signal returns: step ticks and checklist items. */
export const QUEUED_CHANGES: { method: string; path: RegExp }[] = [
  { method: "PUT", path: /^\/api\/guides\/[^/]+\/step-ticks$/ },
  { method: "PATCH", path: /^\/api\/checklists\/[^/]+\/items\/[^/]+$/ },
];

/** Only guide pages can be kept, by their address without a query: `/guides/:slug`. */
export const KEEPABLE_PAGE = /^\/guides\/[^/.]+$/;

/** A signed-in reader's checklist page, kept with the guide it was copied from: `/me/checklists/:id`. */
export const KEPT_CHECKLIST_PAGE = /^\/me\/checklists\/\d{1,10}$/;

/** The queued item change's address: its checklist and item. */
export const QUEUED_ITEM_PATH = /^\/api\/checklists\/(\d{1,10})\/items\/(\d{1,10})$/;

/** The cache of kept pages for one reader; "anon" for a reader who is not signed in. */
export const pagesCacheName = (reader: ReaderId) => `tl-pages-${reader === null ? "anon" : `u${reader}`}`;
/** Photos and the app's assets are the same for everyone. */
export const PHOTOS_CACHE = "tl-photos";
export const ASSETS_CACHE_PREFIX = "tl-assets-";

/**
 * The one width kept of each photo: the variant a phone at 2× (360 px wide) or a desktop column
 * (640 px) would pick, the smallest at least 720 px wide, else the widest.
 */
export function keptVariant<V extends { width: number; format: string; url: string }>(variants: V[]): V | undefined {
  const webp = variants.filter((v) => v.format === "webp").sort((a, b) => a.width - b.width);
  const list = webp.length ? webp : [...variants].sort((a, b) => a.width - b.width);
  return list.find((v) => v.width >= 720) ?? list.at(-1);
}
