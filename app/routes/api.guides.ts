import { getDb } from "~/db/client.server";
import { listPublishedGuides, parseLibraryQuery } from "~/models/library.server";
import type { Route } from "./+types/api.guides";

export async function loader({ request }: Route.LoaderArgs) {
  const query = parseLibraryQuery(new URL(request.url).searchParams);
  return Response.json(await listPublishedGuides(await getDb(), query));
}
