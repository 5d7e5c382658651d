import { describe, expect, it } from "vitest";
import { calloutRow, calloutSchema, evaluateCallout, parseCallout, storedCallout, type Callout } from "./callouts";
import { checkCircuit, circuitInputSchema } from "./circuit";

const parse = (raw: unknown): Callout => calloutSchema.parse(raw);

describe("torque callouts", () => {
  it("shows a maker's value in every unit", () => {
    // NIST SP 811 (2008), Appendix B: 1 lbf·ft = 1.355818 N·m.
    const result = evaluateCallout(parse({ kind: "torque", fastener: "Light bar bracket bolt", value: 20, unit: "lbf·ft" }));
    expect(result.kind === "torque" && result.values?.nm).toBeCloseTo(27.11636, 5);
    expect(result.kind === "torque" && result.estimate).toBeNull();
  });

  it("needs a unit with the value", () => {
    const parsed = parseCallout({ kind: "torque", fastener: "Bracket bolt", value: 20 });
    expect(parsed.ok).toBe(false);
    if (!parsed.ok) expect(parsed.fields.unit).toMatch(/unit is required/);
  });

  it("estimates when asked and the fastener is known", () => {
    // ISO 898-1 proof load and the short-form formula (common practice): M8 8.8 dry ≈ 25.4 N·m.
    const result = evaluateCallout(
      parse({ kind: "torque", fastener: "Skid plate bolt", estimate: true, size: "M8", propertyClass: "8.8" }),
    );
    expect(result.kind === "torque" && result.values).toBeNull();
    expect(result.kind === "torque" && result.estimate?.nm).toBeCloseTo(25.44, 9);
  });

  it("refuses an estimate for an unknown size and an estimate beside a value", () => {
    const unknown = parseCallout({ kind: "torque", fastener: "Bolt", estimate: true, size: "5/16-18", propertyClass: "8.8" });
    expect(!unknown.ok && unknown.fields.size).toMatch(/size must be one of M6/);
    const both = parseCallout({
      kind: "torque",
      fastener: "Bolt",
      estimate: true,
      value: 20,
      unit: "N·m",
      size: "M8",
      propertyClass: "8.8",
    });
    expect(!both.ok && both.fields.estimate).toMatch(/estimate/);
  });

  it("limits the fastener text", () => {
    const parsed = parseCallout({ kind: "torque", fastener: "x".repeat(201), value: 1, unit: "N·m" });
    expect(!parsed.ok && parsed.fields.fastener).toMatch(/^Fastener must be at most 200/);
  });
});

describe("circuit callouts", () => {
  it("defaults the feed to the battery and keeps the relay answer", () => {
    const callout = parse({ kind: "circuit", loadWatts: 170, oneWayLengthM: 3, relay: false, label: "Roof lamps" });
    expect(callout).toMatchObject({ kind: "circuit", feed: "battery", relay: false, label: "Roof lamps" });
  });

  it("evaluates like the calculator", () => {
    const callout = parse({ kind: "circuit", loadWatts: 110, oneWayLengthM: 5, wire: { awg: 10 }, fuseA: 15 });
    const direct = checkCircuit(circuitInputSchema.parse({ loadWatts: 110, oneWayLengthM: 5, wire: { awg: 10 }, fuseA: 15 }));
    const result = evaluateCallout(callout);
    expect(result.kind === "circuit" && result.result.chosen).toEqual(direct.chosen);
    expect(result.kind === "circuit" && result.result.recommendedFuseA).toBe(direct.recommendedFuseA);
  });

  it("applies the load rule inside the union too", () => {
    const parsed = parseCallout({ kind: "circuit", loadWatts: 1, loadAmps: 1, oneWayLengthM: 1 });
    expect(!parsed.ok && parsed.fields.loadWatts).toBe("Give the load as power (W) or as current (A), not both");
  });
});

describe("caution and tip callouts", () => {
  it("takes only the four signal words", () => {
    // ANSI Z535.6 signal words: DANGER, WARNING, CAUTION, NOTICE.
    for (const signalWord of ["DANGER", "WARNING", "CAUTION", "NOTICE"]) {
      expect(parseCallout({ kind: "caution", signalWord, text: "Support the vehicle on stands." }).ok).toBe(true);
    }
    const parsed = parseCallout({ kind: "caution", signalWord: "ALERT", text: "x" });
    expect(!parsed.ok && parsed.fields.signalWord).toMatch(/^Signal word must be one of/);
  });

  it("bounds the text", () => {
    expect(parseCallout({ kind: "tip", text: "" }).ok).toBe(false);
    expect(parseCallout({ kind: "tip", text: "y".repeat(2001) }).ok).toBe(false);
    expect(parseCallout({ kind: "tip", text: "Label both ends of every wire." }).ok).toBe(true);
  });

  it("computes nothing for them", () => {
    expect(evaluateCallout(parse({ kind: "tip", text: "Label both ends." }))).toEqual({ kind: "tip", result: null });
  });

  it("names the kind when it is unknown", () => {
    const parsed = parseCallout({ kind: "photo" });
    expect(!parsed.ok && parsed.fields.kind).toMatch(/^Callout type must be/);
  });
});

describe("torque sources", () => {
  it("records whose value it is and keeps it through the stored columns", () => {
    const callout = parse({ kind: "torque", fastener: "Hinge bolt", value: 24, unit: "N·m", valueSource: "accessory-maker" });
    const row = calloutRow(callout);
    expect(row.torqueSource).toBe("accessory-maker");
    expect(row.data).not.toHaveProperty("valueSource");
    expect(storedCallout(row)).toEqual(callout);
  });

  it("refuses an estimate label on a given value and a maker's label on an estimate", () => {
    const given = parseCallout({ kind: "torque", fastener: "Nut", value: 5, unit: "N·m", valueSource: "estimate" });
    expect(!given.ok && given.fields.valueSource).toMatch(/not an estimate/);
    const estimated = parseCallout({
      kind: "torque",
      fastener: "Nut",
      estimate: true,
      size: "M8",
      propertyClass: "8.8",
      valueSource: "vehicle-maker",
    });
    expect(!estimated.ok && estimated.fields.valueSource).toMatch(/estimate/);
    const unknown = parseCallout({ kind: "torque", fastener: "Nut", value: 5, unit: "N·m", valueSource: "forum" });
    expect(!unknown.ok && unknown.fields.valueSource).toMatch(/^Torque source must be/);
  });
});

describe("switch feed column", () => {
  it("keeps a circuit's switch feed in its own column and joins it back", () => {
    const callout = parse({
      kind: "circuit",
      loadWatts: 170,
      oneWayLengthM: 2.6,
      relay: true,
      switchFeed: { from: "tap", fuseA: 3, wire: { awg: 18 } },
    });
    const row = calloutRow(callout);
    expect(row.switchFeed).toEqual({ from: "tap", fuseA: 3, wire: { awg: 18 } });
    expect(row.data).not.toHaveProperty("switchFeed");
    expect(storedCallout(row)).toEqual(callout);
    // A row stored before the column existed reads back without a feed.
    expect(storedCallout({ kind: "circuit", data: row.data })).not.toHaveProperty("switchFeed");
  });
});
