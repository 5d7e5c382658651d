import { apiError } from "~/utils/http.server";
import type { Route } from "./+types/api.not-found";

/** Any /api address without a route of its own: the API's JSON error shape, for every method. */
export function loader({ request }: Route.LoaderArgs) {
  return apiError(404, "not-found", `No API route at ${new URL(request.url).pathname}.`);
}

export const action = loader;
