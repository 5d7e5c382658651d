import { type CircuitResult, circuitSummary, type SummaryStatus } from "~/engine/circuit";
import { type DiagramInput, wiringDiagramSvg } from "~/engine/diagram";
import { sourceRef } from "~/engine/sources";
import { wireLabel } from "~/engine/wire";
import { round } from "~/utils/format";

const SEVERITY_STYLE: Record<string, string> = {
  blocking: "border-z-danger bg-red-50",
  warning: "border-z-warning bg-brass-50",
  info: "border-z-notice bg-blue-50",
};
const SEVERITY_LABEL: Record<string, string> = { blocking: "Must fix", warning: "Check", info: "Note" };
const SEVERITY_ORDER: Record<string, number> = { blocking: 0, warning: 1, info: 2 };

const SUMMARY_STYLE: Record<SummaryStatus, string> = {
  blocked: "border-z-danger bg-red-50 font-medium",
  check: "border-z-warning bg-brass-50",
  "nothing-chosen": "border-rule bg-paper",
  "partly-chosen": "border-rule bg-paper",
  pass: "border-spruce-500 bg-spruce-50",
};

const NBSP = "\u00a0";
const UNITS = "A|V|W|m|mm|mm²|%|°C|AWG|Ω|mΩ/m|N·m|lbf·ft|lbf·in|conductors";
const NUMBER_THEN_UNIT = new RegExp(`(\\d) (${UNITS})(?![\\p{L}\\d])`, "gu");

/** A number and its unit as one unbreakable piece ("15 A", "17.7 lbf·ft"). */
export function quantity(value: string | number, unit: string): string {
  return `${value}${NBSP}${unit}`;
}

/** Engine sentences keep their numbers and units together, so "15 A" never breaks over two lines. */
export function keepUnits(text: string): string {
  return text.replace(NUMBER_THEN_UNIT, `$1${NBSP}$2`);
}

function Value({ children }: { children: React.ReactNode }) {
  return <dd className="whitespace-nowrap font-mono text-lg tabular-nums">{children}</dd>;
}

/** The engine's numbers for one circuit, with the inputs and sources behind them. */
export function CircuitResults({ result, relay }: { result: CircuitResult; relay?: boolean }) {
  const inputs = result.inputs;
  const load =
    inputs.loadWatts !== undefined ? quantity(round(inputs.loadWatts, 1), "W") : quantity(round(inputs.loadAmps ?? 0, 2), "A");
  const chosen = result.chosen;
  const summary = circuitSummary(result);
  // Most serious first, so the list reads in the order the summary counts.
  const findings = [...result.findings].sort((a, b) => SEVERITY_ORDER[a.severity] - SEVERITY_ORDER[b.severity]);
  return (
    <div className="mt-3 text-sm">
      <p className="text-ink-soft">
        {load} at {quantity(inputs.systemVoltage, "V")}, {inputs.continuous ? "continuous" : "intermittent"},{" "}
        {quantity(round(inputs.oneWayLengthM, 2), "m")} one way with a {inputs.returnPath === "chassis" ? "chassis" : "wire"}{" "}
        return, in the {inputs.location === "cabin" ? "cabin" : "engine bay"}, {quantity(inputs.insulationC, "°C")} insulation,{" "}
        {inputs.bundled} {inputs.bundled === 1 ? "wire" : "wires"} in the bundle, drop limit {quantity(inputs.dropLimitPct, "%")},
        switch rated {quantity(round(inputs.switchRatingA, 1), "A")}.
      </p>
      <dl className="mt-3 grid grid-cols-2 gap-x-4 gap-y-2 sm:grid-cols-4" data-testid="circuit-results">
        <div>
          <dt className="text-xs uppercase tracking-wider text-ink-soft">Current</dt>
          <Value>{quantity(round(result.currentA, 1), "A")}</Value>
        </div>
        <div>
          <dt className="text-xs uppercase tracking-wider text-ink-soft">Recommended fuse</dt>
          <Value>{result.recommendedFuseA ? quantity(result.recommendedFuseA, "A") : "none fits"}</Value>
        </div>
        <div>
          <dt className="text-xs uppercase tracking-wider text-ink-soft">Minimum wire</dt>
          <Value>
            {result.minWire.awg ? quantity(result.minWire.awg, "AWG") : result.minWire.mm2 ? null : "none fits"}
            {result.minWire.mm2 ? (
              <span className="text-sm text-ink-soft">
                {result.minWire.awg ? " / " : ""}
                {quantity(result.minWire.mm2, "mm²")}
              </span>
            ) : null}
          </Value>
        </div>
        <div>
          <dt className="text-xs uppercase tracking-wider text-ink-soft">Relay</dt>
          <dd className="font-mono text-lg">
            {result.relayNeeded ? "needed" : "not needed"}
            {relay !== undefined ? <span className="text-sm text-ink-soft"> ({relay ? "used" : "not used"})</span> : null}
          </dd>
        </div>
      </dl>
      {chosen ? (
        <p className="mt-3">
          Chosen: <strong className="whitespace-nowrap">{chosen.label.replace(" ", NBSP)}</strong>
          {inputs.fuseA !== undefined ? (
            <> with {inputs.fuseA === null ? <strong>no fuse</strong> : <strong>{quantity(inputs.fuseA, "A")} fuse</strong>}</>
          ) : null}{" "}
          · ampacity {chosen.ampacityA === null ? "not rated" : quantity(round(chosen.ampacityA, 1), "A")} · drop{" "}
          {quantity(round(chosen.dropV, 3), "V")} ({quantity(round(chosen.dropPct, 2), "%")})
        </p>
      ) : null}
      <p className={`mt-3 rounded-md border-l-4 px-3 py-2 ${SUMMARY_STYLE[summary.status]}`} data-testid="circuit-summary">
        {summary.text}
      </p>
      {findings.length ? (
        <ul className="mt-3 space-y-2" data-testid="circuit-findings">
          {findings.map((f, i) => (
            <li key={`${f.rule}-${i}`} className={`rounded-md border-l-4 px-3 py-2 ${SEVERITY_STYLE[f.severity]}`}>
              <strong className="mr-1">{SEVERITY_LABEL[f.severity]}:</strong>
              {keepUnits(f.message)} <span className="text-xs text-ink-soft">Source: {sourceRef(f.source).title}.</span>{" "}
              <code
                className="rounded bg-white/70 px-1 text-[0.7rem] text-ink-soft"
                title="Rule id, as the API and the review desk name it"
              >
                rule {f.rule}
              </code>
            </li>
          ))}
        </ul>
      ) : null}
      <details className="mt-3">
        <summary className="flex min-h-11 cursor-pointer items-center text-spruce-700">How these numbers were worked out</summary>
        <ul className="mt-2 list-disc space-y-1 pl-5 text-ink-soft">
          {result.notes.map((note) => (
            <li key={note}>{keepUnits(note)}</li>
          ))}
        </ul>
        <p className="mt-2 text-xs font-semibold uppercase tracking-wider text-ink-soft">Sources</p>
        <ul className="mt-1 list-disc space-y-1 pl-5 text-ink-soft">
          {result.sources.map((s) => (
            <li key={s.id}>
              {s.title}: {keepUnits(s.detail)}
            </li>
          ))}
        </ul>
        {result.candidates.length ? (
          <div className="mt-3 overflow-x-auto">
            <table className="w-full text-left text-xs tabular-nums">
              <thead>
                <tr className="border-b border-rule text-ink-soft">
                  <th className="py-1 pr-2">Wire</th>
                  <th className="pr-2">Ampacity</th>
                  <th className="pr-2">Drop</th>
                  <th className="pr-2">Carries fuse</th>
                  <th>Within drop</th>
                </tr>
              </thead>
              <tbody>
                {result.candidates.map((c) => (
                  <tr key={wireLabel(c.wire)} className="border-b border-rule/60 whitespace-nowrap">
                    <td className="py-1 pr-2">{c.label.replace(" ", NBSP)}</td>
                    <td className="pr-2">{c.ampacityA === null ? "—" : quantity(round(c.ampacityA, 1), "A")}</td>
                    <td className="pr-2">
                      {quantity(round(c.dropV, 3), "V")} ({quantity(round(c.dropPct, 2), "%")})
                    </td>
                    <td className="pr-2">{c.carriesFuse ? "yes" : "no"}</td>
                    <td>{c.withinDrop ? "yes" : "no"}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        ) : null}
      </details>
    </div>
  );
}

/** Markup drawn by the engine's diagram and chart functions, which escape every text they place. */
export function EngineSvg({ svg, className = "" }: { svg: string; className?: string }) {
  // biome-ignore lint/security/noDangerouslySetInnerHtml: built by app/engine from numbers and escaped labels
  return <div className={`tl-figure ${className}`} dangerouslySetInnerHTML={{ __html: svg }} />;
}

/**
 * A link that opens a drawing at full size over the page, and the view it opens. Plain CSS
 * (`:target`), so it works without JavaScript and needs no inline style under the CSP.
 */
export function FullSizeView({ id, title, svg }: { id: string; title: string; svg: string }) {
  const viewId = `${id}-full`;
  return (
    <>
      <a
        href={`#${viewId}`}
        aria-label={`Open full size: ${title}`}
        className="mt-2 inline-flex min-h-11 items-center rounded-md border border-rule px-3 text-sm text-spruce-700 hover:bg-paper-deep"
      >
        Open full size
      </a>
      <div
        id={viewId}
        role="dialog"
        aria-label={`${title}, full size`}
        className="fixed inset-0 z-50 hidden overflow-auto bg-paper target:block"
      >
        <div className="sticky top-0 left-0 flex items-center justify-between gap-3 border-b border-rule bg-paper px-4 py-2">
          <p className="font-medium">{title}</p>
          <a
            href={`#${id}`}
            className="inline-flex min-h-11 items-center rounded-md border border-rule px-4 text-sm font-semibold hover:bg-paper-deep"
          >
            Close
          </a>
        </div>
        <div
          className="p-4 text-ink [&_svg]:h-auto [&_svg]:w-[960px] [&_svg]:max-w-none"
          // biome-ignore lint/security/noDangerouslySetInnerHtml: built by app/engine from numbers and escaped labels
          dangerouslySetInnerHTML={{ __html: svg }}
        />
      </div>
    </>
  );
}

/** The wiring diagram drawn by the engine (escaped SVG markup), as the callout describes it. */
export function CircuitFigure({ input, result, id }: { input: DiagramInput; result: CircuitResult; id: string }) {
  const relayDrawn = input.relay ?? result.relayUsed;
  // The full-size view sits outside the figure: `.tl-figure svg` would squeeze it back to the column's width.
  return (
    <div className="mt-4">
      <figure id={id} className="tl-figure rounded-md border border-rule bg-paper p-3">
        <EngineSvg svg={wiringDiagramSvg(input, result, { idPrefix: id })} />
        <figcaption className="mt-2 text-xs text-ink-soft">
          {relayDrawn
            ? "Wiring diagram. Relay terminals numbered per DIN 72552: 30 supply, 87 load, 85 and 86 coil."
            : "Wiring diagram. No relay: the switch sits in the main line and carries the load."}
        </figcaption>
      </figure>
      <FullSizeView id={id} title="Wiring diagram" svg={wiringDiagramSvg(input, result, { idPrefix: `${id}-full` })} />
    </div>
  );
}
