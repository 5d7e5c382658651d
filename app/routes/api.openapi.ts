import { env } from "~/utils/env.server";
import { publicJson } from "~/utils/http.server";
import { openApiDocument } from "~/utils/openapi.server";
import type { Route } from "./+types/api.openapi";
import { methodNotAllowed } from "./authoring-api.server";

/** The OpenAPI 3.1 document of the reader API, generated from the routes' zod schemas. */
export function loader({ request }: Route.LoaderArgs) {
  return publicJson(request, openApiDocument(env().APP_ORIGIN));
}

export const action = () => methodNotAllowed(["GET"], "The OpenAPI document");
