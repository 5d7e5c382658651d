import { ErrorPage } from "~/components/error-page";
import type { Route } from "./+types/not-found";

export function loader({ request }: Route.LoaderArgs) {
  const path = new URL(request.url).pathname;
  if (path.startsWith("/api/")) {
    throw Response.json({ error: { code: "not-found", message: `No API route at ${path}` } }, { status: 404 });
  }
  throw new Response("Not found", { status: 404 });
}

export const meta: Route.MetaFunction = () => [{ title: "Not found · Torqueleaf" }];

export default function NotFound() {
  return <ErrorPage status={404} />;
}

export function ErrorBoundary() {
  return <ErrorPage status={404} />;
}
