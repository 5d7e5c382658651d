/**
 * The load generator, run as its own process (pinned to its own core by the caller): reads one
 * JSON job from argv and prints one JSON result line. Two kinds of job:
 *   cannon  — autocannon at full speed: N connections, back to back, for a duration;
 *   readers — N readers, each on its own keep-alive connection, each waiting `thinkMs` after every
 *             answer before the next request, starting at random moments within the first think time.
 * Requests never carry Accept-Encoding, so every answer is measured uncompressed.
 */
import http from "node:http";
import { setTimeout as sleep } from "node:timers/promises";
import autocannon from "autocannon";
import { summarize } from "./stats";

export type CannonJob = { kind: "cannon"; url: string; connections: number; seconds: number };
export type ReadersJob = { kind: "readers"; origin: string; paths: string[]; readers: number; thinkMs: number; seconds: number };
export type CannonResult = { rps: number; p50: number; p99: number; requests: number; errors: number; bytesPerRequest: number };
export type ReadersResult = {
  requests: number;
  errors: number;
  p50: number;
  p99: number;
  max: number;
  statuses: Record<string, number>;
};

async function cannon(job: CannonJob): Promise<CannonResult> {
  const result = await autocannon({ url: job.url, connections: job.connections, duration: job.seconds, timeout: 10 });
  const requests = result.requests.total;
  return {
    rps: result.requests.average,
    p50: result.latency.p50,
    p99: result.latency.p99,
    requests,
    errors: result.errors + result.timeouts + result.non2xx,
    bytesPerRequest: requests ? result.throughput.total / requests : 0,
  };
}

function get(agent: http.Agent, url: URL): Promise<number> {
  return new Promise((resolve, reject) => {
    const request = http.get(url, { agent, timeout: 10_000 }, (response) => {
      response.resume();
      response.on("end", () => resolve(response.statusCode ?? 0));
      response.on("error", reject);
    });
    request.on("timeout", () => request.destroy(new Error("timed out after 10 s")));
    request.on("error", reject);
  });
}

async function readers(job: ReadersJob): Promise<ReadersResult> {
  const latencies: number[] = [];
  const statuses: Record<string, number> = {};
  let errors = 0;
  const deadline = Date.now() + job.seconds * 1000;
  const reader = async (n: number) => {
    const agent = new http.Agent({ keepAlive: true, maxSockets: 1 });
    await sleep(Math.random() * job.thinkMs);
    for (let i = n; Date.now() < deadline; i++) {
      const url = new URL(job.paths[i % job.paths.length], job.origin);
      const started = performance.now();
      try {
        const status = await get(agent, url);
        latencies.push(performance.now() - started);
        statuses[status] = (statuses[status] ?? 0) + 1;
        if (status < 200 || status >= 300) errors++;
      } catch (error) {
        errors++;
        const key = (error as Error).message;
        statuses[key] = (statuses[key] ?? 0) + 1;
      }
      await sleep(job.thinkMs);
    }
    agent.destroy();
  };
  await Promise.all(Array.from({ length: job.readers }, (_, n) => reader(n)));
  const { p50, p99 } = summarize(latencies);
  return { requests: latencies.length, errors, p50, p99, max: Math.max(0, ...latencies), statuses };
}

const job = JSON.parse(process.argv[2] ?? "{}") as CannonJob | ReadersJob;
const result = job.kind === "cannon" ? await cannon(job) : await readers(job);
process.stdout.write(`${JSON.stringify(result)}\n`);
