import { Link } from "react-router";
import { Progress } from "~/components/checklist";
import { getDb } from "~/db/client.server";
import { listChecklists } from "~/models/checklists.server";
import { requireUser } from "~/services/auth/guards.server";
import { formatDate } from "~/utils/format";
import { formHeaders } from "~/utils/forms.server";
import type { Route } from "./+types/me.checklists";
import { saveChecklistAction } from "./me.checklists.server";

export const meta: Route.MetaFunction = () => [
  { title: "Parts checklists · Torqueleaf" },
  { name: "description", content: "The parts and tools you keep for the guides you follow." },
  { name: "robots", content: "noindex" },
];

export async function loader(args: Route.LoaderArgs) {
  const user = await requireUser(args);
  return { checklists: await listChecklists(await getDb(), user) };
}

export const action = (args: Route.ActionArgs) => saveChecklistAction(args);

export const headers = formHeaders;

export default function Checklists({ loaderData }: Route.ComponentProps) {
  const { checklists } = loaderData;
  return (
    <div className="mx-auto max-w-3xl px-4 py-8 sm:px-6 sm:py-10">
      <h1 className="font-serif text-3xl font-semibold tracking-tight text-spruce-900 sm:text-4xl">Parts checklists</h1>
      <p className="mt-2 text-ink-soft">
        Saved from a guide's parts list. Tick items off in the shop or the garage; notes and your own items stay with the list.
      </p>
      {checklists.length === 0 ? (
        <div className="mt-8 rounded-xl border border-rule bg-white p-6 shadow-sm">
          <p>You have no checklists yet.</p>
          <p className="mt-2 text-sm text-ink-soft">
            Open a guide in the{" "}
            <Link to="/" className="text-spruce-700 underline">
              Library
            </Link>{" "}
            and choose “Save a parts checklist” beside its parts.
          </p>
        </div>
      ) : (
        <ul className="mt-8 space-y-4">
          {checklists.map((c) => (
            <li key={c.id} className="rounded-xl border border-rule bg-white shadow-sm">
              <Link
                to={`/me/checklists/${c.id}`}
                className="block min-h-11 rounded-xl p-4 hover:bg-paper-deep focus-visible:outline-2 sm:p-5"
              >
                <span className="block font-serif text-lg font-semibold text-spruce-900">{c.guide.title}</span>
                <span className="mt-0.5 block text-sm text-ink-soft">
                  From revision {c.revisionNumber} · changed {formatDate(new Date(c.updatedAt))}
                </span>
                {c.newerRevision ? (
                  <span className="mt-2 inline-block rounded bg-brass-100 px-2 py-0.5 text-xs font-semibold text-spruce-900">
                    A newer revision is published
                  </span>
                ) : null}
                <Progress checked={c.checked} total={c.total} label={c.guide.title} />
              </Link>
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/error-page";
