import { storedCallout } from "~/engine/callouts";
import { and, type Column, count, eq, getTableColumns, max, sql } from "drizzle-orm";
import { toSnakeCase } from "drizzle-orm/casing";
import type { SQLiteTable } from "drizzle-orm/sqlite-core";
import type { BatchQuery } from "~/db/batch.server";
import type { Db } from "~/db/client.server";
import {
  callouts,
  cautionSignoffs,
  findings,
  fitment,
  guides,
  parts,
  reviews,
  revisions,
  stepPhotos,
  steps,
  tools,
} from "~/db/schema";
import { runSafetyRules } from "~/engine/rules";
import { AppError, notFound } from "~/utils/errors";
import { type Actor, assertCan } from "~/utils/permissions";
import { auditInsert } from "./audit.server";
import { getGuideById, loadRevision, rulesInput, runBatch, submitProblems } from "./guides.server";
import type { AcknowledgeInput, RequestChangesInput, ReviewDecision, SignOffInput } from "./review-input";

const sqlName = (column: Column) => (column.keyAsName ? toSnakeCase(column.name) : column.name);

/**
 * A table's columns by SQL name, less the ones the copy sets itself. Read from the schema, so a
 * column added later is copied without anyone remembering to list it here.
 */
function copiedColumns(table: SQLiteTable, setByCopy: Column[]) {
  const skip = new Set(setByCopy.map(sqlName));
  return Object.values(getTableColumns(table))
    .map(sqlName)
    .filter((name) => !skip.has(name));
}

const columnList = (names: string[], from?: string) =>
  sql.join(
    names.map((name) => (from ? sql`${sql.identifier(from)}.${sql.identifier(name)}` : sql.identifier(name))),
    sql`, `,
  );

/** A revision's own columns that describe its content; the rest are identity and review bookkeeping. */
const REVISION_NOT_COPIED = [
  revisions.id,
  revisions.guideId,
  revisions.number,
  revisions.state,
  revisions.version,
  revisions.createdById,
  revisions.changeSummary,
  revisions.submittedAt,
  revisions.reviewedAt,
  revisions.reviewedById,
  revisions.publishedAt,
  revisions.createdAt,
  revisions.updatedAt,
];

/**
 * Statements that copy a revision, column for column, into a new draft (steps, callouts, photos,
 * fitment, parts, tools) and make it the guide's working revision.
 */
function copyRevisionQueries(db: Db, fromId: number, guideId: number, number: number, actorId: number): BatchQuery[] {
  const newId = sql`(SELECT id FROM revisions WHERE guide_id = ${guideId} AND number = ${number})`;
  const content = copiedColumns(revisions, REVISION_NOT_COPIED);
  const perRevision = (table: typeof steps | typeof fitment | typeof parts | typeof tools) => {
    const columns = copiedColumns(table, [table.id, table.revisionId]);
    return db.run(sql`INSERT INTO ${table} (revision_id, ${columnList(columns)})
      SELECT ${newId}, ${columnList(columns)} FROM ${table} WHERE revision_id = ${fromId}`);
  };
  // Callouts and photos follow their step by position: old step → the new step at the same place.
  const perStep = (table: typeof callouts | typeof stepPhotos) => {
    const columns = copiedColumns(table, [table.id, table.stepId]);
    return db.run(sql`INSERT INTO ${table} (step_id, ${columnList(columns)})
      SELECT ns.id, ${columnList(columns, "c")} FROM ${table} c
      JOIN steps os ON os.id = c.step_id JOIN steps ns ON ns.revision_id = ${newId} AND ns.position = os.position
      WHERE os.revision_id = ${fromId}`);
  };
  return [
    db.run(sql`INSERT INTO revisions (guide_id, number, state, version, created_by_id, ${columnList(content)})
      SELECT guide_id, ${number}, 'draft', 1, ${actorId}, ${columnList(content)} FROM revisions WHERE id = ${fromId}`),
    perRevision(steps),
    perStep(callouts),
    perStep(stepPhotos),
    perRevision(fitment),
    perRevision(parts),
    perRevision(tools),
    db
      .update(guides)
      .set({ workingRevisionId: sql`${newId}` })
      .where(eq(guides.id, guideId)),
  ];
}

async function nextRevisionNumber(db: Db, guideId: number) {
  const [row] = await db
    .select({ n: max(revisions.number) })
    .from(revisions)
    .where(eq(revisions.guideId, guideId));
  return (row?.n ?? 0) + 1;
}

/** A published guide stays live while its author drafts the next revision on a copy. */
export async function startNextRevision(db: Db, guideId: number, actor: Actor) {
  const guide = await getGuideById(db, guideId);
  if (!guide) throw notFound("This guide");
  assertCan(actor, "update:guide", guide);
  if (guide.workingRevisionId) {
    const [working] = await db
      .select({ state: revisions.state })
      .from(revisions)
      .where(eq(revisions.id, guide.workingRevisionId));
    // An open draft is simply carried on; one that is with the editors waits for their decision.
    if (working?.state === "draft") return guide.workingRevisionId;
    throw new AppError(
      409,
      "wrong-state",
      "The latest revision is with the editors: wait for their decision before starting another.",
    );
  }
  if (!guide.publishedRevisionId) throw new AppError(409, "wrong-state", "This guide has no revision to continue from.");
  const number = await nextRevisionNumber(db, guideId);
  try {
    await runBatch(db, [
      ...copyRevisionQueries(db, guide.publishedRevisionId, guideId, number, actor.id),
      auditInsert(db, {
        actorId: actor.id,
        action: "revision.start",
        guideId,
        subjectType: "revision",
        subjectId: sql`(SELECT id FROM revisions WHERE guide_id = ${guideId} AND number = ${number})`,
      }),
    ]);
  } catch (error) {
    // A second tab that started the same copy a moment earlier wins; this one joins its draft.
    const working = (await getGuideById(db, guideId))?.workingRevisionId;
    if (working) return working;
    throw error;
  }
  return (await getGuideById(db, guideId))?.workingRevisionId ?? null;
}

export async function submitRevision(db: Db, guideId: number, actor: Actor, changeSummary: string) {
  const guide = await getGuideById(db, guideId);
  if (!guide) throw notFound("This guide");
  assertCan(actor, "submit:guide", guide);
  if (!guide.workingRevisionId) throw new AppError(409, "wrong-state", "There is no draft to submit.");
  const loaded = await loadRevision(db, guide.workingRevisionId);
  if (!loaded) throw notFound("This draft");
  if (loaded.revision.state !== "draft") {
    throw new AppError(409, "wrong-state", "This revision is already with the editors.");
  }
  const summary = changeSummary.trim();
  const { missing, fields } = submitProblems(loaded, { changeSummary: summary, publishedBefore: !!guide.publishedRevisionId });
  if (missing.length) {
    throw new AppError(422, "incomplete", "The draft is not ready for review yet: fix the fields listed.", fields, { missing });
  }
  const found = runSafetyRules(rulesInput(loaded));
  const revisionId = loaded.revision.id;
  await runBatch(db, [
    db
      .update(revisions)
      .set({ state: "in-review", submittedAt: new Date(), changeSummary: summary || null })
      .where(and(eq(revisions.id, revisionId), eq(revisions.state, "draft"))),
    ...found.map((f) =>
      db.insert(findings).values({
        revisionId,
        rule: f.rule,
        severity: f.severity,
        stepIndex: f.stepIndex ?? null,
        message: f.message,
        numbers: f.numbers ?? null,
      }),
    ),
    !guide.publishedRevisionId && db.update(guides).set({ state: "in-review" }).where(eq(guides.id, guideId)),
    auditInsert(db, {
      actorId: actor.id,
      action: "revision.submit",
      guideId,
      subjectType: "revision",
      subjectId: revisionId,
      reason: summary || null,
      data: { findings: found.length },
    }),
  ]);
  return { state: "in-review" as const, revisionId };
}

/** Cautions of a revision with their sign-offs, in step order. */
export async function revisionCautions(db: Db, revisionId: number) {
  const rows = await db
    .select({
      id: callouts.id,
      kind: callouts.kind,
      data: callouts.data,
      stepIndex: steps.position,
      signedOffBy: cautionSignoffs.editorId,
    })
    .from(callouts)
    .innerJoin(steps, eq(steps.id, callouts.stepId))
    .leftJoin(cautionSignoffs, eq(cautionSignoffs.calloutId, callouts.id))
    .where(and(eq(steps.revisionId, revisionId), eq(callouts.kind, "caution")))
    .orderBy(steps.position, callouts.position);
  return rows.flatMap((r) => {
    const caution = storedCallout(r);
    if (caution.kind !== "caution") return [];
    return [{ id: r.id, stepIndex: r.stepIndex, signalWord: caution.signalWord, text: caution.text, signedOffBy: r.signedOffBy }];
  });
}

/** The revision under review with its guide, once the actor may review it and it is waiting for review. */
async function reviewableRevision(db: Db, revisionId: number, actor: Actor) {
  const revision = await db.query.revisions.findFirst({ where: eq(revisions.id, revisionId), with: { guide: true } });
  if (!revision) throw notFound("This revision");
  assertCan(actor, "review:revision", revision);
  if (revision.state !== "in-review") throw new AppError(409, "wrong-state", "This revision is not waiting for review.");
  return revision;
}

/** Accepts a warning or note the editor has weighed; a blocking finding needs a change instead. */
export async function acknowledgeFinding(
  db: Db,
  revisionId: number,
  actor: Actor,
  input: Pick<AcknowledgeInput, "findingId" | "note">,
) {
  const revision = await reviewableRevision(db, revisionId, actor);
  const finding = await db.query.findings.findFirst({
    where: and(eq(findings.id, input.findingId), eq(findings.revisionId, revisionId)),
  });
  if (!finding) throw notFound("This finding");
  if (finding.severity === "blocking") {
    throw new AppError(409, "blocking", "A blocking finding needs a change to the guide: request changes from the author.");
  }
  await runBatch(db, [
    db
      .update(findings)
      .set({ status: "acknowledged", resolvedById: actor.id, resolvedAt: new Date(), note: input.note })
      .where(eq(findings.id, finding.id)),
    auditInsert(db, {
      actorId: actor.id,
      action: "finding.acknowledge",
      guideId: revision.guideId,
      subjectType: "finding",
      subjectId: finding.id,
      reason: input.note,
    }),
  ]);
  return { ok: true };
}

/** Records that an editor has read and accepts one caution's wording; signing twice changes nothing. */
export async function signOffCaution(db: Db, revisionId: number, actor: Actor, input: Pick<SignOffInput, "cautionId">) {
  const revision = await reviewableRevision(db, revisionId, actor);
  assertCan(actor, "signoff:caution", revision);
  const caution = (await revisionCautions(db, revisionId)).find((c) => c.id === input.cautionId);
  if (!caution) throw notFound("This caution");
  if (caution.signedOffBy) return { ok: true };
  await runBatch(db, [
    db.insert(cautionSignoffs).values({ calloutId: caution.id, editorId: actor.id }),
    auditInsert(db, {
      actorId: actor.id,
      action: "caution.sign-off",
      guideId: revision.guideId,
      subjectType: "callout",
      subjectId: caution.id,
    }),
  ]);
  return { ok: true };
}

/** Sends the revision back: it stays as reviewed, and the author continues on a fresh copy. */
export async function requestChanges(db: Db, revisionId: number, actor: Actor, input: Pick<RequestChangesInput, "note">) {
  const revision = await reviewableRevision(db, revisionId, actor);
  const guide = revision.guide;
  const number = await nextRevisionNumber(db, guide.id);
  await runBatch(db, [
    db
      .update(revisions)
      .set({ state: "changes-requested", reviewedAt: new Date(), reviewedById: actor.id })
      .where(eq(revisions.id, revisionId)),
    db.insert(reviews).values({ revisionId, editorId: actor.id, decision: "request-changes", note: input.note }),
    !guide.publishedRevisionId && db.update(guides).set({ state: "changes-requested" }).where(eq(guides.id, guide.id)),
    ...copyRevisionQueries(db, revisionId, guide.id, number, actor.id),
    auditInsert(db, {
      actorId: actor.id,
      action: "revision.request-changes",
      guideId: guide.id,
      subjectType: "revision",
      subjectId: revisionId,
      reason: input.note,
    }),
  ]);
  return { ok: true };
}

/** Publishes the revision once no blocking finding and no unsigned caution remains; the previous one is superseded. */
export async function approveRevision(db: Db, revisionId: number, actor: Actor) {
  const revision = await reviewableRevision(db, revisionId, actor);
  const guide = revision.guide;
  assertCan(actor, "publish:guide", guide);
  const [blocking] = await db
    .select({ n: count() })
    .from(findings)
    .where(and(eq(findings.revisionId, revisionId), eq(findings.severity, "blocking")));
  const unsigned = (await revisionCautions(db, revisionId)).filter((c) => !c.signedOffBy);
  if ((blocking?.n ?? 0) > 0 || unsigned.length > 0) {
    throw new AppError(409, "not-ready", "Blocking findings or unsigned cautions remain.", undefined, {
      blockingFindings: blocking?.n ?? 0,
      unsignedCautions: unsigned.map((c) => c.id),
    });
  }
  const now = new Date();
  await runBatch(db, [
    !!guide.publishedRevisionId &&
      db.update(revisions).set({ state: "superseded" }).where(eq(revisions.id, guide.publishedRevisionId)),
    db
      .update(revisions)
      .set({ state: "published", reviewedAt: now, reviewedById: actor.id, publishedAt: now })
      .where(eq(revisions.id, revisionId)),
    db
      .update(guides)
      .set({
        state: "published",
        publishedRevisionId: revisionId,
        workingRevisionId: null,
        title: revision.title,
        summary: revision.summary,
        category: revision.category,
        difficulty: revision.difficulty,
        minutes: revision.minutes,
        publishedAt: guide.publishedAt ?? now,
      })
      .where(eq(guides.id, guide.id)),
    db.insert(reviews).values({ revisionId, editorId: actor.id, decision: "approve" }),
    auditInsert(db, {
      actorId: actor.id,
      action: "revision.approve-publish",
      guideId: guide.id,
      subjectType: "revision",
      subjectId: revisionId,
    }),
  ]);
  return { ok: true };
}

/** One decision from the review desk (already parsed by `reviewDecisionSchema`), to its function. */
export function decideReview(db: Db, revisionId: number, actor: Actor, decision: ReviewDecision) {
  switch (decision.intent) {
    case "acknowledge":
      return acknowledgeFinding(db, revisionId, actor, decision);
    case "sign-off":
      return signOffCaution(db, revisionId, actor, decision);
    case "request-changes":
      return requestChanges(db, revisionId, actor, decision);
    case "approve":
      return approveRevision(db, revisionId, actor);
  }
}

export async function reviewQueue(db: Db) {
  const rows = await db.query.revisions.findMany({
    where: eq(revisions.state, "in-review"),
    orderBy: (r, { asc }) => asc(r.submittedAt),
    with: { guide: { with: { author: true } }, findings: true },
  });
  return rows.map((r) => ({
    revisionId: r.id,
    guide: { id: r.guide.id, slug: r.guide.slug, title: r.title },
    author: { id: r.guide.author.id, name: r.guide.author.name },
    submittedAt: r.submittedAt,
    blocking: r.findings.filter((f) => f.severity === "blocking").length,
  }));
}
