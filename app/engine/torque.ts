import { sourceRefs, type SourceId, type SourceRef } from "./sources";

export const TORQUE_UNITS = ["N·m", "lbf·ft", "lbf·in"] as const;
export type TorqueUnit = (typeof TORQUE_UNITS)[number];

/**
 * NIST SP 811 lists 1.355818 N·m; the exact value follows from the defined
 * pound-force (4.4482216152605 N) and foot (0.3048 m), and keeping it exact
 * makes a round trip between units return the value the author typed.
 */
export const NM_PER_LBF_FT = 4.4482216152605 * 0.3048;
export const NM_PER_LBF_IN = 4.4482216152605 * 0.0254;
export const NM_PER_KGF_M = 9.80665;

const NM_PER_UNIT: Record<TorqueUnit, number> = {
  N·m: 1,
  lbf·ft: NM_PER_LBF_FT,
  lbf·in: NM_PER_LBF_IN,
};

export type TorqueValues = { nm: number; lbfFt: number; lbfIn: number; source: SourceRef };

export function convertTorque(value: number, unit: TorqueUnit): TorqueValues {
  const nm = value * NM_PER_UNIT[unit];
  return {
    nm,
    lbfFt: nm / NM_PER_LBF_FT,
    lbfIn: nm / NM_PER_LBF_IN,
    source: sourceRefs(["nist-sp-811"])[0],
  };
}

export const METRIC_SIZES = ["M6", "M8", "M10", "M12"] as const;
export type MetricSize = (typeof METRIC_SIZES)[number];
export const PROPERTY_CLASSES = ["8.8", "10.9"] as const;
export type PropertyClass = (typeof PROPERTY_CLASSES)[number];

/** ISO 898-1 proof loads, coarse thread, newtons. */
export const PROOF_LOAD_N: Record<MetricSize, Record<PropertyClass, number>> = {
  M6: { "8.8": 11_600, "10.9": 16_700 },
  M8: { "8.8": 21_200, "10.9": 30_400 },
  M10: { "8.8": 33_700, "10.9": 48_100 },
  M12: { "8.8": 48_900, "10.9": 70_000 },
};

export const NOMINAL_DIAMETER_MM: Record<MetricSize, number> = { M6: 6, M8: 8, M10: 10, M12: 12 };

/** Preload as a share of proof load, and the nut factor K: common practice for the short-form formula. */
export const PRELOAD_FRACTION = 0.75;
export const NUT_FACTOR = { dry: 0.2, lubricated: 0.15 } as const;

export const ESTIMATE_CAUTION =
  "Estimate from fastener size and property class only. The vehicle maker's value governs wherever one exists; use this only when the maker gives none.";

export type TorqueEstimateInput = { size: MetricSize; propertyClass: PropertyClass; lubricated: boolean };

export type TorqueEstimate = {
  inputs: TorqueEstimateInput;
  nm: number;
  lbfFt: number;
  lbfIn: number;
  preloadN: number;
  k: number;
  proofLoadN: number;
  diameterMm: number;
  estimate: true;
  caution: string;
  formula: string;
  sources: SourceRef[];
};

export function estimateTorque(input: TorqueEstimateInput): TorqueEstimate {
  const proofLoadN = PROOF_LOAD_N[input.size][input.propertyClass];
  const preloadN = PRELOAD_FRACTION * proofLoadN;
  const k = input.lubricated ? NUT_FACTOR.lubricated : NUT_FACTOR.dry;
  const diameterMm = NOMINAL_DIAMETER_MM[input.size];
  const nm = k * preloadN * (diameterMm / 1000);
  const converted = convertTorque(nm, "N·m");
  const used: SourceId[] = ["iso-898-1", "common-practice", "nist-sp-811"];
  return {
    inputs: input,
    nm,
    lbfFt: converted.lbfFt,
    lbfIn: converted.lbfIn,
    preloadN,
    k,
    proofLoadN,
    diameterMm,
    estimate: true,
    caution: ESTIMATE_CAUTION,
    formula: "T = K × F × d, F = 0.75 × proof load (common practice)",
    sources: sourceRefs(used),
  };
}
