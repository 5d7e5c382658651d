import type { Route } from "./+types/api.catalogue";
import { getDb } from "~/db/client.server";
import { publicCatalogue } from "~/models/catalogue.server";
import { readCatalogue } from "~/models/reader-cache.server";
import { publicJson } from "~/utils/http.server";

export async function loader({ request }: Route.LoaderArgs) {
  const makes = await readCatalogue(await getDb());
  return publicJson(request, {
    makes: publicCatalogue(makes),
  });
}
