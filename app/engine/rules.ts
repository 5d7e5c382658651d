import type { Callout, CircuitCallout, SignalWord } from "./callouts";
import { checkCircuit, type CircuitRule, type Severity } from "./circuit";
import type { Powertrain } from "../utils/vocab";
import type { SourceId } from "./sources";

export type { Powertrain };

/** Variants whose high-voltage system an electrical install can come near. */
export const HIGH_VOLTAGE_POWERTRAINS: readonly Powertrain[] = ["hybrid", "plug-in-hybrid", "electric"];

export type RevisionRule = "hv-caution-missing" | "battery-disconnect-missing" | "support-caution-missing" | "caution-unsigned";

export type Finding = {
  rule: CircuitRule | RevisionRule;
  severity: Severity;
  /** 0-based; messages count steps from 1 as readers do. */
  stepIndex: number;
  calloutIndex?: number;
  message: string;
  source: SourceId;
  numbers?: Record<string, number>;
};

export type RevisionStep = {
  title: string;
  liftsVehicle: boolean;
  disconnectsBattery: boolean;
  callouts: Callout[];
};

/**
 * `fitmentPowertrains` must hold only the powertrains of rows marked "fits"
 * or "fits with changes": a variant the guide does not fit needs no caution.
 */
export type RevisionForRules = { steps: RevisionStep[]; fitmentPowertrains: Powertrain[] };

/**
 * The powertrains a guide's fitment brings in, for the high-voltage rule: every variant marked as
 * fitting (with or without changes), each powertrain once. Rows whose powertrain is unknown are skipped.
 */
export function fittingPowertrains(rows: { status: string; powertrain: Powertrain | undefined }[]): Powertrain[] {
  return [...new Set(rows.filter((r) => r.status !== "does-not-fit").flatMap((r) => (r.powertrain ? [r.powertrain] : [])))];
}

/** Words an author uses for the traction system; the rule needs only one of them. */
export const HIGH_VOLTAGE_TEXT = /high[\s-]?voltage|\bHV\b|traction battery/i;
/** "stand(s)" as a word, so "understand" does not count, or any form of "support". */
export const SUPPORT_TEXT = /\bstands?\b|\bsupport/i;

type Located<T> = { stepIndex: number; calloutIndex: number; callout: T };

function circuitsOf(steps: RevisionStep[]): Located<CircuitCallout>[] {
  return steps.flatMap((step, stepIndex) =>
    step.callouts.flatMap((callout, calloutIndex) => (callout.kind === "circuit" ? [{ stepIndex, calloutIndex, callout }] : [])),
  );
}

function circuitName(callout: CircuitCallout): string {
  return callout.label ? `the circuit "${callout.label}"` : "a circuit";
}

function circuitRuleFindings(circuits: Located<CircuitCallout>[]): Finding[] {
  return circuits.flatMap(({ stepIndex, calloutIndex, callout }) =>
    checkCircuit(callout).findings.map((finding) => ({
      ...finding,
      stepIndex,
      calloutIndex,
      message: `Step ${stepIndex + 1}, ${circuitName(callout)}: ${finding.message}`,
    })),
  );
}

function hvCautionMissing(revision: RevisionForRules, circuits: Located<CircuitCallout>[]): Finding[] {
  const variants = revision.fitmentPowertrains.filter((p) => HIGH_VOLTAGE_POWERTRAINS.includes(p));
  if (variants.length === 0 || circuits.length === 0) return [];
  const strongWords: SignalWord[] = ["DANGER", "WARNING"];
  const hasCaution = revision.steps.some((step) =>
    step.callouts.some((c) => c.kind === "caution" && strongWords.includes(c.signalWord) && HIGH_VOLTAGE_TEXT.test(c.text)),
  );
  if (hasCaution) return [];
  const first = circuits[0];
  return [
    {
      rule: "hv-caution-missing",
      severity: "blocking",
      stepIndex: first.stepIndex,
      calloutIndex: first.calloutIndex,
      message: `The guide fits ${[...new Set(variants)].join(", ")} variants and step ${first.stepIndex + 1} has electrical work, but no DANGER or WARNING caution mentions the high-voltage system.`,
      source: "common-practice",
    },
  ];
}

/**
 * A disconnect in the same step counts: authors often write "disconnect the
 * battery, then run the feed" as one step. A disconnect in a later step does not.
 */
function batteryDisconnectMissing(steps: RevisionStep[], circuits: Located<CircuitCallout>[]): Finding[] {
  return circuits
    .filter(({ callout }) => callout.feed === "battery")
    .filter(({ stepIndex }) => !steps.slice(0, stepIndex + 1).some((s) => s.disconnectsBattery))
    .map(({ stepIndex, calloutIndex, callout }) => ({
      rule: "battery-disconnect-missing" as const,
      severity: "warning" as const,
      stepIndex,
      calloutIndex,
      message: `Step ${stepIndex + 1} feeds ${circuitName(callout)} from the battery, but no step up to it says to disconnect the battery first.`,
      source: "common-practice" as const,
    }));
}

function supportCautionMissing(steps: RevisionStep[]): Finding[] {
  return steps.flatMap((step, stepIndex) => {
    if (!step.liftsVehicle) return [];
    const hasCaution = step.callouts.some((c) => c.kind === "caution" && SUPPORT_TEXT.test(c.text));
    if (hasCaution) return [];
    return [
      {
        rule: "support-caution-missing" as const,
        severity: "blocking" as const,
        stepIndex,
        message: `Step ${stepIndex + 1} ("${step.title}") lifts the vehicle but carries no caution about supporting it on stands.`,
        source: "common-practice" as const,
      },
    ];
  });
}

/**
 * Everything except caution-unsigned, which depends on sign-offs stored
 * outside the revision: see `cautionUnsignedFindings`.
 */
export function runSafetyRules(revision: RevisionForRules): Finding[] {
  const circuits = circuitsOf(revision.steps);
  return [
    ...circuitRuleFindings(circuits),
    ...hvCautionMissing(revision, circuits),
    ...batteryDisconnectMissing(revision.steps, circuits),
    ...supportCautionMissing(revision.steps),
  ];
}

export type CautionSignOff = { signedOff: boolean; stepIndex: number; calloutIndex?: number; signalWord?: SignalWord };

/** Blocks approval, not saving: the review desk adds these to the revision's findings. */
export function cautionUnsignedFindings(cautions: CautionSignOff[]): Finding[] {
  return cautions
    .filter((c) => !c.signedOff)
    .map((c) => ({
      rule: "caution-unsigned" as const,
      severity: "blocking" as const,
      stepIndex: c.stepIndex,
      ...(c.calloutIndex === undefined ? {} : { calloutIndex: c.calloutIndex }),
      message: `Step ${c.stepIndex + 1}: a ${c.signalWord ?? "caution"} callout has no editor's sign-off yet.`,
      source: "review-policy" as const,
    }));
}
