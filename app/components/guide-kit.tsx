import { SaveChecklistButton } from "~/components/checklist-save";
import { FitmentBadge } from "~/components/fitment";
import type { PublishedGuide } from "~/models/library.server";
import { keepUnitsTogether } from "~/utils/format";
import { FITMENT_LABELS, type FitmentStatus } from "~/utils/vocab";

const card = "scroll-mt-4 rounded-xl border border-rule bg-white p-5 shadow-sm print:shadow-none";
const heading = "font-serif text-lg font-semibold text-spruce-900";

/**
 * What the reader needs before the first step: fitment, parts and tools. It comes before the steps
 * in the page, so a phone shows it first and print puts it on the first page; on a desktop it sits
 * beside the steps, sticky, parts and tools on top (what a reader reaches for mid-article, fitment
 * having been settled before the first step), and scrolls within itself when taller than the window.
 */
export function GuideKit({ guide }: { guide: Pick<PublishedGuide, "slug" | "fitment" | "parts" | "tools"> }) {
  return (
    <aside
      aria-label="Fitment, parts and tools"
      className="tl-guide-kit flex flex-col gap-6 lg:sticky lg:top-4 lg:col-start-2 lg:row-start-1 lg:max-h-[calc(100dvh-2rem)] lg:self-start lg:overflow-y-auto lg:overscroll-contain lg:p-1"
    >
      <section id="fitment" className={`${card} lg:order-last`} aria-labelledby="fitment-heading">
        <h2 id="fitment-heading" className={heading}>
          Fitment
        </h2>
        <ul className="mt-3 space-y-2 text-sm">
          {guide.fitment.map((row) => (
            <li key={row.variantId}>
              <p className="font-medium">
                {row.make} {row.model} {row.generation}{" "}
                <span className="whitespace-nowrap font-normal text-ink-soft">({row.years})</span>
              </p>
              <p className="mt-0.5 flex flex-wrap items-center gap-2">
                <span>{row.variant}</span>
                <FitmentBadge row={row} />
              </p>
              {row.note ? (
                <p className="mt-0.5 text-ink-soft">
                  {FITMENT_LABELS[row.status as FitmentStatus]}: {keepUnitsTogether(row.note)}
                </p>
              ) : null}
            </li>
          ))}
        </ul>
      </section>
      <section id="parts" className={card} aria-labelledby="parts-heading">
        <h2 id="parts-heading" className={heading}>
          Parts
        </h2>
        <ul className="mt-3 divide-y divide-rule/60 text-sm">
          {guide.parts.map((part) => (
            <li key={part.name} className="flex items-start gap-3 py-2">
              <span className="w-8 shrink-0 whitespace-nowrap text-right font-mono tabular-nums text-ink-soft">
                {part.quantity}×
              </span>
              <span className="min-w-0 flex-1">
                {keepUnitsTogether(part.name)}
                {part.partNumber ? (
                  <span className="block break-all font-mono text-xs text-ink-soft">{part.partNumber}</span>
                ) : null}
                {part.notes ? <span className="block text-xs text-ink-soft">{keepUnitsTogether(part.notes)}</span> : null}
              </span>
              {part.stepIndex !== null ? (
                <a
                  href={`#step-${part.stepIndex + 1}`}
                  className="-my-1.5 inline-flex min-h-11 shrink-0 items-center whitespace-nowrap rounded-md px-2 text-xs text-spruce-700 hover:bg-spruce-50 hover:underline"
                >
                  <span className="sr-only">Used in&nbsp;</span>Step&nbsp;{part.stepIndex + 1}
                </a>
              ) : null}
            </li>
          ))}
        </ul>
        <SaveChecklistButton slug={guide.slug} />
      </section>
      <section id="tools" className={card} aria-labelledby="tools-heading">
        <h2 id="tools-heading" className={heading}>
          Tools
        </h2>
        <ul className="mt-3 list-disc space-y-1 pl-5 text-sm">
          {guide.tools.map((tool) => (
            <li key={tool.name}>{keepUnitsTogether(tool.name)}</li>
          ))}
        </ul>
      </section>
    </aside>
  );
}
