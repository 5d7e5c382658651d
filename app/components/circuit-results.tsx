import type { CircuitResult } from "~/engine/circuit";
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

/** The engine's numbers for one circuit, with the inputs and sources behind them. */
export function CircuitResults({ result, relay }: { result: CircuitResult; relay?: boolean }) {
  const inputs = result.inputs;
  const load = inputs.loadWatts !== undefined ? `${round(inputs.loadWatts, 1)} W` : `${round(inputs.loadAmps ?? 0, 2)} A`;
  const chosen = result.chosen;
  return (
    <div className="mt-3 text-sm">
      <p className="text-ink-soft">
        {load} at {inputs.systemVoltage} V, {inputs.continuous ? "continuous" : "intermittent"}, {round(inputs.oneWayLengthM, 2)}{" "}
        m one way with a {inputs.returnPath === "chassis" ? "chassis" : "wire"} return, in the{" "}
        {inputs.location === "cabin" ? "cabin" : "engine bay"}, {inputs.insulationC} °C insulation, drop limit{" "}
        {inputs.dropLimitPct} %.
      </p>
      <dl className="mt-3 grid grid-cols-2 gap-x-4 gap-y-2 sm:grid-cols-4" data-testid="circuit-results">
        <div>
          <dt className="text-xs uppercase tracking-wider text-ink-soft">Current</dt>
          <dd className="font-mono text-lg tabular-nums">{round(result.currentA, 1)} A</dd>
        </div>
        <div>
          <dt className="text-xs uppercase tracking-wider text-ink-soft">Recommended fuse</dt>
          <dd className="font-mono text-lg tabular-nums">
            {result.recommendedFuseA ? `${result.recommendedFuseA} A` : "none fits"}
          </dd>
        </div>
        <div>
          <dt className="text-xs uppercase tracking-wider text-ink-soft">Minimum wire</dt>
          <dd className="font-mono text-lg tabular-nums">
            {result.minWire.awg ? `${result.minWire.awg} AWG` : "—"}
            {result.minWire.mm2 ? <span className="text-sm text-ink-soft"> / {result.minWire.mm2} mm²</span> : null}
          </dd>
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
          Chosen: <strong>{chosen.label}</strong>
          {inputs.fuseA !== undefined ? (
            <> with {inputs.fuseA === null ? <strong>no fuse</strong> : <strong>{inputs.fuseA} A fuse</strong>}</>
          ) : null}{" "}
          · ampacity {chosen.ampacityA === null ? "not rated" : `${round(chosen.ampacityA, 1)} A`} · drop {round(chosen.dropV, 3)}{" "}
          V ({round(chosen.dropPct, 2)} %)
        </p>
      ) : null}
      {result.findings.length ? (
        <ul className="mt-3 space-y-2">
          {result.findings.map((f) => (
            <li key={f.rule} className={`rounded-md border-l-4 px-3 py-2 ${SEVERITY_STYLE[f.severity]}`}>
              <strong className="mr-1">{SEVERITY_LABEL[f.severity]}:</strong>
              {f.message}{" "}
              <span className="text-xs text-ink-soft">
                ({f.rule}; source: {sourceRef(f.source).title})
              </span>
            </li>
          ))}
        </ul>
      ) : (
        <p className="mt-3 rounded-md border-l-4 border-spruce-500 bg-spruce-50 px-3 py-2">
          The chosen fuse and wire pass every check.
        </p>
      )}
      <details className="mt-3">
        <summary className="cursor-pointer text-spruce-700">How these numbers were worked out</summary>
        <ul className="mt-2 list-disc space-y-1 pl-5 text-ink-soft">
          {result.notes.map((note) => (
            <li key={note}>{note}</li>
          ))}
        </ul>
        <p className="mt-2 text-xs font-semibold uppercase tracking-wider text-ink-soft">Sources</p>
        <ul className="mt-1 list-disc space-y-1 pl-5 text-ink-soft">
          {result.sources.map((s) => (
            <li key={s.id}>
              {s.title}: {s.detail}
            </li>
          ))}
        </ul>
        {result.candidates.length ? (
          <table className="mt-3 w-full text-left text-xs tabular-nums">
            <thead>
              <tr className="border-b border-rule text-ink-soft">
                <th className="py-1">Wire</th>
                <th>Ampacity</th>
                <th>Drop</th>
                <th>Carries fuse</th>
                <th>Within drop</th>
              </tr>
            </thead>
            <tbody>
              {result.candidates.map((c) => (
                <tr key={wireLabel(c.wire)} className="border-b border-rule/60">
                  <td className="py-1">{c.label}</td>
                  <td>{c.ampacityA === null ? "—" : `${round(c.ampacityA, 1)} A`}</td>
                  <td>
                    {round(c.dropV, 3)} V ({round(c.dropPct, 2)} %)
                  </td>
                  <td>{c.carriesFuse ? "yes" : "no"}</td>
                  <td>{c.withinDrop ? "yes" : "no"}</td>
                </tr>
              ))}
            </tbody>
          </table>
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

/** The wiring diagram drawn by the engine (escaped SVG markup). */
export function CircuitFigure({ input, result, id }: { input: DiagramInput; result: CircuitResult; id: string }) {
  return (
    <figure className="tl-figure mt-4 rounded-md border border-rule bg-paper p-3">
      <EngineSvg svg={wiringDiagramSvg(input, result, { idPrefix: id })} />
      <figcaption className="mt-2 text-xs text-ink-soft">
        Wiring diagram. Relay terminals numbered per DIN 72552: 30 supply, 87 load, 85 and 86 coil.
      </figcaption>
    </figure>
  );
}
