/** Pure helpers of the benchmark: percentiles, ratios and the printed tables. */

/**
 * The nearest-rank percentile: the smallest sample such that at least `p` per cent of the samples
 * are less than or equal to it (rank = ⌈p/100 × n⌉, counted from 1). NaN for no samples.
 */
export function percentile(samples: readonly number[], p: number): number {
  if (samples.length === 0) return Number.NaN;
  if (p <= 0) return Math.min(...samples);
  const sorted = [...samples].sort((a, b) => a - b);
  const rank = Math.ceil((p / 100) * sorted.length);
  return sorted[Math.min(rank, sorted.length) - 1];
}

export type Summary = { n: number; p50: number; p99: number; mean: number };

export function summarize(samples: readonly number[]): Summary {
  const mean = samples.length ? samples.reduce((a, b) => a + b, 0) / samples.length : Number.NaN;
  return { n: samples.length, p50: percentile(samples, 50), p99: percentile(samples, 99), mean };
}

/** `value / base`, or NaN when either is missing or the base is zero. */
export function ratio(value: number, base: number): number {
  if (!Number.isFinite(value) || !Number.isFinite(base) || base === 0) return Number.NaN;
  return value / base;
}

/** A ratio as "0.125×" (three significant figures at most, two decimals at least); "–" when unknown. */
export function formatRatio(value: number): string {
  if (!Number.isFinite(value)) return "–";
  const digits = value >= 100 ? 0 : value >= 10 ? 1 : value >= 1 ? 2 : 3;
  return `${value.toFixed(digits)}×`;
}

/** Milliseconds with a precision that suits their size: "0.412", "12.4", "310". */
export function formatMs(ms: number): string {
  if (!Number.isFinite(ms)) return "–";
  if (ms >= 100) return ms.toFixed(0);
  if (ms >= 10) return ms.toFixed(1);
  return ms.toFixed(3);
}

/** Bytes as mebibytes, e.g. "212.4 MiB". */
export function formatMiB(bytes: number): string {
  if (!Number.isFinite(bytes)) return "–";
  return `${(bytes / 1024 / 1024).toFixed(1)} MiB`;
}

/** Whether a figure meets its ceiling: "ok", "MISSED", or "–" when it is unknown. */
export function goalMark(value: number, ceiling: number): string {
  if (!Number.isFinite(value)) return "–";
  return value <= ceiling ? "ok" : "MISSED";
}

/**
 * A plain-text table: the first column left-aligned, the others right-aligned (figures), each
 * as wide as its widest cell, columns two spaces apart, a rule of dashes under the header.
 */
export function formatTable(header: readonly string[], rows: readonly (readonly string[])[]): string {
  const widths = header.map((h, i) => Math.max(h.length, ...rows.map((r) => (r[i] ?? "").length)));
  const line = (cells: readonly string[]) =>
    widths
      .map((w, i) => {
        const cell = cells[i] ?? "";
        return i === 0 ? cell.padEnd(w) : cell.padStart(w);
      })
      .join("  ")
      .trimEnd();
  return [line(header), widths.map((w) => "-".repeat(w)).join("  "), ...rows.map(line)].join("\n");
}

/** Reads `--name value` (or `--name=value`) from an argument list; `undefined` when absent. */
export function option(args: readonly string[], name: string): string | undefined {
  for (let i = 0; i < args.length; i++) {
    if (args[i] === `--${name}`) return args[i + 1];
    if (args[i].startsWith(`--${name}=`)) return args[i].slice(name.length + 3);
  }
  return undefined;
}

/** Parses the `VmRSS:` or `VmHWM:` line of /proc/<pid>/status into bytes. */
export function statusBytes(status: string, field: "VmRSS" | "VmHWM"): number {
  const match = status.match(new RegExp(`^${field}:\\s+(\\d+)\\s+kB$`, "m"));
  return match ? Number(match[1]) * 1024 : Number.NaN;
}
