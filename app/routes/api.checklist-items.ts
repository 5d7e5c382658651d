import { getDb } from "~/db/client.server";
import { ownItemSchema } from "~/models/checklist-input";
import { addOwnItem, getChecklist, ownChecklist } from "~/models/checklists.server";
import { apiHandler, readJson } from "~/utils/http.server";
import type { Route } from "./+types/api.checklist-items";
import { apiUser, methodNotAllowed, PRIVATE_JSON } from "./authoring-api.server";
import { CHECKLIST_JSON_MAX_BYTES, pathId } from "./checklist-api.server";

export const loader = apiHandler(async (args: Route.LoaderArgs) => {
  const user = await apiUser(args);
  const checklist = await getChecklist(await getDb(), user, pathId(args.params.id, "This checklist"));
  return Response.json({ items: checklist.items }, { headers: PRIVATE_JSON });
});

/** An own item `{ name, quantity }` → 201 the item. The owner is checked before the body is read. */
export const action = apiHandler(async (args: Route.ActionArgs) => {
  if (args.request.method !== "POST") return methodNotAllowed(["GET", "POST"], "A checklist's items");
  const user = await apiUser(args);
  const id = pathId(args.params.id, "This checklist");
  const db = await getDb();
  await ownChecklist(db, user, id);
  const input = await readJson(args.request, ownItemSchema, { maxBytes: CHECKLIST_JSON_MAX_BYTES });
  const item = await addOwnItem(db, user, id, input);
  return Response.json(item, { status: 201, headers: PRIVATE_JSON });
});
