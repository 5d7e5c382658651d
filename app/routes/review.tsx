import { Form, Link } from "react-router";
import { SubmitButton } from "~/components/form";
import { Count, waitingWords } from "~/components/review-desk";
import { getDb } from "~/db/client.server";
import { reviewQueueView } from "~/models/review-desk.server";
import { reviewQueueQuerySchema } from "~/models/review-input";
import { requirePermission } from "~/services/auth/guards.server";
import { formatDateTime, isoDateTime } from "~/utils/format";
import { forPage } from "~/utils/http.server";
import type { Route } from "./+types/review";

export const meta: Route.MetaFunction = () => [{ title: "Review desk · Torqueleaf" }, { name: "robots", content: "noindex" }];

export async function loader(args: Route.LoaderArgs) {
  const user = await requirePermission(args, "review:revision:any");
  const params = new URL(args.request.url).searchParams;
  const query = reviewQueueQuerySchema.parse({
    vehicle: params.get("vehicle") ?? undefined,
    blocking: params.get("blocking") ?? undefined,
  });
  return forPage(async () => reviewQueueView(await getDb(), user, query));
}

const input = "min-h-11 rounded-md border border-rule bg-white px-3 py-2 text-sm";

export default function ReviewQueue({ loaderData }: Route.ComponentProps) {
  const { items, total, vehicles, filters } = loaderData;
  const filtered = filters.vehicle !== null || filters.blocking;
  return (
    <div className="mx-auto max-w-5xl px-4 py-8 sm:px-6 sm:py-10">
      <h1 className="font-serif text-3xl font-semibold tracking-tight text-spruce-900 sm:text-4xl">Review desk</h1>
      <p className="mt-2 max-w-3xl text-ink-soft">
        Revisions waiting for an editor, oldest first. Nothing reaches readers while a blocking finding remains or a caution lacks
        your sign-off. Guides you wrote are listed too; another editor reviews them.
      </p>

      <Form method="get" role="search" aria-label="Filter the queue" className="mt-6 flex flex-wrap items-end gap-3">
        <label className="text-sm">
          <span className="block font-semibold">Vehicle</span>
          <select name="vehicle" defaultValue={filters.vehicle ?? ""} className={`mt-1 w-full sm:w-auto ${input}`}>
            <option value="">All vehicles</option>
            {vehicles.map((v) => (
              <option key={v.key} value={v.key}>
                {v.name}
              </option>
            ))}
          </select>
        </label>
        <label className="flex min-h-11 items-center gap-2 text-sm font-semibold">
          <input type="checkbox" name="blocking" value="1" defaultChecked={filters.blocking} className="h-5 w-5" />
          Only with blocking findings
        </label>
        <SubmitButton tone="quiet">Show</SubmitButton>
        {filtered ? (
          <Link to="/review" className="inline-flex min-h-11 items-center text-sm text-spruce-700 underline">
            Clear filters
          </Link>
        ) : null}
      </Form>

      <p className="mt-6 text-sm text-ink-soft" aria-live="polite">
        {filtered
          ? `${items.length} of ${total} ${total === 1 ? "revision" : "revisions"} waiting`
          : `${total} ${total === 1 ? "revision" : "revisions"} waiting`}
      </p>

      {items.length === 0 ? (
        <p className="mt-3 rounded-xl border border-dashed border-rule p-8 text-center text-ink-soft">
          {filtered ? "Nothing waiting matches these filters." : "Nothing is waiting for review."}
        </p>
      ) : (
        <ol className="mt-3 space-y-3">
          {items.map((item) => (
            <li
              key={item.revisionId}
              data-revision={item.revisionId}
              className={`rounded-xl border bg-white p-4 shadow-sm sm:p-5 ${item.ownGuide ? "border-dashed border-rule" : "border-rule"}`}
            >
              <div className="flex flex-wrap items-start justify-between gap-3">
                <div className="min-w-0 flex-1">
                  <h2 className="break-words font-serif text-xl font-semibold leading-snug text-spruce-900">
                    {item.ownGuide ? (
                      item.guide.title
                    ) : (
                      <Link to={`/review/${item.revisionId}`} className="hover:underline">
                        {item.guide.title}
                      </Link>
                    )}
                  </h2>
                  <p className="mt-1 text-sm text-ink-soft">
                    Revision {item.number}
                    {item.guide.published ? " of a published guide" : ", first publication"} · by {item.author.name}
                  </p>
                </div>
                {item.ownGuide ? (
                  <p className="rounded-md bg-paper-deep px-3 py-2 text-sm font-semibold text-ink">
                    Your guide: another editor reviews it
                  </p>
                ) : (
                  <Link
                    to={`/review/${item.revisionId}`}
                    aria-label={`Review ${item.guide.title}`}
                    className="inline-flex min-h-11 items-center rounded-md bg-spruce-800 px-4 py-2 text-sm font-semibold text-paper hover:bg-spruce-700"
                  >
                    Review
                  </Link>
                )}
              </div>
              <dl className="mt-3 grid gap-x-6 gap-y-1 text-sm sm:grid-cols-[auto_1fr]">
                <dt className="font-semibold text-ink-soft">Vehicles</dt>
                <dd>{item.vehicles.length ? item.vehicles.map((v) => v.name).join(", ") : "none listed"}</dd>
                <dt className="font-semibold text-ink-soft">Waiting</dt>
                <dd>
                  {waitingWords(item.waitingMinutes)}, since{" "}
                  <time dateTime={isoDateTime(item.submittedAt)}>{formatDateTime(item.submittedAt)}</time>
                </dd>
              </dl>
              <div className="mt-3 flex flex-wrap gap-2">
                <Count n={item.blocking} label={item.blocking === 1 ? "blocking finding" : "blocking findings"} tone="danger" />
                <Count
                  n={item.unsignedCautions}
                  label={`of ${item.cautions} ${item.cautions === 1 ? "caution" : "cautions"} to sign`}
                  tone="warning"
                />
                {item.openWarnings ? (
                  <Count n={item.openWarnings} label={item.openWarnings === 1 ? "open warning" : "open warnings"} tone="calm" />
                ) : null}
              </div>
            </li>
          ))}
        </ol>
      )}
    </div>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/error-page";
