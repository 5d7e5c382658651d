import { describe, expect, it } from "vitest";
import { checkCircuit, circuitInputSchema, type CircuitInputRaw } from "./circuit";
import { wiringDiagramSvg } from "./diagram";
import { findAll, parseSvg, texts } from "./svg-test-helpers";

function draw(raw: CircuitInputRaw, extra: { label?: string } = {}) {
  const input = { ...circuitInputSchema.parse(raw), ...extra };
  const svg = wiringDiagramSvg(input, checkCircuit(input));
  return { svg, root: parseSvg(svg) };
}

describe("wiring diagram", () => {
  // common practice: 170 W of lamps at 12 V (14.2 A) on a relay with a 20 A fuse and 12 AWG.
  const lamps = { loadWatts: 170, oneWayLengthM: 3, wire: { awg: 12 }, fuseA: 20, relay: true } as const;

  it("is an accessible image with a title and a description it points to", () => {
    const { root } = draw(lamps, { label: "Roof lamps" });
    expect(root.attrs.role).toBe("img");
    const title = findAll(root, "title")[0];
    const desc = findAll(root, "desc")[0];
    expect(title.text).toBe("Wiring diagram: Roof lamps");
    expect(desc.text).toMatch(/20 A fuse/);
    expect(root.attrs["aria-labelledby"]).toBe(`${title.attrs.id} ${desc.attrs.id}`);
    expect(root.attrs.viewBox).toBe("0 0 640 280");
  });

  it("numbers the relay terminals per DIN 72552", () => {
    // DIN 72552: 30 supply, 87 load, 85 and 86 coil.
    const { root } = draw(lamps);
    const terminals = findAll(root, "text")
      .filter((t) => t.attrs.class === "tl-terminal")
      .map((t) => t.text);
    expect(terminals).toEqual(expect.arrayContaining(["30", "87", "85", "86"]));
    expect(texts(root)).toContain("RELAY");
    expect(findAll(root, "desc")[0].text).toMatch(/terminal 30.*87.*86.*85/);
  });

  it("labels the fuse rating and every wire segment with the chosen size", () => {
    const { root } = draw(lamps);
    expect(texts(root)).toContain("20 A fuse");
    const sizes = findAll(root, "text")
      .filter((t) => t.attrs.class === "tl-size")
      .map((t) => t.text);
    expect(sizes.length).toBeGreaterThanOrEqual(4);
    expect(new Set(sizes)).toEqual(new Set(["12 AWG", "12 AWG return"]));
  });

  it("puts the switch in line when there is no relay", () => {
    // common practice: a 5 A load within a 10 A switch rating needs no relay.
    const { root } = draw({ loadAmps: 5, oneWayLengthM: 2, returnPath: "chassis" });
    const all = texts(root);
    expect(all).toContain("SWITCH");
    expect(all).not.toContain("RELAY");
    expect(all).not.toContain("87");
    expect(findAll(root, "desc")[0].text).toMatch(/through the switch to the load.*chassis/);
  });

  it("shows the minimum size and the recommended fuse when none is chosen", () => {
    // Derived from engine.md §1: 5 A continuous → 6.25 A → 7.5 A fuse (NEC 210.20(A), ISO 8820-3).
    const { root } = draw({ loadAmps: 5, oneWayLengthM: 2 });
    expect(texts(root)).toEqual(expect.arrayContaining(["7.5 A fuse", "recommended"]));
    expect(texts(root).some((t) => /^\d+ AWG min\.$/.test(t))).toBe(true);
  });

  it("marks a missing fuse", () => {
    const { root } = draw({ loadAmps: 5, oneWayLengthM: 2, fuseA: null });
    const missing = findAll(root, "text").find((t) => t.text === "NO FUSE");
    expect(missing?.attrs.class).toMatch(/tl-alert/);
  });

  it("draws a relay when one is needed and the author has not said", () => {
    const { relay: _relay, ...unsaid } = lamps;
    expect(texts(draw(unsaid).root)).toContain("RELAY");
    expect(texts(draw({ ...unsaid, relay: false }).root)).not.toContain("RELAY");
  });

  it("escapes the author's label", () => {
    const { svg, root } = draw(lamps, { label: `<script>alert("x")</script> & co` });
    expect(svg).not.toContain("<script>");
    expect(findAll(root, "title")[0].text).toBe(`Wiring diagram: <script>alert("x")</script> & co`);
  });

  it("draws in currentColor so the page sets the colour", () => {
    const { root } = draw(lamps);
    expect(root.attrs.stroke).toBe("currentColor");
    expect(findAll(root, "text").every((t) => t.attrs.fill === "currentColor")).toBe(true);
  });
});
