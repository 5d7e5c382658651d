import type { CircuitInput } from "./circuit-input";
import type { CircuitFinding, WireCheck } from "./circuit-types";
import { num } from "./format";

/** 33 CFR 183.455(b): 7 in from the source. */
export const MAX_FUSE_DISTANCE_MM = 178;
/** 33 CFR 183.455(c)(1): a fuse may be up to 150 % of the wire's ampacity. */
export const FUSE_TO_AMPACITY_LIMIT = 1.5;

type Context = {
  input: CircuitInput;
  currentA: number;
  recommendedFuseA: number | null;
  chosen: WireCheck | null;
  relayNeeded: boolean;
  length: number;
};

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

function fuseAgainstWire({ input, chosen }: Context): CircuitFinding[] {
  const fuseA = input.fuseA;
  if (typeof fuseA !== "number" || chosen === null) return [];
  if (chosen.ampacityA === null) {
    return [
      {
        rule: "wire-unrated",
        severity: "warning",
        message: `${chosen.label} is thinner than 18 AWG, the smallest size in the ampacity table, so nothing here shows that the ${num(fuseA)} A fuse protects it. Use 1 mm² or heavier.`,
        source: "cfr-183-425",
        numbers: { fuseA },
      },
    ];
  }
  const ampacity = chosen.ampacityA;
  const limitA = FUSE_TO_AMPACITY_LIMIT * ampacity;
  const numbers = { fuseA, ampacityA: ampacity, limitA };
  if (fuseA > limitA) {
    return [
      {
        rule: "fuse-exceeds-wire",
        severity: "blocking",
        message: `The ${num(fuseA)} A fuse is more than 150 % of what ${chosen.label} may carry here (${num(ampacity)} A, so at most ${num(limitA)} A): the wire could overheat before the fuse opens.`,
        source: "cfr-183-455",
        numbers,
      },
    ];
  }
  if (fuseA > ampacity) {
    return [
      {
        rule: "fuse-above-ampacity",
        severity: "warning",
        message: `The ${num(fuseA)} A fuse is above the ${num(ampacity)} A that ${chosen.label} may carry here; the fuse is there to protect the wire, so choose one no larger than the wire's ampacity or a heavier wire.`,
        source: "common-practice",
        numbers,
      },
    ];
  }
  return [];
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

function relayRecommended({ input, currentA, relayNeeded }: Context): CircuitFinding[] {
  if (!relayNeeded || input.relay !== false) return [];
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
    ...noFuse(context),
    ...fuseAgainstWire(context),
    ...fuseUndersized(context),
    ...dropOverLimit(context),
    ...fuseFarFromBattery(context),
    ...relayRecommended(context),
  ];
}
