import { getDb } from "~/db/client.server";
import { readDraft } from "~/models/drafts.server";
import { draftInputSchema } from "~/models/guide-input";
import { saveDraft } from "~/models/guides.server";
import { AppError } from "~/utils/errors";
import { apiHandler, errorResponse } from "~/utils/http.server";
import { assertCan } from "~/utils/permissions";
import type { Route } from "./+types/api.guide-draft";
import { apiGuide, apiUser, guideIdParam, methodNotAllowed, PRIVATE_JSON, readAuthoringJson } from "./authoring-api.server";

/** The working revision for its author and the editors (design/api.md, `GET /api/guides/:id/draft`). */
export const loader = apiHandler(async (args: Route.LoaderArgs) => {
  const user = await apiUser(args);
  const view = await readDraft(await getDb(), user, guideIdParam(args.params.id));
  return Response.json(view, { headers: PRIVATE_JSON });
});

/**
 * Autosave: the whole draft with the version it was edited from. A stale version gets 409 with
 * the server's current draft in `error.current` (the shape of the GET's `draft`), so the editor
 * can show what differs field by field.
 */
export const action = apiHandler(async (args: Route.ActionArgs) => {
  if (args.request.method !== "PUT") return methodNotAllowed(["GET", "PUT"], "A guide's draft");
  const { user, db, guide, guideId } = await apiGuide(args);
  assertCan(user, "update:guide", guide);
  const input = await readAuthoringJson(args.request, draftInputSchema);
  try {
    const saved = await saveDraft(db, guideId, user, input);
    return Response.json({ version: saved.version, findings: saved.findings }, { headers: PRIVATE_JSON });
  } catch (error) {
    if (error instanceof AppError && error.status === 409 && error.code === "stale-version") {
      const current = await readDraft(db, user, guideId);
      return errorResponse(new AppError(409, error.code, error.message, undefined, { current: current.draft }));
    }
    throw error;
  }
});
