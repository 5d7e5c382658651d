import type { Route } from "./+types/api.catalogue";
import { getDb } from "~/db/client.server";
import { catalogueIntentSchema } from "~/models/catalogue-input";
import { publicCatalogue } from "~/models/catalogue.server";
import { readCatalogue } from "~/models/reader-cache.server";
import { requirePermission } from "~/services/auth/guards.server";
import { readContentStamps } from "~/models/content-stamps.server";
import { anonymousJson } from "~/services/http/anonymous-answers.server";
import { apiHandler } from "~/utils/http.server";
import { applyCatalogueChange } from "./admin.catalogue.server";
import { methodNotAllowed, PRIVATE_JSON, readAuthoringJson } from "./authoring-api.server";

export async function loader({ request }: Route.LoaderArgs) {
  const db = await getDb();
  const stamps = await readContentStamps(db);
  return anonymousJson(request, stamps, { makes: publicCatalogue(await readCatalogue(db, stamps)) });
}

/**
 * The catalogue page's changes for scripts, one JSON intent each (admins only): the same messages,
 * and the API's error shape for refusals; a used variant's 409 lists the guides in `error.guides`.
 */
export const action = apiHandler(async (args: Route.ActionArgs) => {
  if (args.request.method !== "POST") return methodNotAllowed(["GET", "POST"], "The catalogue");
  const admin = await requirePermission(args, "manage:catalogue");
  const input = await readAuthoringJson(args.request, catalogueIntentSchema);
  return Response.json({ message: await applyCatalogueChange(admin, input) }, { headers: PRIVATE_JSON });
});
