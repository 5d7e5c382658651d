import { getDb } from "~/db/client.server";
import { createChecklistSchema } from "~/models/checklist-input";
import { createChecklist, getChecklist, listChecklists } from "~/models/checklists.server";
import { apiHandler, readJson } from "~/utils/http.server";
import type { Route } from "./+types/api.checklists";
import { apiUser, methodNotAllowed, PRIVATE_JSON } from "./authoring-api.server";
import { CHECKLIST_JSON_MAX_BYTES } from "./checklist-api.server";

/** The signed-in reader's checklists with their progress (design/api.md, `GET /api/checklists`). */
export const loader = apiHandler(async (args: Route.LoaderArgs) => {
  const user = await apiUser(args);
  return Response.json({ checklists: await listChecklists(await getDb(), user) }, { headers: PRIVATE_JSON });
});

/** `{ guideSlug }` → 201 a checklist copied from the guide's published parts and tools; 200 with the one the reader has. */
export const action = apiHandler(async (args: Route.ActionArgs) => {
  if (args.request.method !== "POST") return methodNotAllowed(["GET", "POST"], "The checklists address");
  const user = await apiUser(args);
  const input = await readJson(args.request, createChecklistSchema, { maxBytes: CHECKLIST_JSON_MAX_BYTES });
  const db = await getDb();
  const { id, created } = await createChecklist(db, user, input.guideSlug);
  return Response.json(await getChecklist(db, user, id), {
    status: created ? 201 : 200,
    headers: { ...PRIVATE_JSON, Location: `/api/checklists/${id}` },
  });
});
