import { keepUnits } from "~/components/circuit-results";
import type { Finding } from "~/engine/rules";
import { type SourceId, SOURCES } from "~/engine/sources";
import { round } from "~/utils/format";
import { smallButton } from "./fields";

type Severity = Finding["severity"];

export const SEVERITY_WORDS: Record<Severity, string> = { blocking: "Blocking", warning: "Warning", info: "Info" };
const SEVERITY_MEANING: Record<Severity, string> = {
  blocking: "must be fixed before the guide can be published",
  warning: "to check",
  info: "for information",
};
const SEVERITY_STYLE: Record<Severity, string> = {
  blocking: "border-z-danger bg-red-50",
  warning: "border-z-warning bg-brass-50",
  info: "border-z-notice bg-blue-50",
};
const SEVERITY_ORDER: Record<Severity, number> = { blocking: 0, warning: 1, info: 2 };

/** The words for the numbers the engine attaches to a finding (app/engine/circuit-findings.ts). */
const NUMBER_WORDS: Record<string, string> = {
  currentA: "current",
  neededA: "needed",
  largestA: "largest standard fuse",
  recommendedFuseA: "recommended fuse",
  fuseA: "fuse",
  ampacityA: "wire ampacity",
  limitA: "largest fuse for the wire (150 %)",
  dropV: "drop",
  dropPct: "drop",
  dropLimitPct: "drop limit",
  lengthM: "wire length",
  fuseDistanceMm: "fuse to battery",
  maxMm: "allowed",
  switchRatingA: "switch rating",
};

function unitOf(key: string): string {
  if (key.endsWith("Pct")) return "%";
  if (key.endsWith("Mm")) return "mm";
  if (key.endsWith("M")) return "m";
  if (key.endsWith("A")) return "A";
  if (key.endsWith("V")) return "V";
  return "";
}

/** "fuse 30 A · wire ampacity 17 A": each number with its unit, rounded for the screen only. */
export function numbersWords(numbers: Record<string, number> | undefined): string {
  return Object.entries(numbers ?? {})
    .filter(([, value]) => typeof value === "number" && Number.isFinite(value))
    .map(([key, value]) => {
      const unit = unitOf(key);
      return `${NUMBER_WORDS[key] ?? key} ${round(value, 2)}${unit ? `\u00a0${unit}` : ""}`;
    })
    .join(" · ");
}

/** Where a finding points: the callout when it names one, else its step. */
export function findingPath(finding: Pick<Finding, "stepIndex" | "calloutIndex">): string {
  return finding.calloutIndex === undefined
    ? `steps.${finding.stepIndex}`
    : `steps.${finding.stepIndex}.callouts.${finding.calloutIndex}`;
}

export function findingPlace(finding: Pick<Finding, "stepIndex" | "calloutIndex">): string {
  const step = `step ${finding.stepIndex + 1}`;
  return finding.calloutIndex === undefined ? step : `${step}, callout ${finding.calloutIndex + 1}`;
}

export function sortFindings(findings: readonly Finding[]): Finding[] {
  return [...findings].sort(
    (a, b) =>
      SEVERITY_ORDER[a.severity] - SEVERITY_ORDER[b.severity] ||
      a.stepIndex - b.stepIndex ||
      (a.calloutIndex ?? -1) - (b.calloutIndex ?? -1),
  );
}

export function countWords(findings: readonly Finding[]): string {
  if (findings.length === 0) return "No safety findings.";
  const counts = (["blocking", "warning", "info"] as const)
    .map((s) => [s, findings.filter((f) => f.severity === s).length] as const)
    .filter(([, n]) => n > 0)
    .map(([s, n]) => `${n} ${s === "warning" && n > 1 ? "warnings" : s}`);
  return `${counts.join(", ")}.`;
}

/**
 * The engine's safety findings for the draft, most serious first, each with its rule, its place,
 * its numbers and its source, and a button that takes the author to the step or callout.
 */
export function FindingsPanel({ findings, onJump }: { findings: Finding[]; onJump: (path: string) => void }) {
  const sorted = sortFindings(findings);
  return (
    <section aria-labelledby="findings-heading" className="rounded-xl border border-rule bg-white p-4 shadow-sm">
      <h2 id="findings-heading" className="font-serif text-lg font-semibold text-spruce-900">
        Safety findings
      </h2>
      <p role="status" className="mt-1 text-sm text-ink-soft" data-testid="findings-count">
        {countWords(sorted)}
        {sorted.length === 0
          ? " The engine checks fuses, wires, relays and the required cautions each time the draft is saved."
          : null}
      </p>
      {sorted.length ? (
        <ol className="mt-3 space-y-2">
          {sorted.map((finding, i) => {
            const place = findingPlace(finding);
            const numbers = numbersWords(finding.numbers);
            const source = SOURCES[finding.source as SourceId];
            return (
              <li
                key={`${finding.rule}-${finding.stepIndex}-${finding.calloutIndex ?? "step"}-${i}`}
                className={`rounded-md border-l-4 px-3 py-2 text-sm ${SEVERITY_STYLE[finding.severity] ?? ""}`}
              >
                <p className="flex flex-wrap items-baseline gap-x-2">
                  <strong title={SEVERITY_MEANING[finding.severity]}>
                    {SEVERITY_WORDS[finding.severity] ?? finding.severity}
                  </strong>
                  <span>{`${place.charAt(0).toUpperCase()}${place.slice(1)}`}</span>
                  <code
                    className="rounded bg-white/70 px-1 text-[0.7rem] text-ink-soft"
                    title="Rule id, as the API and the review desk name it"
                  >
                    rule {finding.rule}
                  </code>
                </p>
                <p className="mt-1">{keepUnits(finding.message)}</p>
                {numbers ? <p className="mt-1 text-xs text-ink-soft">Numbers: {numbers}</p> : null}
                <p className="mt-1 text-xs text-ink-soft">Source: {source ? source.title : finding.source}.</p>
                <button type="button" className={`${smallButton} mt-2`} onClick={() => onJump(findingPath(finding))}>
                  Go to {place}
                </button>
              </li>
            );
          })}
        </ol>
      ) : null}
    </section>
  );
}
