import { Form, Link } from "react-router";
import { z } from "zod";
import { Notice } from "~/components/form";
import { WorkbenchFitmentReports } from "~/components/workbench-fitment-reports";
import { getDb } from "~/db/client.server";
import { reportsForAuthor } from "~/models/fitment-reports.server";
import { startNextRevision } from "~/models/review.server";
import { listWorkbench, type WorkbenchGuide } from "~/models/workbench.server";
import { requireUser } from "~/services/auth/guards.server";
import { failureOf } from "~/utils/forms";
import { formatDateTime, isoDateTime } from "~/utils/format";
import { handleForm, redirectWithFlash } from "~/utils/forms.server";
import { can } from "~/utils/permissions";
import type { Route } from "./+types/workbench";

export const meta: Route.MetaFunction = () => [{ title: "Workbench · Torqueleaf" }, { name: "robots", content: "noindex" }];

export async function loader(args: Route.LoaderArgs) {
  const user = await requireUser(args);
  // A reader sees how to become an author instead of a refusal.
  if (!can(user, "create:guide")) return { writer: false as const, guides: [], reports: [] };
  const db = await getDb();
  const [guides, reports] = await Promise.all([listWorkbench(db, user), reportsForAuthor(db, user.id)]);
  return { writer: true as const, guides, reports };
}

const startRevisionForm = z.object({ intent: z.literal("start-revision"), guideId: z.coerce.number().int().positive() });

export async function action(args: Route.ActionArgs) {
  const user = await requireUser(args);
  return handleForm(args.request, startRevisionForm, async (input) => {
    await startNextRevision(await getDb(), input.guideId, user);
    return redirectWithFlash(`/workbench/guides/${input.guideId}`, {
      tone: "info",
      text: "A new revision is open. Readers keep seeing the published one until an editor approves this one.",
    });
  });
}

function StatusLine({ guide }: { guide: WorkbenchGuide }) {
  const s = guide.status;
  const text = {
    draft: "Draft",
    "in-review": "In review with the editors",
    "changes-requested": "Changes requested",
    published: "Published",
    "published-with-draft": "Published — a newer draft is open",
    unpublished: "Unpublished",
  }[s.kind];
  const tone = {
    draft: "bg-paper-deep text-ink",
    "in-review": "bg-brass-100 text-spruce-900",
    "changes-requested": "bg-z-warning/15 text-ink",
    published: "bg-spruce-50 text-spruce-900",
    "published-with-draft": "bg-spruce-50 text-spruce-900",
    unpublished: "bg-paper-deep text-ink-soft",
  }[s.kind];
  return (
    <div>
      <span className={`inline-flex rounded-full px-2.5 py-0.5 text-sm font-semibold ${tone}`}>{text}</span>
      {s.kind === "published-with-draft" && s.draftState !== "draft" ? (
        <span className="ml-2 text-sm text-ink-soft">
          {s.draftState === "in-review" ? "the new revision is in review" : "changes requested on the new revision"}
        </span>
      ) : null}
      {s.kind === "changes-requested" && s.note ? (
        <blockquote className="mt-2 border-l-4 border-brass-500 pl-3 text-sm text-ink">
          <span className="font-semibold">The editor's note: </span>
          {s.note}
        </blockquote>
      ) : null}
    </div>
  );
}

function GuideRow({ guide }: { guide: WorkbenchGuide }) {
  const published = guide.status.kind === "published" || guide.status.kind === "published-with-draft";
  return (
    <li className="rounded-xl border border-rule bg-white p-5 shadow-sm">
      <div className="flex flex-wrap items-start justify-between gap-3">
        <div className="min-w-0">
          <h2 className="font-serif text-xl font-semibold text-spruce-900">
            {guide.canStartRevision ? guide.title : <Link to={`/workbench/guides/${guide.id}`}>{guide.title}</Link>}
          </h2>
          <p className="mt-1 text-sm text-ink-soft">
            Revision {guide.revisionNumber} · last edit{" "}
            <time dateTime={isoDateTime(guide.lastEdit)}>{formatDateTime(guide.lastEdit)}</time>
            {guide.openFindings > 0 ? (
              <>
                {" "}
                ·{" "}
                <span className={guide.blockingFindings ? "font-semibold text-z-danger" : ""}>
                  {guide.openFindings} open safety finding{guide.openFindings === 1 ? "" : "s"}
                  {guide.blockingFindings ? ` (${guide.blockingFindings} must be fixed)` : ""}
                </span>
              </>
            ) : null}
          </p>
        </div>
        <div className="flex flex-wrap gap-2">
          {published ? (
            <Link
              to={`/guides/${guide.slug}`}
              className="inline-flex min-h-11 items-center rounded-md border border-rule px-3 py-2 text-sm font-semibold text-spruce-800 hover:bg-paper-deep"
            >
              Read the published guide
            </Link>
          ) : null}
          {guide.canStartRevision ? (
            <Form method="post">
              <input type="hidden" name="intent" value="start-revision" />
              <input type="hidden" name="guideId" value={guide.id} />
              <button
                type="submit"
                className="min-h-11 rounded-md bg-spruce-800 px-3 py-2 text-sm font-semibold text-paper hover:bg-spruce-700"
              >
                Start a new revision
              </button>
            </Form>
          ) : (
            <Link
              to={`/workbench/guides/${guide.id}`}
              className="inline-flex min-h-11 items-center rounded-md bg-spruce-800 px-3 py-2 text-sm font-semibold text-paper hover:bg-spruce-700"
            >
              {guide.status.kind === "in-review" ||
              (guide.status.kind === "published-with-draft" && guide.status.draftState === "in-review")
                ? "View"
                : "Edit"}
            </Link>
          )}
        </div>
      </div>
      <div className="mt-3">
        <StatusLine guide={guide} />
      </div>
    </li>
  );
}

export default function Workbench({ loaderData, actionData }: Route.ComponentProps) {
  const failure = failureOf(actionData);
  if (!loaderData.writer) {
    return (
      <div className="mx-auto max-w-3xl px-4 py-10 sm:px-6">
        <h1 className="font-serif text-4xl font-semibold text-spruce-900">Workbench</h1>
        <p className="mt-4 text-lg">
          The Workbench is where authors write install guides. Your account reads guides; to write them, accept the contributor
          terms and your account becomes an author straight away.
        </p>
        <Link
          to="/contributor-terms"
          className="mt-6 inline-flex min-h-11 items-center rounded-md bg-spruce-800 px-4 py-2 font-semibold text-paper hover:bg-spruce-700"
        >
          Read and accept the contributor terms
        </Link>
      </div>
    );
  }
  const { guides, reports } = loaderData;
  return (
    <div className="mx-auto max-w-4xl px-4 py-10 sm:px-6">
      <div className="flex flex-wrap items-end justify-between gap-4">
        <div>
          <h1 className="font-serif text-4xl font-semibold text-spruce-900">Workbench</h1>
          <p className="mt-2 text-ink-soft">
            Your guides and where each one stands. An editor reviews every revision before readers see it.
          </p>
        </div>
        <Link
          to="/workbench/guides/new"
          className="inline-flex min-h-11 items-center rounded-md bg-spruce-800 px-4 py-2 font-semibold text-paper hover:bg-spruce-700"
        >
          Write a new guide
        </Link>
      </div>
      <div className="mt-6">
        {failure ? (
          <Notice tone="error" focusOn={failure}>
            {failure.message}
          </Notice>
        ) : null}
      </div>
      {guides.length === 0 ? (
        <p className="mt-8 rounded-xl border border-dashed border-rule p-8 text-center text-ink-soft">
          You have no guides yet. Start with one install you know well.
        </p>
      ) : (
        <ul className="mt-6 space-y-4">
          {guides.map((g) => (
            <GuideRow key={g.id} guide={g} />
          ))}
        </ul>
      )}
      <WorkbenchFitmentReports reports={reports} />
    </div>
  );
}
