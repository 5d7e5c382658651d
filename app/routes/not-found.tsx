import { ErrorPage } from "~/components/error-page";
import { notFound } from "~/utils/errors";
import { pageErrorResponse } from "~/utils/http.server";
import type { Route } from "./+types/not-found";

/** Every address without a route of its own; /api addresses have theirs (routes/api.not-found.ts). */
export function loader() {
  throw pageErrorResponse(notFound());
}

export const meta: Route.MetaFunction = () => [{ title: "Not found · Torqueleaf" }];

export default function NotFound() {
  return <ErrorPage status={404} />;
}

export function ErrorBoundary() {
  return <ErrorPage status={404} />;
}
