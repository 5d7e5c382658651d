import { describe, expect, it } from "vitest";
import { dropChartSvg, dropSeries, defaultLengthsM, niceStep } from "./chart";
import { checkCircuit, circuitInputSchema, resistanceOhmPerM, type CircuitInputRaw } from "./circuit";
import { findAll, parseSvg, texts } from "./svg-test-helpers";

const parse = (raw: CircuitInputRaw) => circuitInputSchema.parse(raw);

describe("drop series", () => {
  it("covers every table gauge plus a metric choice, from 0.5 m to 15 m", () => {
    const series = dropSeries(parse({ loadWatts: 110, oneWayLengthM: 5, wire: { mm2: 2.5 } }));
    expect(series.map((s) => s.label)).toEqual([
      "18 AWG",
      "16 AWG",
      "14 AWG",
      "12 AWG",
      "10 AWG",
      "8 AWG",
      "6 AWG",
      "4 AWG",
      "2.5 mm²",
    ]);
    expect(series.filter((s) => s.chosen).map((s) => s.label)).toEqual(["2.5 mm²"]);
    const lengths = series[0].points.map((p) => p.lengthM);
    expect(lengths[0]).toBe(0.5);
    expect(lengths[lengths.length - 1]).toBe(15);
  });

  it("computes each point from I·R·L", () => {
    // ASTM B258 with IACS ρ = 1/58; derived by hand: 9.17 A, 12 AWG, wire return.
    const input = parse({ loadWatts: 110, oneWayLengthM: 5 });
    const twelve = dropSeries(input, [1, 5, 10]).find((s) => s.label === "12 AWG");
    const r = resistanceOhmPerM({ awg: 12 });
    for (const p of twelve?.points ?? []) {
      expect(p.dropV).toBeCloseTo((110 / 12) * r * 2 * p.lengthM, 12);
      expect(p.dropPct).toBeCloseTo((100 * p.dropV) / 12, 12);
    }
    expect(twelve?.points).toHaveLength(3);
  });

  it("stretches the lengths to a run longer than 15 m", () => {
    expect(defaultLengthsM(22.3)).toContain(22.3);
    expect(Math.max(...defaultLengthsM(22.3))).toBe(23);
  });

  it("picks readable tick steps", () => {
    expect(niceStep(15, 6)).toBe(2.5);
    expect(niceStep(10, 5)).toBe(2);
  });
});

describe("drop chart", () => {
  // common practice: a pair of 170 W lamps on 12 AWG over 5 m, 3 % limit.
  const input = parse({ loadWatts: 170, oneWayLengthM: 5, wire: { awg: 12 }, fuseA: 20 });
  const result = checkCircuit(input);
  const root = parseSvg(dropChartSvg(input, result));

  it("is an accessible image with title and description", () => {
    expect(root.attrs.role).toBe("img");
    expect(findAll(root, "title")[0].text).toBe("Voltage drop against run length");
    expect(findAll(root, "desc")[0].text).toMatch(/12 AWG up to 2\.44 m/);
  });

  it("draws one line per size, the dashed limit and the run", () => {
    expect(findAll(root, "polyline")).toHaveLength(8);
    expect(findAll(root, "polyline").filter((p) => p.attrs.class.includes("tl-chosen"))).toHaveLength(1);
    const limit = findAll(root, "line").find((l) => l.attrs.class === "tl-limit");
    expect(limit?.attrs["stroke-dasharray"]).toBeTruthy();
    expect(limit?.attrs.y1).toBe(limit?.attrs.y2);
    expect(texts(root)).toEqual(expect.arrayContaining(["limit 3 %", "this run 5 m"]));
  });

  it("labels both axes and every size", () => {
    const all = texts(root);
    expect(all).toEqual(expect.arrayContaining(["one-way run length (m)", "voltage drop (%)"]));
    for (const awg of [18, 16, 14, 12, 10, 8, 6, 4]) expect(all).toContain(`${awg} AWG`);
  });

  it("places the limit line at the limit", () => {
    const limit = findAll(root, "line").find((l) => l.attrs.class === "tl-limit");
    const zero = findAll(root, "line").find((l) => l.attrs.class === "tl-axis" && l.attrs.y1 === l.attrs.y2);
    const topTick = findAll(root, "text").filter((t) => t.attrs.class === "tl-axis-label" && t.text.endsWith("%"));
    const yMax = Math.max(...topTick.map((t) => Number.parseFloat(t.text)));
    const top = 34;
    const expected = Number(zero?.attrs.y1) - (3 / yMax) * (Number(zero?.attrs.y1) - top);
    expect(Number(limit?.attrs.y1)).toBeCloseTo(expected, 0);
  });
});
