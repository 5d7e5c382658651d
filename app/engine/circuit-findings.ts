import type { CircuitInput } from "./circuit-input";
import type { CircuitFinding, WireCheck } from "./circuit-types";
import { num } from "./format";
import type { AwgSize, Mm2Size, WireSize } from "./wire";

/** 33 CFR 183.455(b): 7 in from the source. */
export const MAX_FUSE_DISTANCE_MM = 178;
/** 33 CFR 183.455(c)(1): a fuse may be up to 150 % of the wire's ampacity. */
export const FUSE_TO_AMPACITY_LIMIT = 1.5;

/** The largest standard rating the engine knows (ISO 8820-3 and cartridge types). */
export const LARGEST_STANDARD_FUSE_A = 100;

/** The branch that feeds the switch (and the relay coil behind it), checked like the main line. */
export type SwitchFeedCheck = {
  from: "main" | "tap";
  wire: WireSize;
  label: string;
  ampacityA: number | null;
  /** The fuse that protects the branch: the tap's own, else the main fuse (chosen, or recommended when none is chosen). */
  fuseA: number | null;
  fuseIs: "tap" | "chosen" | "recommended" | "none";
};

type Context = {
  input: CircuitInput;
  currentA: number;
  fuseFactor: number;
  recommendedFuseA: number | null;
  minWire: { awg: AwgSize | null; mm2: Mm2Size | null };
  noneFits: { awg: string | null; mm2: string | null };
  chosen: WireCheck | null;
  relayNeeded: boolean;
  switchFeed: SwitchFeedCheck | null;
  length: number;
};

/** Always blocking: with nothing that fits there is nothing safe to buy. */
function noFuseFits({ currentA, fuseFactor, recommendedFuseA, input }: Context): CircuitFinding[] {
  if (recommendedFuseA !== null) return [];
  const neededA = fuseFactor * currentA;
  const why = input.continuous
    ? `125 % of the ${num(currentA)} A continuous load is ${num(neededA)} A`
    : `the load draws ${num(currentA)} A`;
  return [
    {
      rule: "no-fuse-fits",
      severity: "blocking",
      message: `No standard fuse fits: ${why}, above ${LARGEST_STANDARD_FUSE_A} A, the largest standard rating. Split the load over several circuits, each with its own fuse and wire.`,
      source: "iso-8820-3",
      numbers: { currentA, neededA, largestA: LARGEST_STANDARD_FUSE_A },
    },
  ];
}

function noWireFits({ minWire, noneFits, recommendedFuseA }: Context): CircuitFinding[] {
  if (minWire.awg !== null || minWire.mm2 !== null) return [];
  const reason =
    recommendedFuseA === null
      ? "with no standard fuse to size it against, no wire in the table can be chosen. Split the load over several circuits."
      : (noneFits.awg ?? noneFits.mm2 ?? "");
  return [
    {
      rule: "no-wire-fits",
      severity: "blocking",
      message: `No wire size in the table fits (18 to 4 AWG, 1 to 10 mm²): ${reason.charAt(0).toLowerCase()}${reason.slice(1)}`,
      source: "cfr-183-425",
      numbers: recommendedFuseA === null ? {} : { recommendedFuseA },
    },
  ];
}

function noFuse({ input, recommendedFuseA }: Context): CircuitFinding[] {
  if (input.fuseA !== null) return [];
  const fit = recommendedFuseA === null ? "split the load and fuse each part" : `fit a ${recommendedFuseA} A fuse`;
  return [
    {
      rule: "no-fuse",
      severity: "blocking",
      message: `No fuse: a short anywhere along the ${num(input.oneWayLengthM)} m run would draw all the battery can give and could set the wire alight. Close to the battery, ${fit}.`,
      source: "common-practice",
      numbers: recommendedFuseA === null ? {} : { recommendedFuseA },
    },
  ];
}

type WireWords = {
  /** The wire is thinner than the ampacity table: nothing shows the fuse protects it. */
  unrated: string;
  /** The fuse is above 150 % of the wire's ampacity (blocking, under `exceedsRule`). */
  exceeds: (ampacity: number, limitA: number) => string;
  /** The fuse is above the wire's ampacity but within 150 % (warning). */
  above: (ampacity: number) => string;
  exceedsRule: "fuse-exceeds-wire" | "switch-feed-exceeds-wire";
};

/**
 * Whether a fuse protects a wire (33 CFR 183.455: at most 150 % of the wire's ampacity), the same
 * check for the main run and the switch feed; only the wording and the blocking rule's id differ.
 */
function fuseProtectsWire(fuseA: number, ampacityA: number | null, words: WireWords): CircuitFinding[] {
  if (ampacityA === null) {
    return [{ rule: "wire-unrated", severity: "warning", message: words.unrated, source: "cfr-183-425", numbers: { fuseA } }];
  }
  const limitA = FUSE_TO_AMPACITY_LIMIT * ampacityA;
  const numbers = { fuseA, ampacityA, limitA };
  if (fuseA > limitA) {
    return [
      {
        rule: words.exceedsRule,
        severity: "blocking",
        message: words.exceeds(ampacityA, limitA),
        source: "cfr-183-455",
        numbers,
      },
    ];
  }
  if (fuseA > ampacityA) {
    return [
      { rule: "fuse-above-ampacity", severity: "warning", message: words.above(ampacityA), source: "common-practice", numbers },
    ];
  }
  return [];
}

function fuseAgainstWire({ input, chosen }: Context): CircuitFinding[] {
  const fuseA = input.fuseA;
  if (typeof fuseA !== "number" || chosen === null) return [];
  return fuseProtectsWire(fuseA, chosen.ampacityA, {
    unrated: `${chosen.label} is thinner than 18 AWG, the smallest size in the ampacity table, so nothing here shows that the ${num(fuseA)} A fuse protects it. Use 1 mm² or heavier.`,
    exceeds: (ampacity, limitA) =>
      `The ${num(fuseA)} A fuse is more than 150 % of what ${chosen.label} may carry here (${num(ampacity)} A, so at most ${num(limitA)} A): the wire could overheat before the fuse opens.`,
    above: (ampacity) =>
      `The ${num(fuseA)} A fuse is above the ${num(ampacity)} A that ${chosen.label} may carry here; the fuse is there to protect the wire, so choose one no larger than the wire's ampacity or a heavier wire.`,
    exceedsRule: "fuse-exceeds-wire",
  });
}

/**
 * The spec asks for the 125 % margin on continuous loads; a fuse below the
 * current itself would blow on a short-time load too, so that is flagged as well.
 */
function fuseUndersized({ input, currentA }: Context): CircuitFinding[] {
  const fuseA = input.fuseA;
  if (typeof fuseA !== "number") return [];
  const neededA = input.continuous ? 1.25 * currentA : currentA;
  if (fuseA >= neededA) return [];
  const why = input.continuous
    ? `125 % of the ${num(currentA)} A continuous load is ${num(neededA)} A`
    : `the load draws ${num(currentA)} A`;
  return [
    {
      rule: "fuse-undersized",
      severity: "warning",
      message: `The ${num(fuseA)} A fuse is too small: ${why}, so it will blow in normal use.`,
      source: input.continuous ? "nec-210-20a" : "common-practice",
      numbers: { fuseA, currentA, neededA },
    },
  ];
}

function dropOverLimit({ input, chosen, currentA, length }: Context): CircuitFinding[] {
  if (chosen === null || chosen.withinDrop) return [];
  return [
    {
      rule: "drop-over-limit",
      severity: "warning",
      message: `${chosen.label} loses ${num(chosen.dropV)} V (${num(chosen.dropPct)} % of ${input.systemVoltage} V) carrying ${num(currentA)} A over ${num(length)} m of wire, above the ${num(input.dropLimitPct)} % limit.`,
      source: "awg" in chosen.wire ? "astm-b258" : "iec-60228",
      numbers: { dropV: chosen.dropV, dropPct: chosen.dropPct, dropLimitPct: input.dropLimitPct, currentA, lengthM: length },
    },
  ];
}

function fuseFarFromBattery({ input }: Context): CircuitFinding[] {
  const distance = input.fuseDistanceMm;
  if (input.fuseA === null || distance === undefined || distance <= MAX_FUSE_DISTANCE_MM) return [];
  return [
    {
      rule: "fuse-far-from-battery",
      severity: "warning",
      message: `The fuse sits ${num(distance, 0)} mm of wire from the battery terminal; more than ${MAX_FUSE_DISTANCE_MM} mm (7 in) of unprotected wire is left. Move it closer.`,
      source: "cfr-183-455",
      numbers: { fuseDistanceMm: distance, maxMm: MAX_FUSE_DISTANCE_MM },
    },
  ];
}

/** The author says there is no relay, so the switch carries the whole load (common practice: a switch is used within its rating). */
function switchOverloaded({ input, currentA }: Context): CircuitFinding[] {
  if (input.relay !== false || currentA <= input.switchRatingA) return [];
  return [
    {
      rule: "switch-overloaded",
      severity: "blocking",
      message: `With no relay the switch carries the whole ${num(currentA)} A load, more than its ${num(input.switchRatingA)} A rating: it will overheat. Fit a relay (the switch drives terminals 85/86, the relay carries the load 30 → 87) or a switch rated for the load.`,
      source: "common-practice",
      numbers: { currentA, switchRatingA: input.switchRatingA },
    },
  ];
}

function switchFeedAgainstWire({ switchFeed }: Context): CircuitFinding[] {
  if (switchFeed === null || switchFeed.fuseA === null) return [];
  const fuseA = switchFeed.fuseA;
  const which =
    switchFeed.fuseIs === "tap" ? `its own ${num(fuseA)} A fuse` : `the ${num(fuseA)} A ${switchFeed.fuseIs} main fuse`;
  const branch = switchFeed.from === "tap" ? "the separate switch feed" : "the switch feed taken from the main fused line";
  const Branch = `${branch.charAt(0).toUpperCase()}${branch.slice(1)}`;
  return fuseProtectsWire(fuseA, switchFeed.ampacityA, {
    unrated: `The ${switchFeed.label} wire of ${branch} is thinner than 18 AWG, the smallest size in the ampacity table, so nothing here shows that ${which} protects it. Use 1 mm² or heavier.`,
    exceeds: (ampacity, limitA) =>
      `${Branch} is ${switchFeed.label}, which may carry ${num(ampacity)} A here (so a fuse of at most ${num(limitA)} A), but it is protected only by ${which}: a short on that wire could burn it before the fuse opens. Give the switch feed its own small fuse or heavier wire.`,
    above: (ampacity) =>
      `${Branch} is ${switchFeed.label} (${num(ampacity)} A here), protected by ${which}; the fuse is there to protect the wire, so give the feed a fuse no larger than its wire's ampacity.`,
    exceedsRule: "switch-feed-exceeds-wire",
  });
}

/** Only for an undecided relay: a switch feed of its own already implies one. */
function relayRecommended({ input, currentA, relayNeeded }: Context): CircuitFinding[] {
  if (!relayNeeded || input.relay !== undefined || input.switchFeed !== undefined) return [];
  return [
    {
      rule: "relay-recommended",
      severity: "info",
      message: `The load draws ${num(currentA)} A, more than the ${num(input.switchRatingA)} A switch rating: let the switch drive a relay (terminals 85/86) and the relay carry the load (30 → 87).`,
      source: "common-practice",
      numbers: { currentA, switchRatingA: input.switchRatingA },
    },
  ];
}

export function circuitFindings(context: Context): CircuitFinding[] {
  return [
    ...noFuseFits(context),
    ...noWireFits(context),
    ...noFuse(context),
    ...fuseAgainstWire(context),
    ...fuseUndersized(context),
    ...dropOverLimit(context),
    ...fuseFarFromBattery(context),
    ...switchOverloaded(context),
    ...switchFeedAgainstWire(context),
    ...relayRecommended(context),
  ];
}
