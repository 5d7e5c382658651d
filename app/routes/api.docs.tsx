import { API_OPERATIONS } from "~/utils/openapi.server";
import type { Route } from "./+types/api.docs";
import { methodNotAllowed } from "./authoring-api.server";

export const meta: Route.MetaFunction = () => [
  { title: "Reader API · Torqueleaf" },
  { name: "description", content: "The JSON routes for guides, the vehicle catalogue and parts checklists." },
];

/** Under /api, so a write is answered in the API's error shape. */
export const action = () => methodNotAllowed(["GET"], "The API documentation page");

export function loader() {
  return {
    operations: API_OPERATIONS.map((op) => ({
      method: op.method.toUpperCase(),
      path: op.path,
      summary: op.summary,
      who: op.who,
      tag: op.tag,
      status: op.answer.status,
    })),
  };
}

export default function ApiDocs({ loaderData }: Route.ComponentProps) {
  const tags = [...new Set(loaderData.operations.map((o) => o.tag))];
  return (
    <div className="mx-auto max-w-4xl px-4 py-8 sm:px-6 sm:py-10">
      <h1 className="font-serif text-3xl font-semibold tracking-tight text-spruce-900 sm:text-4xl">Reader API</h1>
      <p className="mt-2 text-ink-soft">
        JSON over HTTPS. The full description, with every body and answer, is the OpenAPI 3.1 document at{" "}
        <a href="/api/openapi.json" className="break-all font-mono text-spruce-700 underline">
          /api/openapi.json
        </a>
        . Errors answer <code className="font-mono text-sm">{"{ error: { code, message, fields } }"}</code>; routes for signed-in
        readers use the session of the site, and writes must come from the site itself.
      </p>
      {tags.map((tag) => (
        <section key={tag} className="mt-8">
          <h2 className="font-serif text-xl font-semibold text-spruce-900">{tag}</h2>
          <ul className="mt-3 divide-y divide-rule rounded-xl border border-rule bg-white shadow-sm">
            {loaderData.operations
              .filter((o) => o.tag === tag)
              .map((o) => (
                <li key={`${o.method} ${o.path}`} className="px-4 py-3">
                  <p className="flex flex-wrap items-baseline gap-x-3 font-mono text-sm">
                    <span className="font-semibold text-brass-700">{o.method}</span>
                    <span className="break-all">{o.path}</span>
                  </p>
                  <p className="mt-1 text-sm">{o.summary}</p>
                  <p className="text-xs text-ink-soft">
                    Who: {o.who} · answers {o.status}
                  </p>
                </li>
              ))}
          </ul>
        </section>
      ))}
    </div>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/error-page";
