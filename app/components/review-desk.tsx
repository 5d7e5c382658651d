import type { ReactNode } from "react";
import type { ListChange, RevisionDiff, StepDiff, TextPart, ValueChange } from "~/models/revision-diff";

/** "12 minutes", "5 hours", "3 days": how long a revision has waited, in the largest whole unit. */
export function waitingWords(minutes: number): string {
  const unit = (n: number, word: string) => `${n} ${word}${n === 1 ? "" : "s"}`;
  if (minutes < 1) return "less than a minute";
  if (minutes < 60) return unit(minutes, "minute");
  if (minutes < 48 * 60) return unit(Math.floor(minutes / 60), "hour");
  return unit(Math.floor(minutes / (24 * 60)), "day");
}

export function Count({ n, label, tone }: { n: number; label: string; tone: "danger" | "warning" | "calm" }) {
  const styles = {
    danger: n ? "bg-z-danger text-white" : "bg-spruce-50 text-spruce-900",
    warning: n ? "bg-brass-100 text-spruce-900" : "bg-spruce-50 text-spruce-900",
    calm: "bg-paper-deep text-ink",
  }[tone];
  return (
    <span className={`inline-flex min-h-8 items-center gap-1.5 rounded-full px-3 text-sm font-semibold ${styles}`}>
      <span className="tabular-nums">{n}</span> {label}
    </span>
  );
}

/** A panel of the review desk's side column. */
export function Panel({ id, title, children, aside }: { id: string; title: string; children: ReactNode; aside?: ReactNode }) {
  return (
    <section id={id} aria-labelledby={`${id}-title`} className="rounded-xl border border-rule bg-white p-4 shadow-sm">
      <div className="flex flex-wrap items-baseline justify-between gap-2">
        <h2 id={`${id}-title`} className="font-serif text-xl font-semibold text-spruce-900">
          {title}
        </h2>
        {aside}
      </div>
      <div className="mt-3">{children}</div>
    </section>
  );
}

/** Words removed struck through on red, words added underlined on green; both named for screen readers. */
export function WordDiff({ parts }: { parts: TextPart[] }) {
  return (
    <p className="whitespace-pre-wrap break-words text-sm leading-relaxed">
      {parts.map((part, i) =>
        part.added ? (
          <ins key={i} className="rounded-sm bg-spruce-100 text-spruce-900 underline decoration-spruce-500">
            <span className="sr-only">added: </span>
            {part.value}
          </ins>
        ) : part.removed ? (
          <del key={i} className="rounded-sm bg-z-danger/10 text-z-danger line-through">
            <span className="sr-only">removed: </span>
            {part.value}
          </del>
        ) : (
          <span key={i}>{part.value}</span>
        ),
      )}
    </p>
  );
}

function Values({ values }: { values: ValueChange[] }) {
  return (
    <ul className="mt-1 space-y-0.5 text-sm">
      {values.map((v) => (
        <li key={v.field} data-change={v.field}>
          {v.label} <del className="text-z-danger">{v.from}</del> <span aria-hidden="true">→</span>
          <span className="sr-only">changed to</span> <ins className="font-semibold text-spruce-900 no-underline">{v.to}</ins>
        </li>
      ))}
    </ul>
  );
}

const STATUS_WORDS = { added: "added", removed: "removed", changed: "changed", same: "unchanged" } as const;
const STATUS_STYLE = {
  added: "bg-spruce-100 text-spruce-900",
  removed: "bg-z-danger/10 text-z-danger",
  changed: "bg-brass-100 text-spruce-900",
  same: "bg-paper-deep text-ink-soft",
} as const;

function StatusTag({ status }: { status: keyof typeof STATUS_WORDS }) {
  return (
    <span className={`rounded px-1.5 py-0.5 text-xs font-bold uppercase tracking-wider ${STATUS_STYLE[status]}`}>
      {STATUS_WORDS[status]}
    </span>
  );
}

function StepChange({ step }: { step: StepDiff }) {
  const number = step.to ?? step.from ?? 0;
  return (
    <li className="border-t border-rule pt-3 first:border-t-0 first:pt-0" data-step-diff={number}>
      <p className="flex flex-wrap items-center gap-2 text-sm font-semibold">
        <StatusTag status={step.status} />
        <span>
          Step {number + 1}
          {step.from !== null && step.to !== null && step.from !== step.to ? ` (was ${step.from + 1})` : ""}: {step.title}
        </span>
      </p>
      {step.titleChange ? <Values values={[step.titleChange]} /> : null}
      {step.flags.length ? <Values values={step.flags} /> : null}
      {step.text && step.status === "changed" ? (
        <details className="mt-1">
          <summary className="min-h-11 cursor-pointer py-2 text-sm text-spruce-700 underline">Text changes</summary>
          <WordDiff parts={step.text} />
        </details>
      ) : null}
      {step.callouts.map((c, i) => (
        <div key={i} className="mt-2 text-sm" data-callout-diff={c.kind}>
          <p>
            <StatusTag status={c.status} /> <span className="font-semibold">{c.name}</span>
          </p>
          {c.values.length ? <Values values={c.values} /> : null}
          {c.text && c.status === "changed" ? <WordDiff parts={c.text} /> : null}
        </div>
      ))}
      {step.photos.added.length || step.photos.removed.length ? (
        <ul className="mt-2 space-y-0.5 text-sm">
          {step.photos.added.map((alt) => (
            <li key={`+${alt}`}>
              <StatusTag status="added" /> photo: {alt}
            </li>
          ))}
          {step.photos.removed.map((alt) => (
            <li key={`-${alt}`}>
              <StatusTag status="removed" /> photo: {alt}
            </li>
          ))}
        </ul>
      ) : null}
    </li>
  );
}

function ListChanges({ title, changes }: { title: string; changes: ListChange[] }) {
  if (!changes.length) return null;
  return (
    <div className="mt-4">
      <h3 className="text-sm font-bold uppercase tracking-wider text-ink-soft">{title}</h3>
      <ul className="mt-1 space-y-2">
        {changes.map((c) => (
          <li key={`${c.status}:${c.name}`} className="text-sm">
            <StatusTag status={c.status} /> <span className="font-semibold">{c.name}</span>
            {c.values.length ? <Values values={c.values} /> : null}
          </li>
        ))}
      </ul>
    </div>
  );
}

export function DiffView({ diff }: { diff: RevisionDiff }) {
  if (!diff.changed) return <p className="text-sm text-ink-soft">No differences in the content.</p>;
  const changedSteps = diff.steps.filter((s) => s.status !== "same");
  return (
    <div>
      {diff.details.length ? (
        <div>
          <h3 className="text-sm font-bold uppercase tracking-wider text-ink-soft">The guide</h3>
          <Values values={diff.details} />
        </div>
      ) : null}
      {changedSteps.length ? (
        <div className={diff.details.length ? "mt-4" : ""}>
          <h3 className="text-sm font-bold uppercase tracking-wider text-ink-soft">
            Steps ({changedSteps.length} of {diff.steps.length} changed)
          </h3>
          <ol className="mt-2 space-y-3">
            {changedSteps.map((s) => (
              <StepChange key={`${s.from}-${s.to}`} step={s} />
            ))}
          </ol>
        </div>
      ) : null}
      <ListChanges title="Fitment" changes={diff.fitment} />
      <ListChanges title="Parts" changes={diff.parts} />
      <ListChanges title="Tools" changes={diff.tools} />
    </div>
  );
}
