import { unit } from "mathjs";
import { describe, expect, it } from "vitest";
import { calloutSchema } from "~/engine/callouts";
import {
  circuitPreview,
  loadKindOf,
  newCallout,
  setField,
  setOptionalText,
  setRelay,
  setTorqueOrigin,
  switchLoadKind,
  torqueOrigin,
  torquePreview,
} from "./callout-state";
import { fuseFrom, fuseValue, switchFeedFor, wireFrom, wireValue } from "./circuit-form";
import { numberText, readNumber } from "./fields";

describe("the callout objects the editor keeps", () => {
  it("are what the API's schema parses once the required fields are filled in", () => {
    let torque = newCallout("torque");
    torque = setField(torque, "fastener", "Lamp bracket nuts");
    torque = setField(torque, "value", 9);
    torque = setTorqueOrigin(torque, "accessory-maker").callout;
    expect(calloutSchema.safeParse(torque).success).toBe(true);

    let circuit = newCallout("circuit");
    circuit = setField(circuit, "loadWatts", 55);
    circuit = setField(circuit, "oneWayLengthM", 3);
    expect(calloutSchema.safeParse(circuit).success).toBe(true);

    const caution = setField(setField(newCallout("caution"), "signalWord", "CAUTION"), "text", "Hot exhaust nearby.");
    expect(calloutSchema.safeParse(caution).success).toBe(true);
    expect(calloutSchema.safeParse(setField(newCallout("tip"), "text", "Tape the loom.")).success).toBe(true);
  });

  it("start with their required texts empty, so the schema names each one still to fill in", () => {
    const parsed = calloutSchema.safeParse(newCallout("caution"));
    expect(parsed.success).toBe(false);
    expect(parsed.error?.issues.map((i) => i.path.join("."))).toEqual(expect.arrayContaining(["signalWord", "text"]));
  });

  it("leave a blank optional text out, because the schema refuses an empty one", () => {
    const torque = { kind: "torque", fastener: "Bolt", value: 10, unit: "N·m", valueSource: "vehicle-maker" };
    expect(calloutSchema.safeParse({ ...torque, threadlocker: "" }).success).toBe(false);
    const cleared = setOptionalText({ ...torque, threadlocker: "blue" }, "threadlocker", "  ");
    expect("threadlocker" in cleared).toBe(false);
    expect(calloutSchema.safeParse(cleared).success).toBe(true);
  });
});

describe("torque: a maker's value or an estimate", () => {
  it("takes the value and unit out for an estimate and gives them back after", () => {
    const given = { kind: "torque", fastener: "Bolt", value: 22, unit: "lbf·ft", valueSource: "vehicle-maker" };
    const estimating = setTorqueOrigin(given, "estimate");
    expect(estimating.callout).toEqual({ kind: "torque", fastener: "Bolt", estimate: true, valueSource: "estimate" });
    expect(estimating.set).toEqual({ value: 22, unit: "lbf·ft" });
    expect(torqueOrigin(estimating.callout)).toBe("estimate");
    const back = setTorqueOrigin(estimating.callout, "author-measured", estimating.set);
    expect(back.callout).toEqual({ kind: "torque", fastener: "Bolt", value: 22, unit: "lbf·ft", valueSource: "author-measured" });
  });

  it("previews the value in every unit, checked against mathjs", () => {
    const preview = torquePreview({ kind: "torque", value: 120, unit: "lbf·in" });
    expect(preview.kind).toBe("value");
    if (preview.kind !== "value") return;
    // Reference: mathjs; NIST SP 811: 1 lbf·in = 0.1129848 N·m.
    expect(preview.values.nm).toBeCloseTo(unit(120, "lbf in").toNumber("N m"), 9);
    expect(preview.values.lbfFt).toBeCloseTo(10, 9);
  });

  it("estimates a lubricated M10 class 10.9 with the lower nut factor", () => {
    const preview = torquePreview({ kind: "torque", estimate: true, size: "M10", propertyClass: "10.9", lubricated: true });
    expect(preview.kind).toBe("estimate");
    // ISO 898-1 proof load 48 100 N; K = 0.15 lubricated, F = 0.75 × proof load (common practice).
    if (preview.kind === "estimate") expect(preview.estimate.nm).toBeCloseTo(0.15 * 0.75 * 48_100 * 0.01, 9);
  });

  it("names what is missing for a value that is not there or not positive", () => {
    expect(torquePreview({ kind: "torque", value: 0, unit: "N·m" })).toEqual({
      kind: "missing",
      words: "Fill in the torque value to see it in every unit.",
    });
    expect(torquePreview({ kind: "torque", estimate: true })).toEqual({
      kind: "missing",
      words: "Choose the bolt size (M6, M8, M10, M12) and the property class to see the estimate.",
    });
  });
});

describe("circuit: load, relay and live check", () => {
  it("converts the load when it switches between watts and amps (P = V × I at the nominal voltage)", () => {
    const amps = switchLoadKind({ kind: "circuit", loadWatts: 120 }, "amps");
    expect(amps.callout).toEqual({ kind: "circuit", loadAmps: 10 });
    expect(amps.notice).toBe("Converted the load: 120 W is 10 A at 12 V.");
    const watts = switchLoadKind({ kind: "circuit", systemVoltage: 24, loadAmps: 2.5 }, "watts");
    expect(watts.callout).toEqual({ kind: "circuit", systemVoltage: 24, loadWatts: 60 });
    expect(loadKindOf(watts.callout, "amps")).toBe("watts");
    expect(loadKindOf({ kind: "circuit" }, "amps")).toBe("amps");
    expect(switchLoadKind({ kind: "circuit" }, "amps")).toEqual({ callout: { kind: "circuit" }, notice: null });
  });

  it("takes a separate switch feed out when the relay is set to not used, and hands it back", () => {
    const feed = { from: "tap", fuseA: 3, wire: { awg: 18 } };
    const next = setRelay({ kind: "circuit", relay: true, switchFeed: feed }, false);
    expect(next.callout).toEqual({ kind: "circuit", relay: false });
    expect(next.removed).toEqual(feed);
    expect(setRelay({ kind: "circuit" }, undefined).callout).toEqual({ kind: "circuit" });
  });

  it("keeps a switch feed's wire and fuse when its kind changes, and nothing the schema would refuse", () => {
    expect(switchFeedFor("main", { from: "tap", fuseA: 3, wire: { awg: 18 } })).toEqual({ from: "main", wire: { awg: 18 } });
    expect(switchFeedFor("tap", { from: "main" })).toEqual({ from: "tap" });
    expect(switchFeedFor("", { from: "main" })).toBeUndefined();
  });

  it("reads the menus' values back into the engine's fields", () => {
    expect(wireFrom(wireValue({ awg: 12 }))).toEqual({ awg: 12 });
    expect(wireFrom(wireValue({ mm2: 2.5 }))).toEqual({ mm2: 2.5 });
    expect(wireFrom("")).toBeUndefined();
    // engine.md §1: fuseA null = no fuse, absent = not chosen.
    expect(fuseFrom(fuseValue(null))).toBeNull();
    expect(fuseFrom(fuseValue(undefined))).toBeUndefined();
    expect(fuseFrom(fuseValue(7.5))).toBe(7.5);
  });

  it("checks with the engine once the callout parses, and matches the hand-worked wire return case", () => {
    // engine.md §4 (derived by hand): 110 W, 5 m one way, wire return, 3 % → 10 AWG (0.300 V).
    const preview = circuitPreview({ kind: "circuit", loadWatts: 110, oneWayLengthM: 5, returnPath: "wire" });
    expect(preview.ok).toBe(true);
    if (!preview.ok) return;
    expect(preview.result.minWire.awg).toBe(10);
    expect(preview.result.recommendedFuseA).toBe(15);
    expect(preview.input.feed).toBe("battery");
  });

  it("says what to fill in, and what is wrong, without throwing", () => {
    expect(circuitPreview({})).toEqual({ ok: false, missing: ["the load (W or A)", "the one-way run"], problems: [] });
    const wrong = circuitPreview({ loadWatts: -1, oneWayLengthM: 3, fuseA: "big" });
    expect(wrong.ok).toBe(false);
    if (wrong.ok) return;
    expect(wrong.missing).toEqual([]);
    expect(wrong.problems).toEqual(expect.arrayContaining(["Load power must be more than 0 W", "Fuse must be a number"]));
  });
});

describe("number inputs", () => {
  it("read plain decimals (a comma too) and leave anything else as text", () => {
    expect(readNumber("2,5")).toBe(2.5);
    expect(readNumber(" 12 ")).toBe(12);
    expect(readNumber("")).toBeUndefined();
    expect(readNumber("2.")).toBe(2);
    for (const text of ["abc", "1e3", "0x10", "Infinity", "1.2.3"]) expect(readNumber(text)).toBe("invalid");
    expect(numberText(7.5)).toBe("7.5");
    expect(numberText(undefined)).toBe("");
  });
});
