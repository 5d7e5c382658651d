import { Form, Link } from "react-router";
import { GuideArticle, type ShownGuide } from "~/components/guide-article";
import { Count, DiffView, Panel } from "~/components/review-desk";
import { Notice, SubmitButton } from "~/components/form";
import { getDb } from "~/db/client.server";
import { reviewDeskView } from "~/models/review-desk.server";
import { decideReview } from "~/models/review.server";
import { REVIEW_NOTE_MAX, reviewDecisionSchema } from "~/models/review-input";
import { requirePermission } from "~/services/auth/guards.server";
import { getStorage } from "~/services/storage.server";
import { env } from "~/utils/env.server";
import { formatDate, formatDateTime, isoDateTime } from "~/utils/format";
import { failureOf, type FormFailure } from "~/utils/forms";
import { handleForm, redirectWithFlash } from "~/utils/forms.server";
import { forPage } from "~/utils/http.server";
import type { Route } from "./+types/review.revision";
import { revisionIdParam } from "./review-desk.server";

export const meta: Route.MetaFunction = ({ data }) => [
  { title: `Review: ${data?.view.revision.title ?? "revision"} · Torqueleaf` },
  { name: "robots", content: "noindex" },
];

export async function loader(args: Route.LoaderArgs) {
  const user = await requirePermission(args, "read:revision:any");
  return forPage(async () => {
    const view = await reviewDeskView(await getDb(), getStorage(), user, revisionIdParam(args.params.revisionId));
    return { view, url: new URL(`/guides/${encodeURIComponent(view.revision.guide.slug)}`, env().APP_ORIGIN).href };
  });
}

const DONE: Record<string, (title: string) => string> = {
  acknowledge: () => "Finding acknowledged with your note.",
  "sign-off": () => "Caution signed off.",
  comment: () => "Comment added. The author sees it if you ask for changes.",
  "request-changes": (title) =>
    `Sent back to the author: "${title}". They continue on a fresh draft with your note and comments.`,
  approve: (title) => `Published: "${title}" is in the Library now.`,
  unpublish: (title) => `Unpublished: "${title}" has left the Library.`,
};

export async function action(args: Route.ActionArgs) {
  const user = await requirePermission(args, "review:revision:any");
  return handleForm(args.request, reviewDecisionSchema, async (decision) => {
    const revisionId = revisionIdParam(args.params.revisionId);
    const db = await getDb();
    await decideReview(db, revisionId, user, decision);
    const revision = await db.query.revisions.findFirst({ where: (r, { eq }) => eq(r.id, revisionId) });
    const title = revision?.title ?? "the guide";
    const back = decision.intent === "approve" || decision.intent === "request-changes";
    return redirectWithFlash(back ? "/review" : `/review/${revisionId}`, { tone: "success", text: DONE[decision.intent](title) });
  });
}

type View = Route.ComponentProps["loaderData"]["view"];

const input = "mt-1 w-full rounded-md border bg-white px-3 py-2 text-sm";
const stepName = (i: number | null) => (i === null ? "Whole guide" : `Step ${i + 1}`);

/** The failure for this form (same intent, and the same finding or caution), else null. */
function mine(failure: FormFailure | null, intent: string, match?: [string, number]) {
  if (!failure || failure.values?.intent !== intent) return null;
  if (match && failure.values?.[match[0]] !== String(match[1])) return null;
  return failure;
}

function FieldError({ failure, field }: { failure: FormFailure | null; field: string }) {
  const message = failure?.fields?.[field];
  return message ? <p className="mt-1 text-sm font-medium text-z-danger">{message}</p> : null;
}

const SEVERITY_STYLE: Record<string, string> = {
  blocking: "bg-z-danger text-white",
  warning: "bg-z-warning text-black",
  info: "bg-z-notice text-white",
};

function Findings({ view, failure }: { view: View; failure: FormFailure | null }) {
  const { findings, can } = view;
  if (!findings.length) return <p className="text-sm text-ink-soft">The safety rules found nothing in this revision.</p>;
  return (
    <ul className="space-y-3">
      {findings.map((f) => {
        const own = mine(failure, "acknowledge", ["findingId", f.id]);
        return (
          <li key={f.id} className="border-t border-rule pt-3 first:border-t-0 first:pt-0" data-finding={f.rule}>
            <p className="flex flex-wrap items-center gap-2 text-sm">
              <span className={`rounded px-1.5 py-0.5 text-xs font-bold uppercase tracking-wider ${SEVERITY_STYLE[f.severity]}`}>
                {f.severity}
              </span>
              <code className="font-mono text-xs">{f.rule}</code>
              <span className="text-ink-soft">{stepName(f.stepIndex)}</span>
              <span className={f.status === "acknowledged" ? "font-semibold text-spruce-700" : "font-semibold"}>
                {f.status === "acknowledged" ? "acknowledged" : "open"}
              </span>
            </p>
            <p className="mt-1 text-sm">{f.message}</p>
            {f.numbers && Object.keys(f.numbers).length ? (
              <p className="mt-1 font-mono text-xs text-ink-soft">
                {Object.entries(f.numbers)
                  .map(([k, v]) => `${k} ${Number.isInteger(v) ? v : v.toFixed(2)}`)
                  .join(" · ")}
              </p>
            ) : null}
            <p className="mt-1 text-xs text-ink-soft">Source: {f.source.title}</p>
            {f.status === "acknowledged" ? (
              <p className="mt-1 text-sm">
                <span className="font-semibold">{f.resolvedBy ?? "An editor"}:</span> {f.note}
              </p>
            ) : f.severity === "blocking" ? (
              <p className="mt-1 text-sm font-medium text-z-danger">Needs a change by the author: request changes.</p>
            ) : can.decide ? (
              <Form method="post" className="mt-2">
                <input type="hidden" name="intent" value="acknowledge" />
                <input type="hidden" name="findingId" value={f.id} />
                <label className="block text-sm font-semibold" htmlFor={`ack-${f.id}`}>
                  Why it is acceptable
                </label>
                <textarea
                  id={`ack-${f.id}`}
                  name="note"
                  rows={2}
                  maxLength={REVIEW_NOTE_MAX}
                  required
                  defaultValue={own?.values?.note ?? ""}
                  aria-invalid={own?.fields?.note ? true : undefined}
                  className={`${input} ${own?.fields?.note ? "border-z-danger" : "border-rule"}`}
                />
                <FieldError failure={own} field="note" />
                <div className="mt-2">
                  <SubmitButton tone="quiet">Acknowledge</SubmitButton>
                </div>
              </Form>
            ) : null}
          </li>
        );
      })}
    </ul>
  );
}

function Cautions({ view }: { view: View }) {
  const { cautions, can } = view;
  if (!cautions.length) return <p className="text-sm text-ink-soft">This revision has no cautions.</p>;
  return (
    <ul className="space-y-3">
      {cautions.map((c) => (
        <li key={c.id} className="border-t border-rule pt-3 first:border-t-0 first:pt-0" data-caution={c.id}>
          <p className="text-sm">
            <span className="font-bold tracking-wider">{c.signalWord}</span>{" "}
            <span className="text-ink-soft">· {stepName(c.stepIndex)}</span>
          </p>
          <blockquote className="mt-1 border-l-4 border-rule pl-3 text-sm">{c.text}</blockquote>
          {c.signedOffBy !== null ? (
            <p className="mt-1 text-sm font-semibold text-spruce-700">
              ✓ Signed off by {c.signedOffByName}
              {c.signedOffAt ? ` on ${formatDate(c.signedOffAt)}` : ""}
              {c.carriedFrom !== null ? `, for the same words in revision ${c.carriedFrom}` : ""}
            </p>
          ) : can.decide ? (
            <Form method="post" className="mt-2">
              <input type="hidden" name="intent" value="sign-off" />
              <input type="hidden" name="cautionId" value={c.id} />
              <SubmitButton tone="quiet">Sign off this wording</SubmitButton>
            </Form>
          ) : (
            <p className="mt-1 text-sm font-medium text-z-danger">Not signed off</p>
          )}
        </li>
      ))}
    </ul>
  );
}

function Comments({ view, failure }: { view: View; failure: FormFailure | null }) {
  const { comments, can, article } = view;
  const own = mine(failure, "comment");
  return (
    <div>
      {comments.length ? (
        <ul className="space-y-2">
          {comments.map((c) => (
            <li key={c.id} className="rounded-md bg-paper px-3 py-2 text-sm">
              <p className="text-xs text-ink-soft">
                <span className="font-semibold text-ink">{stepName(c.stepIndex)}</span> · {c.editor.name} ·{" "}
                <time dateTime={isoDateTime(c.createdAt)}>{formatDateTime(c.createdAt)}</time>
              </p>
              <p className="mt-1 whitespace-pre-wrap break-words">{c.body}</p>
            </li>
          ))}
        </ul>
      ) : (
        <p className="text-sm text-ink-soft">No comments yet.</p>
      )}
      {can.decide ? (
        <Form method="post" className="mt-3">
          <input type="hidden" name="intent" value="comment" />
          <label className="block text-sm font-semibold" htmlFor="comment-step">
            Pin to
          </label>
          <select
            id="comment-step"
            name="stepIndex"
            defaultValue={own?.values?.stepIndex ?? ""}
            className={`${input} min-h-11 border-rule`}
          >
            <option value="">Whole guide</option>
            {article.steps.map((s, i) => (
              <option key={`${i}-${s.title}`} value={i}>
                Step {i + 1}: {s.title}
              </option>
            ))}
          </select>
          <FieldError failure={own} field="stepIndex" />
          <label className="mt-2 block text-sm font-semibold" htmlFor="comment-body">
            Comment
          </label>
          <textarea
            id="comment-body"
            name="body"
            rows={3}
            maxLength={REVIEW_NOTE_MAX}
            required
            defaultValue={own?.values?.body ?? ""}
            aria-invalid={own?.fields?.body ? true : undefined}
            className={`${input} ${own?.fields?.body ? "border-z-danger" : "border-rule"}`}
          />
          <FieldError failure={own} field="body" />
          <div className="mt-2">
            <SubmitButton tone="quiet">Add comment</SubmitButton>
          </div>
        </Form>
      ) : null}
    </div>
  );
}

function Decision({ view, failure }: { view: View; failure: FormFailure | null }) {
  const { remaining, can, revision } = view;
  const unsigned = remaining.unsignedCautions.length;
  const ready = remaining.blockingFindings === 0 && unsigned === 0;
  const changes = mine(failure, "request-changes");
  const unpublish = mine(failure, "unpublish");
  if (!can.review) {
    return (
      <p className="text-sm">This is your own guide. Another editor reviews it: a second pair of eyes is the point of review.</p>
    );
  }
  return (
    <div className="space-y-4">
      {can.decide ? (
        <>
          <div>
            {ready ? (
              <p className="text-sm">No blocking finding remains and every caution is signed off.</p>
            ) : (
              <div className="flex flex-wrap gap-2">
                <span className="sr-only">Still in the way of approval:</span>
                <Count n={remaining.blockingFindings} label="blocking" tone="danger" />
                <Count n={unsigned} label={unsigned === 1 ? "caution to sign" : "cautions to sign"} tone="warning" />
              </div>
            )}
            <Form method="post" className="mt-3">
              <input type="hidden" name="intent" value="approve" />
              <button
                type="submit"
                disabled={!ready}
                className="min-h-11 w-full rounded-md bg-spruce-800 px-4 py-2 font-semibold text-paper hover:bg-spruce-700 disabled:cursor-not-allowed disabled:opacity-50"
              >
                Approve and publish revision {revision.number}
              </button>
            </Form>
            {!ready ? (
              <p className="mt-1 text-xs text-ink-soft">
                Approval opens once every caution is signed off and no blocking finding remains.
              </p>
            ) : null}
          </div>
          <Form method="post" className="border-t border-rule pt-4">
            <input type="hidden" name="intent" value="request-changes" />
            <label className="block text-sm font-semibold" htmlFor="changes-note">
              Ask the author for changes
            </label>
            <textarea
              id="changes-note"
              name="note"
              rows={3}
              maxLength={REVIEW_NOTE_MAX}
              required
              placeholder="What to change, and why"
              defaultValue={changes?.values?.note ?? ""}
              aria-invalid={changes?.fields?.note ? true : undefined}
              className={`${input} ${changes?.fields?.note ? "border-z-danger" : "border-rule"}`}
            />
            <FieldError failure={changes} field="note" />
            <p className="mt-1 text-xs text-ink-soft">
              The author gets this note and the comments by e-mail and in the Workbench.
            </p>
            <div className="mt-2">
              <SubmitButton tone="quiet">Request changes</SubmitButton>
            </div>
          </Form>
        </>
      ) : (
        <p className="text-sm">
          Revision {revision.number} is {revision.state === "published" ? "published" : revision.state.replace("-", " ")}
          {revision.reviewedAt ? ` (decided ${formatDate(revision.reviewedAt)})` : ""}.
        </p>
      )}
      {can.unpublish ? (
        <Form method="post" className="border-t border-rule pt-4">
          <input type="hidden" name="intent" value="unpublish" />
          <label className="block text-sm font-semibold" htmlFor="unpublish-reason">
            Take it out of the Library
          </label>
          <textarea
            id="unpublish-reason"
            name="reason"
            rows={2}
            maxLength={REVIEW_NOTE_MAX}
            required
            placeholder="The reason readers will see"
            defaultValue={unpublish?.values?.reason ?? ""}
            aria-invalid={unpublish?.fields?.reason ? true : undefined}
            className={`${input} ${unpublish?.fields?.reason ? "border-z-danger" : "border-rule"}`}
          />
          <FieldError failure={unpublish} field="reason" />
          <div className="mt-2">
            <SubmitButton tone="danger">Unpublish</SubmitButton>
          </div>
        </Form>
      ) : null}
    </div>
  );
}

export default function ReviewRevision({ loaderData, actionData }: Route.ComponentProps) {
  const { view, url } = loaderData;
  const { revision, article, diff } = view;
  const failure = failureOf(actionData);
  const guide: ShownGuide = {
    id: revision.guide.id,
    slug: revision.guide.slug,
    title: article.title,
    summary: article.summary,
    category: article.category,
    difficulty: article.difficulty,
    minutes: article.minutes,
    author: revision.author,
    publishedAt: null,
    revision: { ...article.revision, reviewedAt: article.revision.reviewedAt ? new Date(article.revision.reviewedAt) : null },
    steps: article.steps,
    parts: article.parts,
    tools: article.tools,
    fitment: article.fitment,
  };
  return (
    <div className="mx-auto max-w-[90rem] px-4 py-6 sm:px-6">
      <nav aria-label="Breadcrumb" className="text-sm">
        <Link to="/review" className="inline-flex min-h-11 items-center text-spruce-700 underline">
          ← Review desk
        </Link>
      </nav>
      <header className="max-w-4xl">
        <h1 className="break-words font-serif text-2xl font-semibold leading-tight text-spruce-900 sm:text-3xl">
          {revision.title}
        </h1>
        <p className="mt-1 text-sm text-ink-soft">
          Revision {revision.number} by {revision.author.name}
          {revision.submittedAt ? (
            <>
              {" "}
              · submitted <time dateTime={isoDateTime(revision.submittedAt)}>{formatDateTime(revision.submittedAt)}</time>
            </>
          ) : null}
        </p>
        {revision.changeSummary ? (
          <p className="mt-2 text-sm">
            <span className="font-semibold">What changed, in the author's words:</span> {revision.changeSummary}
          </p>
        ) : null}
      </header>
      <div className="mt-4">
        {failure ? (
          <Notice tone="error" focusOn={failure}>
            {failure.message}
          </Notice>
        ) : null}
      </div>

      <div className="mt-2 grid gap-6 lg:grid-cols-[minmax(0,1fr)_26rem]">
        <aside aria-label="Review" className="min-w-0 space-y-4 lg:order-last">
          <Panel id="decision" title="Decision">
            <Decision view={view} failure={failure} />
          </Panel>
          <Panel id="findings" title="Findings" aside={<span className="text-sm text-ink-soft">{view.findings.length}</span>}>
            <Findings view={view} failure={failure} />
          </Panel>
          <Panel id="cautions" title="Cautions" aside={<span className="text-sm text-ink-soft">{view.cautions.length}</span>}>
            <Cautions view={view} />
          </Panel>
          <Panel
            id="changes"
            title="Changes"
            aside={
              diff ? (
                <span className="text-sm text-ink-soft">
                  against revision {diff.against.number}
                  {diff.against.why === "published" ? ", published" : ", sent back"}
                </span>
              ) : null
            }
          >
            {diff ? <DiffView diff={diff} /> : <p className="text-sm text-ink-soft">First revision: nothing to compare with.</p>}
          </Panel>
          <Panel id="comments" title="Comments" aside={<span className="text-sm text-ink-soft">{view.comments.length}</span>}>
            <Comments view={view} failure={failure} />
          </Panel>
        </aside>
        <section aria-label="As readers will see it" className="min-w-0 rounded-xl border border-rule bg-paper">
          <p className="rounded-t-xl border-b border-rule bg-paper-deep px-4 py-2 text-sm font-semibold text-ink-soft">
            As readers will see it
          </p>
          <GuideArticle guide={guide} url={url} print={false} />
        </section>
      </div>
    </div>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/error-page";
