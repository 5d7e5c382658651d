import { Link } from "react-router";
import { CalloutView } from "~/components/callouts";
import { SafetyNotice } from "~/components/chrome";
import { FitmentBadge } from "~/components/fitment";
import { PRINT_STYLE } from "~/components/print-style";
import { getDb } from "~/db/client.server";
import { getPublishedGuide } from "~/models/library.server";
import { getStorage } from "~/services/storage.server";
import { formatMinutes } from "~/utils/format";
import { CATEGORY_LABELS, DIFFICULTY_LABELS, FITMENT_LABELS, type Category, type FitmentStatus } from "~/utils/vocab";
import { notFound } from "~/utils/errors";
import { pageErrorResponse } from "~/utils/http.server";
import type { Route } from "./+types/guide";

export async function loader({ params, request }: Route.LoaderArgs) {
  const guide = await getPublishedGuide(await getDb(), getStorage(), params.slug);
  if (!guide) throw pageErrorResponse(notFound(`A published guide called "${params.slug}"`));
  return { guide, print: new URL(request.url).searchParams.get("print") === "1" };
}

export const meta: Route.MetaFunction = ({ data }) =>
  data
    ? [{ title: `${data.guide.title} · Torqueleaf` }, { name: "description", content: data.guide.summary }]
    : [{ title: "Guide not found · Torqueleaf" }];

type Photo = Route.ComponentProps["loaderData"]["guide"]["steps"][number]["photos"][number];

function StepPhoto({ photo, eager }: { photo: Photo; eager: boolean }) {
  const webp = photo.variants.filter((v) => v.format === "webp");
  const jpeg = photo.variants.filter((v) => v.format === "jpeg");
  const srcset = (list: typeof webp) => list.map((v) => `${v.url} ${v.width}w`).join(", ");
  const fallback = jpeg[Math.min(1, jpeg.length - 1)] ?? jpeg[0];
  return (
    <figure className="overflow-hidden rounded-lg border border-rule bg-white">
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
      {photo.caption ? <figcaption className="px-3 py-2 text-sm text-ink-soft">{photo.caption}</figcaption> : null}
    </figure>
  );
}

export default function GuidePage({ loaderData }: Route.ComponentProps) {
  const { guide, print } = loaderData;
  const electrical = guide.steps.some((s) => s.callouts.some((c) => c.kind === "circuit") || s.disconnectsBattery);
  const lifting = guide.steps.some((s) => s.liftsVehicle);
  return (
    <article className="mx-auto max-w-6xl px-6 py-10">
      {print ? (
        // The print view: no site chrome, one column, every photo loaded.
        <style>{PRINT_STYLE}</style>
      ) : null}
      <nav aria-label="Breadcrumb" className="no-print text-sm text-ink-soft">
        <Link to="/" className="hover:underline">
          Library
        </Link>{" "}
        /{" "}
        <Link to={`/?category=${guide.category}`} className="hover:underline">
          {CATEGORY_LABELS[guide.category as Category]}
        </Link>
      </nav>
      <header className="mt-3 max-w-3xl">
        <h1 className="font-serif text-4xl font-semibold leading-tight tracking-tight text-spruce-900">{guide.title}</h1>
        <p className="mt-3 font-serif text-xl text-ink-soft">{guide.summary}</p>
        <dl className="mt-4 flex flex-wrap gap-x-6 gap-y-1 text-sm">
          <div>
            <dt className="inline text-ink-soft">Difficulty </dt>
            <dd className="inline font-medium">
              {DIFFICULTY_LABELS[guide.difficulty]} ({guide.difficulty}/5)
            </dd>
          </div>
          <div>
            <dt className="inline text-ink-soft">Time </dt>
            <dd className="inline font-medium">about {formatMinutes(guide.minutes)}</dd>
          </div>
          <div>
            <dt className="inline text-ink-soft">Written by </dt>
            <dd className="inline font-medium">{guide.author.name}</dd>
          </div>
          <div>
            <dt className="inline text-ink-soft">Revision </dt>
            <dd className="inline font-medium">
              {guide.revision.number}
              {guide.revision.reviewedAt
                ? `, reviewed ${new Date(guide.revision.reviewedAt).toLocaleDateString("en-GB", { day: "numeric", month: "short", year: "numeric" })}`
                : ""}
            </dd>
          </div>
        </dl>
        <p className="no-print mt-4 flex gap-3 text-sm">
          <Link to={`/guides/${guide.slug}?print=1`} className="rounded-md border border-rule px-3 py-1.5 hover:bg-paper-deep">
            Print view
          </Link>
        </p>
      </header>

      {electrical || lifting ? (
        <div className="mt-6 max-w-3xl">
          <SafetyNotice />
        </div>
      ) : null}

      <div className="tl-guide-grid mt-8 grid gap-10 lg:grid-cols-[1fr_20rem]">
        <div className="min-w-0">
          <ol className="space-y-12">
            {guide.steps.map((step, index) => (
              <li key={step.title + index} id={`step-${index + 1}`} className="scroll-mt-6">
                <h2 className="flex items-baseline gap-3 font-serif text-2xl font-semibold text-spruce-900">
                  <span className="font-mono text-base text-brass-700">Step {index + 1}</span>
                  {step.title}
                </h2>
                {step.liftsVehicle || step.disconnectsBattery ? (
                  <p className="mt-2 flex flex-wrap gap-2 text-xs font-semibold uppercase tracking-wider">
                    {step.liftsVehicle ? <span className="rounded bg-paper-deep px-2 py-1">Vehicle raised</span> : null}
                    {step.disconnectsBattery ? (
                      <span className="rounded bg-paper-deep px-2 py-1">Battery disconnected</span>
                    ) : null}
                  </p>
                ) : null}
                <div
                  className="prose prose-lg mt-3 max-w-none font-serif prose-headings:font-serif prose-strong:text-ink"
                  // biome-ignore lint/security/noDangerouslySetInnerHtml: rendered from validated rich-text JSON when the revision was saved
                  dangerouslySetInnerHTML={{ __html: step.html }}
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
                      <CalloutView key={`${callout.kind}-${i}`} callout={callout} id={`s${index}c${i}`} />
                    ))}
                  </div>
                ) : null}
              </li>
            ))}
          </ol>
        </div>

        <aside className="space-y-6 lg:sticky lg:top-6 lg:self-start">
          <section className="rounded-xl border border-rule bg-white p-5 shadow-sm">
            <h2 className="font-serif text-lg font-semibold text-spruce-900">Fitment</h2>
            <ul className="mt-3 space-y-2 text-sm">
              {guide.fitment.map((row) => (
                <li key={row.variantId}>
                  <p className="font-medium">
                    {row.make} {row.model} {row.generation} <span className="font-normal text-ink-soft">({row.years})</span>
                  </p>
                  <p className="mt-0.5 flex flex-wrap items-center gap-2">
                    <span>{row.variant}</span>
                    <FitmentBadge row={row} />
                  </p>
                  {row.note ? (
                    <p className="mt-0.5 text-ink-soft">
                      {FITMENT_LABELS[row.status as FitmentStatus]}: {row.note}
                    </p>
                  ) : null}
                </li>
              ))}
            </ul>
          </section>
          <section className="rounded-xl border border-rule bg-white p-5 shadow-sm">
            <h2 className="font-serif text-lg font-semibold text-spruce-900">Parts</h2>
            <ul className="mt-3 space-y-2 text-sm">
              {guide.parts.map((part) => (
                <li key={part.name} className="flex gap-3">
                  <span className="w-8 shrink-0 text-right font-mono tabular-nums text-ink-soft">{part.quantity}×</span>
                  <span>
                    {part.name}
                    {part.partNumber ? <span className="block font-mono text-xs text-ink-soft">{part.partNumber}</span> : null}
                    {part.notes ? <span className="block text-xs text-ink-soft">{part.notes}</span> : null}
                    {part.stepIndex !== null ? (
                      <a href={`#step-${part.stepIndex + 1}`} className="block text-xs text-spruce-700 hover:underline">
                        used in step {part.stepIndex + 1}
                      </a>
                    ) : null}
                  </span>
                </li>
              ))}
            </ul>
          </section>
          <section className="rounded-xl border border-rule bg-white p-5 shadow-sm">
            <h2 className="font-serif text-lg font-semibold text-spruce-900">Tools</h2>
            <ul className="mt-3 list-disc space-y-1 pl-5 text-sm">
              {guide.tools.map((tool) => (
                <li key={tool.name}>{tool.name}</li>
              ))}
            </ul>
          </section>
        </aside>
      </div>
    </article>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/error-page";
