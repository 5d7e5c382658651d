import { and, asc, desc, eq, inArray, lt } from "drizzle-orm";
import type { Db } from "~/db/client.server";
import { findings, fitment, guides, reviews, revisions, users } from "~/db/schema";
import { storedCallout } from "~/engine/callouts";
import { runSafetyRules } from "~/engine/rules";
import { type SourceId, sourceRef } from "~/engine/sources";
import type { Storage } from "~/services/storage.server";
import { notFound } from "~/utils/errors";
import { type Actor, assertCan, canOn } from "~/utils/permissions";
import { type LoadedRevision, loadRevision, partsAndTools, rulesInput } from "./guides.server";
import { revisionView } from "./library.server";
import { approvalBlockers, commentsOn, revisionCautions } from "./review.server";
import type { ReviewQueueQuery } from "./review-input";
import { type DiffRevision, revisionDiff } from "./revision-diff";

/** The review desk's reads: the queue, and one revision with everything an editor decides on. */

type Vehicle = { key: string; name: string };

/** Vehicles a revision fits (not the rows marked "does not fit"), one entry per model. */
async function vehiclesOf(db: Db, revisionIds: number[]) {
  const byRevision = new Map<number, Vehicle[]>();
  if (!revisionIds.length) return byRevision;
  const rows = await db.query.fitment.findMany({
    where: inArray(fitment.revisionId, revisionIds),
    with: { variant: { with: { generation: { with: { model: { with: { make: true } } } } } } },
  });
  for (const row of rows) {
    if (row.status === "does-not-fit") continue;
    const model = row.variant.generation.model;
    const vehicle = { key: `${model.make.slug}.${model.slug}`, name: `${model.make.name} ${model.name}` };
    const list = byRevision.get(row.revisionId) ?? [];
    if (!list.some((v) => v.key === vehicle.key)) list.push(vehicle);
    byRevision.set(row.revisionId, list);
  }
  return byRevision;
}

/**
 * Revisions waiting for review, oldest first, with what an editor weighs before opening one: the
 * vehicles, how long it has waited, blocking findings and cautions still to sign. An editor's own
 * guides are listed too, marked as not theirs to review. `vehicles` lists every vehicle in the
 * queue for the filter, whatever the filter.
 */
export async function reviewQueueView(db: Db, actor: Actor, query: ReviewQueueQuery, now = new Date()) {
  const rows = await db.query.revisions.findMany({
    where: eq(revisions.state, "in-review"),
    orderBy: [asc(revisions.submittedAt), asc(revisions.id)],
    with: { guide: { with: { author: true } }, findings: true },
  });
  const vehicles = await vehiclesOf(
    db,
    rows.map((r) => r.id),
  );
  const all = await Promise.all(
    rows.map(async (r) => {
      const cautions = await revisionCautions(db, r.id);
      const submittedAt = r.submittedAt ?? r.updatedAt;
      return {
        revisionId: r.id,
        number: r.number,
        guide: { id: r.guide.id, slug: r.guide.slug, title: r.title, published: r.guide.publishedRevisionId !== null },
        author: { id: r.guide.author.id, name: r.guide.author.name },
        submittedAt,
        waitingMinutes: Math.max(0, Math.floor((now.getTime() - submittedAt.getTime()) / 60_000)),
        vehicles: vehicles.get(r.id) ?? [],
        blocking: r.findings.filter((f) => f.severity === "blocking").length,
        openWarnings: r.findings.filter((f) => f.severity !== "blocking" && f.status === "open").length,
        cautions: cautions.length,
        unsignedCautions: cautions.filter((c) => c.signedOffBy === null).length,
        /** The editor's own guide: listed, but someone else reviews it. */
        ownGuide: !canOn(actor, "review:revision", { guide: r.guide }),
      };
    }),
  );
  const choices = new Map<string, string>();
  for (const item of all) for (const v of item.vehicles) choices.set(v.key, v.name);
  const items = all.filter(
    (item) => (!query.vehicle || item.vehicles.some((v) => v.key === query.vehicle)) && (!query.blocking || item.blocking > 0),
  );
  return {
    items,
    total: all.length,
    vehicles: [...choices].map(([key, name]) => ({ key, name })).sort((a, b) => a.name.localeCompare(b.name)),
    filters: { vehicle: query.vehicle ?? null, blocking: query.blocking ?? false },
  };
}

/** A loaded revision in the diff's terms. */
export function diffSource(loaded: LoadedRevision): DiffRevision {
  const { revision } = loaded;
  return {
    title: revision.title,
    summary: revision.summary,
    category: revision.category,
    difficulty: revision.difficulty,
    minutes: revision.minutes,
    steps: loaded.steps.map((s) => ({
      title: s.title,
      text: s.bodyText,
      liftsVehicle: s.liftsVehicle,
      disconnectsBattery: s.disconnectsBattery,
      callouts: s.callouts.map(storedCallout),
      photos: s.photos.map((p) => ({ mediaId: p.mediaId, alt: p.alt })),
    })),
    fitment: loaded.fitment.map((f) => {
      const g = f.variant.generation;
      return {
        variantId: f.variantId,
        vehicle: `${g.model.make.name} ${g.model.name} ${g.name}, ${f.variant.name}`,
        status: f.status,
        note: f.note,
      };
    }),
    ...partsAndTools(loaded),
  };
}

/**
 * What the revision is compared with: the published revision, or for a guide never published the
 * last revision sent back for changes (what the author was asked to change).
 */
async function comparedWith(
  db: Db,
  guide: { id: number; publishedRevisionId: number | null },
  revision: { id: number; number: number },
) {
  if (guide.publishedRevisionId && guide.publishedRevisionId !== revision.id) {
    return { id: guide.publishedRevisionId, why: "published" as const };
  }
  const [sentBack] = await db
    .select({ id: revisions.id })
    .from(revisions)
    .where(and(eq(revisions.guideId, guide.id), eq(revisions.state, "changes-requested"), lt(revisions.number, revision.number)))
    .orderBy(desc(revisions.number))
    .limit(1);
  return sentBack ? { id: sentBack.id, why: "sent-back" as const } : null;
}

/** The source behind a stored finding's rule, when the engine no longer produces it for this content. */
const RULE_SOURCES: Partial<Record<string, SourceId>> = {
  "no-fuse": "cfr-183-455",
  "fuse-exceeds-wire": "cfr-183-455",
  "fuse-far-from-battery": "cfr-183-455",
  "fuse-above-ampacity": "common-practice",
  "fuse-undersized": "nec-210-20a",
  "caution-unsigned": "review-policy",
};

/**
 * One revision for the review desk: the reader's view of it, the findings stored when it was
 * submitted (each with its source, numbers and state), its cautions and their sign-offs, the
 * comments, the diff, what still stands in the way of approval, and what the actor may do.
 */
export async function reviewDeskView(db: Db, storage: Pick<Storage, "publicUrl">, actor: Actor, revisionId: number) {
  const revision = await db.query.revisions.findFirst({
    where: eq(revisions.id, revisionId),
    with: { guide: { with: { author: true } } },
  });
  if (!revision || revision.state === "draft") throw notFound("This revision");
  const guide = revision.guide;
  assertCan(actor, "read:revision", revision);
  const [loaded, view] = await Promise.all([loadRevision(db, revisionId), revisionView(db, storage, revisionId)]);
  if (!loaded || !view) throw notFound("This revision");

  const engine = runSafetyRules(rulesInput(loaded));
  const stored = await db
    .select({ finding: findings, resolvedBy: users.name })
    .from(findings)
    .leftJoin(users, eq(users.id, findings.resolvedById))
    .where(eq(findings.revisionId, revisionId))
    .orderBy(asc(findings.stepIndex), asc(findings.id));
  const findingList = stored.map(({ finding: f, resolvedBy }) => {
    const same = engine.find((e) => e.rule === f.rule && e.stepIndex === f.stepIndex && e.message === f.message);
    const source = same?.source ?? RULE_SOURCES[f.rule] ?? "common-practice";
    return {
      id: f.id,
      rule: f.rule,
      severity: f.severity,
      stepIndex: f.stepIndex,
      calloutIndex: same?.calloutIndex ?? null,
      message: f.message,
      numbers: f.numbers ?? same?.numbers ?? null,
      source: sourceRef(source),
      status: f.status,
      note: f.note,
      resolvedBy,
      resolvedAt: f.resolvedAt,
    };
  });

  const against = await comparedWith(db, guide, revision);
  const base = against ? await loadRevision(db, against.id) : null;
  const diff =
    against && base
      ? {
          against: { revisionId: against.id, number: base.revision.number, why: against.why },
          ...revisionDiff(diffSource(base), diffSource(loaded)),
        }
      : null;

  const [cautions, comments, decisions, remaining] = await Promise.all([
    revisionCautions(db, revisionId),
    commentsOn(db, revisionId),
    db
      .select({ decision: reviews.decision, note: reviews.note, createdAt: reviews.createdAt, editor: users.name })
      .from(reviews)
      .innerJoin(users, eq(users.id, reviews.editorId))
      .where(eq(reviews.revisionId, revisionId))
      .orderBy(asc(reviews.createdAt), asc(reviews.id)),
    approvalBlockers(db, revisionId),
  ]);
  const mayReview = canOn(actor, "review:revision", revision);
  const live = guide.state === "published" && guide.publishedRevisionId === revisionId;
  return {
    revision: {
      id: revision.id,
      number: revision.number,
      state: revision.state,
      title: revision.title,
      changeSummary: revision.changeSummary,
      submittedAt: revision.submittedAt,
      reviewedAt: revision.reviewedAt,
      guide: {
        id: guide.id,
        slug: guide.slug,
        state: guide.state,
        publishedRevisionId: guide.publishedRevisionId,
        unpublishedReason: guide.unpublishedReason,
      },
      author: { id: guide.author.id, name: guide.author.name, bio: guide.author.bio },
    },
    article: view,
    findings: findingList,
    cautions: cautions.map((c) => ({
      id: c.id,
      stepIndex: c.stepIndex,
      signalWord: c.signalWord,
      text: c.text,
      signedOffBy: c.signedOffBy,
      signedOffByName: c.signedOffByName,
      signedOffAt: c.signedOffAt,
      carriedFrom: c.carriedFrom,
    })),
    comments,
    decisions,
    diff,
    remaining,
    can: {
      /** False on the editor's own guide: another editor decides. */
      review: mayReview,
      decide: mayReview && revision.state === "in-review",
      unpublish: mayReview && live && canOn(actor, "unpublish:guide", guide),
    },
  };
}

export type ReviewDeskView = Awaited<ReturnType<typeof reviewDeskView>>;

/** A guide an editor took out of the Library, with the reason its page gives (410), or null. */
export async function unpublishedGuide(db: Db, slug: string) {
  const [guide] = await db
    .select({ title: guides.title, reason: guides.unpublishedReason, at: guides.unpublishedAt })
    .from(guides)
    .where(and(eq(guides.slug, slug), eq(guides.state, "unpublished")));
  return guide ?? null;
}
