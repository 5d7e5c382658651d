import { getDb } from "~/db/client.server";
import { checklistCsvResponse } from "~/models/checklist-csv.server";
import { idParam } from "~/models/checklist-input";
import { getChecklist } from "~/models/checklists.server";
import { requireUser } from "~/services/auth/guards.server";
import { notFound } from "~/utils/errors";
import { forPage } from "~/utils/http.server";
import type { Route } from "./+types/me.checklist-csv";

/** The checklist as a CSV download for its owner (design/api.md: `item,quantity,part number,step,checked,note`). */
export async function loader(args: Route.LoaderArgs) {
  const user = await requireUser(args);
  return forPage(async () => {
    const id = idParam(args.params.id);
    if (id === null) throw notFound("This checklist");
    return checklistCsvResponse(await getChecklist(await getDb(), user, id));
  });
}
