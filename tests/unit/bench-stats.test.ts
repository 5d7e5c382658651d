import { describe, expect, it } from "vitest";
import {
  formatMs,
  formatRatio,
  formatTable,
  goalMark,
  option,
  percentile,
  ratio,
  statusBytes,
  summarize,
} from "../../bench/stats";

describe("the benchmark's percentile (nearest rank)", () => {
  // Source: the worked examples of the nearest-rank method in Wikipedia's "Percentile" article.
  // By hand, rank = ⌈p/100 × n⌉: for n = 5, p5 → ⌈0.25⌉ = 1 (15), p30 → ⌈1.5⌉ = 2 (20),
  // p40 → ⌈2⌉ = 2 (20), p50 → ⌈2.5⌉ = 3 (35), p100 → 5 (50).
  it("matches the five-value worked example", () => {
    const list = [50, 15, 40, 20, 35];
    expect([5, 30, 40, 50, 100].map((p) => percentile(list, p))).toEqual([15, 20, 20, 35, 50]);
  });

  // Same source, ten values: p25 → ⌈2.5⌉ = 3 (7), p50 → ⌈5⌉ = 5 (8), p75 → ⌈7.5⌉ = 8 (15), p100 → 10 (20).
  it("matches the ten-value worked example", () => {
    const list = [20, 3, 16, 6, 15, 7, 13, 8, 10, 8];
    expect([25, 50, 75, 100].map((p) => percentile(list, p))).toEqual([7, 8, 15, 20]);
  });

  // By hand: of 1…1000, p99 has rank ⌈990⌉ = 990 and p50 rank 500; the mean is 1001 / 2 = 500.5.
  it("summarises samples as p50, p99 and mean, whatever their order", () => {
    const samples = Array.from({ length: 1000 }, (_, i) => ((i * 7919) % 1000) + 1);
    expect(summarize(samples)).toEqual({ n: 1000, p50: 500, p99: 990, mean: 500.5 });
    expect(Number.isNaN(percentile([], 50))).toBe(true);
  });
});

describe("the benchmark's ratios and figures", () => {
  // By hand: 1250 / 10000 = 0.125; 3 / 2 = 1.5; 37.5 / 2.5 = 15.
  it("prints ratios with a precision that suits their size, and a dash when unknown", () => {
    expect(formatRatio(ratio(1250, 10000))).toBe("0.125×");
    expect(formatRatio(ratio(3, 2))).toBe("1.50×");
    expect(formatRatio(ratio(37.5, 2.5))).toBe("15.0×");
    expect(formatRatio(ratio(5, 0))).toBe("–");
    expect(formatMs(0.41249)).toBe("0.412");
    expect(formatMs(12.44)).toBe("12.4");
    expect(formatMs(Number.NaN)).toBe("–");
  });

  it("marks a figure against its ceiling, the ceiling itself included", () => {
    expect([goalMark(15, 15), goalMark(15.1, 15), goalMark(Number.NaN, 15)]).toEqual(["ok", "MISSED", "–"]);
  });

  it("lays out a table: first column left, figures right, two spaces apart, a rule under the header", () => {
    const table = formatTable(
      ["target", "req/s"],
      [
        ["bare page", "9000"],
        ["Library", "850"],
      ],
    );
    expect(table).toBe(["target     req/s", "---------  -----", "bare page   9000", "Library      850"].join("\n"));
  });

  // By hand: 123456 kB × 1024 = 126,418,944 bytes.
  it("reads VmRSS and VmHWM from /proc/<pid>/status", () => {
    const status = "Name:\tnode\nVmHWM:\t  123456 kB\nVmRSS:\t   65536 kB\n";
    expect(statusBytes(status, "VmHWM")).toBe(126_418_944);
    expect(statusBytes(status, "VmRSS")).toBe(67_108_864);
    expect(Number.isNaN(statusBytes("Name:\tnode\n", "VmRSS"))).toBe(true);
  });

  it("reads --name value and --name=value", () => {
    expect(option(["--quick", "--scale", "/tmp/s.db"], "scale")).toBe("/tmp/s.db");
    expect(option(["--guides=20000"], "guides")).toBe("20000");
    expect(option(["--quick"], "scale")).toBeUndefined();
  });
});
