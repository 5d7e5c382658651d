import { performance } from "node:perf_hooks";

/**
 * Runs `fn` `warmup` times unmeasured, then up to `runs` times, and returns each run's milliseconds.
 * With `budgetMs`, stops early once that much time has gone on measured runs (after at least one),
 * so a slow case still ends in bounded time; the caller prints how many runs there were.
 */
export async function timeRuns(
  runs: number,
  fn: () => unknown,
  warmup = Math.min(20, Math.ceil(runs / 5)),
  budgetMs = Number.POSITIVE_INFINITY,
): Promise<number[]> {
  for (let i = 0; i < warmup; i++) await fn();
  const samples: number[] = [];
  const started = performance.now();
  for (let i = 0; i < runs; i++) {
    const before = performance.now();
    await fn();
    samples.push(performance.now() - before);
    if (performance.now() - started > budgetMs) break;
  }
  return samples;
}
