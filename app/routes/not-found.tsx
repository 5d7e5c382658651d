import { ErrorPage } from "~/components/error-page";
import { AppError, notFound } from "~/utils/errors";
import { errorResponse, pageErrorResponse } from "~/utils/http.server";
import type { Route } from "./+types/not-found";

export function loader({ request }: Route.LoaderArgs) {
  const path = new URL(request.url).pathname;
  if (path.startsWith("/api/")) throw errorResponse(new AppError(404, "not-found", `No API route at ${path}`));
  throw pageErrorResponse(notFound());
}

export const meta: Route.MetaFunction = () => [{ title: "Not found · Torqueleaf" }];

export default function NotFound() {
  return <ErrorPage status={404} />;
}

export function ErrorBoundary() {
  return <ErrorPage status={404} />;
}
