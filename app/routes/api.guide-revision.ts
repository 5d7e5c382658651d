import { eq } from "drizzle-orm";
import { revisions } from "~/db/schema";
import { startNextRevision } from "~/models/review.server";
import { notFound } from "~/utils/errors";
import { apiHandler } from "~/utils/http.server";
import { assertCan } from "~/utils/permissions";
import type { Route } from "./+types/api.guide-revision";
import { apiGuide, methodNotAllowed, PRIVATE_JSON } from "./authoring-api.server";

export function loader() {
  return methodNotAllowed(["POST"], "Starting a revision");
}

/**
 * Opens the next working revision of a published guide, a copy of the published one, which stays
 * live. 201 when a copy was made; 200 with the draft already open (a second tab, a retry).
 */
export const action = apiHandler(async (args: Route.ActionArgs) => {
  if (args.request.method !== "POST") return loader();
  const { user, db, guide, guideId } = await apiGuide(args);
  assertCan(user, "update:guide", guide);
  const revisionId = await startNextRevision(db, guideId, user);
  const [row] = revisionId
    ? await db.select({ version: revisions.version }).from(revisions).where(eq(revisions.id, revisionId))
    : [];
  if (!revisionId || !row) throw notFound("This guide's new revision");
  const created = revisionId !== guide.workingRevisionId;
  return Response.json({ revisionId, version: row.version }, { status: created ? 201 : 200, headers: PRIVATE_JSON });
});
