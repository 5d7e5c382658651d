import { and, asc, eq, inArray, isNull, lt, lte, or, sql } from "drizzle-orm";
import type { Db } from "~/db/client.server";
import { markOutboxWrite, outboxChanged } from "~/db/outbox-signal.server";
import { mailOptOuts, outbox } from "~/db/schema";
import type { Mail } from "~/services/mail.server";
import type { MailKind } from "~/utils/vocab";

/** One mail for the outbox: rendered in full, for one recipient, of one kind. */
export type OutboxMail = Mail & { kind: MailKind; userId?: number | null };
export type OutboxRow = typeof outbox.$inferSelect;

/**
 * The outbox insert as a query, so it joins the batch (transaction) of the change it reports: the
 * mail exists exactly when the change does. The worker sends it later; `batch` wakes it on commit.
 */
export function outboxInsert(db: Db, mail: OutboxMail) {
  return markOutboxWrite(db.insert(outbox).values(mail));
}

/** For a mail that belongs to no other change: written on its own, and the worker woken. */
export async function queueMail(db: Db, mail: OutboxMail) {
  await outboxInsert(db, mail);
  outboxChanged();
}

const due = (now: Date) =>
  and(eq(outbox.state, "pending"), lte(outbox.nextAttemptAt, now), or(isNull(outbox.claimedUntil), lt(outbox.claimedUntil, now)));

/**
 * Claims the oldest due row until `now + leaseMs`, in one UPDATE … RETURNING: SQLite runs it under
 * the write lock, so of two workers (or processes) only one gets a row while its claim is live. A
 * worker that dies holding a claim leaves it to run out; then the row is due again. Null when
 * nothing is due.
 */
export async function claimDueMail(db: Db, now: Date, leaseMs: number): Promise<OutboxRow | null> {
  const oldest = db
    .select({ id: outbox.id })
    .from(outbox)
    .where(due(now))
    .orderBy(asc(outbox.nextAttemptAt), asc(outbox.id))
    .limit(1);
  const [row] = await db
    .update(outbox)
    .set({ claimedUntil: new Date(now.getTime() + leaseMs) })
    .where(and(inArray(outbox.id, oldest), due(now)))
    .returning();
  return row ?? null;
}

/**
 * The claim as the fence of every later write: if this worker's claim ran out and another worker
 * took the row, this worker's outcome changes nothing.
 */
const held = (row: OutboxRow) => and(eq(outbox.id, row.id), eq(outbox.claimedUntil, row.claimedUntil ?? new Date(0)));

export async function markSent(db: Db, row: OutboxRow, now: Date) {
  await db
    .update(outbox)
    .set({ state: "sent", sentAt: now, attempts: sql`${outbox.attempts} + 1`, claimedUntil: null, lastError: null })
    .where(held(row));
}

/** The recipient turned this kind off: the row stays, marked, and is never sent. */
export async function markSkipped(db: Db, row: OutboxRow) {
  await db.update(outbox).set({ state: "skipped", claimedUntil: null }).where(held(row));
}

/** A failed attempt: counted, its error kept, and either tried again at `retryAt` or, without one, given up (failed). */
export async function markAttemptFailed(db: Db, row: OutboxRow, error: string, retryAt: Date | null) {
  await db
    .update(outbox)
    .set({
      attempts: sql`${outbox.attempts} + 1`,
      lastError: error.slice(0, 1000),
      claimedUntil: null,
      ...(retryAt ? { nextAttemptAt: retryAt } : { state: "failed" as const }),
    })
    .where(held(row));
}

/** When the next pending row falls due (null when none is pending), so the worker knows how long it may sleep. */
export async function nextDueAt(db: Db): Promise<Date | null> {
  const [row] = await db
    // A claimed row is due again only when its claim runs out.
    .select({ at: sql<number | null>`min(max(${outbox.nextAttemptAt}, coalesce(${outbox.claimedUntil}, 0)))` })
    .from(outbox)
    .where(eq(outbox.state, "pending"));
  return row?.at == null ? null : new Date(Number(row.at));
}

export async function hasOptedOut(db: Db, userId: number, kind: MailKind): Promise<boolean> {
  const [row] = await db
    .select({ kind: mailOptOuts.kind })
    .from(mailOptOuts)
    .where(and(eq(mailOptOuts.userId, userId), eq(mailOptOuts.kind, kind)))
    .limit(1);
  return !!row;
}
