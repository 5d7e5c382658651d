import type { Db } from "~/db/client.server";
import { contentStamps } from "~/db/schema";

/** The counters that triggers raise on every change to the catalogue and to guides (migration 0008). */
export type ContentStamps = { catalogue: number; guides: number };

/** One small read: the stamps now, for keying what was computed from that content. */
export async function readContentStamps(db: Db): Promise<ContentStamps> {
  const rows = await db.select().from(contentStamps);
  const stamps: ContentStamps = { catalogue: 0, guides: 0 };
  for (const row of rows) if (row.name === "catalogue" || row.name === "guides") stamps[row.name] = row.stamp;
  return stamps;
}
