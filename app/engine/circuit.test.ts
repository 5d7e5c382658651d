import { describe, expect, it } from "vitest";
import { checkCircuit, circuitInputSchema, parseCircuitInput, type CircuitInputRaw } from "./circuit";
import { maxRunLengthM } from "./chart";

const circuit = (raw: CircuitInputRaw) => checkCircuit(circuitInputSchema.parse(raw));
const rules = (raw: CircuitInputRaw) => circuit(raw).findings.map((f) => f.rule);

describe("the worked example", () => {
  // Derived by hand from engine.md §1 (not a published value): ASTM B258 areas,
  // IACS ρ = 1/58, NEC 210.20(A) 125 %, ISO 8820-3 ratings, 33 CFR 183.425 ampacity.
  const lamp = { loadWatts: 110, oneWayLengthM: 5, dropLimitPct: 3 } as const;

  it("turns 110 W at 12 V into 9.167 A and a 15 A fuse", () => {
    const result = circuit(lamp);
    expect(result.currentA).toBeCloseTo(9.1667, 4);
    expect(result.recommendedFuseA).toBe(15);
  });

  it("needs 12 AWG with a chassis return (0.239 V)", () => {
    const result = circuit({ ...lamp, returnPath: "chassis", wire: { awg: 12 } });
    expect(result.minWire.awg).toBe(12);
    expect(result.circuitLengthM).toBe(5);
    expect(result.chosen?.dropV).toBeCloseTo(0.239, 3);
  });

  it("needs 10 AWG with a return wire (0.300 V)", () => {
    const result = circuit({ ...lamp, returnPath: "wire", wire: { awg: 10 } });
    expect(result.minWire.awg).toBe(10);
    expect(result.circuitLengthM).toBe(10);
    expect(result.chosen?.dropV).toBeCloseTo(0.3, 3);
  });

  it("echoes the normalised inputs and names its sources", () => {
    const result = circuit(lamp);
    expect(result.inputs).toMatchObject({ systemVoltage: 12, continuous: true, returnPath: "wire", insulationC: 105 });
    expect(result.sources.map((s) => s.id)).toEqual(expect.arrayContaining(["astm-b258", "nec-210-20a", "cfr-183-425"]));
    expect(result.notes.some((n) => n.includes("common practice"))).toBe(true);
  });
});

describe("a pair of auxiliary lamps, 170 W together, 12 AWG", () => {
  // common practice
  const lamps = { loadWatts: 170, oneWayLengthM: 2, wire: { awg: 12 }, fuseA: 20 } as const;

  it("draws about 14.2 A, takes a 20 A fuse, and 12 AWG carries it", () => {
    const result = circuit(lamps);
    expect(result.currentA).toBeCloseTo(170 / 12, 9);
    expect(result.recommendedFuseA).toBe(20);
    expect(result.chosen?.ampacityA).toBeGreaterThanOrEqual(20);
    expect(rules(lamps)).not.toContain("fuse-above-ampacity");
    expect(result.relayNeeded).toBe(true);
  });

  it("stays within 3 % and 10 % up to the lengths the formula gives", () => {
    const currentA = 170 / 12;
    const d = 0.127 * 92 ** ((36 - 12) / 39);
    const ohmPerM = 1 / 58 / ((Math.PI * d * d) / 4);
    const maxLength = (pct: number) => ((pct / 100) * 12) / (currentA * ohmPerM * 2);
    expect(maxLength(3)).toBeCloseTo(2.438, 3);
    expect(maxLength(10)).toBeCloseTo(8.128, 3);
    for (const pct of [3, 10]) {
      const boundary = maxLength(pct);
      expect(maxRunLengthM(circuitInputSchema.parse({ ...lamps, dropLimitPct: pct }), { awg: 12 })).toBeCloseTo(boundary, 9);
      expect(rules({ ...lamps, dropLimitPct: pct, oneWayLengthM: boundary * 0.999 })).not.toContain("drop-over-limit");
      expect(rules({ ...lamps, dropLimitPct: pct, oneWayLengthM: boundary * 1.001 })).toContain("drop-over-limit");
    }
  });
});

describe("when no size fits", () => {
  it("says so when the run is too long for any size", () => {
    // Derived from engine.md §1: 4 AWG (ASTM B258, 0.815 mΩ/m) at 40 A over 80 m drops 2.6 V, far above 3 %.
    const result = circuit({ loadAmps: 40, oneWayLengthM: 40 });
    expect(result.minWire).toEqual({ awg: null, mm2: null });
    expect(result.noneFits.awg).toMatch(/Even 4 AWG drops/);
  });

  it("says so when the current is beyond the largest fuse", () => {
    // ISO 8820-3 and cartridge ratings stop at 100 A; 1.25 × 90 A is above it (NEC 210.20(A)).
    const result = circuit({ loadAmps: 90, oneWayLengthM: 1 });
    expect(result.recommendedFuseA).toBeNull();
    expect(result.noneFits.awg).toMatch(/above 100 A/);
  });
});

describe("finding rules", () => {
  // Derived from engine.md §1: 110 W at 12 V = 9.17 A; 18 AWG in the engine bay at 105 °C
  // may carry 20 × 0.85 = 17 A (33 CFR 183.425 Table 5 and engine-room factor).
  const base = { loadWatts: 110, oneWayLengthM: 1, wire: { awg: 18 } } as const;

  it("no-fuse fires only for an explicit null", () => {
    // common practice: every feed from the battery is fused.
    const finding = circuit({ ...base, fuseA: null }).findings.find((f) => f.rule === "no-fuse");
    expect(finding?.severity).toBe("blocking");
    expect(finding?.message).toMatch(/15 A fuse/);
    expect(rules({ ...base, fuseA: 15 })).not.toContain("no-fuse");
    expect(rules(base)).not.toContain("no-fuse");
  });

  it("fuse-exceeds-wire fires above 150 % of ampacity", () => {
    // 33 CFR 183.455(c)(1): at most 150 % of 17 A = 25.5 A.
    const finding = circuit({ ...base, fuseA: 30 }).findings.find((f) => f.rule === "fuse-exceeds-wire");
    expect(finding).toMatchObject({ severity: "blocking", source: "cfr-183-455", numbers: { fuseA: 30, ampacityA: 17 } });
    expect(finding?.numbers.limitA).toBeCloseTo(25.5, 9);
    expect(rules({ ...base, fuseA: 25 })).not.toContain("fuse-exceeds-wire");
  });

  it("fuse-above-ampacity fires between 100 % and 150 %", () => {
    // common practice: the fuse protects the wire, so it should not exceed the 17 A ampacity.
    expect(circuit({ ...base, fuseA: 20 }).findings.find((f) => f.rule === "fuse-above-ampacity")?.severity).toBe("warning");
    expect(rules({ ...base, fuseA: 30 })).not.toContain("fuse-above-ampacity");
    expect(rules({ ...base, fuseA: 15 })).not.toContain("fuse-above-ampacity");
  });

  it("fuse-undersized fires below 125 % of a continuous load", () => {
    // NEC 210.20(A): 1.25 × 9.17 A = 11.46 A, so a 10 A fuse is too small.
    const finding = circuit({ ...base, fuseA: 10 }).findings.find((f) => f.rule === "fuse-undersized");
    expect(finding).toMatchObject({ severity: "warning", source: "nec-210-20a" });
    expect(finding?.numbers.neededA).toBeCloseTo(11.458, 3);
    expect(rules({ ...base, fuseA: 15 })).not.toContain("fuse-undersized");
    // common practice: a short-time load only needs a fuse at or above its current.
    expect(rules({ ...base, continuous: false, fuseA: 10 })).not.toContain("fuse-undersized");
    expect(rules({ ...base, continuous: false, fuseA: 7.5 })).toContain("fuse-undersized");
  });

  it("drop-over-limit fires above the limit", () => {
    // ASTM B258 with ρ = 1/58: 12 AWG over 10 m at 9.17 A drops 0.478 V = 3.98 % of 12 V.
    const finding = circuit({ loadWatts: 110, oneWayLengthM: 5, wire: { awg: 12 } }).findings.find(
      (f) => f.rule === "drop-over-limit",
    );
    expect(finding?.severity).toBe("warning");
    expect(finding?.numbers.dropPct).toBeCloseTo(3.98, 2);
    // ASTM B258 with ρ = 1/58: 10 AWG drops 0.300 V = 2.5 %.
    expect(rules({ loadWatts: 110, oneWayLengthM: 5, wire: { awg: 10 } })).not.toContain("drop-over-limit");
  });

  it("fuse-far-from-battery fires beyond 178 mm", () => {
    // 33 CFR 183.455(b): within 7 in (178 mm) of the source.
    expect(
      circuit({ ...base, fuseA: 15, fuseDistanceMm: 250 }).findings.find((f) => f.rule === "fuse-far-from-battery")?.source,
    ).toBe("cfr-183-455");
    expect(rules({ ...base, fuseA: 15, fuseDistanceMm: 178 })).not.toContain("fuse-far-from-battery");
    expect(rules({ ...base, fuseA: 15 })).not.toContain("fuse-far-from-battery");
  });

  it("relay-recommended notes a needed relay while the relay is undecided", () => {
    // common practice: a load above the switch rating goes through a relay; 170 W / 12 V = 14.2 A > 10 A.
    const heavy = { loadWatts: 170, oneWayLengthM: 1 } as const;
    expect(circuit(heavy).findings.find((f) => f.rule === "relay-recommended")?.severity).toBe("info");
    expect(rules({ ...heavy, relay: true })).not.toContain("relay-recommended");
    expect(rules({ ...heavy, relay: false })).not.toContain("relay-recommended");
    expect(rules({ loadAmps: 5, oneWayLengthM: 1 })).not.toContain("relay-recommended");
  });

  it("wire-unrated fires for sizes below the ampacity table", () => {
    // 33 CFR 183.425 Table 5 starts at 18 AWG (0.82 mm²); 0.75 mm² has no row.
    expect(rules({ loadAmps: 1, oneWayLengthM: 1, wire: { mm2: 0.75 }, fuseA: 2 })).toContain("wire-unrated");
    expect(rules({ loadAmps: 1, oneWayLengthM: 1, wire: { mm2: 1 }, fuseA: 2 })).not.toContain("wire-unrated");
  });
});

describe("validation", () => {
  it("names both load fields when both are given", () => {
    const parsed = parseCircuitInput({ loadWatts: 110, loadAmps: 9, oneWayLengthM: 5 });
    expect(parsed).toEqual({
      ok: false,
      fields: {
        loadWatts: "Give the load as power (W) or as current (A), not both",
        loadAmps: "Give the load as power (W) or as current (A), not both",
      },
    });
  });

  it("rejects a zero length, naming oneWayLengthM", () => {
    const parsed = parseCircuitInput({ loadWatts: 110, oneWayLengthM: 0 });
    expect(parsed.ok).toBe(false);
    if (!parsed.ok) expect(parsed.fields.oneWayLengthM).toBe("One-way run must be more than 0 m");
  });

  it("rejects 36 V, naming systemVoltage", () => {
    const parsed = parseCircuitInput({ systemVoltage: 36, loadWatts: 110, oneWayLengthM: 5 });
    expect(parsed.ok).toBe(false);
    if (!parsed.ok) expect(parsed.fields.systemVoltage).toBe("System voltage must be 12 or 24 V");
  });

  it("reports every problem at once, with dotted paths", () => {
    const parsed = parseCircuitInput({ systemVoltage: 36, loadWatts: 1, loadAmps: 1, oneWayLengthM: 0, wire: { awg: 7 } });
    expect(parsed.ok).toBe(false);
    if (!parsed.ok)
      expect(Object.keys(parsed.fields).sort()).toEqual(["loadAmps", "loadWatts", "oneWayLengthM", "systemVoltage", "wire"]);
  });

  it("fills the design defaults", () => {
    const parsed = parseCircuitInput({ loadAmps: 3, oneWayLengthM: 2 });
    expect(parsed.ok && parsed.value).toMatchObject({
      systemVoltage: 12,
      continuous: true,
      returnPath: "wire",
      location: "engine-bay",
      insulationC: 105,
      bundled: 1,
      dropLimitPct: 3,
      conductorTempC: 20,
      switchRatingA: 10,
    });
    expect(parsed.ok && "fuseA" in parsed.value).toBe(false);
  });

  it("keeps an explicit null fuse apart from an absent one", () => {
    const parsed = parseCircuitInput({ loadAmps: 3, oneWayLengthM: 2, fuseA: null });
    expect(parsed.ok && parsed.value.fuseA).toBeNull();
  });
});
