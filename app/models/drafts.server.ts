import { and, desc, eq } from "drizzle-orm";
import type { Db } from "~/db/client.server";
import { reviews, revisions } from "~/db/schema";
import { type Callout, storedCallout } from "~/engine/callouts";
import { type Finding, runSafetyRules } from "~/engine/rules";
import { getStorage, type Storage } from "~/services/storage.server";
import { forbidden, notFound, unauthorized } from "~/utils/errors";
import { type Actor, canOn } from "~/utils/permissions";
import type { Category, FitmentStatus, GuideState, RevisionState } from "~/utils/vocab";
import type { DraftInput } from "./guide-input";
import { getGuideById, type LoadedRevision, loadRevision, partsAndTools, rulesInput } from "./guides.server";
import { publicVariants } from "./media.server";

export type PhotoVariant = { width: number; format: "webp" | "jpeg"; url: string };

/**
 * A working revision as the editor holds it: exactly the body `PUT /api/guides/:id/draft`
 * accepts, plus each photo's `variants` for display (the PUT ignores them).
 */
export type DraftDocument = Omit<DraftInput, "steps"> & {
  steps: (Omit<DraftInput["steps"][number], "photos"> & {
    photos: { mediaId: number; alt: string; caption: string | null; variants: PhotoVariant[] }[];
  })[];
};

/** What `GET /api/guides/:id/draft` answers and the editor page loads. */
export type DraftView = {
  guide: {
    id: number;
    slug: string;
    state: GuideState;
    authorId: number;
    publishedRevisionId: number | null;
    workingRevisionId: number | null;
  };
  revision: {
    id: number;
    number: number;
    state: RevisionState;
    version: number;
    changeSummary: string | null;
    updatedAt: Date;
  };
  draft: DraftDocument;
  /** The engine's safety findings on this content, each with its `stepIndex` and (where it has one) `calloutIndex`. */
  findings: Finding[];
  /** The editor's note of the "changes requested" decision this revision answers, else null. */
  reviewNote: string | null;
};

/** The author, and anyone who reviews (editors, admins), may open a guide's draft; nobody else. */
export function assertCanReadDraft(actor: Actor | null | undefined, guide: { authorId: number }) {
  if (!actor) throw unauthorized();
  if (canOn(actor, "update:guide", guide) || canOn(actor, "read:revision", { guide })) return;
  throw forbidden("Only the guide's author and the editors can open this draft.");
}

/** A loaded revision as the body the PUT takes (plus photo variants). */
export function draftDocument(loaded: LoadedRevision, storage: Pick<Storage, "publicUrl">): DraftDocument {
  const { revision } = loaded;
  return {
    version: revision.version,
    title: revision.title,
    summary: revision.summary,
    category: revision.category as Category,
    difficulty: revision.difficulty,
    minutes: revision.minutes,
    steps: loaded.steps.map((s) => ({
      title: s.title,
      body: s.body as Record<string, unknown>,
      liftsVehicle: s.liftsVehicle,
      disconnectsBattery: s.disconnectsBattery,
      photos: s.photos.map((p) => ({
        mediaId: p.mediaId,
        alt: p.alt,
        caption: p.caption,
        variants: publicVariants(storage, p.media.variants),
      })),
      callouts: s.callouts.map((c): Callout => storedCallout(c)),
    })),
    fitment: loaded.fitment.map((f) => ({ variantId: f.variantId, status: f.status as FitmentStatus, note: f.note })),
    ...partsAndTools(loaded),
  };
}

/** The note of the request for changes that sent back the revision before this one, if that is how it began. */
async function reviewNoteFor(db: Db, guideId: number, number: number): Promise<string | null> {
  if (number <= 1) return null;
  const [row] = await db
    .select({ note: reviews.note })
    .from(reviews)
    .innerJoin(revisions, eq(revisions.id, reviews.revisionId))
    .where(and(eq(revisions.guideId, guideId), eq(revisions.number, number - 1), eq(reviews.decision, "request-changes")))
    .orderBy(desc(reviews.createdAt), desc(reviews.id))
    .limit(1);
  return row?.note ?? null;
}

/**
 * The guide's working revision (or, with none open, its published one) for the editor: the
 * guide's identity and state, the revision's bookkeeping, the content as the PUT takes it, the
 * live safety findings and the editor's note that sent it back.
 */
export async function readDraft(
  db: Db,
  actor: Actor | null | undefined,
  guideId: number,
  storage: Pick<Storage, "publicUrl"> = getStorage(),
): Promise<DraftView> {
  const guide = await getGuideById(db, guideId);
  if (!guide) throw notFound("This guide");
  assertCanReadDraft(actor, guide);
  const revisionId = guide.workingRevisionId ?? guide.publishedRevisionId;
  const loaded = revisionId ? await loadRevision(db, revisionId) : null;
  if (!loaded) throw notFound("This guide's draft");
  const { revision } = loaded;
  return {
    guide: {
      id: guide.id,
      slug: guide.slug,
      state: guide.state,
      authorId: guide.authorId,
      publishedRevisionId: guide.publishedRevisionId,
      workingRevisionId: guide.workingRevisionId,
    },
    revision: {
      id: revision.id,
      number: revision.number,
      state: revision.state,
      version: revision.version,
      changeSummary: revision.changeSummary,
      updatedAt: revision.updatedAt,
    },
    draft: draftDocument(loaded, storage),
    findings: runSafetyRules(rulesInput(loaded)),
    reviewNote: await reviewNoteFor(db, guide.id, revision.number),
  };
}
