import { getDb } from "~/db/client.server";
import { parseLibraryQuery } from "~/models/library.server";
import { readLibrary } from "~/models/reader-cache.server";
import { apiHandler, publicJson } from "~/utils/http.server";
import type { Route } from "./+types/api.guides";

export const loader = apiHandler(async ({ request }: Route.LoaderArgs) => {
  const query = parseLibraryQuery(new URL(request.url).searchParams);
  return publicJson(request, await readLibrary(await getDb(), query));
});
