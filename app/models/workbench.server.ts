import { and, desc, eq, inArray } from "drizzle-orm";
import type { Db } from "~/db/client.server";
import { findings, guides, revisions, reviews } from "~/db/schema";
import { runSafetyRules } from "~/engine/rules";
import { assertCan, type Actor } from "~/utils/permissions";
import { loadRevision, rulesInput } from "./guides.server";

/** How the Workbench names where a guide stands, in the author's words. */
export type WorkbenchStatus =
  | { kind: "draft" }
  | { kind: "in-review" }
  | { kind: "changes-requested"; note: string | null }
  | { kind: "published" }
  | { kind: "published-with-draft"; draftState: "draft" | "in-review" | "changes-requested" }
  | { kind: "unpublished" };

export type WorkbenchGuide = {
  id: number;
  slug: string;
  title: string;
  status: WorkbenchStatus;
  revisionNumber: number;
  lastEdit: Date;
  openFindings: number;
  blockingFindings: number;
  canStartRevision: boolean;
};

function statusOf(
  guide: { state: string; publishedRevisionId: number | null },
  working: { state: string } | undefined,
  note: string | null,
): WorkbenchStatus {
  const draftState = working?.state === "in-review" ? "in-review" : note ? "changes-requested" : "draft";
  if (guide.state === "unpublished") return { kind: "unpublished" };
  if (guide.publishedRevisionId) return working ? { kind: "published-with-draft", draftState } : { kind: "published" };
  if (draftState === "changes-requested") return { kind: "changes-requested", note };
  return { kind: draftState };
}

/**
 * The signed-in author's guides, newest edit first. Findings of a draft are the engine's live
 * answer on what is saved; those of a revision with the editors are the stored, still open ones.
 */
export async function listWorkbench(db: Db, actor: Actor): Promise<WorkbenchGuide[]> {
  assertCan(actor, "create:guide");
  const own = await db.select().from(guides).where(eq(guides.authorId, actor.id));
  if (own.length === 0) return [];
  const revisionIds = own.flatMap((g) => [g.workingRevisionId, g.publishedRevisionId]).filter((id): id is number => !!id);
  const revisionRows = revisionIds.length ? await db.select().from(revisions).where(inArray(revisions.id, revisionIds)) : [];
  const byId = new Map(revisionRows.map((r) => [r.id, r]));
  const workingIds = own.map((g) => g.workingRevisionId).filter((id): id is number => !!id);
  const notes = workingIds.length
    ? await db
        .select({ guideId: revisions.guideId, revisionId: reviews.revisionId, note: reviews.note, decision: reviews.decision })
        .from(reviews)
        .innerJoin(revisions, eq(revisions.id, reviews.revisionId))
        .where(
          inArray(
            revisions.guideId,
            own.map((g) => g.id),
          ),
        )
        .orderBy(desc(reviews.createdAt), desc(reviews.id))
    : [];
  const stored = workingIds.length
    ? await db
        .select({ revisionId: findings.revisionId, severity: findings.severity })
        .from(findings)
        .where(and(inArray(findings.revisionId, workingIds), eq(findings.status, "open")))
    : [];

  const list = await Promise.all(
    own.map(async (guide): Promise<WorkbenchGuide> => {
      const working = guide.workingRevisionId ? byId.get(guide.workingRevisionId) : undefined;
      const shown = working ?? (guide.publishedRevisionId ? byId.get(guide.publishedRevisionId) : undefined);
      // The note that sent the work back: the latest "changes requested" on this guide, while a draft is open after it.
      const latest = notes.find((n) => n.guideId === guide.id);
      const note =
        working?.state === "draft" && latest?.decision === "request-changes" && latest.revisionId !== working.id
          ? latest.note
          : null;
      let open = 0;
      let blocking = 0;
      if (working?.state === "draft") {
        const loaded = await loadRevision(db, working.id);
        const live = loaded ? runSafetyRules(rulesInput(loaded)) : [];
        open = live.length;
        blocking = live.filter((f) => f.severity === "blocking").length;
      } else if (working) {
        const mine = stored.filter((f) => f.revisionId === working.id);
        open = mine.length;
        blocking = mine.filter((f) => f.severity === "blocking").length;
      }
      return {
        id: guide.id,
        slug: guide.slug,
        title: shown?.title ?? guide.title,
        status: statusOf(guide, working, note),
        revisionNumber: shown?.number ?? 1,
        lastEdit: shown?.updatedAt ?? guide.updatedAt,
        openFindings: open,
        blockingFindings: blocking,
        canStartRevision: !working && !!guide.publishedRevisionId,
      };
    }),
  );
  return list.sort((a, b) => b.lastEdit.getTime() - a.lastEdit.getTime());
}
