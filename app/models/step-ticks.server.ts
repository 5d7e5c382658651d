import { and, asc, count, eq } from "drizzle-orm";
import type { Db } from "~/db/client.server";
import { guides, revisions, steps, stepTicks } from "~/db/schema";
import { AppError, invalid, notFound } from "~/utils/errors";
import type { StepTickInput, StepTicks } from "~/utils/step-ticks";
import { runBatch } from "./guides.server";

/**
 * Work-through mode: which steps of a published guide a signed-in reader has marked done. Ticks
 * belong to one reader and one revision; a new revision starts with none (its steps may differ).
 * They are not audited: a reader's own progress changes nothing anyone else sees.
 */

/** The published revision behind a guide's address and its number of steps, or 404. */
async function publishedRevision(db: Db, slug: string) {
  const [row] = await db
    .select({ revisionId: revisions.id, number: revisions.number })
    .from(guides)
    .innerJoin(revisions, eq(revisions.id, guides.publishedRevisionId))
    .where(and(eq(guides.slug, slug), eq(guides.state, "published")));
  if (!row) throw notFound(`A published guide called "${slug}"`);
  const [{ n }] = await db.select({ n: count() }).from(steps).where(eq(steps.revisionId, row.revisionId));
  return { ...row, stepCount: n };
}

async function ticksOf(db: Db, userId: number, revisionId: number, number: number): Promise<StepTicks> {
  const rows = await db
    .select({ position: stepTicks.position })
    .from(stepTicks)
    .where(and(eq(stepTicks.userId, userId), eq(stepTicks.revisionId, revisionId)))
    .orderBy(asc(stepTicks.position));
  return { revision: number, done: rows.map((r) => r.position) };
}

/** The reader's own ticks on the guide's published revision. */
export async function readStepTicks(db: Db, userId: number, slug: string): Promise<StepTicks> {
  const { revisionId, number } = await publishedRevision(db, slug);
  return ticksOf(db, userId, revisionId, number);
}

/**
 * Sets or clears one tick and answers the reader's ticks. A tick for a revision that is no longer
 * the published one (made offline before a new revision came out) is refused with 409, so the
 * reader's queue drops it instead of ticking a different step.
 */
export async function setStepTick(db: Db, userId: number, slug: string, input: StepTickInput): Promise<StepTicks> {
  const { revisionId, number, stepCount } = await publishedRevision(db, slug);
  if (input.revision !== number) {
    throw new AppError(409, "stale-revision", `The guide is now at revision ${number}; reload it to tick its steps.`, {
      revision: `Revision ${input.revision} is no longer the published one.`,
    });
  }
  if (input.position >= stepCount) {
    throw invalid({ position: `This revision has ${stepCount} steps: a position from 0 to ${stepCount - 1}.` });
  }
  const where = and(eq(stepTicks.userId, userId), eq(stepTicks.revisionId, revisionId), eq(stepTicks.position, input.position));
  await runBatch(db, [
    input.done
      ? db.insert(stepTicks).values({ userId, revisionId, position: input.position }).onConflictDoNothing()
      : db.delete(stepTicks).where(where),
  ]);
  return ticksOf(db, userId, revisionId, number);
}
