import fc from "fast-check";
import { describe, expect, it } from "vitest";
import {
  AWG_SIZES,
  CIRCUIT_RULES,
  MM2_SIZES,
  STANDARD_FUSES_A,
  checkCircuit,
  circuitInputSchema,
  circuitSummary,
  parseCircuitInput,
  type CircuitInputRaw,
} from "./circuit";
import { wiringDiagramSvg } from "./diagram";

const circuit = (raw: CircuitInputRaw) => checkCircuit(circuitInputSchema.parse(raw));
const finding = (raw: CircuitInputRaw, rule: string) => circuit(raw).findings.find((f) => f.rule === rule);

describe("no-fuse-fits and no-wire-fits", () => {
  it("3000 W over 8 m: 250 A needs more than the largest standard fuse, so nothing fits and nothing passes", () => {
    // 3000 W / 12 V = 250 A; × 1.25 (NEC 210.20(A)) = 312.5 A, above 100 A, the largest rating of ISO 8820-3
    // blades and the cartridge types engine.md §1 lists.
    const result = circuit({ loadWatts: 3000, oneWayLengthM: 8 });
    expect(result.currentA).toBe(250);
    expect(result.recommendedFuseA).toBeNull();
    const fuse = result.findings.find((f) => f.rule === "no-fuse-fits");
    expect(fuse).toMatchObject({ severity: "blocking", source: "iso-8820-3", numbers: { neededA: 312.5, largestA: 100 } });
    expect(fuse?.message).toMatch(/Split the load/);
    const wire = result.findings.find((f) => f.rule === "no-wire-fits");
    expect(wire?.severity).toBe("blocking");
    expect(wire?.message).toMatch(/split the load/i);
    const summary = circuitSummary(result);
    expect(summary.status).toBe("blocked");
    expect(summary.text).not.toMatch(/pass/);
  });

  it("no-wire-fits when the fuse exists but even 4 AWG cannot carry it", () => {
    // 80 A continuous → 100 A fuse (ISO 8820-3 / cartridge). 4 AWG at 105 °C carries 160 A × 0.85 (engine bay) × 0.5
    // (7–24 conductors) = 68 A (33 CFR 183.425 Table 5), below 100 A; 10 mm² takes 8 AWG's row, less still.
    const result = circuit({ loadAmps: 80, oneWayLengthM: 1, bundled: 10 });
    expect(result.recommendedFuseA).toBe(100);
    expect(result.findings.map((f) => f.rule)).not.toContain("no-fuse-fits");
    const wire = result.findings.find((f) => f.rule === "no-wire-fits");
    expect(wire?.message).toMatch(/4 AWG carries only 68 A/);
    expect(wire?.message).toMatch(/heavier cable/);
  });

  it("no-wire-fits when every size drops too much, naming a shorter run", () => {
    // 40 A over 60 m one way with a return wire: 4 AWG is 0.8152 mΩ/m at 20 °C (ASTM B258, ρ = 1/58), so
    // 40 × 0.000815 × 120 = 3.9 V, 33 % of 12 V, far above the 3 % limit.
    const wire = finding({ loadAmps: 40, oneWayLengthM: 60 }, "no-wire-fits");
    expect(wire?.severity).toBe("blocking");
    expect(wire?.message).toMatch(/shorten the run/);
  });

  it("is silent when a size fits", () => {
    // Derived by hand from engine.md §1: 110 W, 5 m, chassis return → 15 A fuse and 12 AWG.
    const result = circuit({ loadWatts: 110, oneWayLengthM: 5, returnPath: "chassis" });
    expect(result.findings.map((f) => f.rule)).toEqual([]);
    expect(circuitSummary(result)).toEqual({ status: "nothing-chosen", text: "Nothing chosen yet: these are the sizes to buy." });
  });
});

describe("switch-overloaded", () => {
  // common practice: a switch is used within its contact rating; above it, a relay carries the load.
  it("blocks 300 W through a 10 A switch said to have no relay", () => {
    // 300 W / 12 V = 25 A > 10 A. 8 AWG with a 35 A fuse passes the wire checks (80 A × 0.85 = 68 A, 33 CFR 183.425).
    const result = circuit({ loadWatts: 300, oneWayLengthM: 8, wire: { awg: 8 }, fuseA: 35, relay: false, switchRatingA: 10 });
    const overloaded = result.findings.find((f) => f.rule === "switch-overloaded");
    expect(overloaded).toMatchObject({
      severity: "blocking",
      source: "common-practice",
      numbers: { currentA: 25, switchRatingA: 10 },
    });
    expect(overloaded?.message).toMatch(/relay/);
    expect(result.findings.map((f) => f.rule)).not.toContain("relay-recommended");
    expect(circuitSummary(result).status).toBe("blocked");
  });

  it("keeps relay-recommended as a note while the relay is undecided", () => {
    // 8 AWG, 16 m of wire, 25 A: 2.061 mΩ/m (ASTM B258) × 16 × 25 = 0.82 V, 6.9 % of 12 V, within a 10 % limit.
    const result = circuit({ loadWatts: 300, oneWayLengthM: 8, wire: { awg: 8 }, fuseA: 35, dropLimitPct: 10 });
    expect(result.findings.map((f) => [f.rule, f.severity])).toEqual([["relay-recommended", "info"]]);
    // A note is not a failed check: the pass sentence may stand beside it.
    expect(circuitSummary(result).status).toBe("pass");
  });

  it("is silent at or below the switch rating and with a relay", () => {
    expect(finding({ loadAmps: 10, oneWayLengthM: 1, relay: false }, "switch-overloaded")).toBeUndefined();
    expect(finding({ loadAmps: 25, oneWayLengthM: 1, relay: true }, "switch-overloaded")).toBeUndefined();
  });
});

describe("the switch (coil) feed branch", () => {
  // 33 CFR 183.455(c)(1): a fuse may be at most 150 % of the conductor's ampacity; 18 AWG at 105 °C carries 20 A
  // in the cabin, 17 A in the engine bay (× 0.85), 33 CFR 183.425 Table 5.
  const lamps = { loadWatts: 170, oneWayLengthM: 2.6, returnPath: "chassis", wire: { awg: 12 }, fuseA: 20, relay: true } as const;

  it("passes a separate 3 A tap on 18 AWG", () => {
    const result = circuit({ ...lamps, switchFeed: { from: "tap", fuseA: 3, wire: { awg: 18 } } });
    expect(result.switchFeed).toMatchObject({ from: "tap", fuseA: 3, ampacityA: 17, fuseIs: "tap" });
    expect(result.findings).toEqual([]);
  });

  it("blocks a thin feed taken from the main line behind a fuse it cannot survive", () => {
    // 18 AWG in the engine bay: 17 A, so at most 25.5 A of fuse; behind a 30 A main fuse it is unprotected.
    const result = circuit({ ...lamps, wire: { awg: 10 }, fuseA: 30, switchFeed: { from: "main", wire: { awg: 18 } } });
    const branch = result.findings.find((f) => f.rule === "switch-feed-exceeds-wire");
    expect(branch).toMatchObject({
      severity: "blocking",
      source: "cfr-183-455",
      numbers: { fuseA: 30, ampacityA: 17, limitA: 25.5 },
    });
  });

  it("warns between 100 % and 150 % (common practice: the fuse protects the wire)", () => {
    const result = circuit({ ...lamps, switchFeed: { from: "main", wire: { awg: 18 } } });
    expect(result.findings.map((f) => [f.rule, f.severity])).toEqual([["fuse-above-ampacity", "warning"]]);
    expect(result.findings[0].message).toMatch(/switch feed/);
  });

  it("checks a tap's own fuse against its own wire", () => {
    const result = circuit({ ...lamps, switchFeed: { from: "tap", fuseA: 30, wire: { awg: 18 } } });
    expect(result.findings.map((f) => f.rule)).toContain("switch-feed-exceeds-wire");
  });

  it("refuses a separate feed with no relay and a tap without its own fuse", () => {
    const noRelay = parseCircuitInput({ ...lamps, relay: false, switchFeed: { from: "tap", fuseA: 3, wire: { awg: 18 } } });
    expect(!noRelay.ok && noRelay.fields.switchFeed).toMatch(/needs a relay/);
    const noFuse = parseCircuitInput({ ...lamps, switchFeed: { from: "tap", wire: { awg: 18 } } });
    expect(!noFuse.ok && noFuse.fields["switchFeed.fuseA"]).toBe("Switch feed fuse is required");
  });

  it("draws the tap as the callout says and labels its own wire", () => {
    const input = circuitInputSchema.parse({ ...lamps, switchFeed: { from: "tap", fuseA: 3, wire: { awg: 18 } } });
    const svg = wiringDiagramSvg(input, checkCircuit(input), { idPrefix: "t" });
    expect(svg).toContain(">fused tap<");
    expect(svg).toContain(">3 A fuse<");
    expect(svg).toContain(">18 AWG<");
    expect(svg).toMatch(/separate tap behind its own 3 A fuse on 18 AWG wire/);
    // The main line still carries the main size to terminal 30 and from 87.
    expect(svg.match(/>12 AWG</g)?.length).toBeGreaterThanOrEqual(2);
  });
});

describe("plain words", () => {
  it("uses the labels a person sees, never the field names", () => {
    const parsed = parseCircuitInput({ loadWatts: "x", bundled: 0, dropLimitPct: 30 });
    expect(parsed.ok).toBe(false);
    if (parsed.ok) return;
    expect(parsed.fields).toMatchObject({
      loadWatts: "Load power must be a number",
      oneWayLengthM: "One-way run is required",
      bundled: "Wires in the bundle must be at least 1",
      dropLimitPct: "Drop limit must be at most 20 %",
    });
    for (const message of Object.values(parsed.fields)) expect(message).not.toMatch(/[a-z][A-Z]|Watts|Amps\b/);
  });

  it("keeps rule ids out of the finding sentences", () => {
    const result = circuit({
      loadWatts: 3000,
      oneWayLengthM: 8,
      wire: { awg: 18 },
      fuseA: 30,
      relay: false,
      fuseDistanceMm: 500,
    });
    for (const f of result.findings) {
      for (const rule of Object.keys(CIRCUIT_RULES)) expect(f.message).not.toContain(rule);
    }
  });
});

// A generated circuit with every choice the planner offers, chosen or not.
const arbitraryCircuit = fc
  .record({
    systemVoltage: fc.constantFrom(12 as const, 24 as const),
    load: fc.oneof(
      fc.record({ loadAmps: fc.double({ min: 0.1, max: 400, noNaN: true }) }),
      fc.record({ loadWatts: fc.double({ min: 1, max: 5000, noNaN: true }) }),
    ),
    continuous: fc.boolean(),
    oneWayLengthM: fc.double({ min: 0.1, max: 100, noNaN: true }),
    returnPath: fc.constantFrom("wire" as const, "chassis" as const),
    location: fc.constantFrom("engine-bay" as const, "cabin" as const),
    bundled: fc.integer({ min: 1, max: 30 }),
    wire: fc.option(
      fc.oneof(
        fc.constantFrom(...AWG_SIZES).map((awg) => ({ awg })),
        fc.constantFrom(...MM2_SIZES).map((mm2) => ({ mm2 })),
      ),
      {
        nil: undefined,
      },
    ),
    fuseA: fc.option(fc.oneof(fc.constant(null), fc.constantFrom(...STANDARD_FUSES_A)), { nil: undefined }),
    fuseDistanceMm: fc.option(fc.integer({ min: 0, max: 1000 }), { nil: undefined }),
    switchRatingA: fc.constantFrom(5, 10, 20, 30),
    relay: fc.option(fc.boolean(), { nil: undefined }),
  })
  .map(({ load, ...rest }) => circuitInputSchema.parse({ ...rest, ...load } satisfies CircuitInputRaw));

describe("the summary never claims more than was checked", () => {
  it("never says pass while a blocking or warning finding exists, nor without both a fuse and a wire", () => {
    fc.assert(
      fc.property(arbitraryCircuit, (input) => {
        const result = checkCircuit(input);
        const summary = circuitSummary(result);
        const serious = result.findings.some((f) => f.severity === "blocking" || f.severity === "warning");
        const claimsPass = summary.status === "pass" || /pass every check/.test(summary.text);
        if (serious || input.wire === undefined || typeof input.fuseA !== "number") expect(claimsPass).toBe(false);
        if (result.findings.some((f) => f.severity === "blocking")) expect(summary.status).toBe("blocked");
      }),
      { numRuns: 500 },
    );
  });

  it("always reports a blocking finding when no fuse or no wire fits", () => {
    fc.assert(
      fc.property(arbitraryCircuit, (input) => {
        const result = checkCircuit(input);
        const rules = result.findings.map((f) => f.rule);
        if (result.recommendedFuseA === null) expect(rules).toContain("no-fuse-fits");
        if (result.minWire.awg === null && result.minWire.mm2 === null) expect(rules).toContain("no-wire-fits");
        for (const f of result.findings) expect(f.severity).toBe(CIRCUIT_RULES[f.rule]);
      }),
      { numRuns: 300 },
    );
  });
});
