import { getDb } from "~/db/client.server";
import { guideMetaSchema } from "~/models/guide-input";
import { createGuide } from "~/models/guides.server";
import { parseLibraryQuery } from "~/models/library.server";
import { readLibrary } from "~/models/reader-cache.server";
import { readContentStamps } from "~/models/content-stamps.server";
import { anonymousJson } from "~/services/http/anonymous-answers.server";
import { apiHandler } from "~/utils/http.server";
import { assertCan } from "~/utils/permissions";
import type { Route } from "./+types/api.guides";
import { apiUser, methodNotAllowed, PRIVATE_JSON, readAuthoringJson } from "./authoring-api.server";

export const loader = apiHandler(async ({ request }: Route.LoaderArgs) => {
  const query = parseLibraryQuery(new URL(request.url).searchParams);
  const db = await getDb();
  const stamps = await readContentStamps(db);
  return anonymousJson(request, stamps, await readLibrary(db, query, stamps));
});

/**
 * A new guide with its first draft, for authors. Only the guide's details are read: an
 * `authorId`, `state`, `role` or `publishedRevisionId` in the body is dropped by the schema, so
 * the guide is always the caller's own draft.
 */
export const action = apiHandler(async (args: Route.ActionArgs) => {
  if (args.request.method !== "POST") return methodNotAllowed(["GET", "POST"], "The guides address");
  const user = await apiUser(args);
  assertCan(user, "create:guide");
  const input = await readAuthoringJson(args.request, guideMetaSchema);
  const created = await createGuide(await getDb(), user, input);
  return Response.json(created, { status: 201, headers: PRIVATE_JSON });
});
