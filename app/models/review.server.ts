import { and, count, eq, max, sql } from "drizzle-orm";
import type { BatchQuery } from "~/db/batch.server";
import type { Db } from "~/db/client.server";
import { callouts, cautionSignoffs, findings, guides, reviews, revisions, steps } from "~/db/schema";
import { runSafetyRules } from "~/engine/rules";
import { AppError, forbidden, notFound } from "~/utils/errors";
import { auditInsert } from "./audit.server";
import { getGuideById, loadRevision, missingForSubmit, rulesInput, runBatch } from "./guides.server";

/** Statements that copy a revision into a new draft (steps, callouts, photos, fitment, parts, tools). */
function copyRevisionQueries(db: Db, fromId: number, guideId: number, number: number, actorId: number): BatchQuery[] {
  const newId = sql`(SELECT id FROM revisions WHERE guide_id = ${guideId} AND number = ${number})`;
  return [
    db.run(sql`INSERT INTO revisions (guide_id, number, state, version, title, summary, category, difficulty, minutes, created_by_id)
      SELECT guide_id, ${number}, 'draft', 1, title, summary, category, difficulty, minutes, ${actorId} FROM revisions WHERE id = ${fromId}`),
    db.run(sql`INSERT INTO steps (revision_id, position, title, body, body_html, body_text, lifts_vehicle, disconnects_battery)
      SELECT ${newId}, position, title, body, body_html, body_text, lifts_vehicle, disconnects_battery FROM steps WHERE revision_id = ${fromId}`),
    db.run(sql`INSERT INTO callouts (step_id, position, kind, data)
      SELECT ns.id, c.position, c.kind, c.data FROM callouts c
      JOIN steps os ON os.id = c.step_id JOIN steps ns ON ns.revision_id = ${newId} AND ns.position = os.position
      WHERE os.revision_id = ${fromId}`),
    db.run(sql`INSERT INTO step_photos (step_id, media_id, position, alt, caption)
      SELECT ns.id, p.media_id, p.position, p.alt, p.caption FROM step_photos p
      JOIN steps os ON os.id = p.step_id JOIN steps ns ON ns.revision_id = ${newId} AND ns.position = os.position
      WHERE os.revision_id = ${fromId}`),
    db.run(sql`INSERT INTO fitment (revision_id, variant_id, status, note)
      SELECT ${newId}, variant_id, status, note FROM fitment WHERE revision_id = ${fromId}`),
    db.run(sql`INSERT INTO parts (revision_id, position, name, quantity, part_number, notes, step_index)
      SELECT ${newId}, position, name, quantity, part_number, notes, step_index FROM parts WHERE revision_id = ${fromId}`),
    db.run(sql`INSERT INTO tools (revision_id, position, name)
      SELECT ${newId}, position, name FROM tools WHERE revision_id = ${fromId}`),
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
export async function startNextRevision(db: Db, guideId: number, actorId: number) {
  const guide = await getGuideById(db, guideId);
  if (!guide) throw notFound("This guide");
  if (guide.workingRevisionId) return guide.workingRevisionId;
  if (!guide.publishedRevisionId) throw new AppError(409, "wrong-state", "This guide has no revision to continue from.");
  const number = await nextRevisionNumber(db, guideId);
  await runBatch(db, copyRevisionQueries(db, guide.publishedRevisionId, guideId, number, actorId));
  return (await getGuideById(db, guideId))?.workingRevisionId ?? null;
}

export async function submitRevision(db: Db, guideId: number, actorId: number, changeSummary: string) {
  const guide = await getGuideById(db, guideId);
  if (!guide?.workingRevisionId) throw new AppError(409, "wrong-state", "There is no draft to submit.");
  const loaded = await loadRevision(db, guide.workingRevisionId);
  if (!loaded) throw notFound("This draft");
  if (loaded.revision.state !== "draft") {
    throw new AppError(409, "wrong-state", "This revision is already with the editors.");
  }
  const missing = missingForSubmit(loaded);
  if (missing.length) {
    throw new AppError(422, "incomplete", "The draft is not ready for review yet.", undefined, { missing });
  }
  const found = runSafetyRules(rulesInput(loaded));
  const revisionId = loaded.revision.id;
  await runBatch(db, [
    db
      .update(revisions)
      .set({ state: "in-review", submittedAt: new Date(), changeSummary })
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
    ...(guide.publishedRevisionId ? [] : [db.update(guides).set({ state: "in-review" }).where(eq(guides.id, guideId))]),
    auditInsert(db, {
      actorId,
      action: "revision.submit",
      subjectType: "revision",
      subjectId: revisionId,
      reason: changeSummary,
      data: { findings: found.length },
    }),
  ]);
  return { state: "in-review" as const, revisionId };
}

/** Cautions of a revision with their sign-offs, in step order. */
export async function revisionCautions(db: Db, revisionId: number) {
  const rows = await db
    .select({ id: callouts.id, data: callouts.data, stepIndex: steps.position, signedOffBy: cautionSignoffs.editorId })
    .from(callouts)
    .innerJoin(steps, eq(steps.id, callouts.stepId))
    .leftJoin(cautionSignoffs, eq(cautionSignoffs.calloutId, callouts.id))
    .where(and(eq(steps.revisionId, revisionId), eq(callouts.kind, "caution")))
    .orderBy(steps.position, callouts.position);
  return rows.map((r) => ({
    id: r.id,
    stepIndex: r.stepIndex,
    signalWord: String(r.data.signalWord),
    text: String(r.data.text),
    signedOffBy: r.signedOffBy,
  }));
}

async function reviewableRevision(db: Db, revisionId: number, editorId: number) {
  const revision = await db.query.revisions.findFirst({ where: eq(revisions.id, revisionId), with: { guide: true } });
  if (!revision) throw notFound("This revision");
  if (revision.guide.authorId === editorId) throw forbidden("Editors cannot review their own guides.");
  if (revision.state !== "in-review") throw new AppError(409, "wrong-state", "This revision is not waiting for review.");
  return revision;
}

export type ReviewDecision =
  | { intent: "acknowledge"; findingId: number; note: string }
  | { intent: "sign-off"; cautionId: number }
  | { intent: "request-changes"; note: string }
  | { intent: "approve" };

export async function decideReview(db: Db, revisionId: number, editorId: number, decision: ReviewDecision) {
  const revision = await reviewableRevision(db, revisionId, editorId);
  const guide = revision.guide;

  if (decision.intent === "acknowledge") {
    const finding = await db.query.findings.findFirst({
      where: and(eq(findings.id, decision.findingId), eq(findings.revisionId, revisionId)),
    });
    if (!finding) throw notFound("This finding");
    if (finding.severity === "blocking") {
      throw new AppError(409, "blocking", "A blocking finding needs a change to the guide: request changes from the author.");
    }
    await runBatch(db, [
      db
        .update(findings)
        .set({ status: "acknowledged", resolvedById: editorId, resolvedAt: new Date(), note: decision.note })
        .where(eq(findings.id, finding.id)),
      auditInsert(db, {
        actorId: editorId,
        action: "finding.acknowledge",
        subjectType: "finding",
        subjectId: finding.id,
        reason: decision.note,
      }),
    ]);
    return { ok: true };
  }

  if (decision.intent === "sign-off") {
    const caution = (await revisionCautions(db, revisionId)).find((c) => c.id === decision.cautionId);
    if (!caution) throw notFound("This caution");
    if (caution.signedOffBy) return { ok: true };
    await runBatch(db, [
      db.insert(cautionSignoffs).values({ calloutId: caution.id, editorId }),
      auditInsert(db, { actorId: editorId, action: "caution.sign-off", subjectType: "callout", subjectId: caution.id }),
    ]);
    return { ok: true };
  }

  if (decision.intent === "request-changes") {
    const number = await nextRevisionNumber(db, guide.id);
    await runBatch(db, [
      db
        .update(revisions)
        .set({ state: "changes-requested", reviewedAt: new Date(), reviewedById: editorId })
        .where(eq(revisions.id, revisionId)),
      db.insert(reviews).values({ revisionId, editorId, decision: "request-changes", note: decision.note }),
      ...(guide.publishedRevisionId
        ? []
        : [db.update(guides).set({ state: "changes-requested" }).where(eq(guides.id, guide.id))]),
      ...copyRevisionQueries(db, revisionId, guide.id, number, editorId),
      auditInsert(db, {
        actorId: editorId,
        action: "revision.request-changes",
        subjectType: "revision",
        subjectId: revisionId,
        reason: decision.note,
      }),
    ]);
    return { ok: true };
  }

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
    ...(guide.publishedRevisionId
      ? [db.update(revisions).set({ state: "superseded" }).where(eq(revisions.id, guide.publishedRevisionId))]
      : []),
    db
      .update(revisions)
      .set({ state: "published", reviewedAt: now, reviewedById: editorId, publishedAt: now })
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
    db.insert(reviews).values({ revisionId, editorId, decision: "approve" }),
    auditInsert(db, { actorId: editorId, action: "revision.approve-publish", subjectType: "revision", subjectId: revisionId }),
  ]);
  return { ok: true };
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
