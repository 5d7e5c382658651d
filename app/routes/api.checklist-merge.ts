import { getDb } from "~/db/client.server";
import { getChecklist, mergeLatestRevision } from "~/models/checklists.server";
import { apiHandler } from "~/utils/http.server";
import type { Route } from "./+types/api.checklist-merge";
import { apiUser, methodNotAllowed, PRIVATE_JSON } from "./authoring-api.server";
import { pathId } from "./checklist-api.server";

export const loader = () => methodNotAllowed(["POST"], "A checklist's merge");

/**
 * Brings the checklist up to the guide's published revision: added parts appear, removed ones are
 * marked; ticks, quantities, notes and own items stay. Merging when up to date changes nothing.
 */
export const action = apiHandler(async (args: Route.ActionArgs) => {
  if (args.request.method !== "POST") return methodNotAllowed(["POST"], "A checklist's merge");
  const user = await apiUser(args);
  const id = pathId(args.params.id, "This checklist");
  const db = await getDb();
  const merged = await mergeLatestRevision(db, user, id);
  return Response.json({ ...merged, checklist: await getChecklist(db, user, id) }, { headers: PRIVATE_JSON });
});
