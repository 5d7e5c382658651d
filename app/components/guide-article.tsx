import { type ReactNode, useRef } from "react";
import { Link } from "react-router";
import { CalloutView } from "~/components/callouts";
import { SafetyNotice } from "~/components/chrome";
import { DocumentHtml } from "~/components/document-html";
import { GuideKit } from "~/components/guide-kit";
import {
  PrintFooter,
  PrintMasthead,
  PrintViewBar,
  useDetailsOpenForPrint,
  useScrollableFiguresFocusable,
} from "~/components/guide-print";
import { PRINT_STYLE } from "~/components/print-style";
import type { PublishedGuide } from "~/models/library.server";
import { formatDate, formatMinutes, isoDateTime, keepUnitsTogether } from "~/utils/format";
import { CATEGORY_LABELS, DIFFICULTY_LABELS, type Category } from "~/utils/vocab";

type Photo = PublishedGuide["steps"][number]["photos"][number];

/** The guide as the page shows it; a document's steps may come without their HTML (see DocumentHtml). */
export type ShownGuide = Omit<PublishedGuide, "steps" | "history"> & {
  steps: (Omit<PublishedGuide["steps"][number], "html"> & { html: string | undefined })[];
  /** The published revisions, newest first; a draft's preview has none. */
  history?: PublishedGuide["history"];
};

/** The id of a step's text in the page: where the browser finds it again on hydration. */
export const stepBodyId = (index: number) => `step-${index + 1}-text`;

function StepPhoto({ photo, eager }: { photo: Photo; eager: boolean }) {
  const webp = photo.variants.filter((v) => v.format === "webp");
  const jpeg = photo.variants.filter((v) => v.format === "jpeg");
  const srcset = (list: typeof webp) => list.map((v) => `${v.url} ${v.width}w`).join(", ");
  const fallback = jpeg[Math.min(1, jpeg.length - 1)] ?? jpeg[0];
  return (
    <figure className="tl-photo overflow-hidden rounded-lg border border-rule bg-white print:break-inside-avoid">
      <picture>
        <source type="image/webp" srcSet={srcset(webp)} sizes="(min-width: 768px) 640px, 100vw" />
        <img
          src={fallback?.url}
          srcSet={srcset(jpeg)}
          sizes="(min-width: 768px) 640px, 100vw"
          alt={photo.alt}
          width={photo.width}
          height={photo.height}
          loading={eager ? "eager" : "lazy"}
          className="h-auto w-full"
        />
      </picture>
      {photo.caption ? (
        <figcaption className="px-3 py-2 text-sm text-ink-soft">{keepUnitsTogether(photo.caption)}</figcaption>
      ) : null}
    </figure>
  );
}

const jumpLink =
  "inline-flex min-h-11 items-center rounded-full border border-rule bg-white px-3 text-sm font-medium text-spruce-800 hover:bg-paper-deep";

/**
 * A guide as readers see it: the published guide page, and the author's preview of a draft, which
 * must look exactly the same.
 */
export function GuideArticle({
  guide,
  url,
  print,
  work,
}: {
  guide: ShownGuide;
  url: string;
  print: boolean;
  /** The published page's work-through controls (app/routes/guide.tsx); a draft's preview has none. */
  work?: { headerActions: ReactNode; beforeSteps: ReactNode; afterStep: (index: number) => ReactNode };
}) {
  const article = useRef<HTMLElement>(null);
  useDetailsOpenForPrint(article, print);
  useScrollableFiguresFocusable(article);
  const electrical = guide.steps.some((s) => s.callouts.some((c) => c.kind === "circuit") || s.disconnectsBattery);
  const lifting = guide.steps.some((s) => s.liftsVehicle);
  return (
    <article ref={article} className="tl-guide mx-auto max-w-6xl px-4 py-8 sm:px-6 sm:py-10">
      {print ? (
        // The print view: no site chrome, one column, every photo loaded.
        <style>{PRINT_STYLE}</style>
      ) : null}
      {print ? <PrintViewBar slug={guide.slug} /> : null}
      <PrintMasthead url={url} revision={guide.revision} onScreen={print} />
      <nav aria-label="Breadcrumb" className="no-print -ml-1 flex flex-wrap items-center text-sm text-ink-soft">
        <Link to="/" className="inline-flex min-h-11 items-center px-1 hover:underline">
          Library
        </Link>
        <span aria-hidden="true">/</span>
        <Link to={`/?category=${guide.category}`} className="inline-flex min-h-11 items-center px-1 hover:underline">
          {CATEGORY_LABELS[guide.category as Category]}
        </Link>
      </nav>
      <header className="mt-1 max-w-3xl">
        <h1 className="break-words font-serif text-3xl font-semibold leading-tight tracking-tight text-spruce-900 sm:text-4xl">
          {guide.title}
        </h1>
        <p className="mt-3 font-serif text-lg text-ink-soft sm:text-xl">{keepUnitsTogether(guide.summary)}</p>
        <dl className="mt-4 flex flex-wrap gap-x-6 gap-y-1 text-sm">
          <div>
            <dt className="inline text-ink-soft">Difficulty </dt>
            <dd className="inline font-medium">
              {DIFFICULTY_LABELS[guide.difficulty]} <span className="whitespace-nowrap">({guide.difficulty}/5)</span>
            </dd>
          </div>
          <div>
            <dt className="inline text-ink-soft">Time </dt>
            <dd className="inline whitespace-nowrap font-medium">about {formatMinutes(guide.minutes)}</dd>
          </div>
          <div>
            <dt className="inline text-ink-soft">Written by </dt>
            <dd className="inline font-medium">{guide.author.name}</dd>
          </div>
          {/* On paper, and in the print view, the masthead above the title gives the revision. */}
          <div className={print ? "hidden" : "screen-only"}>
            <dt className="sr-only">Review </dt>
            <dd className="inline font-medium">
              {guide.revision.reviewedAt ? (
                <>
                  Safety-reviewed by an editor on{" "}
                  <time dateTime={isoDateTime(guide.revision.reviewedAt)} className="whitespace-nowrap">
                    {formatDate(guide.revision.reviewedAt)}
                  </time>{" "}
                  ·{" "}
                </>
              ) : (
                "Not reviewed yet · "
              )}
              <span className="whitespace-nowrap">revision {guide.revision.number}</span>
            </dd>
          </div>
        </dl>
        {print ? null : (
          <p className="no-print mt-4 flex flex-wrap gap-3 text-sm">
            <Link
              to={`/guides/${guide.slug}?print=1`}
              className="inline-flex min-h-11 items-center rounded-md border border-rule bg-white px-4 font-medium hover:bg-paper-deep"
            >
              Print view
            </Link>
            {work?.headerActions}
          </p>
        )}
      </header>

      {electrical || lifting ? (
        <div className="mt-6 max-w-3xl">
          <SafetyNotice />
        </div>
      ) : null}

      {/* On a phone the kit comes before the steps; these links reach each part of the page from the top. */}
      <nav aria-label="On this page" className="no-print mt-6 flex flex-wrap gap-2 lg:hidden">
        <a href="#fitment" className={jumpLink}>
          Fitment
        </a>
        <a href="#parts" className={jumpLink}>
          Parts and tools
        </a>
        <a href="#steps" className={jumpLink}>
          Steps ({guide.steps.length})
        </a>
      </nav>

      <div className="tl-guide-grid mt-6 grid gap-10 lg:mt-8 lg:grid-cols-[minmax(0,1fr)_20rem]">
        <GuideKit guide={guide} />
        <div className="min-w-0 lg:col-start-1 lg:row-start-1">
          <h2 id="steps" className="sr-only scroll-mt-4">
            Steps
          </h2>
          {work?.beforeSteps}
          <ol className="space-y-12">
            {guide.steps.map((step, index) => (
              <li key={step.title + index} id={`step-${index + 1}`} className="scroll-mt-6">
                <h3 className="flex items-baseline gap-3 font-serif text-2xl font-semibold text-spruce-900 print:break-after-avoid">
                  <span className="shrink-0 whitespace-nowrap font-mono text-base text-brass-700">Step {index + 1}</span>
                  <span className="min-w-0">{keepUnitsTogether(step.title)}</span>
                </h3>
                {step.liftsVehicle || step.disconnectsBattery ? (
                  <p className="mt-2 flex flex-wrap gap-2 text-xs font-semibold uppercase tracking-wider">
                    {step.liftsVehicle ? <span className="rounded bg-paper-deep px-2 py-1">Vehicle raised</span> : null}
                    {step.disconnectsBattery ? (
                      <span className="rounded bg-paper-deep px-2 py-1">Battery disconnected</span>
                    ) : null}
                  </p>
                ) : null}
                <DocumentHtml
                  id={stepBodyId(index)}
                  html={step.html}
                  className="prose prose-lg mt-3 max-w-none font-serif prose-headings:font-serif prose-strong:text-ink"
                />
                {step.photos.length ? (
                  <div className={`mt-4 grid gap-4 ${step.photos.length > 1 ? "sm:grid-cols-2" : ""}`}>
                    {step.photos.map((photo) => (
                      <StepPhoto key={photo.variants[0]?.url} photo={photo} eager={print || index < 2} />
                    ))}
                  </div>
                ) : null}
                {step.callouts.length ? (
                  <div className="mt-4 space-y-3">
                    {step.callouts.map((callout, i) => (
                      <div key={`${callout.kind}-${i}`} className="tl-callout print:break-inside-avoid">
                        <CalloutView callout={callout} id={`s${index}c${i}`} />
                      </div>
                    ))}
                  </div>
                ) : null}
                {work?.afterStep(index)}
              </li>
            ))}
          </ol>
        </div>
      </div>
      {guide.history?.length ? <RevisionHistory history={guide.history} /> : null}
      <PrintFooter title={guide.title} url={url} revision={guide.revision} onScreen={print} />
    </article>
  );
}

/** What changed in each published revision, newest first: readers see how the guide has been kept. */
function RevisionHistory({ history }: { history: NonNullable<ShownGuide["history"]> }) {
  return (
    <section aria-labelledby="history" className="mt-12 max-w-3xl border-t border-rule pt-6 print:break-inside-avoid">
      <h2 id="history" className="scroll-mt-6 font-serif text-xl font-semibold text-spruce-900">
        Revision history
      </h2>
      <p className="mt-1 text-sm text-ink-soft">Each revision was safety-reviewed by an editor before it was published.</p>
      <ol className="mt-3 space-y-3">
        {history.map((entry) => {
          const when = entry.publishedAt ?? entry.reviewedAt;
          return (
            <li key={entry.number} className="text-sm">
              <p>
                <span className="font-semibold">Revision {entry.number}</span>
                {when ? (
                  <>
                    {" · "}
                    <time dateTime={isoDateTime(when)} className="whitespace-nowrap text-ink-soft">
                      {formatDate(when)}
                    </time>
                  </>
                ) : null}
              </p>
              <p className="mt-0.5 break-words">
                {entry.changeSummary ? keepUnitsTogether(entry.changeSummary) : "No summary given."}
              </p>
            </li>
          );
        })}
      </ol>
    </section>
  );
}
