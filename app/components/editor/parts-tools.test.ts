import { describe, expect, it } from "vitest";
import { type PartRow, PartsEditor, stepOptions, ToolsEditor } from "./parts-tools";
import { hasFlag, noop, render, tagWithId, textOf } from "./render-test-support";

const steps = ["Disconnect the battery", "Run the feed", "Fit the switch"];
const renderParts = (parts: PartRow[], errors: Record<string, string> = {}) =>
  render(PartsEditor, { parts, onChange: noop, stepTitles: steps, path: "parts", errors });

describe("the parts list", () => {
  it("shows each part's fields under its path's ids, with the step that uses it chosen", () => {
    const html = renderParts([
      { name: "Inline fuse holder", quantity: 1, partNumber: "TL-FH-30", notes: "", stepIndex: 1 },
      { name: "Heat-shrink butt connectors", quantity: 6, partNumber: null, notes: "Adhesive lined", stepIndex: null },
    ]);
    expect(tagWithId(html, "field-parts-0-name")).toContain('value="Inline fuse holder"');
    expect(tagWithId(html, "field-parts-1-quantity")).toContain('value="6"');
    expect(tagWithId(html, "field-parts-1-notes")).toContain('value="Adhesive lined"');
    expect(html).toMatch(/<option value="1" selected="">Step 2: Run the feed<\/option>/);
    expect(html).toMatch(/<select id="field-parts-1-stepIndex"[^>]*>\s*<option value="" selected="">Not tied to a step/);
  });

  it("keeps a part's step visible when that step is gone, so nothing changes unseen", () => {
    expect(stepOptions(steps, 5).at(-1)).toEqual({ value: "5", label: "Step 6 (no longer in the guide)" });
    expect(stepOptions(["", " Wire up "], null).map((o) => o.label)).toEqual(["Not tied to a step", "Step 1", "Step 2: Wire up"]);
  });

  it("shows a message beside its field", () => {
    const html = renderParts([{ name: "", quantity: 1, stepIndex: null }], {
      "parts.0.name": "Name the part",
      "parts.0.stepIndex": "This part points at a step that does not exist",
    });
    expect(tagWithId(html, "field-parts-0-name")).toContain('aria-invalid="true"');
    expect(tagWithId(html, "field-parts-0-stepIndex")).toContain('aria-describedby="field-parts-0-stepIndex-error"');
    expect(textOf(html)).toContain("Name the part");
  });

  it("gives every input and button a target of at least 44 px and stacks on a narrow screen", () => {
    const html = renderParts([{ name: "Relay, 40 A", quantity: 1, stepIndex: 2 }]);
    // WCAG 2.2 SC 2.5.5 asks 44 × 44 CSS px; Tailwind's min-h-11 is 11 × 0.25 rem = 2.75 rem = 44 px at the default 16 px.
    for (const tag of html.match(/<(input|select|textarea|button)\b[^>]*>/g) ?? []) {
      if (tag.includes('type="hidden"')) continue;
      expect(tag).toMatch(/min-h-11/);
    }
    for (const button of html.match(/<button\b[^>]*>/g) ?? []) expect(button).toMatch(/min-h-11/);
    // One column by default; the four-column row only from Tailwind's md breakpoint (768 px) up.
    expect(html).toContain("grid-cols-[5.5rem_minmax(0,1fr)]");
    expect(html).toContain("md:grid-cols-[minmax(0,2fr)_5.5rem_minmax(0,1fr)_minmax(0,1fr)]");
  });

  it("offers to add a part and says when there are none", () => {
    const html = renderParts([]);
    expect(textOf(html)).toContain("No parts yet.");
    expect(hasFlag(html, "field-parts-add", "disabled")).toBe(false);
  });
});

describe("the tools list", () => {
  it("lists the tools with move and remove buttons named for each row", () => {
    const html = render(ToolsEditor, {
      tools: [{ name: "Torque wrench, 5–60 N·m" }, { name: "Wire stripper" }],
      onChange: noop,
      path: "tools",
      errors: { "tools.1.name": "Name the tool" },
    });
    expect(tagWithId(html, "field-tools-0-name")).toContain('value="Torque wrench, 5–60 N·m"');
    expect(tagWithId(html, "field-tools-1-name")).toContain('aria-invalid="true"');
    expect(html).toContain('aria-label="Move tool 2 up"');
    expect(html).toContain('aria-label="Remove tool 1"');
    expect(hasFlag(html, "field-tools-1-down", "disabled")).toBe(true);
  });
});
