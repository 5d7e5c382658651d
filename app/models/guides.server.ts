import { asc, eq, inArray, like, sql } from "drizzle-orm";
import { batch } from "~/db/batch.server";
import type { Db } from "~/db/client.server";
import { callouts, fitment, guides, media, parts, revisions, stepPhotos, steps, tools, variants } from "~/db/schema";
import { type Callout, calloutRow, storedCallout } from "~/engine/callouts";
import { fittingPowertrains, runSafetyRules } from "~/engine/rules";
import { renderBody } from "~/services/richtext.server";
import { AppError, fromDbError, notFound } from "~/utils/errors";
import { type Actor, assertCan, canOn } from "~/utils/permissions";
import { auditInsert } from "./audit.server";
import type { DraftInput, GuideMetaInput } from "./guide-input";

export function slugify(title: string) {
  return (
    title
      .normalize("NFKD")
      .replace(/[\u0300-\u036f]/g, "")
      .toLowerCase()
      .replace(/[^a-z0-9]+/g, "-")
      .replace(/^-+|-+$/g, "")
      .slice(0, 80) || "guide"
  );
}

async function uniqueSlug(db: Db, title: string) {
  const base = slugify(title);
  const taken = new Set(
    (
      await db
        .select({ slug: guides.slug })
        .from(guides)
        .where(like(guides.slug, `${base}%`))
    ).map((r) => r.slug),
  );
  if (!taken.has(base)) return base;
  for (let n = 2; ; n++) if (!taken.has(`${base}-${n}`)) return `${base}-${n}`;
}

/** Runs a batch and turns the database's concurrency and freeze refusals into 409s. */
export async function runBatch(db: Db, queries: Parameters<typeof batch>[1]) {
  try {
    return await batch(db, queries);
  } catch (error) {
    throw fromDbError(error) ?? error;
  }
}

export async function createGuide(db: Db, actor: Actor, input: GuideMetaInput, options: { slug?: string } = {}) {
  assertCan(actor, "create:guide");
  const authorId = actor.id;
  const meta = {
    title: input.title,
    summary: input.summary,
    category: input.category,
    difficulty: input.difficulty,
    minutes: input.minutes,
  };
  const slug = await uniqueSlug(db, options.slug ?? meta.title);
  const guideId = sql`(SELECT id FROM guides WHERE slug = ${slug})`;
  await runBatch(db, [
    db.insert(guides).values({ ...meta, slug, authorId, state: "draft" }),
    db.insert(revisions).values({ ...meta, guideId: sql`${guideId}`, number: 1, createdById: authorId }),
    db
      .update(guides)
      .set({ workingRevisionId: sql`(SELECT id FROM revisions WHERE guide_id = ${guideId} AND number = 1)` })
      .where(eq(guides.slug, slug)),
    auditInsert(db, {
      actorId: authorId,
      action: "guide.create",
      subjectType: "guide",
      subjectId: slug,
      guideId: sql`${guideId}`,
    }),
  ]);
  const guide = await db.query.guides.findFirst({ where: eq(guides.slug, slug) });
  if (!guide?.workingRevisionId) throw new Error("guide was not created");
  return { id: guide.id, slug, draft: { revisionId: guide.workingRevisionId, version: 1 } };
}

export async function getGuideById(db: Db, id: number) {
  return db.query.guides.findFirst({ where: eq(guides.id, id) });
}

/**
 * A revision with everything in it, in order: the one loader behind the editor, the review desk
 * and the reader's page (which shapes its output from this).
 */
export async function loadRevision(db: Db, revisionId: number) {
  const revision = await db.query.revisions.findFirst({ where: eq(revisions.id, revisionId) });
  if (!revision) return null;
  const stepRows = await db.query.steps.findMany({
    where: eq(steps.revisionId, revisionId),
    orderBy: asc(steps.position),
    with: {
      callouts: { orderBy: asc(callouts.position) },
      photos: { orderBy: asc(stepPhotos.position), with: { media: true } },
    },
  });
  const [fitmentRows, partRows, toolRows] = await Promise.all([
    db.query.fitment.findMany({
      where: eq(fitment.revisionId, revisionId),
      with: { variant: { with: { generation: { with: { model: { with: { make: true } } } } } } },
    }),
    db.query.parts.findMany({ where: eq(parts.revisionId, revisionId), orderBy: asc(parts.position) }),
    db.query.tools.findMany({ where: eq(tools.revisionId, revisionId), orderBy: asc(tools.position) }),
  ]);
  return { revision, steps: stepRows, fitment: fitmentRows, parts: partRows, tools: toolRows };
}

export type LoadedRevision = NonNullable<Awaited<ReturnType<typeof loadRevision>>>;

/** A revision's parts and tools as the editor, the review desk and readers are given them. */
export function partsAndTools(loaded: Pick<LoadedRevision, "parts" | "tools">) {
  return {
    parts: loaded.parts.map((p) => ({
      name: p.name,
      quantity: p.quantity,
      partNumber: p.partNumber,
      notes: p.notes,
      stepIndex: p.stepIndex,
    })),
    tools: loaded.tools.map((t) => ({ name: t.name })),
  };
}

/** The engine's view of a revision: what the safety rules read. Rows that do not fit are left out. */
export function rulesInput(loaded: Pick<LoadedRevision, "steps" | "fitment">) {
  return {
    steps: loaded.steps.map((s) => ({
      title: s.title,
      liftsVehicle: s.liftsVehicle,
      disconnectsBattery: s.disconnectsBattery,
      callouts: s.callouts.map(storedCallout),
    })),
    fitmentPowertrains: fittingPowertrains(loaded.fitment.map((f) => ({ status: f.status, powertrain: f.variant.powertrain }))),
  };
}

/**
 * Everything about a draft that the schema alone cannot check, before anything is written: each
 * step's rich text (rendered here, once), that every fitment row names a known variant, and that
 * every photo was uploaded by the actor. Problems come back together as one 400 keyed by field.
 */
export async function checkDraft(db: Db, actor: Actor, input: DraftInput) {
  const fields: Record<string, string> = {};
  const rendered = input.steps.map((step, i) => {
    try {
      return renderBody(step.body);
    } catch (error) {
      if (!(error instanceof AppError)) throw error;
      fields[`steps.${i}.body`] = `Step ${i + 1}: ${error.message}`;
      return { html: "", text: "", json: {} };
    }
  });
  const variantIds = input.fitment.map((f) => f.variantId);
  const knownVariants = variantIds.length
    ? await db.select({ id: variants.id, powertrain: variants.powertrain }).from(variants).where(inArray(variants.id, variantIds))
    : [];
  input.fitment.forEach((row, i) => {
    if (!knownVariants.some((v) => v.id === row.variantId)) fields[`fitment.${i}.variantId`] = "Unknown vehicle variant";
  });
  const mediaIds = input.steps.flatMap((s) => s.photos.map((p) => p.mediaId));
  const knownMedia = new Map(
    mediaIds.length
      ? (await db.select({ id: media.id, ownerId: media.ownerId }).from(media).where(inArray(media.id, mediaIds))).map((m) => [
          m.id,
          m,
        ])
      : [],
  );
  input.steps.forEach((s, i) => {
    s.photos.forEach((p, j) => {
      const photo = knownMedia.get(p.mediaId);
      if (!photo) fields[`steps.${i}.photos.${j}.mediaId`] = "This photo was not uploaded";
      // A draft shows only photos its author uploaded; anyone else's stay theirs.
      else if (!canOn(actor, "attach:media", photo)) {
        fields[`steps.${i}.photos.${j}.mediaId`] = "This photo was uploaded by another account: upload your own";
      }
    });
  });
  if (Object.keys(fields).length) throw new AppError(400, "invalid", "Some fields need attention.", fields);
  return { rendered, knownVariants };
}

export const FROZEN_MESSAGE =
  "This revision is with the editors for review, so it cannot change now. If they ask for changes, you carry on in a new draft.";

/**
 * Replaces the working revision's content in one batch. The first statement moves the version on
 * by one; a trigger refuses it when another save came first or the revision is already submitted,
 * and the whole batch rolls back.
 */
export async function saveDraft(db: Db, guideId: number, actor: Actor, input: DraftInput) {
  const guide = await getGuideById(db, guideId);
  if (!guide) throw notFound("This guide");
  assertCan(actor, "update:guide", guide);
  if (!guide.workingRevisionId) {
    throw new AppError(409, "wrong-state", "This guide has no open draft: start a new revision to change it.");
  }
  const revisionId = guide.workingRevisionId;
  const [current] = await db.select({ state: revisions.state }).from(revisions).where(eq(revisions.id, revisionId));
  // The triggers refuse it too; this says why in words the author can act on.
  if (current && current.state !== "draft")
    throw new AppError(409, "wrong-state", FROZEN_MESSAGE, undefined, { state: current.state });
  const { rendered, knownVariants } = await checkDraft(db, actor, input);

  const stepId = (position: number) => sql`(SELECT id FROM steps WHERE revision_id = ${revisionId} AND position = ${position})`;
  const meta = {
    title: input.title,
    summary: input.summary,
    category: input.category,
    difficulty: input.difficulty,
    minutes: input.minutes,
  };
  const queries = [
    db
      .update(revisions)
      .set({ ...meta, version: input.version + 1 })
      .where(eq(revisions.id, revisionId)),
    // A never-published guide lists under its working title in the author's workbench.
    ...(guide.publishedRevisionId ? [] : [db.update(guides).set(meta).where(eq(guides.id, guideId))]),
    db.delete(steps).where(eq(steps.revisionId, revisionId)),
    db.delete(fitment).where(eq(fitment.revisionId, revisionId)),
    db.delete(parts).where(eq(parts.revisionId, revisionId)),
    db.delete(tools).where(eq(tools.revisionId, revisionId)),
    // One multi-row insert per table: a 40-step save is a dozen statements, not hundreds.
    ...insertRows(
      input.steps.map((step, position) => ({
        revisionId,
        position,
        title: step.title,
        body: rendered[position].json,
        bodyHtml: rendered[position].html,
        bodyText: rendered[position].text,
        liftsVehicle: step.liftsVehicle,
        disconnectsBattery: step.disconnectsBattery,
      })),
      (rows) => db.insert(steps).values(rows),
    ),
    ...insertRows(
      input.steps.flatMap((step, position) =>
        step.callouts.map((callout, i) => ({ stepId: sql`${stepId(position)}`, position: i, ...calloutRow(callout) })),
      ),
      (rows) => db.insert(callouts).values(rows),
    ),
    ...insertRows(
      input.steps.flatMap((step, position) =>
        step.photos.map((photo, i) => ({ stepId: sql`${stepId(position)}`, position: i, ...photo })),
      ),
      (rows) => db.insert(stepPhotos).values(rows),
    ),
    ...insertRows(
      input.fitment.map((row) => ({ revisionId, ...row })),
      (rows) => db.insert(fitment).values(rows),
    ),
    ...insertRows(
      input.parts.map((part, position) => ({ revisionId, position, ...part })),
      (rows) => db.insert(parts).values(rows),
    ),
    ...insertRows(
      input.tools.map((tool, position) => ({ revisionId, position, ...tool })),
      (rows) => db.insert(tools).values(rows),
    ),
  ];
  await runBatch(db, queries);

  const findings = runSafetyRules({
    steps: input.steps,
    fitmentPowertrains: fittingPowertrains(
      input.fitment.map((f) => ({ status: f.status, powertrain: knownVariants.find((v) => v.id === f.variantId)?.powertrain })),
    ),
  });
  return { version: input.version + 1, revisionId, findings };
}

/** Rows per insert statement: well under SQLite's limit on bound values (32,766) for any table here. */
const ROWS_PER_INSERT = 200;

/** Multi-row inserts of `rows`, none when there are none (an empty VALUES list is not SQL). */
function insertRows<R, Q>(rows: R[], insert: (chunk: R[]) => Q): Q[] {
  const queries: Q[] = [];
  for (let i = 0; i < rows.length; i += ROWS_PER_INSERT) queries.push(insert(rows.slice(i, i + ROWS_PER_INSERT)));
  return queries;
}

export const ALT_MIN_CHARS = 3;
const SUMMARY_MIN_CHARS = 10;

/** What a revision still lacks before an editor can look at it (the API's 422 `missing`, one word per kind of gap). */
export function missingForSubmit(loaded: LoadedRevision): string[] {
  return submitProblems(loaded).missing;
}

/** A circuit callout the engine can check completely: wire and fuse chosen, the relay decided, a battery feed's fuse placed. */
function circuitGaps(callout: Callout): Record<string, string> {
  if (callout.kind !== "circuit") return {};
  const gaps: Record<string, string> = {};
  if (callout.wire === undefined) gaps.wire = "Choose the wire size";
  if (callout.fuseA === undefined) gaps.fuseA = "Choose the fuse rating";
  if (callout.relay === undefined) gaps.relay = "Say whether the circuit uses a relay";
  if (callout.feed === "battery" && callout.fuseDistanceMm === undefined) {
    gaps.fuseDistanceMm = "Give the wire length from the battery terminal to the fuse";
  }
  return gaps;
}

/**
 * Everything to fix before submitting, both as the short `missing` list and as `fields`: a message
 * per place in the draft (`steps.2.photos.0.alt`, `steps.1.callouts.0.wire`, `changeSummary` …),
 * so the editor can link each one to its field. Blocking safety findings count: the author can
 * fix all of them (engine.md §3); `caution-unsigned` is the editors' and is not among them.
 */
export function submitProblems(
  loaded: Pick<LoadedRevision, "revision" | "steps" | "fitment">,
  options: { changeSummary?: string; publishedBefore?: boolean } = {},
): { missing: string[]; fields: Record<string, string> } {
  const missing = new Set<string>();
  const fields: Record<string, string> = {};
  const add = (kind: string, path: string, message: string) => {
    missing.add(kind);
    fields[path] ??= message;
  };
  if (loaded.revision.summary.trim().length < SUMMARY_MIN_CHARS) {
    add("summary", "summary", `Write a summary of at least ${SUMMARY_MIN_CHARS} characters`);
  }
  if (loaded.steps.length === 0) add("steps", "steps", "Add at least one step");
  loaded.steps.forEach((step, i) => {
    if (step.bodyText.trim() === "") add("steps.body", `steps.${i}.body`, `Step ${i + 1}: write what to do in this step`);
  });
  if (loaded.fitment.length === 0) add("fitment", "fitment", "Mark at least one vehicle variant in the fitment matrix");
  loaded.steps.forEach((step, i) => {
    step.photos.forEach((photo, j) => {
      if (photo.alt.trim().length < ALT_MIN_CHARS) {
        add(
          "steps.photos.alt",
          `steps.${i}.photos.${j}.alt`,
          `Step ${i + 1}, photo ${j + 1}: describe the photo for readers who cannot see it`,
        );
      }
    });
  });
  loaded.steps.forEach((step, i) => {
    step.callouts.forEach((row, j) => {
      for (const [field, message] of Object.entries(circuitGaps(storedCallout(row)))) {
        add("steps.callouts", `steps.${i}.callouts.${j}.${field}`, `Step ${i + 1}, circuit: ${message.toLowerCase()}`);
      }
    });
  });
  for (const finding of runSafetyRules(rulesInput(loaded))) {
    if (finding.severity !== "blocking") continue;
    const path =
      finding.calloutIndex === undefined
        ? `steps.${finding.stepIndex}.callouts`
        : `steps.${finding.stepIndex}.callouts.${finding.calloutIndex}`;
    missing.add("findings");
    fields[path] = fields[path] ? `${fields[path]} ${finding.message}` : finding.message;
  }
  if (options.publishedBefore && !options.changeSummary?.trim()) {
    add("changeSummary", "changeSummary", "Say what changed since the published revision");
  }
  return { missing: [...missing], fields };
}
