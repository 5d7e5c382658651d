/**
 * How steady this machine's server core is: the same piece of CPU work (some 4 ms) run 500 times
 * in a process pinned where the servers run, timed one by one. A virtual machine whose host lends
 * its cores to others shows it here as a p99 well above the p50, and every p99 in the tables
 * inherits that. Run as `tsx bench/steadiness.ts --work` it does the work and prints one JSON line.
 */
import { spawn } from "node:child_process";
import { PINNING, ROOT, SERVER_CORE } from "./servers";
import { formatMs, percentile } from "./stats";

const ITEMS = 500;
const SPINS = 1_500_000;

function work(): number[] {
  const times: number[] = [];
  let sink = 0;
  for (let k = 0; k < ITEMS; k++) {
    const before = performance.now();
    for (let i = 0; i < SPINS; i++) sink += i % 7;
    times.push(performance.now() - before);
  }
  if (sink < 0) console.error(sink);
  return times;
}

if (process.argv.includes("--work")) {
  process.stdout.write(`${JSON.stringify(work())}\n`);
}

/** Times the work on the server core; a line for the report. */
export function steadiness(): Promise<string> {
  const node = [process.execPath, "--import", "tsx", "bench/steadiness.ts", "--work"];
  const [command, args] = PINNING ? [PINNING, ["-c", String(SERVER_CORE), ...node]] : [node[0] as string, node.slice(1)];
  return new Promise((done, fail) => {
    const child = spawn(command, args, { cwd: ROOT, stdio: ["ignore", "pipe", "inherit"] });
    let out = "";
    child.stdout.on("data", (chunk) => (out += chunk));
    child.on("error", fail);
    child.on("exit", (code) => {
      if (code !== 0) return fail(new Error(`the steadiness probe failed (${code})`));
      const times = (JSON.parse(out.trim()) as number[]).sort((a, b) => a - b);
      const p50 = percentile(times, 50);
      const p99 = percentile(times, 99);
      done(
        `this machine's steadiness: the same CPU work ${ITEMS} times on the server core took p50 ${formatMs(p50)} ms, ` +
          `p99 ${formatMs(p99)} ms (${(p99 / p50).toFixed(2)}× the p50; a steady core gives about 1.1×)`,
      );
    });
  });
}
