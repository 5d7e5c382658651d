import type { CircuitResult } from "~/engine/circuit";
import type { TorqueEstimate, TorqueValues } from "~/engine/torque";
import { TORQUE_SOURCE_LABELS, type TorqueSource } from "~/engine/torque-sources";
import { keepUnitsTogether, round } from "~/utils/format";
import { CircuitFigure, CircuitResults, quantity } from "./circuit-results";

type AnyCallout = { kind: string; [key: string]: unknown };
type Evaluated = AnyCallout & { result: unknown };

/**
 * The signal words of ANSI Z535.6 in their Z535 colours: danger red, warning orange, caution yellow,
 * notice blue. On screen the word sits on its colour with the text colour that reaches WCAG 2.2's
 * 4.5:1 there (black on orange and yellow, white on red and blue; checked in callouts.test.ts).
 * Printed, where backgrounds are usually left off, the word is black on the paper, framed by a
 * rule in its colour, so no label turns white on white.
 */
export const SIGNAL_STYLE: Record<string, { bar: string; print: string; panel: string; icon: string }> = {
  DANGER: { bar: "bg-z-danger text-white", print: "print:border-z-danger", panel: "border-z-danger", icon: "▲" },
  WARNING: { bar: "bg-z-warning text-black", print: "print:border-z-warning", panel: "border-z-warning", icon: "▲" },
  CAUTION: { bar: "bg-z-caution text-black", print: "print:border-z-caution", panel: "border-z-caution", icon: "▲" },
  NOTICE: { bar: "bg-z-notice text-white", print: "print:border-z-notice", panel: "border-z-notice", icon: "■" },
};

/** What every label becomes on paper: black text on no background, over a rule in the signal colour. */
export const SIGNAL_PRINT = "print:bg-transparent print:text-black print:border-b-4";

/** A caution panel after ANSI Z535.6: the signal word in its colour band, then the message. */
export function CautionCallout({ signalWord, text }: { signalWord: string; text: string }) {
  const style = SIGNAL_STYLE[signalWord] ?? SIGNAL_STYLE.NOTICE;
  return (
    <div
      role="note"
      aria-label={signalWord}
      className={`tl-caution overflow-hidden rounded-lg border-2 bg-white break-inside-avoid ${style.panel}`}
    >
      <div
        data-signal-word={signalWord}
        className={`flex items-center gap-2 px-4 py-1.5 text-sm font-bold tracking-[0.2em] ${style.bar} ${SIGNAL_PRINT} ${style.print}`}
      >
        {signalWord !== "NOTICE" ? <span aria-hidden="true">{style.icon}</span> : null}
        {signalWord}
      </div>
      <p className="px-4 py-3 text-[0.95rem] leading-relaxed">{keepUnitsTogether(text)}</p>
    </div>
  );
}

function torqueSourceWords(callout: AnyCallout, result: { estimate: TorqueEstimate | null }): string {
  if (result.estimate) return TORQUE_SOURCE_LABELS.estimate;
  const source = callout.valueSource as TorqueSource | undefined;
  if (source && source in TORQUE_SOURCE_LABELS) return TORQUE_SOURCE_LABELS[source];
  return "not recorded by the author; check the vehicle maker's value before you tighten";
}

export function TorqueCallout({
  callout,
  result,
}: {
  callout: AnyCallout;
  result: { values: TorqueValues | null; estimate: TorqueEstimate | null };
}) {
  const values = result.values ?? result.estimate;
  const details = [callout.size, callout.propertyClass ? `class ${callout.propertyClass}` : null].filter(Boolean).join(" · ");
  return (
    <div className="rounded-lg border border-brass-100 bg-brass-50 px-4 py-3">
      <div className="flex flex-wrap items-baseline justify-between gap-2">
        <p className="font-medium">
          <span className="mr-2 text-xs font-bold uppercase tracking-widest text-brass-700">Torque</span>
          {String(callout.fastener)}
          {details ? <span className="ml-2 text-sm text-ink-soft">{details}</span> : null}
        </p>
        {result.estimate ? (
          <span className="rounded bg-white px-2 py-0.5 text-xs font-semibold uppercase tracking-wider text-z-warning">
            Estimate
          </span>
        ) : null}
      </div>
      {values ? (
        <p className="mt-1 font-mono text-lg tabular-nums text-ink" data-testid="torque-values">
          {/* Each value keeps its unit; the line may break only before an "=". */}
          <strong className="whitespace-nowrap text-2xl">{quantity(round(values.nm, 1), "N·m")}</strong>{" "}
          <span className="whitespace-nowrap">
            <span className="mr-2 text-ink-soft">=</span>
            {quantity(round(values.lbfFt, 1), "lbf·ft")}
          </span>{" "}
          <span className="whitespace-nowrap">
            <span className="mr-2 text-ink-soft">=</span>
            {quantity(round(values.lbfIn, 0), "lbf·in")}
          </span>
        </p>
      ) : null}
      <p className="mt-1 text-sm" data-testid="torque-source">
        <span className="font-medium">Value from: </span>
        {torqueSourceWords(callout, result)}
      </p>
      {callout.threadlocker ? <p className="mt-1 text-sm">Threadlocker: {String(callout.threadlocker)}</p> : null}
      {result.estimate ? (
        <p className="mt-1 text-sm text-ink-soft">
          {result.estimate.formula}. {result.estimate.caution}
        </p>
      ) : (
        <p className="mt-1 text-xs text-ink-soft">Unit conversions: {result.values?.source.title}.</p>
      )}
    </div>
  );
}

export function TipCallout({ text }: { text: string }) {
  return (
    <div className="rounded-lg border border-spruce-100 bg-spruce-50 px-4 py-3">
      <p>
        <span className="mr-2 text-xs font-bold uppercase tracking-widest text-spruce-700">Tip</span>
        {text}
      </p>
    </div>
  );
}

export function CalloutView({ callout, id }: { callout: Evaluated; id: string }) {
  switch (callout.kind) {
    case "caution":
      return <CautionCallout signalWord={String(callout.signalWord)} text={String(callout.text)} />;
    case "tip":
      return <TipCallout text={String(callout.text)} />;
    case "torque":
      return (
        <TorqueCallout
          callout={callout}
          result={callout.result as { values: TorqueValues | null; estimate: TorqueEstimate | null }}
        />
      );
    case "circuit": {
      const result = (callout.result as { result: CircuitResult }).result;
      return (
        <div className="rounded-lg border border-spruce-200 bg-white p-4">
          <p className="font-medium">
            <span className="mr-2 text-xs font-bold uppercase tracking-widest text-spruce-700">Circuit</span>
            {callout.label ? String(callout.label) : "Circuit check"}
          </p>
          <CircuitResults result={result} relay={callout.relay as boolean | undefined} />
          <CircuitFigure
            input={{ ...result.inputs, relay: callout.relay as boolean | undefined, label: callout.label as string | undefined }}
            result={result}
            id={id}
          />
        </div>
      );
    }
    default:
      return null;
  }
}
