import { getDb } from "~/db/client.server";
import { listPublishedGuides, parseLibraryQuery } from "~/models/library.server";
import { apiHandler } from "~/utils/http.server";
import type { Route } from "./+types/api.guides";

export const loader = apiHandler(async ({ request }: Route.LoaderArgs) => {
  const query = parseLibraryQuery(new URL(request.url).searchParams);
  return Response.json(await listPublishedGuides(await getDb(), query));
});
