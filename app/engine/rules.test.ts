import { describe, expect, it } from "vitest";
import { calloutSchema, type Callout } from "./callouts";
import { cautionUnsignedFindings, fittingPowertrains, runSafetyRules, type Powertrain, type RevisionStep } from "./rules";

const callout = (raw: unknown): Callout => calloutSchema.parse(raw);
const step = (over: Partial<RevisionStep> = {}): RevisionStep => ({
  title: "Step",
  liftsVehicle: false,
  disconnectsBattery: false,
  callouts: [],
  ...over,
});
// A sound circuit: 110 W, 10 AWG, 15 A fuse, 5 m, as in the engine.md §4 example.
const goodCircuit = callout({ kind: "circuit", loadWatts: 110, oneWayLengthM: 5, wire: { awg: 10 }, fuseA: 15, label: "Lamps" });
const disconnect = step({ title: "Disconnect the battery", disconnectsBattery: true });
const hvWarning = callout({ kind: "caution", signalWord: "WARNING", text: "Never touch the orange high-voltage cables." });
const rulesOf = (steps: RevisionStep[], fitmentPowertrains: Powertrain[] = ["gas"]) =>
  runSafetyRules({ steps, fitmentPowertrains }).map((f) => f.rule);

describe("circuit findings inside a revision", () => {
  it("carry the step and callout they belong to", () => {
    const unfused = callout({ kind: "circuit", loadWatts: 110, oneWayLengthM: 5, wire: { awg: 10 }, fuseA: null });
    const findings = runSafetyRules({
      steps: [disconnect, step({ callouts: [goodCircuit, unfused] })],
      fitmentPowertrains: ["gas"],
    });
    expect(findings).toEqual([expect.objectContaining({ rule: "no-fuse", stepIndex: 1, calloutIndex: 1, severity: "blocking" })]);
    expect(findings[0].message).toMatch(/^Step 2, a circuit: No fuse/);
  });

  it("stay silent for a sound circuit", () => {
    expect(rulesOf([disconnect, step({ callouts: [goodCircuit] })])).toEqual([]);
  });
});

describe("hv-caution-missing", () => {
  // common practice: electrical work near a traction system is flagged for a high-voltage warning.
  const work = step({ callouts: [goodCircuit] });

  it("fires for a hybrid fitment without a high-voltage warning", () => {
    const findings = runSafetyRules({ steps: [disconnect, work], fitmentPowertrains: ["gas", "hybrid"] });
    expect(findings).toEqual([expect.objectContaining({ rule: "hv-caution-missing", severity: "blocking", stepIndex: 1 })]);
  });

  it("is satisfied by a DANGER or WARNING that mentions high voltage", () => {
    expect(rulesOf([step({ callouts: [hvWarning] }), disconnect, work], ["electric"])).toEqual([]);
    const danger = callout({ kind: "caution", signalWord: "DANGER", text: "The HV system stays live after shutdown." });
    expect(rulesOf([disconnect, step({ callouts: [danger, goodCircuit] })], ["plug-in-hybrid"])).toEqual([]);
  });

  it("is not satisfied by a lesser signal word", () => {
    // ANSI Z535.6: CAUTION and NOTICE signal less severe hazards than DANGER and WARNING.
    const notice = callout({ kind: "caution", signalWord: "NOTICE", text: "Mind the high-voltage cables." });
    expect(rulesOf([disconnect, step({ callouts: [notice, goodCircuit] })], ["hybrid"])).toContain("hv-caution-missing");
  });

  it("does not fire without electrical work or for gas and diesel only", () => {
    expect(rulesOf([step()], ["hybrid"])).toEqual([]);
    expect(rulesOf([disconnect, work], ["gas", "diesel"])).toEqual([]);
  });
});

describe("battery-disconnect-missing", () => {
  // common practice: disconnect the battery before connecting to it.
  const work = step({ callouts: [goodCircuit] });

  it("fires when no step up to the circuit disconnects the battery", () => {
    const findings = runSafetyRules({ steps: [work, disconnect], fitmentPowertrains: ["gas"] });
    expect(findings).toEqual([
      expect.objectContaining({ rule: "battery-disconnect-missing", severity: "warning", stepIndex: 0, calloutIndex: 0 }),
    ]);
    expect(findings[0].message).toMatch(/"Lamps"/);
  });

  it("accepts an earlier step or the same step", () => {
    expect(rulesOf([disconnect, work])).toEqual([]);
    expect(rulesOf([step({ disconnectsBattery: true, callouts: [goodCircuit] })])).toEqual([]);
  });

  it("ignores circuits fed from the fuse box", () => {
    const fromFuseBox = callout({
      kind: "circuit",
      loadAmps: 2,
      oneWayLengthM: 2,
      wire: { awg: 18 },
      fuseA: 5,
      feed: "fuse-box",
    });
    expect(rulesOf([step({ callouts: [fromFuseBox] })])).toEqual([]);
  });
});

describe("support-caution-missing", () => {
  // common practice: a lifted vehicle is supported on stands before anyone works under it.
  it("fires for a lifting step without a support caution", () => {
    const findings = runSafetyRules({
      steps: [step({ title: "Raise the front", liftsVehicle: true })],
      fitmentPowertrains: ["gas"],
    });
    expect(findings).toEqual([expect.objectContaining({ rule: "support-caution-missing", severity: "blocking", stepIndex: 0 })]);
  });

  it("is satisfied by a caution about stands in the same step", () => {
    const stands = callout({ kind: "caution", signalWord: "WARNING", text: "Support the vehicle on rated stands." });
    expect(rulesOf([step({ liftsVehicle: true, callouts: [stands] })])).toEqual([]);
  });

  it("does not count other words or other steps", () => {
    const vague = callout({ kind: "caution", signalWord: "CAUTION", text: "Understand the jack before use." });
    const stands = callout({ kind: "caution", signalWord: "WARNING", text: "Use axle stands." });
    expect(rulesOf([step({ liftsVehicle: true, callouts: [vague] })])).toContain("support-caution-missing");
    expect(rulesOf([step({ callouts: [stands] }), step({ liftsVehicle: true })])).toContain("support-caution-missing");
    expect(rulesOf([step({ liftsVehicle: false })])).toEqual([]);
  });
});

describe("caution-unsigned", () => {
  // Torqueleaf review policy: every caution needs an editor's sign-off before approval.
  it("fires for each caution without a sign-off", () => {
    const findings = cautionUnsignedFindings([
      { signedOff: true, stepIndex: 0, calloutIndex: 0 },
      { signedOff: false, stepIndex: 2, calloutIndex: 1, signalWord: "WARNING" },
    ]);
    expect(findings).toEqual([
      expect.objectContaining({ rule: "caution-unsigned", severity: "blocking", stepIndex: 2, calloutIndex: 1 }),
    ]);
    expect(findings[0].message).toMatch(/Step 3: a WARNING callout/);
  });

  it("is silent when all are signed", () => {
    expect(cautionUnsignedFindings([{ signedOff: true, stepIndex: 0 }])).toEqual([]);
  });
});

describe("fittingPowertrains", () => {
  it("takes each fitting variant's powertrain once, leaves out does-not-fit and unknown variants", () => {
    // engine.md §3: the high-voltage rule looks at the variants a guide is said to fit.
    expect(
      fittingPowertrains([
        { status: "fits", powertrain: "gas" },
        { status: "fits-with-changes", powertrain: "hybrid" },
        { status: "fits", powertrain: "gas" },
        { status: "does-not-fit", powertrain: "electric" },
        { status: "fits", powertrain: undefined },
      ]),
    ).toEqual(["gas", "hybrid"]);
  });
});
