import { getDb } from "~/db/client.server";
import { checklistCsvResponse } from "~/models/checklist-csv.server";
import { deleteChecklist, getChecklist } from "~/models/checklists.server";
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

/** `DELETE` removes the checklist and its items → 204. */
export const action = apiHandler(async (args: Route.ActionArgs) => {
  if (args.request.method !== "DELETE") return methodNotAllowed(["GET", "DELETE"], "A checklist");
  const user = await apiUser(args);
  await deleteChecklist(await getDb(), user, pathId(args.params.id, "This checklist"));
  return new Response(null, { status: 204, headers: PRIVATE_JSON });
});
