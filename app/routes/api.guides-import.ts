import { getDb } from "~/db/client.server";
import { draftImportSchema } from "~/models/guide-input";
import { checkDraft, createGuide, saveDraft } from "~/models/guides.server";
import { apiHandler } from "~/utils/http.server";
import { assertCan } from "~/utils/permissions";
import type { Route } from "./+types/api.guides-import";
import { apiUser, methodNotAllowed, PRIVATE_JSON, readAuthoringJson } from "./authoring-api.server";

export function loader() {
  return methodNotAllowed(["POST"], "Importing a guide");
}

/**
 * A new draft owned by the importer from an exported draft (`format: "torqueleaf-draft"`). Every
 * photo must be one the importer uploaded: another account's media id is refused with 400 naming
 * the field (`steps.N.photos.M.mediaId`), as a save would; nothing is created then.
 */
export const action = apiHandler(async (args: Route.ActionArgs) => {
  if (args.request.method !== "POST") return loader();
  const user = await apiUser(args);
  assertCan(user, "create:guide");
  const input = await readAuthoringJson(args.request, draftImportSchema);
  const db = await getDb();
  // Checked before the guide exists, so a refused import leaves no empty guide behind.
  await checkDraft(db, user, input);
  const created = await createGuide(db, user, input);
  const saved = await saveDraft(db, created.id, user, { ...input, version: created.draft.version });
  return Response.json(
    { id: created.id, slug: created.slug, draft: { revisionId: created.draft.revisionId, version: saved.version } },
    { status: 201, headers: PRIVATE_JSON },
  );
});
