import fc from "fast-check";
import { unit } from "mathjs";
import { describe, expect, it } from "vitest";
import { TORQUE_UNITS, convertTorque, estimateTorque } from "./torque";

describe("torque conversion", () => {
  it("uses the NIST factors", () => {
    // NIST SP 811 (2008), Appendix B: 1 lbf·ft = 1.355818 N·m, 1 lbf·in = 0.1129848 N·m.
    expect(convertTorque(1, "lbf·ft").nm).toBeCloseTo(1.355818, 6);
    expect(convertTorque(1, "lbf·in").nm).toBeCloseTo(0.1129848, 7);
    expect(convertTorque(1, "N·m").source.id).toBe("nist-sp-811");
  });

  it("agrees with mathjs to twelve digits", () => {
    // mathjs unit definitions of lbf, ft and in are exact; an independent implementation.
    expect(convertTorque(1, "lbf·ft").nm).toBeCloseTo(unit(1, "lbf ft").toNumber("N m"), 12);
    expect(convertTorque(1, "lbf·in").nm).toBeCloseTo(unit(1, "lbf in").toNumber("N m"), 12);
    expect(convertTorque(25, "N·m").lbfFt).toBeCloseTo(unit(25, "N m").toNumber("lbf ft"), 12);
    expect(convertTorque(25, "N·m").lbfIn).toBeCloseTo(unit(25, "N m").toNumber("lbf in"), 12);
  });

  it("gives 12 lbf·in per lbf·ft and returns what was typed", () => {
    // NIST SP 811: 1 ft = 12 in exactly, so the two pound-force units differ by 12.
    fc.assert(
      fc.property(fc.double({ min: 0.01, max: 5000, noNaN: true }), fc.constantFrom(...TORQUE_UNITS), (value, u) => {
        const all = convertTorque(value, u);
        expect(all.lbfIn).toBeCloseTo(all.lbfFt * 12, 9);
        const back = { N·m: all.nm, lbf·ft: all.lbfFt, lbf·in: all.lbfIn }[u];
        expect(back).toBeCloseTo(value, 9);
      }),
    );
  });
});

describe("torque estimate", () => {
  it("gives about 25.4 N·m for M8 class 8.8 dry", () => {
    // ISO 898-1: M8 class 8.8 proof load 21 200 N; T = 0.20 × 0.75 × 21 200 N × 8 mm (common practice formula).
    const estimate = estimateTorque({ size: "M8", propertyClass: "8.8", lubricated: false });
    expect(estimate.proofLoadN).toBe(21_200);
    expect(estimate.preloadN).toBe(15_900);
    expect(estimate.k).toBe(0.2);
    expect(estimate.nm).toBeCloseTo(25.44, 9);
    // Published μ = 0.14 tightening tables give 25 N·m (engine.md §4; the table itself from memory).
    expect(Math.abs(estimate.nm - 25) / 25).toBeLessThan(0.05);
  });

  it("takes a lower nut factor when lubricated", () => {
    // ISO 898-1: M10 class 10.9 proof load 48 100 N; K = 0.15 lubricated (common practice).
    const estimate = estimateTorque({ size: "M10", propertyClass: "10.9", lubricated: true });
    expect(estimate.nm).toBeCloseTo(0.15 * 0.75 * 48_100 * 0.01, 9);
    expect(estimate.lbfFt).toBeCloseTo(unit(estimate.nm, "N m").toNumber("lbf ft"), 12);
  });

  it("always says it is an estimate and that the maker's value governs", () => {
    // common practice: a formula value never replaces the vehicle maker's specification.
    const estimate = estimateTorque({ size: "M6", propertyClass: "8.8", lubricated: false });
    expect(estimate.estimate).toBe(true);
    expect(estimate.caution).toMatch(/vehicle maker's value governs/);
    expect(estimate.sources.map((s) => s.id)).toContain("iso-898-1");
  });

  it("grows with size and class", () => {
    // ISO 898-1: proof loads rise with size and from class 8.8 to 10.9.
    const sizes = ["M6", "M8", "M10", "M12"] as const;
    const torques = sizes.map((size) => estimateTorque({ size, propertyClass: "8.8", lubricated: false }).nm);
    expect([...torques].sort((a, b) => a - b)).toEqual(torques);
    for (const size of sizes) {
      expect(estimateTorque({ size, propertyClass: "10.9", lubricated: false }).nm).toBeGreaterThan(
        estimateTorque({ size, propertyClass: "8.8", lubricated: false }).nm,
      );
    }
  });
});
