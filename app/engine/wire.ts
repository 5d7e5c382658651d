import type { SourceId } from "./sources";

/** The gauges of the ampacity table, thinnest first. */
export const AWG_SIZES = [18, 16, 14, 12, 10, 8, 6, 4] as const;
export type AwgSize = (typeof AWG_SIZES)[number];

/** IEC 60228 class 5 nominal sections this engine knows, smallest first. */
export const MM2_SIZES = [0.5, 0.75, 1, 1.5, 2.5, 4, 6, 10] as const;
export type Mm2Size = (typeof MM2_SIZES)[number];

export type WireSize = { awg: AwgSize } | { mm2: Mm2Size };

export const INSULATION_RATINGS_C = [60, 90, 105, 125] as const;
export type InsulationC = (typeof INSULATION_RATINGS_C)[number];

export type WireLocation = "engine-bay" | "cabin";

/** IACS annealed copper, Ω·mm²/m at 20 °C. */
export const COPPER_RESISTIVITY_20C = 1 / 58;
/** IACS temperature coefficient of resistance, per °C, referred to 20 °C. */
export const COPPER_ALPHA_20C = 0.00393;

/** ASTM B258 defines gauges by a geometric series between 0000 and 36. */
export function awgDiameterMm(awg: number): number {
  return 0.127 * 92 ** ((36 - awg) / 39);
}

export function awgAreaMm2(awg: number): number {
  const d = awgDiameterMm(awg);
  return (Math.PI * d * d) / 4;
}

/** IEC 60228 class 5 maximum resistance at 20 °C, mΩ/m. */
export const IEC_60228_CLASS5_MOHM_PER_M: Record<Mm2Size, number> = {
  0.5: 39.0,
  0.75: 26.0,
  1: 19.5,
  1.5: 13.3,
  2.5: 7.98,
  4: 4.95,
  6: 3.3,
  10: 1.91,
};

export function temperatureFactor(tempC: number): number {
  return 1 + COPPER_ALPHA_20C * (tempC - 20);
}

/**
 * AWG sizes are modelled as solid copper at full IACS conductivity; metric
 * sizes use the class 5 maximum, which is what a buyer of flexible cable can
 * rely on.
 */
export function resistanceOhmPerM(wire: WireSize, tempC = 20): number {
  const r20 = "awg" in wire ? COPPER_RESISTIVITY_20C / awgAreaMm2(wire.awg) : IEC_60228_CLASS5_MOHM_PER_M[wire.mm2] / 1000;
  return r20 * temperatureFactor(tempC);
}

/** 33 CFR 183.425 Table 5, single conductor, 30 °C ambient, amps. */
export const AMPACITY_TABLE_A: Record<AwgSize, Record<InsulationC, number>> = {
  18: { 60: 10, 90: 20, 105: 20, 125: 25 },
  16: { 60: 15, 90: 25, 105: 25, 125: 30 },
  14: { 60: 20, 90: 30, 105: 35, 125: 40 },
  12: { 60: 25, 90: 40, 105: 45, 125: 50 },
  10: { 60: 40, 90: 55, 105: 60, 125: 70 },
  8: { 60: 55, 90: 70, 105: 80, 125: 90 },
  6: { 60: 80, 90: 100, 105: 120, 125: 125 },
  4: { 60: 105, 90: 135, 105: 160, 125: 170 },
};

type Factor = { factor: number; source: SourceId };

/** Only the 105 °C factor is taken from the regulation here; the others are recalled. */
export function engineBayFactor(insulationC: InsulationC): Factor {
  const recalled: Record<InsulationC, number> = { 60: 0.58, 90: 0.82, 105: 0.85, 125: 0.89 };
  return { factor: recalled[insulationC], source: insulationC === 105 ? "cfr-183-425" : "from-memory" };
}

export function locationFactor(location: WireLocation, insulationC: InsulationC): Factor {
  return location === "engine-bay" ? engineBayFactor(insulationC) : { factor: 1, source: "cfr-183-425" };
}

/** Conductors in a bundle warm each other, so each may carry less. */
export function bundleFactor(bundled: number): Factor {
  if (bundled <= 2) return { factor: 1, source: "cfr-183-425" };
  if (bundled === 3) return { factor: 0.7, source: "cfr-183-425" };
  if (bundled <= 6) return { factor: 0.6, source: "cfr-183-425" };
  if (bundled <= 24) return { factor: 0.5, source: "cfr-183-425" };
  return { factor: 0.4, source: "from-memory" };
}

/**
 * The gauge whose table row a wire uses. A metric size borrows the largest
 * gauge that is not larger than it (common practice), so it is never credited
 * with more copper than it has; below 18 AWG there is no row.
 */
export function ampacityGauge(wire: WireSize): AwgSize | null {
  if ("awg" in wire) return wire.awg;
  let found: AwgSize | null = null;
  for (const awg of AWG_SIZES) {
    if (awgAreaMm2(awg) <= wire.mm2) found = awg;
  }
  return found;
}

export function ampacityA(wire: WireSize, insulationC: InsulationC, location: WireLocation, bundled: number): number | null {
  const gauge = ampacityGauge(wire);
  if (gauge === null) return null;
  const base = AMPACITY_TABLE_A[gauge][insulationC];
  return base * locationFactor(location, insulationC).factor * bundleFactor(bundled).factor;
}

/** ISO 8820-3 blade ratings, continuing with the larger cartridge types. */
export const STANDARD_FUSES_A = [1, 2, 3, 4, 5, 7.5, 10, 15, 20, 25, 30, 35, 40, 50, 60, 70, 80, 100] as const;

export function nextStandardFuseA(minimumA: number): number | null {
  return STANDARD_FUSES_A.find((rating) => rating >= minimumA) ?? null;
}

export function wireLabel(wire: WireSize): string {
  return "awg" in wire ? `${wire.awg} AWG` : `${wire.mm2} mm²`;
}

export function sameWire(a: WireSize, b: WireSize): boolean {
  return "awg" in a ? "awg" in b && a.awg === b.awg : "mm2" in b && a.mm2 === b.mm2;
}
