import { isValidElement, type ReactElement, type ReactNode } from "react";
import { describe, expect, it } from "vitest";
import { calloutSchema } from "~/engine/callouts";
import { type Finding, runSafetyRules } from "~/engine/rules";
import { SOURCES } from "~/engine/sources";
import { EditorSafetyNotice } from "./safety-notice";
import { FindingsPanel, findingPath, numbersWords, sortFindings } from "./findings-panel";
import { render, textOf } from "./render-test-support";

/** Findings from the real engine for a draft with three problems: a fuse too large for its wire, a lift without a stands caution, and a hybrid without a high-voltage warning. */
function draftFindings(): Finding[] {
  const circuit = calloutSchema.parse({
    kind: "circuit",
    feed: "battery",
    loadAmps: 8,
    oneWayLengthM: 2,
    location: "engine-bay",
    wire: { awg: 18 },
    fuseA: 30,
    relay: false,
  });
  return runSafetyRules({
    steps: [
      { title: "Raise the front", liftsVehicle: true, disconnectsBattery: false, callouts: [] },
      { title: "Run the feed", liftsVehicle: false, disconnectsBattery: true, callouts: [circuit] },
    ],
    fitmentPowertrains: ["hybrid"],
  });
}

function buttonsOf(node: ReactNode): ReactElement<{ onClick: () => void; children: ReactNode }>[] {
  if (Array.isArray(node)) return node.flatMap(buttonsOf);
  if (!isValidElement<{ children?: ReactNode }>(node)) return [];
  const own = node.type === "button" ? [node as ReactElement<{ onClick: () => void; children: ReactNode }>] : [];
  return [...own, ...buttonsOf(node.props.children)];
}

describe("the findings panel", () => {
  it("lists each finding with its severity in words, rule, place, numbers and source", () => {
    const text = textOf(render(FindingsPanel, { findings: draftFindings(), onJump: () => {} }));
    expect(text).toContain("3 blocking, 1 warning.");
    // ASTM B258: 18 AWG is 1.024 mm across, 0.823 mm², so 1/58 ÷ 0.823 = 20.9 mΩ/m (IACS copper);
    // 8 A over 2 × 2 m drops 0.67 V, 5.6 % of 12 V, over the 3 % limit (engine.md §1).
    expect(text).toContain("Warning Step 2, callout 1 rule drop-over-limit");
    expect(text).toContain("drop 0.67 V · drop 5.59 %");
    expect(text).toContain("Blocking Step 2, callout 1 rule fuse-exceeds-wire");
    // 33 CFR 183.425 Table 5: 18 AWG, 105 °C, × 0.85 in the engine space = 17 A; 183.455(c)(1): 150 % → 25.5 A.
    expect(text).toContain("Numbers: fuse 30 A · wire ampacity 17 A · largest fuse for the wire (150 %) 25.5 A");
    expect(text).toContain(`Source: ${SOURCES["cfr-183-455"].title}.`);
    expect(text).toContain("Blocking Step 1 rule support-caution-missing");
    expect(text).toContain("rule hv-caution-missing");
    expect(text).toContain(`Source: ${SOURCES["common-practice"].title}.`);
  });

  it("puts the most serious first, then by step", () => {
    const findings: Finding[] = [
      { rule: "relay-recommended", severity: "info", stepIndex: 0, calloutIndex: 0, message: "m", source: "common-practice" },
      { rule: "drop-over-limit", severity: "warning", stepIndex: 3, calloutIndex: 1, message: "m", source: "common-practice" },
      { rule: "no-fuse", severity: "blocking", stepIndex: 4, calloutIndex: 0, message: "m", source: "common-practice" },
      { rule: "support-caution-missing", severity: "blocking", stepIndex: 2, message: "m", source: "common-practice" },
    ];
    expect(sortFindings(findings).map((f) => f.rule)).toEqual([
      "support-caution-missing",
      "no-fuse",
      "drop-over-limit",
      "relay-recommended",
    ]);
    const text = textOf(render(FindingsPanel, { findings, onJump: () => {} }));
    expect(text).toContain("2 blocking, 1 warning, 1 info.");
    expect(text.indexOf("Warning")).toBeLessThan(text.indexOf("Info"));
  });

  it("jumps to the callout when the finding names one, else to the step", () => {
    const findings = sortFindings(draftFindings());
    const jumps: string[] = [];
    const panel = FindingsPanel({ findings, onJump: (path) => jumps.push(path) });
    const buttons = buttonsOf(panel);
    expect(buttons).toHaveLength(findings.length);
    for (const button of buttons) button.props.onClick();
    expect(jumps).toEqual(findings.map(findingPath));
    expect(jumps).toContain("steps.1.callouts.0");
    expect(jumps).toContain("steps.0");
    expect(findingPath({ stepIndex: 4 })).toBe("steps.4");
  });

  it("says when there is nothing to fix", () => {
    expect(textOf(render(FindingsPanel, { findings: [], onJump: () => {} }))).toContain("No safety findings.");
  });

  it("writes numbers with their units, rounded for the screen only", () => {
    expect(numbersWords({ dropV: 0.30012, dropPct: 2.501, lengthM: 10, fuseDistanceMm: 250 })).toBe(
      "drop 0.3\u00a0V · drop 2.5\u00a0% · wire length 10\u00a0m · fuse to battery 250\u00a0mm",
    );
    expect(numbersWords(undefined)).toBe("");
  });
});

describe("the editor's standing safety notice", () => {
  it("carries the reader pages' notice: the maker's instructions, local codes, a qualified technician for high voltage and airbags", () => {
    const text = textOf(render(EditorSafetyNotice, {}));
    expect(text).toContain("Follow the vehicle maker's instructions and torque values, local codes and licensed practice.");
    expect(text).toMatch(/qualified technician do or check work on high-voltage systems \(orange cables\) and near airbags/);
    expect(text).toContain("never work under a vehicle held only by a jack");
  });
});
