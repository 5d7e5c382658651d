import { performance } from "node:perf_hooks";

/** Runs `fn` `warmup` times unmeasured, then `runs` times, and returns each run's milliseconds. */
export async function timeRuns(runs: number, fn: () => unknown, warmup = Math.min(20, Math.ceil(runs / 5))): Promise<number[]> {
  for (let i = 0; i < warmup; i++) await fn();
  const samples: number[] = [];
  for (let i = 0; i < runs; i++) {
    const started = performance.now();
    await fn();
    samples.push(performance.now() - started);
  }
  return samples;
}
