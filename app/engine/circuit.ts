import type { CircuitInput } from "./circuit-input";
import { circuitFindings, type SwitchFeedCheck } from "./circuit-findings";
import type { CircuitFinding, WireCheck } from "./circuit-types";
import { sourceRefs, type SourceId, type SourceRef } from "./sources";
import {
  AWG_SIZES,
  MM2_SIZES,
  ampacityA,
  ampacityGauge,
  bundleFactor,
  locationFactor,
  nextStandardFuseA,
  resistanceOhmPerM,
  wireLabel,
  type AwgSize,
  type Mm2Size,
  type WireSize,
} from "./wire";
import { num } from "./format";

export * from "./circuit-input";
export * from "./wire";
export type { CircuitFinding, CircuitRule, Severity, WireCheck } from "./circuit-types";
export { CIRCUIT_RULES } from "./circuit-types";
export type { SwitchFeedCheck } from "./circuit-findings";

/** NEC 210.20(A): a continuous load may use only 80 % of the device's rating. */
export const CONTINUOUS_FUSE_FACTOR = 1.25;

export type CircuitResult = {
  inputs: CircuitInput;
  currentA: number;
  fuseFactor: number;
  recommendedFuseA: number | null;
  /** Conductor length the current flows through: both ways, or one way with a chassis return. */
  circuitLengthM: number;
  dropLimitV: number;
  ampacityFactors: { location: number; bundle: number };
  minWire: { awg: AwgSize | null; mm2: Mm2Size | null };
  /** Why a `minWire` entry is null, in plain words. */
  noneFits: { awg: string | null; mm2: string | null };
  chosen: WireCheck | null;
  /** Every size the engine tried, thinnest first, so a page can show the comparison. */
  candidates: WireCheck[];
  relayNeeded: boolean;
  /** Whether the circuit is drawn and checked with a relay: the author's word, else a switch feed of its own or the need. */
  relayUsed: boolean;
  /** The switch (coil) feed branch, when the callout gives one and a relay is used. */
  switchFeed: SwitchFeedCheck | null;
  findings: CircuitFinding[];
  notes: string[];
  sources: SourceRef[];
};

export function loadCurrentA(input: Pick<CircuitInput, "loadWatts" | "loadAmps" | "systemVoltage">): number {
  // Nominal voltage rather than a charging voltage: the lower voltage gives the larger current.
  if (input.loadAmps !== undefined) return input.loadAmps;
  return (input.loadWatts ?? 0) / input.systemVoltage;
}

export function circuitLengthM(input: Pick<CircuitInput, "oneWayLengthM" | "returnPath">): number {
  return input.returnPath === "wire" ? 2 * input.oneWayLengthM : input.oneWayLengthM;
}

export function dropV(currentA: number, ohmPerM: number, lengthM: number): number {
  return currentA * ohmPerM * lengthM;
}

export function checkWire(input: CircuitInput, wire: WireSize, currentA: number, fuseA: number | null): WireCheck {
  const ampacity = ampacityA(wire, input.insulationC, input.location, input.bundled);
  const r = resistanceOhmPerM(wire, input.conductorTempC);
  const v = dropV(currentA, r, circuitLengthM(input));
  const pct = (100 * v) / input.systemVoltage;
  return {
    wire,
    label: wireLabel(wire),
    ampacityA: ampacity,
    ampacityGauge: ampacityGauge(wire),
    resistanceOhmPerM: r,
    dropV: v,
    dropPct: pct,
    carriesFuse: ampacity !== null && fuseA !== null && ampacity >= fuseA,
    withinDrop: pct <= input.dropLimitPct,
  };
}

function explainNoneFits(family: WireCheck[], recommendedFuseA: number | null, input: CircuitInput): string {
  const heaviest = family[family.length - 1];
  if (recommendedFuseA === null) {
    return "The load needs a fuse above 100 A, the largest standard rating here: split the load over several circuits.";
  }
  if (!heaviest.carriesFuse) {
    return `Even ${heaviest.label} carries only ${num(heaviest.ampacityA ?? 0)} A here, below the ${recommendedFuseA} A fuse: split the load or use heavier cable.`;
  }
  const fitting = family.filter((c) => c.carriesFuse);
  const best = fitting[fitting.length - 1];
  return `Even ${best.label} drops ${num(best.dropV)} V (${num(best.dropPct)} %) over ${num(circuitLengthM(input))} m of wire, above the ${input.dropLimitPct} % limit: shorten the run, split the load or use heavier cable.`;
}

/** The switch feed branch: same insulation, place and bundle as the main run (common practice: they share the loom). */
export function checkSwitchFeed(input: CircuitInput, recommendedFuseA: number | null): SwitchFeedCheck | null {
  const feed = input.switchFeed;
  if (feed === undefined) return null;
  const wire = feed.wire ?? input.wire ?? null;
  if (wire === null) return null;
  const ampacity = ampacityA(wire, input.insulationC, input.location, input.bundled);
  if (feed.from === "tap") {
    return { from: "tap", wire, label: wireLabel(wire), ampacityA: ampacity, fuseA: feed.fuseA, fuseIs: "tap" };
  }
  const main =
    typeof input.fuseA === "number"
      ? { fuseA: input.fuseA, fuseIs: "chosen" as const }
      : input.fuseA === null
        ? { fuseA: null, fuseIs: "none" as const }
        : { fuseA: recommendedFuseA, fuseIs: recommendedFuseA === null ? ("none" as const) : ("recommended" as const) };
  return { from: "main", wire, label: wireLabel(wire), ampacityA: ampacity, ...main };
}

export function checkCircuit(input: CircuitInput): CircuitResult {
  const used: SourceId[] = ["iacs", "astm-b258", "iec-60228", "cfr-183-425", "iso-8820-3"];
  const notes: string[] = [];

  const currentA = loadCurrentA(input);
  if (input.loadAmps === undefined) {
    notes.push(
      `Current = ${num(input.loadWatts ?? 0)} W ÷ ${input.systemVoltage} V nominal; the nominal voltage gives the larger current (common practice).`,
    );
  }

  const fuseFactor = input.continuous ? CONTINUOUS_FUSE_FACTOR : 1;
  if (input.continuous) used.push("nec-210-20a");
  const recommendedFuseA = nextStandardFuseA(fuseFactor * currentA);
  notes.push(
    input.continuous
      ? `Recommended fuse: the smallest standard rating at or above 125 % of ${num(currentA)} A, because the load runs 3 h or more (NEC 210.20(A)).`
      : `Recommended fuse: the smallest standard rating at or above ${num(currentA)} A, because the load is not continuous.`,
  );

  const length = circuitLengthM(input);
  if (input.returnPath === "chassis") {
    used.push("common-practice");
    notes.push("Chassis return: only the feed wire is counted; the chassis path's resistance is neglected (common practice).");
  }

  const location = locationFactor(input.location, input.insulationC);
  const bundle = bundleFactor(input.bundled);
  used.push(location.source, bundle.source);
  if (location.source === "from-memory") {
    notes.push(`Engine-bay factor ${location.factor} for ${input.insulationC} °C insulation is from memory.`);
  }
  if (bundle.source === "from-memory") {
    notes.push(`Bundle factor ${bundle.factor} for more than 24 conductors is from memory.`);
  }
  const where = input.location === "engine-bay" ? "engine bay" : "cabin";
  notes.push(
    `Ampacity: 33 CFR 183.425 Table 5 at ${input.insulationC} °C insulation × ${location.factor} (${where}) × ${bundle.factor} (${input.bundled} in the bundle).`,
    `Drop = current × resistance × ${num(length)} m of wire at ${num(input.conductorTempC)} °C; AWG resistance from ASTM B258 diameters and IACS copper (1/58 Ω·mm²/m), metric from the IEC 60228 class 5 maximum.`,
  );
  used.push("common-practice");
  notes.push(
    "Metric sizes take the ampacity of the largest AWG size not larger than them (common practice); 0.5 and 0.75 mm² are below the table and never recommended.",
  );

  const check = (wire: WireSize) => checkWire(input, wire, currentA, recommendedFuseA);
  const awgChecks = AWG_SIZES.map((awg) => check({ awg }));
  const mm2Checks = MM2_SIZES.map((mm2) => check({ mm2 }));
  const fits = (c: WireCheck) => c.carriesFuse && c.withinDrop;
  const awgFit = awgChecks.find(fits);
  const mm2Fit = mm2Checks.find(fits);
  const minWire = {
    awg: awgFit && "awg" in awgFit.wire ? awgFit.wire.awg : null,
    mm2: mm2Fit && "mm2" in mm2Fit.wire ? mm2Fit.wire.mm2 : null,
  };
  const noneFits = {
    awg: minWire.awg === null ? explainNoneFits(awgChecks, recommendedFuseA, input) : null,
    mm2: minWire.mm2 === null ? explainNoneFits(mm2Checks, recommendedFuseA, input) : null,
  };

  const chosenFuse = typeof input.fuseA === "number" ? input.fuseA : null;
  const chosen = input.wire ? checkWire(input, input.wire, currentA, chosenFuse) : null;

  const relayNeeded = currentA > input.switchRatingA;
  if (relayNeeded) {
    used.push("din-72552", "common-practice");
    notes.push(
      `A relay is needed: ${num(currentA)} A is more than the ${num(input.switchRatingA)} A switch rating (common practice).`,
    );
  }

  const relayUsed = input.relay ?? (relayNeeded || input.switchFeed !== undefined);
  const switchFeed = relayUsed ? checkSwitchFeed(input, recommendedFuseA) : null;
  if (switchFeed) {
    notes.push(
      switchFeed.from === "tap"
        ? `The switch and relay coil are fed from a separate tap: ${switchFeed.label} wire behind its own ${num(switchFeed.fuseA ?? 0)} A fuse, checked like the main line.`
        : `The switch and relay coil are fed from the main fused line on ${switchFeed.label} wire, so the main fuse must protect that wire too.`,
    );
  }

  const findings = circuitFindings({
    input,
    currentA,
    fuseFactor,
    recommendedFuseA,
    minWire,
    noneFits,
    chosen,
    relayNeeded,
    switchFeed,
    length,
  });
  for (const finding of findings) used.push(finding.source);

  return {
    inputs: input,
    currentA,
    fuseFactor,
    recommendedFuseA,
    circuitLengthM: length,
    dropLimitV: (input.dropLimitPct / 100) * input.systemVoltage,
    ampacityFactors: { location: location.factor, bundle: bundle.factor },
    minWire,
    noneFits,
    chosen,
    candidates: [...awgChecks, ...mm2Checks],
    relayNeeded,
    relayUsed,
    switchFeed,
    findings,
    notes,
    sources: sourceRefs(used),
  };
}

export type SummaryStatus = "blocked" | "check" | "nothing-chosen" | "partly-chosen" | "pass";

/**
 * One sentence over the whole check that speaks only of what was checked: a pass needs both a fuse
 * and a wire chosen and no blocking or warning finding (info notes do not stop it).
 */
export function circuitSummary(result: Pick<CircuitResult, "inputs" | "findings">): { status: SummaryStatus; text: string } {
  const blocking = result.findings.filter((f) => f.severity === "blocking").length;
  const warnings = result.findings.filter((f) => f.severity === "warning").length;
  if (blocking > 0) {
    const more = warnings > 0 ? ` and ${warnings} more to check` : "";
    return {
      status: "blocked",
      text: `${blocking === 1 ? "1 problem" : `${blocking} problems`} must be fixed before this circuit is built${more}: see below.`,
    };
  }
  if (warnings > 0) {
    return {
      status: "check",
      text: `${warnings === 1 ? "1 point" : `${warnings} points`} to check before this circuit is built: see below.`,
    };
  }
  const wireChosen = result.inputs.wire !== undefined;
  const fuseChosen = typeof result.inputs.fuseA === "number";
  if (!wireChosen && !fuseChosen) return { status: "nothing-chosen", text: "Nothing chosen yet: these are the sizes to buy." };
  if (!fuseChosen) {
    return { status: "partly-chosen", text: "The chosen wire passes its checks; choose a fuse to check it against the wire." };
  }
  if (!wireChosen) {
    return {
      status: "partly-chosen",
      text: "The chosen fuse passes its checks; choose a wire size to check the fuse against it.",
    };
  }
  return { status: "pass", text: "The chosen fuse and wire pass every check." };
}
