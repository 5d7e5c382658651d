import { submitInputSchema } from "~/models/guide-input";
import { submitRevision } from "~/models/review.server";
import { apiHandler } from "~/utils/http.server";
import { assertCan } from "~/utils/permissions";
import type { Route } from "./+types/api.guide-submit";
import { apiGuide, methodNotAllowed, PRIVATE_JSON, readAuthoringJson } from "./authoring-api.server";

export function loader() {
  return methodNotAllowed(["POST"], "Submitting a guide");
}

/**
 * Sends the working revision to the editors. Not ready yet: 422 with `missing` (the kinds of gap)
 * and `fields` (a message per place to fix, e.g. `steps.2.photos.0.alt`). Afterwards the revision
 * is frozen until the editors decide.
 */
export const action = apiHandler(async (args: Route.ActionArgs) => {
  if (args.request.method !== "POST") return loader();
  const { user, db, guide, guideId } = await apiGuide(args);
  assertCan(user, "submit:guide", guide);
  const { changeSummary } = await readAuthoringJson(args.request, submitInputSchema);
  return Response.json(await submitRevision(db, guideId, user, changeSummary), { headers: PRIVATE_JSON });
});
