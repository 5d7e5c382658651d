import { eq } from "drizzle-orm";
import { getDb } from "~/db/client.server";
import { revisions } from "~/db/schema";
import { reviewDeskView } from "~/models/review-desk.server";
import { decideReview } from "~/models/review.server";
import { reviewDecisionSchema } from "~/models/review-input";
import { requirePermission } from "~/services/auth/guards.server";
import { getStorage } from "~/services/storage.server";
import { notFound } from "~/utils/errors";
import { apiHandler, readJson } from "~/utils/http.server";
import { assertCan } from "~/utils/permissions";
import type { Route } from "./+types/api.review";
import { methodNotAllowed, PRIVATE_JSON } from "./authoring-api.server";
import { REVIEW_JSON_MAX_BYTES, revisionIdParam } from "./review-desk.server";

/** A submitted revision with its findings, cautions, comments and diff (design/api.md). Editors only. */
export const loader = apiHandler(async (args: Route.LoaderArgs) => {
  const user = await requirePermission(args, "read:revision:any");
  const view = await reviewDeskView(await getDb(), getStorage(), user, revisionIdParam(args.params.revisionId));
  return Response.json(view, { headers: PRIVATE_JSON });
});

/**
 * One decision as JSON: `{ intent: "acknowledge" | "sign-off" | "comment" | "request-changes" |
 * "approve" | "unpublish", … }`. Who may decide is settled before the body is read: an editor's
 * own guide answers 403 whatever the body. 409 when the revision is no longer waiting, or (approve)
 * while blocking findings or unsigned cautions remain, naming them.
 */
export const action = apiHandler(async (args: Route.ActionArgs) => {
  if (args.request.method !== "POST") return methodNotAllowed(["GET", "POST"], "A revision on the review desk");
  const user = await requirePermission(args, "review:revision:any");
  const revisionId = revisionIdParam(args.params.revisionId);
  const db = await getDb();
  const revision = await db.query.revisions.findFirst({ where: eq(revisions.id, revisionId), with: { guide: true } });
  if (!revision || revision.state === "draft") throw notFound("This revision");
  assertCan(user, "review:revision", revision);
  const decision = await readJson(args.request, reviewDecisionSchema, { maxBytes: REVIEW_JSON_MAX_BYTES });
  await decideReview(db, revisionId, user, decision);
  const [now] = await db.select({ state: revisions.state }).from(revisions).where(eq(revisions.id, revisionId));
  return Response.json({ ok: true, intent: decision.intent, state: now?.state ?? null }, { headers: PRIVATE_JSON });
});
