import fc from "fast-check";
import { unit } from "mathjs";
import { describe, expect, it } from "vitest";
import { calloutSchema } from "~/engine/callouts";
import { runSafetyRules } from "~/engine/rules";
import { SOURCES } from "~/engine/sources";
import { TORQUE_SOURCE_LABELS } from "~/engine/torque-sources";
import { CalloutListEditor, MAX_CALLOUTS, STANDS_CAUTION } from "./callout-editor";
import { hasFlag, noop, render, tagWithId, textOf } from "./render-test-support";

const flags = { liftsVehicle: false, disconnectsBattery: false };
const renderList = (callouts: unknown[], over: Partial<Parameters<typeof CalloutListEditor>[0]> = {}) =>
  render(CalloutListEditor, { callouts, onChange: noop, path: "steps.2.callouts", errors: {}, stepFlags: flags, ...over });

/** en-GB, one decimal, as the reader page rounds torque (app/components/callouts.tsx). */
const oneDecimal = (n: number) => n.toLocaleString("en-GB", { maximumFractionDigits: 1 });

describe("torque callout form", () => {
  it("converts 25 N·m into every unit while typing, with the conversion's source", () => {
    const text = textOf(
      renderList([{ kind: "torque", fastener: "Bracket bolts", value: 25, unit: "N·m", valueSource: "vehicle-maker" }]),
    );
    // Reference: mathjs unit conversion (exact lbf, ft, in definitions); NIST SP 811 App. B gives 1 lbf·ft = 1.355818 N·m.
    const lbfFt = unit(25, "N m").toNumber("lbf ft");
    const lbfIn = unit(25, "N m").toNumber("lbf in");
    expect(oneDecimal(lbfFt)).toBe("18.4");
    expect(text).toContain(`25 N·m = ${oneDecimal(lbfFt)} lbf·ft = ${Math.round(lbfIn)} lbf·in`);
    expect(text).toContain(`Unit conversions: ${SOURCES["nist-sp-811"].title}`);
    // The value's own source, in the words the reader page uses (app/engine/torque-sources.ts).
    expect(text).toContain(`Value from: ${TORQUE_SOURCE_LABELS["vehicle-maker"]}`);
  });

  it("converts from lbf·ft too: 30 lbf·ft is 40.7 N·m", () => {
    const text = textOf(renderList([{ kind: "torque", fastener: "Skid plate bolts", value: 30, unit: "lbf·ft" }]));
    // Reference: mathjs; NIST SP 811: 30 × 1.355818 = 40.67 N·m.
    expect(text).toContain(`${oneDecimal(unit(30, "lbf ft").toNumber("N m"))} N·m = 30 lbf·ft = 360 lbf·in`);
    expect(text).toContain("not recorded by the author");
  });

  it("shows the labelled short-form estimate when the maker gives no value", () => {
    const html = renderList([
      { kind: "torque", fastener: "Rack foot", estimate: true, valueSource: "estimate", size: "M8", propertyClass: "8.8" },
    ]);
    const text = textOf(html);
    // engine.md §4: M8 class 8.8 dry, T = 0.20 × 0.75 × 21 200 N (ISO 898-1 proof load) × 8 mm = 25.44 N·m.
    expect(text).toContain(`${oneDecimal(0.2 * 0.75 * 21_200 * 0.008)} N·m`);
    expect(text).toContain("Estimate");
    expect(text).toContain("T = K × F × d");
    expect(text).toContain("The vehicle maker's value governs");
    expect(text).toContain(`Value from: ${TORQUE_SOURCE_LABELS.estimate}`);
    expect(text).toContain("Not said: the estimate takes dry threads.");
    // Estimating: no value input, and the size and class are menus of what can be estimated.
    expect(html).not.toContain('id="field-steps-2-callouts-0-value"');
    expect(tagWithId(html, "field-steps-2-callouts-0-size")).toMatch(/^<select/);
  });

  it("says what is missing instead of a result", () => {
    expect(textOf(renderList([{ kind: "torque", fastener: "", unit: "N·m" }]))).toContain(
      "Fill in the torque value to see it in every unit.",
    );
    expect(textOf(renderList([{ kind: "torque", fastener: "Bolt", estimate: true, size: "M8" }]))).toContain(
      "Choose the property class to see the estimate.",
    );
  });

  it("keeps a size that cannot be estimated visible in the menu instead of dropping it", () => {
    const html = renderList([{ kind: "torque", fastener: "Bolt", estimate: true, size: "M14", propertyClass: "8.8" }]);
    expect(textOf(html)).toContain("M14 (cannot be estimated)");
  });
});

describe("circuit callout form", () => {
  it("shows fuse-exceeds-wire for a 30 A fuse on 18 AWG in the engine bay", () => {
    const html = renderList([
      { kind: "circuit", feed: "battery", loadAmps: 8, oneWayLengthM: 2, location: "engine-bay", wire: { awg: 18 }, fuseA: 30 },
    ]);
    const text = textOf(html);
    // 33 CFR 183.425 Table 5: 18 AWG at 105 °C carries 20 A, × 0.85 in an engine space = 17 A;
    // 33 CFR 183.455(c)(1): the fuse may be at most 150 % of that, 25.5 A, so 30 A is refused (engine.md §1).
    expect(text).toContain("rule fuse-exceeds-wire");
    expect(text).toContain("Must fix");
    expect(text).toContain(SOURCES["cfr-183-455"].title);
    expect(text).toMatch(/ampacity 17 A/);
    // The wiring diagram, drawn by the engine, with the chosen fuse on it.
    expect(html).toContain('id="field-steps-2-callouts-0-diagram"');
    expect(html).toMatch(/<svg[^>]*>[\s\S]*30 A fuse/);
  });

  it("sizes the circuit of engine.md's hand-worked example as the planner does", () => {
    // engine.md §4 (derived by hand): 110 W at 12 V → 9.167 A → 15 A fuse; 5 m one way, chassis return → 12 AWG.
    const text = textOf(
      renderList([{ kind: "circuit", loadWatts: 110, oneWayLengthM: 5, returnPath: "chassis", dropLimitPct: 3 }]),
    );
    expect(text).toMatch(/Current 9\.2 A/);
    expect(text).toMatch(/Recommended fuse 15 A/);
    expect(text).toMatch(/Minimum wire 12 AWG/);
  });

  it("asks for what is missing on a new circuit and draws nothing", () => {
    const html = renderList([{ kind: "circuit", feed: "battery" }]);
    expect(textOf(html)).toContain(
      "Fill in the load (W or A) and the one-way run to see the results, the findings and the wiring diagram.",
    );
    expect(html).not.toContain("<svg");
  });

  it("lists values out of range instead of computing with them", () => {
    const text = textOf(renderList([{ kind: "circuit", loadWatts: 110, oneWayLengthM: 500 }]));
    expect(text).toContain("One-way run must be at most 100 m");
  });

  it("reminds that a battery feed needs a disconnect step, unless the step disconnects it", () => {
    const circuit = { kind: "circuit", feed: "battery", loadWatts: 60, oneWayLengthM: 2 };
    expect(textOf(renderList([circuit]))).toContain("battery-disconnect-missing");
    expect(textOf(renderList([circuit], { stepFlags: { liftsVehicle: false, disconnectsBattery: true } }))).not.toContain(
      "battery-disconnect-missing",
    );
  });

  it("never throws on half-typed or malformed circuit input", () => {
    const fields = ["systemVoltage", "loadWatts", "loadAmps", "oneWayLengthM", "wire", "fuseA", "relay", "switchFeed", "bundled"];
    fc.assert(
      fc.property(fc.dictionary(fc.constantFrom(...fields), fc.oneof(fc.anything(), fc.double(), fc.integer())), (raw) => {
        const html = renderList([{ ...raw, kind: "circuit" }]);
        expect(html).toContain('id="field-steps-2-callouts-0"');
      }),
      { numRuns: 150 },
    );
  });
});

describe("caution and tip forms", () => {
  it("offers the four ANSI Z535.6 signal words, each with what it means", () => {
    const text = textOf(renderList([{ kind: "caution", text: "" }]));
    expect(text).toContain("Signal word (ANSI Z535.6)");
    // ANSI Z535.6: DANGER "will", WARNING "could" result in death or serious injury; CAUTION minor or moderate injury; NOTICE no injury.
    expect(text).toMatch(/DANGER A hazard that will kill or seriously injure/);
    expect(text).toMatch(/WARNING A hazard that could kill or seriously injure/);
    expect(text).toMatch(/CAUTION A hazard that could cause minor or moderate injury/);
    expect(text).toMatch(/NOTICE No risk of injury/);
  });

  it("previews a caution as the reader page draws it", () => {
    const html = renderList([{ kind: "caution", signalWord: "WARNING", text: "Orange cables carry high voltage." }]);
    expect(html).toMatch(/role="note" aria-label="WARNING"/);
    expect(hasFlag(html, "field-steps-2-callouts-0-signalWord-WARNING", "checked")).toBe(true);
  });

  it("edits a tip's text", () => {
    const html = renderList([{ kind: "tip", text: "Label both ends of each wire." }]);
    expect(tagWithId(html, "field-steps-2-callouts-0-text")).toMatch(/^<textarea/);
    expect(html).toContain("Label both ends of each wire.");
  });
});

describe("the list of callouts", () => {
  it("gives each input its path as id and shows its message beside it", () => {
    const errors = { "steps.2.callouts.1.value": "Torque value must be more than 0" };
    const html = renderList(
      [
        { kind: "tip", text: "A tip" },
        { kind: "torque", fastener: "Bolt", unit: "N·m" },
      ],
      { errors },
    );
    const input = tagWithId(html, "field-steps-2-callouts-1-value");
    expect(input).toContain('aria-invalid="true"');
    expect(input).toMatch(/aria-describedby="field-steps-2-callouts-1-value-error"/);
    expect(tagWithId(html, "field-steps-2-callouts-1-value-error")).toBeTruthy();
    expect(textOf(html)).toContain("Torque value must be more than 0");
    // The callout as a whole can be jumped to (findings name a callout, not a field).
    expect(tagWithId(html, "field-steps-2-callouts-1")).toContain('tabindex="-1"');
  });

  it("disables moving the first callout up and the last one down", () => {
    const html = renderList([
      { kind: "tip", text: "one" },
      { kind: "tip", text: "two" },
    ]);
    expect(hasFlag(html, "field-steps-2-callouts-0-up", "disabled")).toBe(true);
    expect(hasFlag(html, "field-steps-2-callouts-0-down", "disabled")).toBe(false);
    expect(hasFlag(html, "field-steps-2-callouts-1-down", "disabled")).toBe(true);
    expect(tagWithId(html, "field-steps-2-callouts-1-up")).toMatch(/aria-label="Move callout 2 up"/);
  });

  it("offers the four kinds and stops at the step's limit", () => {
    const empty = renderList([]);
    for (const kind of ["torque", "circuit", "caution", "tip"]) {
      expect(hasFlag(empty, `field-steps-2-callouts-add-${kind}`, "disabled")).toBe(false);
    }
    const full = renderList(Array.from({ length: MAX_CALLOUTS }, () => ({ kind: "tip", text: "x" })));
    expect(hasFlag(full, "field-steps-2-callouts-add-tip", "disabled")).toBe(true);
    expect(textOf(full)).toContain(`at most ${MAX_CALLOUTS} callouts`);
  });

  it("asks a lifting step for a stands caution until it has one the safety rule accepts", () => {
    const lifting = { liftsVehicle: true, disconnectsBattery: false };
    expect(textOf(renderList([], { stepFlags: lifting }))).toContain("support-caution-missing");
    expect(textOf(renderList([STANDS_CAUTION], { stepFlags: lifting }))).not.toContain("support-caution-missing");
    // The offered caution satisfies the engine's own rule, not only the editor's check.
    const step = { title: "Raise the front", liftsVehicle: true, disconnectsBattery: false };
    const callout = calloutSchema.parse(STANDS_CAUTION);
    expect(runSafetyRules({ steps: [{ ...step, callouts: [callout] }], fitmentPowertrains: ["gas"] })).toEqual([]);
    expect(runSafetyRules({ steps: [{ ...step, callouts: [] }], fitmentPowertrains: ["gas"] })[0].rule).toBe(
      "support-caution-missing",
    );
  });

  it("keeps an unknown kind removable rather than failing", () => {
    const html = renderList([{ kind: "sticker" }, "not an object"]);
    expect(textOf(html)).toContain("Callout 1: Unknown type");
    expect(tagWithId(html, "field-steps-2-callouts-1-remove")).toBeTruthy();
  });
});
