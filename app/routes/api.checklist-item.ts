import { getDb } from "~/db/client.server";
import { itemPatchSchema } from "~/models/checklist-input";
import { deleteItem, getChecklist, ownChecklist, patchItem } from "~/models/checklists.server";
import { notFound } from "~/utils/errors";
import { apiHandler, readJson } from "~/utils/http.server";
import type { Route } from "./+types/api.checklist-item";
import { apiUser, methodNotAllowed, PRIVATE_JSON } from "./authoring-api.server";
import { CHECKLIST_JSON_MAX_BYTES, pathId } from "./checklist-api.server";

export const loader = apiHandler(async (args: Route.LoaderArgs) => {
  const user = await apiUser(args);
  const checklist = await getChecklist(await getDb(), user, pathId(args.params.id, "This checklist"));
  const itemId = pathId(args.params.itemId, "This item");
  const item = checklist.items.find((i) => i.id === itemId);
  if (!item) throw notFound("This item");
  return Response.json(item, { headers: PRIVATE_JSON });
});

/**
 * `PATCH { checked?, quantity?, note? }` changes only the fields sent (two devices ticking different
 * items both keep their ticks) → the item; `DELETE` removes an own item → 204.
 */
export const action = apiHandler(async (args: Route.ActionArgs) => {
  const method = args.request.method;
  if (method !== "PATCH" && method !== "DELETE") return methodNotAllowed(["GET", "PATCH", "DELETE"], "A checklist item");
  const user = await apiUser(args);
  const id = pathId(args.params.id, "This checklist");
  const itemId = pathId(args.params.itemId, "This item");
  const db = await getDb();
  if (method === "DELETE") {
    await deleteItem(db, user, id, itemId);
    return new Response(null, { status: 204, headers: PRIVATE_JSON });
  }
  // The owner is checked before the body is read, so a stranger learns nothing from field errors.
  await ownChecklist(db, user, id);
  const patch = await readJson(args.request, itemPatchSchema, { maxBytes: CHECKLIST_JSON_MAX_BYTES });
  return Response.json(await patchItem(db, user, id, itemId, patch), { headers: PRIVATE_JSON });
});
