import { storedCallout } from "~/engine/callouts";
import { and, type Column, count, desc, eq, getTableColumns, inArray, isNull, lt, max, ne, sql } from "drizzle-orm";
import { toSnakeCase } from "drizzle-orm/casing";
import type { SQLiteTable } from "drizzle-orm/sqlite-core";
import { type BatchQuery, batch } from "~/db/batch.server";
import type { Db } from "~/db/client.server";
import {
  callouts,
  cautionSignoffs,
  findings,
  fitment,
  guides,
  parts,
  reviewComments,
  reviews,
  revisions,
  stepPhotos,
  steps,
  tools,
  users,
} from "~/db/schema";
import { runSafetyRules } from "~/engine/rules";
import {
  changesRequestedMail,
  guidePublishedMail,
  guideUnpublishedMail,
  revisionSubmittedMail,
} from "~/services/mail/review-mail.server";
import { AppError, fromDbError, invalid, notFound } from "~/utils/errors";
import { type Actor, assertCan, ROLE_PERMISSIONS } from "~/utils/permissions";
import { ROLES, type RevisionState } from "~/utils/vocab";
import { auditInsert } from "./audit.server";
import { getGuideById, loadRevision, rulesInput, runBatch, submitProblems } from "./guides.server";
import { outboxInsert } from "./outbox.server";
import type {
  AcknowledgeInput,
  CommentInput,
  RequestChangesInput,
  ReviewDecision,
  SignOffInput,
  UnpublishInput,
} from "./review-input";

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

/** The accounts that review (their role holds `review:revision:any`), still active: who hears of a submission. */
async function reviewers(db: Db) {
  const roles = ROLES.filter((role) => ROLE_PERMISSIONS[role].includes("review:revision:any"));
  return db
    .select({ id: users.id, email: users.email, name: users.name })
    .from(users)
    .where(and(inArray(users.role, roles), isNull(users.disabledAt)));
}

async function userById(db: Db, id: number) {
  const [user] = await db.select({ id: users.id, email: users.email, name: users.name }).from(users).where(eq(users.id, id));
  if (!user) throw notFound("This account");
  return user;
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
  const author = await userById(db, guide.authorId);
  const editors = (await reviewers(db)).filter((u) => u.id !== guide.authorId);
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
    ...editors.map((editor) =>
      outboxInsert(
        db,
        revisionSubmittedMail(editor, {
          title: loaded.revision.title,
          authorName: author.name,
          number: loaded.revision.number,
          revisionId,
          changeSummary: summary || null,
        }),
      ),
    ),
  ]);
  return { state: "in-review" as const, revisionId };
}

/** The words a sign-off accepts: a changed signal word or text is another caution, and needs its own. */
export const cautionWording = (caution: { signalWord: string; text: string }) => `${caution.signalWord}: ${caution.text}`;

/**
 * Cautions of a revision with their sign-offs, in step order. A caution is signed off by a sign-off
 * on it, or by one an editor gave an earlier revision of the same guide for exactly the same
 * wording (`carriedFrom` names that revision): a caution that changed needs a new one.
 */
export async function revisionCautions(db: Db, revisionId: number) {
  const [revision] = await db
    .select({ guideId: revisions.guideId, number: revisions.number })
    .from(revisions)
    .where(eq(revisions.id, revisionId));
  if (!revision) return [];
  const rows = await db
    .select({
      id: callouts.id,
      kind: callouts.kind,
      data: callouts.data,
      position: callouts.position,
      stepIndex: steps.position,
      signedOffBy: cautionSignoffs.editorId,
      signedOffByName: users.name,
      signedOffAt: cautionSignoffs.createdAt,
    })
    .from(callouts)
    .innerJoin(steps, eq(steps.id, callouts.stepId))
    .leftJoin(cautionSignoffs, eq(cautionSignoffs.calloutId, callouts.id))
    .leftJoin(users, eq(users.id, cautionSignoffs.editorId))
    .where(and(eq(steps.revisionId, revisionId), eq(callouts.kind, "caution")))
    .orderBy(steps.position, callouts.position);
  const earlier = await db
    .select({
      wording: cautionSignoffs.wording,
      editorId: cautionSignoffs.editorId,
      editorName: users.name,
      createdAt: cautionSignoffs.createdAt,
      number: revisions.number,
    })
    .from(cautionSignoffs)
    .innerJoin(callouts, eq(callouts.id, cautionSignoffs.calloutId))
    .innerJoin(steps, eq(steps.id, callouts.stepId))
    .innerJoin(revisions, eq(revisions.id, steps.revisionId))
    .innerJoin(users, eq(users.id, cautionSignoffs.editorId))
    .where(and(eq(revisions.guideId, revision.guideId), lt(revisions.number, revision.number)))
    .orderBy(desc(revisions.number));
  return rows.flatMap((r) => {
    const caution = storedCallout(r);
    if (caution.kind !== "caution") return [];
    const wording = cautionWording(caution);
    const carried = r.signedOffBy === null ? earlier.find((e) => e.wording === wording) : undefined;
    return [
      {
        id: r.id,
        stepIndex: r.stepIndex,
        calloutIndex: r.position,
        signalWord: caution.signalWord,
        text: caution.text,
        wording,
        signedOffBy: r.signedOffBy ?? carried?.editorId ?? null,
        signedOffByName: r.signedOffByName ?? carried?.editorName ?? null,
        signedOffAt: r.signedOffAt ?? carried?.createdAt ?? null,
        carriedFrom: carried?.number ?? null,
        /** Whether this revision's own callout carries the sign-off (a carried one does not). */
        ownSignOff: r.signedOffBy !== null,
      },
    ];
  });
}

export type RevisionCaution = Awaited<ReturnType<typeof revisionCautions>>[number];

/** The revision under review with its guide, once the actor may review it and it is waiting for review. */
async function reviewableRevision(db: Db, revisionId: number, actor: Actor) {
  const revision = await db.query.revisions.findFirst({ where: eq(revisions.id, revisionId), with: { guide: true } });
  if (!revision) throw notFound("This revision");
  assertCan(actor, "review:revision", revision);
  if (revision.state !== "in-review") throw decidedAlready(revision.state);
  return revision;
}

const STATE_WORDS: Record<RevisionState, string> = {
  draft: "a draft",
  "in-review": "waiting for review",
  "changes-requested": "sent back to its author",
  published: "published",
  superseded: "replaced by a later revision",
};

function decidedAlready(state: RevisionState | undefined) {
  return new AppError(
    409,
    "wrong-state",
    `This revision is no longer waiting for review: it is ${state ? STATE_WORDS[state] : "gone"}. Another editor may have decided a moment ago; reload to see where it stands.`,
    undefined,
    { state: state ?? null },
  );
}

/** A value that is NULL unless the revision is still in review: a NOT NULL column fed it refuses the whole batch otherwise. */
const whileInReview = (revisionId: number, value: number | string) =>
  sql`(SELECT ${value} FROM revisions WHERE id = ${revisionId} AND state = 'in-review')`;

/**
 * Runs a review decision's batch. Each batch carries its own check that the revision is still in
 * review, inside the transaction (the revision triggers, or a `whileInReview` value); when it fails,
 * the second of two editors acting at once is told that someone else decided first.
 */
async function decisionBatch(db: Db, revisionId: number, queries: Parameters<typeof batch>[1]) {
  try {
    return await batch(db, queries);
  } catch (error) {
    const [now] = await db.select({ state: revisions.state }).from(revisions).where(eq(revisions.id, revisionId));
    if (now?.state !== "in-review") throw decidedAlready(now?.state);
    throw fromDbError(error) ?? error;
  }
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
  await decisionBatch(db, revisionId, [
    db
      .update(findings)
      .set({
        status: sql`${whileInReview(revisionId, "acknowledged")}`,
        resolvedById: actor.id,
        resolvedAt: new Date(),
        note: input.note,
      })
      .where(eq(findings.id, finding.id)),
    auditInsert(db, {
      actorId: actor.id,
      action: "finding.acknowledge",
      guideId: revision.guideId,
      subjectType: "finding",
      subjectId: finding.id,
      reason: input.note,
      data: { rule: finding.rule, severity: finding.severity },
    }),
  ]);
  return { ok: true };
}

/**
 * Records that an editor has read and accepts one caution's wording (stored with the sign-off);
 * signing twice, or two editors at once, changes nothing.
 */
export async function signOffCaution(db: Db, revisionId: number, actor: Actor, input: Pick<SignOffInput, "cautionId">) {
  const revision = await reviewableRevision(db, revisionId, actor);
  assertCan(actor, "signoff:caution", revision);
  const caution = (await revisionCautions(db, revisionId)).find((c) => c.id === input.cautionId);
  if (!caution) throw notFound("This caution");
  if (caution.ownSignOff) return { ok: true };
  try {
    await decisionBatch(db, revisionId, [
      db.insert(cautionSignoffs).values({
        calloutId: caution.id,
        editorId: sql`${whileInReview(revisionId, actor.id)}`,
        wording: caution.wording,
      }),
      auditInsert(db, {
        actorId: actor.id,
        action: "caution.sign-off",
        subjectType: "callout",
        subjectId: caution.id,
        data: { wording: caution.wording, revision: revision.number },
        guideId: revision.guideId,
      }),
    ]);
  } catch (error) {
    // Another editor's sign-off of the same caution landed first: the caution is signed either way.
    const again = (await revisionCautions(db, revisionId)).find((c) => c.id === caution.id);
    if (again?.ownSignOff && !(error instanceof AppError && error.code === "wrong-state")) return { ok: true };
    throw error;
  }
  return { ok: true };
}

/** A comment pinned to a step (or to the whole guide), kept with the revision and shown to its author. */
export async function addReviewComment(
  db: Db,
  revisionId: number,
  actor: Actor,
  input: Pick<CommentInput, "stepIndex" | "body">,
) {
  const revision = await reviewableRevision(db, revisionId, actor);
  if (input.stepIndex !== null) {
    const stepCount = await db.$count(steps, eq(steps.revisionId, revisionId));
    if (input.stepIndex >= stepCount) throw invalid({ stepIndex: `This guide has ${stepCount} steps: pick one of them` });
  }
  await decisionBatch(db, revisionId, [
    db.insert(reviewComments).values({
      revisionId,
      stepIndex: input.stepIndex,
      editorId: sql`${whileInReview(revisionId, actor.id)}`,
      body: input.body,
    }),
    auditInsert(db, {
      actorId: actor.id,
      action: "review.comment",
      subjectType: "revision",
      subjectId: revisionId,
      data: { stepIndex: input.stepIndex },
      guideId: revision.guideId,
    }),
  ]);
  return { ok: true };
}

/** The comments on one revision, oldest first, with who wrote them. */
export async function commentsOn(db: Db, revisionId: number) {
  return db
    .select({
      id: reviewComments.id,
      stepIndex: reviewComments.stepIndex,
      body: reviewComments.body,
      createdAt: reviewComments.createdAt,
      editor: { id: users.id, name: users.name },
    })
    .from(reviewComments)
    .innerJoin(users, eq(users.id, reviewComments.editorId))
    .where(eq(reviewComments.revisionId, revisionId))
    .orderBy(reviewComments.createdAt, reviewComments.id);
}

/**
 * The editors' comments the author's open draft answers: those on the revision just before it,
 * when that one was sent back for changes (the draft is its fresh copy).
 */
export async function commentsForDraft(db: Db, guideId: number, number: number) {
  const [previous] = await db
    .select({ id: revisions.id })
    .from(revisions)
    .where(and(eq(revisions.guideId, guideId), eq(revisions.number, number - 1), eq(revisions.state, "changes-requested")));
  return previous ? commentsOn(db, previous.id) : [];
}

/**
 * Sends the revision back: it stays as reviewed, and the author continues on a fresh copy, with
 * the note and the comments attached (mailed, and shown in the Workbench).
 */
export async function requestChanges(db: Db, revisionId: number, actor: Actor, input: Pick<RequestChangesInput, "note">) {
  const revision = await reviewableRevision(db, revisionId, actor);
  const guide = revision.guide;
  const number = await nextRevisionNumber(db, guide.id);
  const [author, editor, comments] = await Promise.all([
    userById(db, guide.authorId),
    userById(db, actor.id),
    commentsOn(db, revisionId),
  ]);
  await decisionBatch(db, revisionId, [
    // The revision triggers refuse this unless the revision is still in review.
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
      data: { comments: comments.length, nextRevision: number },
    }),
    outboxInsert(
      db,
      changesRequestedMail(author, {
        title: revision.title,
        number: revision.number,
        guideId: guide.id,
        note: input.note,
        editorName: editor.name,
        comments,
      }),
    ),
  ]);
  return { ok: true };
}

/** How many blocking findings and which unsigned cautions stand between a revision and its approval. */
export async function approvalBlockers(db: Db, revisionId: number) {
  const [blocking] = await db
    .select({ n: count() })
    .from(findings)
    .where(and(eq(findings.revisionId, revisionId), eq(findings.severity, "blocking")));
  const unsigned = (await revisionCautions(db, revisionId)).filter((c) => c.signedOffBy === null);
  return { blockingFindings: blocking?.n ?? 0, unsignedCautions: unsigned.map((c) => c.id) };
}

function notReady(remaining: { blockingFindings: number; unsignedCautions: number[] }) {
  const parts = [
    remaining.blockingFindings
      ? `${remaining.blockingFindings} blocking finding${remaining.blockingFindings > 1 ? "s" : ""}`
      : "",
    remaining.unsignedCautions.length
      ? `${remaining.unsignedCautions.length} caution${remaining.unsignedCautions.length > 1 ? "s" : ""} without a sign-off`
      : "",
  ].filter(Boolean);
  return new AppError(409, "not-ready", `Not ready to approve: ${parts.join(" and ")} remain.`, undefined, remaining);
}

/**
 * Publishes the revision once no blocking finding and no unsigned caution remains, in one batch:
 * whatever revision of the guide is published now is superseded, the guide points at this one and
 * is back in the Library (an earlier unpublish reason is cleared). Readers never see a half state.
 */
export async function approveRevision(db: Db, revisionId: number, actor: Actor) {
  const revision = await reviewableRevision(db, revisionId, actor);
  const guide = revision.guide;
  assertCan(actor, "publish:guide", guide);
  const remaining = await approvalBlockers(db, revisionId);
  if (remaining.blockingFindings > 0 || remaining.unsignedCautions.length > 0) throw notReady(remaining);
  const author = await userById(db, guide.authorId);
  const now = new Date();
  try {
    await decisionBatch(db, revisionId, [
      db
        .update(revisions)
        .set({ state: "superseded" })
        .where(and(eq(revisions.guideId, guide.id), eq(revisions.state, "published"), ne(revisions.id, revisionId))),
      db
        .update(revisions)
        .set({
          state: "published",
          reviewedAt: now,
          reviewedById: actor.id,
          // NULL (refused by the revision triggers) if a blocking finding appeared since the check above.
          publishedAt: sql`(SELECT ${now.getTime()} WHERE NOT EXISTS (SELECT 1 FROM findings WHERE revision_id = ${revisionId} AND severity = 'blocking'))`,
        })
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
          unpublishedReason: null,
          unpublishedAt: null,
        })
        .where(eq(guides.id, guide.id)),
      db.insert(reviews).values({ revisionId, editorId: actor.id, decision: "approve" }),
      auditInsert(db, {
        actorId: actor.id,
        action: "revision.approve-publish",
        subjectType: "revision",
        subjectId: revisionId,
        data: { number: revision.number, replaced: guide.publishedRevisionId },
        guideId: guide.id,
      }),
      outboxInsert(db, guidePublishedMail(author, { title: revision.title, number: revision.number, slug: guide.slug })),
    ]);
  } catch (error) {
    if (error instanceof AppError && error.code === "wrong-state" && error.extra?.state === "in-review") {
      throw notReady(await approvalBlockers(db, revisionId));
    }
    throw error;
  }
  return { ok: true };
}

/**
 * Takes a published guide out of the Library with a reason: its page then answers 410 with it.
 * Its published revision stays recorded (and comes back only through a new approval).
 */
export async function unpublishGuide(db: Db, revisionId: number, actor: Actor, input: Pick<UnpublishInput, "reason">) {
  const revision = await db.query.revisions.findFirst({ where: eq(revisions.id, revisionId), with: { guide: true } });
  if (!revision) throw notFound("This revision");
  const guide = revision.guide;
  assertCan(actor, "review:revision", revision);
  assertCan(actor, "unpublish:guide", guide);
  const live = () => guide.state === "published" && guide.publishedRevisionId === revisionId;
  if (!live()) {
    throw new AppError(409, "wrong-state", "Only the revision readers see now can be unpublished, and this one is not it.");
  }
  const [author, editor] = await Promise.all([userById(db, guide.authorId), userById(db, actor.id)]);
  try {
    await batch(db, [
      db
        .update(guides)
        .set({
          // NULL (refused: the column is NOT NULL) unless the guide is still published at this revision.
          state: sql`(SELECT 'unpublished' FROM guides WHERE id = ${guide.id} AND state = 'published' AND published_revision_id = ${revisionId})`,
          unpublishedReason: input.reason,
          unpublishedAt: new Date(),
        })
        .where(eq(guides.id, guide.id)),
      db.insert(reviews).values({ revisionId, editorId: actor.id, decision: "unpublish", note: input.reason }),
      auditInsert(db, {
        actorId: actor.id,
        action: "guide.unpublish",
        subjectType: "guide",
        subjectId: guide.id,
        reason: input.reason,
        data: { revision: revision.number },
        guideId: guide.id,
      }),
      outboxInsert(
        db,
        guideUnpublishedMail(author, { title: revision.title, guideId: guide.id, reason: input.reason, editorName: editor.name }),
      ),
    ]);
  } catch (error) {
    const now = await getGuideById(db, guide.id);
    if (now?.state !== "published" || now.publishedRevisionId !== revisionId) {
      throw new AppError(
        409,
        "wrong-state",
        "Another editor changed this guide a moment ago: reload to see where it stands.",
        undefined,
        {
          state: now?.state ?? null,
        },
      );
    }
    throw fromDbError(error) ?? error;
  }
  return { ok: true };
}

/** One decision from the review desk (already parsed by `reviewDecisionSchema`), to its function. */
export function decideReview(db: Db, revisionId: number, actor: Actor, decision: ReviewDecision) {
  switch (decision.intent) {
    case "acknowledge":
      return acknowledgeFinding(db, revisionId, actor, decision);
    case "sign-off":
      return signOffCaution(db, revisionId, actor, decision);
    case "comment":
      return addReviewComment(db, revisionId, actor, decision);
    case "request-changes":
      return requestChanges(db, revisionId, actor, decision);
    case "approve":
      return approveRevision(db, revisionId, actor);
    case "unpublish":
      return unpublishGuide(db, revisionId, actor, decision);
  }
}
