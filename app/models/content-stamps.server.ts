import { sql } from "drizzle-orm";
import { createContext, type RouterContextProvider } from "react-router";
import type { Db } from "~/db/client.server";

/**
 * The counters that triggers raise on every change to the catalogue, to guides and to readers'
 * fitment reports (migrations 0008 and 0011).
 */
export type ContentStamps = { catalogue: number; guides: number; reports: number };

const STAMPS = sql`SELECT name, stamp FROM content_stamps`;

/** One small read: the stamps now, for keying what was computed from that content. */
export async function readContentStamps(db: Db): Promise<ContentStamps> {
  const rows = await db.all<{ name: string; stamp: number }>(STAMPS);
  const stamps: ContentStamps = { catalogue: 0, guides: 0, reports: 0 };
  for (const row of rows)
    if (row.name === "catalogue" || row.name === "guides" || row.name === "reports") stamps[row.name] = row.stamp;
  return stamps;
}

/** The stamps a page's loader read for this request, for keeping what it answered under them. */
const requestStampsContext = createContext<ContentStamps | null>(null);

/** The stamps now, noted on the request (`context`) as the ones its answer was made from. */
export async function readRequestStamps(context: Readonly<RouterContextProvider>, db: Db): Promise<ContentStamps> {
  const stamps = await readContentStamps(db);
  (context as RouterContextProvider).set(requestStampsContext, stamps);
  return stamps;
}

/** The stamps a loader noted for this request, or null when none did. */
export function requestStampsOf(context: Readonly<RouterContextProvider> | undefined): ContentStamps | null {
  try {
    return context?.get(requestStampsContext) ?? null;
  } catch {
    return null;
  }
}
