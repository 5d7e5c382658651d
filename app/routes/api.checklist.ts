import { getDb } from "~/db/client.server";
import { checklistCsvResponse } from "~/models/checklist-csv.server";
import { deleteChecklist, getChecklist, mergeLatestRevision } from "~/models/checklists.server";
import { apiHandler } from "~/utils/http.server";
import type { Route } from "./+types/api.checklist";
import { apiUser, methodNotAllowed, PRIVATE_JSON } from "./authoring-api.server";
import { pathId } from "./checklist-api.server";

/** `GET /api/checklists/:id` for its owner; `/api/checklists/:id.csv` is the same checklist as CSV. */
export const loader = apiHandler(async (args: Route.LoaderArgs) => {
  const user = await apiUser(args);
  const raw = args.params.id ?? "";
  const csv = raw.endsWith(".csv");
  const checklist = await getChecklist(await getDb(), user, pathId(csv ? raw.slice(0, -4) : raw, "This checklist"));
  if (csv) return checklistCsvResponse(checklist);
  return Response.json(checklist, { headers: PRIVATE_JSON });
});

/**
 * `DELETE` removes the checklist; `POST` with `?merge` brings it up to the guide's published
 * revision (added parts appear, removed ones are marked; ticks, quantities, notes and own items stay).
 */
export const action = apiHandler(async (args: Route.ActionArgs) => {
  const method = args.request.method;
  const merge = method === "POST" && new URL(args.request.url).searchParams.has("merge");
  if (method !== "DELETE" && !merge) return methodNotAllowed(["GET", "DELETE", "POST"], "A checklist");
  const user = await apiUser(args);
  const id = pathId(args.params.id, "This checklist");
  const db = await getDb();
  if (merge) {
    const merged = await mergeLatestRevision(db, user, id);
    return Response.json({ ...merged, checklist: await getChecklist(db, user, id) }, { headers: PRIVATE_JSON });
  }
  await deleteChecklist(db, user, id);
  return new Response(null, { status: 204, headers: PRIVATE_JSON });
});
