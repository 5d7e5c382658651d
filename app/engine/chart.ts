import type { CircuitInput } from "./circuit-input";
import { circuitLengthM, loadCurrentA, type CircuitResult } from "./circuit";
import { escapeXml, hashId, num } from "./format";
import { AWG_SIZES, resistanceOhmPerM, sameWire, wireLabel, type WireSize } from "./wire";

export type DropPoint = { lengthM: number; dropV: number; dropPct: number };
export type DropSeries = {
  wire: WireSize;
  label: string;
  chosen: boolean;
  ohmPerM: number;
  /** Longest one-way run that stays within the drop limit. */
  maxLengthM: number;
  points: DropPoint[];
};

export const CHART_MIN_SPAN_M = 15;

/** 0.5 m steps over at least 15 m, stretched to include the actual run. */
export function defaultLengthsM(oneWayLengthM: number): number[] {
  const span = Math.max(CHART_MIN_SPAN_M, Math.ceil(oneWayLengthM));
  const lengths = Array.from({ length: span * 2 }, (_, i) => (i + 1) / 2);
  if (!lengths.includes(oneWayLengthM)) lengths.push(oneWayLengthM);
  return lengths.sort((a, b) => a - b);
}

export function maxRunLengthM(input: CircuitInput, wire: WireSize): number {
  const perMetreOneWay = circuitLengthM({ oneWayLengthM: 1, returnPath: input.returnPath });
  const limitV = (input.dropLimitPct / 100) * input.systemVoltage;
  return limitV / (loadCurrentA(input) * resistanceOhmPerM(wire, input.conductorTempC) * perMetreOneWay);
}

export function dropSeries(input: CircuitInput, lengthsM: number[] = defaultLengthsM(input.oneWayLengthM)): DropSeries[] {
  const currentA = loadCurrentA(input);
  const wires: WireSize[] = AWG_SIZES.map((awg) => ({ awg }));
  if (input.wire && !wires.some((w) => sameWire(w, input.wire as WireSize))) wires.push(input.wire);
  return wires.map((wire) => {
    const ohmPerM = resistanceOhmPerM(wire, input.conductorTempC);
    return {
      wire,
      label: wireLabel(wire),
      chosen: input.wire !== undefined && sameWire(wire, input.wire),
      ohmPerM,
      maxLengthM: maxRunLengthM(input, wire),
      points: lengthsM.map((lengthM) => {
        const dropV = currentA * ohmPerM * circuitLengthM({ oneWayLengthM: lengthM, returnPath: input.returnPath });
        return { lengthM, dropV, dropPct: (100 * dropV) / input.systemVoltage };
      }),
    };
  });
}

/** Steps of 1, 2, 2.5 or 5 × 10ⁿ give tick labels people read at a glance. */
export function niceStep(span: number, targetTicks = 5): number {
  const raw = span / targetTicks;
  const power = 10 ** Math.floor(Math.log10(raw));
  const step = [1, 2, 2.5, 5, 10].find((m) => m * power >= raw) ?? 10;
  return step * power;
}

function niceCeil(value: number): number {
  const step = niceStep(value);
  return Math.ceil(value / step - 1e-9) * step;
}

const W = 640;
const H = 280;
const PLOT = { left: 56, right: 560, top: 34, bottom: 232 };
const LABEL_GAP_Y = 11;
const CHAR_WIDTH = 6.2;

/** Labels whose natural positions crowd are pushed apart along one axis, in order. */
function spread(positions: number[], minGap: number[]): number[] {
  const out = [...positions];
  for (let i = 1; i < out.length; i++) out[i] = Math.max(out[i], out[i - 1] + minGap[i]);
  return out;
}

export function dropChartSvg(input: CircuitInput, result: CircuitResult, options: { idPrefix?: string } = {}): string {
  const id = options.idPrefix ?? `tl-dc-${hashId(JSON.stringify(input))}`;
  const series = dropSeries(input);
  const marked = input.wire ?? (result.minWire.awg !== null ? { awg: result.minWire.awg } : undefined);
  const limit = input.dropLimitPct;
  const markedDrop = result.chosen?.dropPct ?? result.candidates.find((c) => marked && sameWire(c.wire, marked))?.dropPct ?? 0;
  const xMax = niceCeil(Math.max(CHART_MIN_SPAN_M, input.oneWayLengthM));
  const yMax = niceCeil(Math.min(Math.max(3 * limit, markedDrop * 1.15), 10 * limit));
  const x = (m: number) => PLOT.left + (m / xMax) * (PLOT.right - PLOT.left);
  const y = (pct: number) => PLOT.bottom - (pct / yMax) * (PLOT.bottom - PLOT.top);
  const t = (px: number, py: number, s: string, cls: string, anchor = "middle") =>
    `<text class="${cls}" x="${num(px, 1)}" y="${num(py, 1)}" text-anchor="${anchor}" fill="currentColor" stroke="none">${escapeXml(s)}</text>`;
  const parts: string[] = [];

  const xStep = niceStep(xMax, 6);
  for (let v = 0; v <= xMax + 1e-9; v += xStep) {
    parts.push(`<line class="tl-tick" x1="${num(x(v), 1)}" y1="${PLOT.bottom}" x2="${num(x(v), 1)}" y2="${PLOT.bottom + 4}"/>`);
    parts.push(t(x(v), PLOT.bottom + 16, num(v, 1), "tl-axis-label"));
  }
  const yStep = niceStep(yMax, 5);
  for (let v = 0; v <= yMax + 1e-9; v += yStep) {
    parts.push(
      `<line class="tl-grid" x1="${PLOT.left}" y1="${num(y(v), 1)}" x2="${PLOT.right}" y2="${num(y(v), 1)}" stroke-width="0.5" opacity="0.3"/>`,
    );
    parts.push(t(PLOT.left - 6, y(v) + 4, `${num(v, 1)} %`, "tl-axis-label", "end"));
  }
  parts.push(`<line class="tl-axis" x1="${PLOT.left}" y1="${PLOT.bottom}" x2="${PLOT.right}" y2="${PLOT.bottom}"/>`);
  parts.push(`<line class="tl-axis" x1="${PLOT.left}" y1="${PLOT.top}" x2="${PLOT.left}" y2="${PLOT.bottom}"/>`);
  parts.push(t((PLOT.left + PLOT.right) / 2, H - 8, "one-way run length (m)", "tl-axis-title"));
  parts.push(
    `<text class="tl-axis-title" transform="translate(14 ${(PLOT.top + PLOT.bottom) / 2}) rotate(-90)" text-anchor="middle" fill="currentColor" stroke="none">voltage drop (%)</text>`,
  );

  const clip = `${id}-clip`;
  parts.push(
    `<clipPath id="${clip}"><rect x="${PLOT.left}" y="${PLOT.top}" width="${PLOT.right - PLOT.left}" height="${PLOT.bottom - PLOT.top}"/></clipPath>`,
  );
  const top: { pos: number; label: string }[] = [];
  const side: { pos: number; label: string }[] = [];
  for (const s of series) {
    const pts = [{ lengthM: 0, dropPct: 0 }, ...s.points].map((p) => `${num(x(p.lengthM), 1)},${num(y(p.dropPct), 1)}`);
    const isMarked = marked !== undefined && sameWire(s.wire, marked);
    parts.push(
      `<polyline class="${isMarked ? "tl-series tl-chosen" : "tl-series"}" clip-path="url(#${clip})" points="${pts.join(" ")}" stroke-width="${isMarked ? 3 : 1.5}" opacity="${isMarked ? 1 : 0.7}"/>`,
    );
    const slope = s.points[s.points.length - 1].dropPct / s.points[s.points.length - 1].lengthM;
    const end = slope * xMax;
    if (end <= yMax) side.push({ pos: y(end) + 4, label: s.label });
    else top.push({ pos: x(yMax / slope), label: s.label });
  }
  top.sort((a, b) => a.pos - b.pos);
  const topX = spread(
    top.map((l) => l.pos),
    top.map((l, i) => (i === 0 ? 0 : ((top[i - 1].label.length + l.label.length) * CHAR_WIDTH) / 2 + 8)),
  );
  parts.push(...top.map((l, i) => t(topX[i], PLOT.top - 6, l.label, "tl-series-label")));
  side.sort((a, b) => a.pos - b.pos);
  const sideY = spread(
    side.map((l) => l.pos),
    side.map(() => LABEL_GAP_Y),
  );
  parts.push(...side.map((l, i) => t(PLOT.right + 6, sideY[i], l.label, "tl-series-label", "start")));

  parts.push(
    `<line class="tl-limit" x1="${PLOT.left}" y1="${num(y(limit), 1)}" x2="${PLOT.right}" y2="${num(y(limit), 1)}" stroke-dasharray="6 4"/>`,
  );
  parts.push(t(PLOT.left + 6, y(limit) - 5, `limit ${num(limit)} %`, "tl-limit-label", "start"));
  const runX = x(input.oneWayLengthM);
  const nearRight = runX > PLOT.right - 90;
  parts.push(
    `<line class="tl-run" x1="${num(runX, 1)}" y1="${PLOT.top}" x2="${num(runX, 1)}" y2="${PLOT.bottom}" stroke-dasharray="2 3" stroke-width="1"/>`,
  );
  parts.push(
    t(
      runX + (nearRight ? -4 : 4),
      PLOT.bottom - 6,
      `this run ${num(input.oneWayLengthM)} m`,
      "tl-run-label",
      nearRight ? "end" : "start",
    ),
  );
  if (marked && markedDrop <= yMax) {
    parts.push(
      `<circle class="tl-marker" cx="${num(runX, 1)}" cy="${num(y(markedDrop), 1)}" r="4" fill="currentColor" stroke="none"/>`,
    );
  }

  const ret = input.returnPath === "wire" ? "a return wire" : "a chassis return";
  const reach = series.map((s) => `${s.label} up to ${num(s.maxLengthM)} m`).join("; ");
  const desc =
    `Voltage drop in percent of ${input.systemVoltage} V against one-way run length, at ${num(result.currentA)} A with ${ret}. ` +
    `The ${num(limit)} % limit is reached at: ${reach}. This run is ${num(input.oneWayLengthM)} m` +
    (marked ? `; ${wireLabel(marked)} drops ${num(markedDrop)} % here.` : ".");

  return [
    `<svg xmlns="http://www.w3.org/2000/svg" class="tl-chart" viewBox="0 0 ${W} ${H}" width="${W}" height="${H}" role="img" aria-labelledby="${id}-title ${id}-desc" fill="none" stroke="currentColor" stroke-width="1" font-family="system-ui, sans-serif" font-size="10">`,
    `<title id="${id}-title">Voltage drop against run length</title>`,
    `<desc id="${id}-desc">${escapeXml(desc)}</desc>`,
    ...parts,
    `</svg>`,
  ].join("");
}
