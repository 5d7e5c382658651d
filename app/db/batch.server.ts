import type { BatchItem } from "drizzle-orm/batch";
import type { Db } from "./client.server";
import { isOutboxWrite, outboxChanged } from "./outbox-signal.server";

/** One statement of a batch: any insert, update, delete, select or raw `db.run` built on this database. */
export type BatchQuery = BatchItem<"sqlite">;

/**
 * Runs statements as one atomic unit (libSQL runs a batch in a single transaction, so either all
 * of them take effect or none). Takes a plain array, so callers can build it with spreads and
 * conditionals; drizzle's own signature wants a non-empty tuple, which is the one cast kept here.
 */
export async function batch(db: Db, queries: readonly (BatchQuery | false | null | undefined)[]): Promise<unknown[]> {
  const items = queries.filter((q): q is BatchQuery => !!q);
  if (items.length === 0) return [];
  const results = await db.batch(items as [BatchQuery, ...BatchQuery[]]);
  // Committed: mail written with the change can go now.
  if (items.some(isOutboxWrite)) outboxChanged();
  return results;
}
