import { evaluate, unit, type Unit } from "mathjs";
import { describe, expect, it } from "vitest";
import { checkCircuit, circuitInputSchema } from "./circuit";
import {
  AWG_SIZES,
  ampacityA,
  ampacityGauge,
  awgAreaMm2,
  awgDiameterMm,
  bundleFactor,
  engineBayFactor,
  nextStandardFuseA,
  resistanceOhmPerM,
} from "./wire";

const mOhmPerM = (awg: (typeof AWG_SIZES)[number], tempC = 20) => resistanceOhmPerM({ awg }, tempC) * 1000;

describe("AWG conductor model", () => {
  it("matches published 20 °C resistances", () => {
    // ASTM B258 diameters with IACS ρ = 1/58 Ω·mm²/m; engine.md §4 check values.
    expect(mOhmPerM(12)).toBeCloseTo(5.211, 3);
    expect(mOhmPerM(16)).toBeCloseTo(13.17, 2);
    expect(mOhmPerM(10)).toBeCloseTo(3.277, 3);
  });

  it("gives 12 AWG a diameter of 80.8 mil", () => {
    // ASTM B258 table value, from memory: 12 AWG nominal diameter 0.0808 in.
    expect(awgDiameterMm(12) / 25.4).toBeCloseTo(0.0808, 4);
  });

  it("lands within 3 % of NEC Chapter 9 Table 8 at 75 °C", () => {
    // NEC Chapter 9 Table 8: 16 AWG stranded uncoated copper, 4.99 Ω/kft at 75 °C;
    // 100 ft one way (200 ft of wire) at 4 A. mathjs does the unit arithmetic independently.
    const published: Unit = evaluate("(4.99 ohm / (1000 ft)) * (200 ft) * (4 A)");
    expect(published.toNumber("V")).toBeCloseTo(3.992, 6);
    const wireM = unit(200, "ft").toNumber("m");
    const ours = 4 * resistanceOhmPerM({ awg: 16 }, 75) * wireM;
    expect(Math.abs(ours - published.toNumber("V")) / published.toNumber("V")).toBeLessThan(0.03);
  });

  it("agrees with the ABYC circular-mil formula example", () => {
    // ABYC formula CM = K·I·L/E, K = 10.75: 10 A, 21 ft round trip, 3 % of 12 V → CM ≥ 6271.
    const cm = (10.75 * 10 * 21) / (0.03 * 12);
    expect(Math.ceil(cm)).toBe(6271);
    const cmil = (awg: number) => (awgDiameterMm(awg) / 0.0254) ** 2;
    // ASTM B258: 12 AWG is 6530 cmil.
    expect(cmil(12)).toBeCloseTo(6530, -1);
    const smallest = AWG_SIZES.find((awg) => cmil(awg) >= cm);
    expect(smallest).toBe(12);
    // The engine reaches the same size for the same run.
    const input = circuitInputSchema.parse({
      loadAmps: 10,
      continuous: false,
      oneWayLengthM: unit(10.5, "ft").toNumber("m"),
      location: "cabin",
    });
    expect(checkCircuit(input).minWire.awg).toBe(12);
  });

  it("keeps the area consistent with the diameter", () => {
    // ASTM B258 table value, from memory: 10 AWG is 0.1019 in, 5.261 mm².
    expect(awgAreaMm2(10)).toBeCloseTo(5.261, 2);
  });
});

describe("metric conductor model", () => {
  const run = { oneWayLengthM: 18, currentA: 2.1, limitV: 0.6 };

  it("finds that IEC 60228 class 5 2.5 mm² just misses 0.6 V", () => {
    // IEC 60228 class 5: 2.5 mm² at most 7.98 mΩ/m at 20 °C — the engine's metric model.
    const dropV = run.currentA * resistanceOhmPerM({ mm2: 2.5 }) * 2 * run.oneWayLengthM;
    expect(dropV).toBeCloseTo(0.6033, 4);
    expect(dropV).toBeGreaterThan(run.limitV);
    // 0.6 V is 5 % of 12 V; the class 5 model therefore asks for the next size up.
    const input = circuitInputSchema.parse({ loadAmps: 2.1, oneWayLengthM: 18, dropLimitPct: 5, wire: { mm2: 2.5 } });
    const result = checkCircuit(input);
    expect(result.minWire.mm2).toBe(4);
    expect(result.findings.map((f) => f.rule)).toContain("drop-over-limit");
  });

  it("corrects metric resistance for temperature like copper", () => {
    // IACS temperature coefficient 0.00393/°C applied to IEC 60228 class 5, 4 mm² = 4.95 mΩ/m.
    expect(resistanceOhmPerM({ mm2: 4 }, 70) * 1000).toBeCloseTo(4.95 * (1 + 0.00393 * 50), 9);
  });
});

describe("ampacity", () => {
  it("reads 33 CFR 183.425 Table 5 and its engine-room factor", () => {
    // 33 CFR 183.425 Table 5: 12 AWG, 105 °C insulation, 45 A; × 0.85 in an engine space.
    expect(ampacityA({ awg: 12 }, 105, "cabin", 1)).toBe(45);
    expect(ampacityA({ awg: 12 }, 105, "engine-bay", 1)).toBeCloseTo(38.25, 9);
    // 33 CFR 183.425 Table 5: 4 AWG at 60 °C, 105 A.
    expect(ampacityA({ awg: 4 }, 60, "cabin", 1)).toBe(105);
  });

  it("labels the recalled engine-bay factors as such", () => {
    // from memory: 0.58 / 0.82 / 0.89 for 60 / 90 / 125 °C insulation.
    expect(engineBayFactor(90)).toEqual({ factor: 0.82, source: "from-memory" });
    expect(engineBayFactor(105).source).toBe("cfr-183-425");
  });

  it("derates bundles", () => {
    // 33 CFR 183.425 bundle factors per engine.md: 3 → 0.70, 4–6 → 0.60, 7–24 → 0.50.
    expect(bundleFactor(2).factor).toBe(1);
    expect(bundleFactor(3).factor).toBe(0.7);
    expect(bundleFactor(6).factor).toBe(0.6);
    expect(bundleFactor(24).factor).toBe(0.5);
    // from memory: more than 24 conductors → 0.40.
    expect(bundleFactor(25)).toEqual({ factor: 0.4, source: "from-memory" });
    // 33 CFR 183.425 Table 5, 10 AWG 105 °C = 60 A, × 0.6 for five conductors, cabin.
    expect(ampacityA({ awg: 10 }, 105, "cabin", 5)).toBeCloseTo(36, 9);
  });

  it("gives metric sizes the row of the largest gauge not larger than them", () => {
    // common practice: 2.5 mm² borrows 14 AWG (2.08 mm²); 4 mm² borrows 12 AWG (3.31 mm²).
    expect(ampacityGauge({ mm2: 2.5 })).toBe(14);
    expect(ampacityGauge({ mm2: 4 })).toBe(12);
    expect(ampacityGauge({ mm2: 1 })).toBe(18);
    // common practice: below 18 AWG (0.82 mm²) the table has no row.
    expect(ampacityA({ mm2: 0.75 }, 105, "cabin", 1)).toBeNull();
  });
});

describe("standard fuses", () => {
  it("rounds up to the next ISO 8820-3 rating", () => {
    // ISO 8820-3 blade ratings include 7.5, 10, 15 A; larger cartridge types up to 100 A.
    expect(nextStandardFuseA(11.46)).toBe(15);
    expect(nextStandardFuseA(7.5)).toBe(7.5);
    expect(nextStandardFuseA(100)).toBe(100);
    expect(nextStandardFuseA(100.1)).toBeNull();
  });
});
