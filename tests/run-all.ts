import { spawnSync } from "node:child_process";

/**
 * `npm test`: every check in turn, each timed; all of them run even after a failure, a table of
 * times and results follows, and the exit code is non-zero when any step failed.
 */
const steps: [name: string, script: string][] = [
  ["typecheck", "typecheck"],
  ["lint", "lint"],
  ["unit", "test:unit"],
  ["integration", "test:integration"],
  ["e2e", "test:e2e"],
];

const npm = process.platform === "win32" ? "npm.cmd" : "npm";
const results: { name: string; seconds: number; ok: boolean }[] = [];
const total = Date.now();
for (const [name, script] of steps) {
  console.log(`\n▶ ${name} (npm run ${script})`);
  const started = Date.now();
  const run = spawnSync(npm, ["run", "--silent", script], { stdio: "inherit" });
  results.push({ name, seconds: (Date.now() - started) / 1000, ok: run.status === 0 });
}

const width = Math.max(...results.map((r) => r.name.length), "total".length);
const line = (name: string, seconds: number, result: string) =>
  `  ${name.padEnd(width)}  ${seconds.toFixed(1).padStart(6)} s  ${result}`;
console.log("\nTest steps:");
for (const r of results) console.log(line(r.name, r.seconds, r.ok ? "passed" : "FAILED"));
const failed = results.filter((r) => !r.ok);
console.log(line("total", (Date.now() - total) / 1000, failed.length ? `${failed.length} failed` : "all passed"));
process.exit(failed.length ? 1 : 0);
