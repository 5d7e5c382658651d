/**
 * Processes of the benchmark: builds, the servers under test (each in its own process group, pinned
 * to core 0 where `taskset` exists), the load generator (pinned to core 1) and the servers' memory.
 */
import { type ChildProcess, spawn } from "node:child_process";
import { cpSync, existsSync, mkdirSync, mkdtempSync, readdirSync, readFileSync, statSync, writeFileSync } from "node:fs";
import { availableParallelism, tmpdir } from "node:os";
import { dirname, join, resolve } from "node:path";
import { fileURLToPath } from "node:url";
import type { CannonJob, CannonResult, ReadersJob, ReadersResult } from "./load";
import { statusBytes } from "./stats";

export const ROOT = resolve(dirname(fileURLToPath(import.meta.url)), "..");
export const BARE_DIR = join(ROOT, "bench", "bare");
const BIN = join(ROOT, "node_modules", ".bin");

const TASKSET = ["/usr/bin/taskset", "/bin/taskset"].find((path) => existsSync(path));
/** Server on core 0, load generator on core 1: only with taskset and at least two cores. */
export const PINNING = TASKSET && availableParallelism() >= 2 ? TASKSET : undefined;
export const SERVER_CORE = 0;
export const LOAD_CORE = 1;

function pinned(core: number, command: string, args: string[]): [string, string[]] {
  return PINNING ? [PINNING, ["-c", String(core), command, ...args]] : [command, args];
}

/** Runs a command to its end, its output shown only when it fails. */
export function run(command: string, args: string[], options: { cwd: string; env?: NodeJS.ProcessEnv }) {
  return new Promise<void>((done, fail) => {
    const child = spawn(command, args, { cwd: options.cwd, env: options.env ?? process.env, stdio: ["ignore", "pipe", "pipe"] });
    let output = "";
    child.stdout.on("data", (chunk) => (output += chunk));
    child.stderr.on("data", (chunk) => (output += chunk));
    child.on("error", fail);
    child.on("exit", (code) =>
      code === 0 ? done() : fail(new Error(`${command} ${args.join(" ")} failed (${code}):\n${output.slice(-4000)}`)),
    );
  });
}

function newestMtime(paths: string[]): number {
  let newest = 0;
  const visit = (path: string) => {
    if (!existsSync(path)) return;
    const stat = statSync(path);
    if (stat.isDirectory()) {
      for (const entry of readdirSync(path)) if (entry !== "node_modules" && entry !== "build") visit(join(path, entry));
    } else newest = Math.max(newest, stat.mtimeMs);
  };
  for (const path of paths) visit(path);
  return newest;
}

/**
 * Builds in `cwd` (`npm run build` where the package has that script, as Torqueleaf does for its
 * server as well, else `react-router build`) unless every bundle is newer than every input (or
 * `force`). Returns whether it built.
 */
export async function buildIfStale(
  cwd: string,
  inputs: string[],
  force: boolean,
  bundles = ["build/server/index.js"],
): Promise<boolean> {
  const newest = newestMtime(inputs);
  const fresh = bundles.every((bundle) => existsSync(join(cwd, bundle)) && statSync(join(cwd, bundle)).mtimeMs > newest);
  if (!force && fresh) return false;
  // bench/bare has no package.json of its own: it builds with the project's react-router.
  const manifest = join(cwd, "package.json");
  const scripts = existsSync(manifest) ? (JSON.parse(readFileSync(manifest, "utf8")).scripts ?? {}) : {};
  const env = { ...process.env, NODE_ENV: "production" };
  if (scripts.build) await run("npm", ["run", "build"], { cwd, env });
  else await run(join(BIN, "react-router"), ["build"], { cwd, env });
  return true;
}

/** What `npm run build` writes for Torqueleaf: the app's server bundle and the server itself, as plain JavaScript. */
export const TORQUELEAF_BUNDLES = ["build/server/index.js", "build/cli/start.js"];

export type Server = { name: string; pid: number; origin: string; stop: () => Promise<void>; output: () => string };

/**
 * Starts a server in its own process group, pinned to the server core, and waits until `readyPath`
 * answers 200 (or the process ends, which fails with its output).
 */
export async function startServer(
  name: string,
  command: string,
  args: string[],
  options: { cwd: string; env: NodeJS.ProcessEnv; origin: string; readyPath?: string; timeoutMs?: number },
): Promise<Server> {
  const [cmd, argv] = pinned(SERVER_CORE, command, args);
  const child: ChildProcess = spawn(cmd, argv, {
    cwd: options.cwd,
    env: options.env,
    stdio: ["ignore", "pipe", "pipe"],
    detached: true,
  });
  let output = "";
  const keep = (chunk: Buffer) => {
    output = (output + chunk.toString()).slice(-8000);
  };
  child.stdout?.on("data", keep);
  child.stderr?.on("data", keep);
  let exited = false;
  const exit = new Promise<void>((done) =>
    child.once("exit", () => {
      exited = true;
      done();
    }),
  );
  const pid = child.pid;
  if (!pid) throw new Error(`${name} did not start`);
  const stop = async () => {
    if (exited) return;
    try {
      process.kill(-pid, "SIGTERM");
    } catch {
      return;
    }
    const timer = setTimeout(() => {
      try {
        process.kill(-pid, "SIGKILL");
      } catch {}
    }, 5000);
    await exit;
    clearTimeout(timer);
  };
  const deadline = Date.now() + (options.timeoutMs ?? 180_000);
  const url = new URL(options.readyPath ?? "/", options.origin);
  while (!exited) {
    try {
      const response = await fetch(url, { signal: AbortSignal.timeout(5000) });
      await response.arrayBuffer();
      if (response.status === 200) return { name, pid, origin: options.origin, stop, output: () => output };
    } catch {}
    if (Date.now() > deadline) {
      await stop();
      throw new Error(`${name} did not answer ${url} within ${(options.timeoutMs ?? 180_000) / 1000} s:\n${output}`);
    }
    await new Promise((done) => setTimeout(done, 250));
  }
  throw new Error(`${name} exited before it answered ${url}:\n${output}`);
}

/** The bare React Router app of bench/bare, served by react-router-serve. */
export function startBare(port: number) {
  const origin = `http://127.0.0.1:${port}`;
  return startServer("bare app", join(BIN, "react-router-serve"), ["./build/server/index.js"], {
    cwd: BARE_DIR,
    env: { ...process.env, NODE_ENV: "production", HOST: "127.0.0.1", PORT: String(port) },
    origin,
  });
}

/** `npm start`'s settings (production build, NODE_ENV=production, --local-demo) with port-0 stand-ins. */
export function torqueleafEnv(port: number, databaseFile: string, dataDir: string): NodeJS.ProcessEnv {
  return {
    ...process.env,
    NODE_ENV: "production",
    PORT: String(port),
    APP_ORIGIN: `http://localhost:${port}`,
    DATABASE_URL: `file:${databaseFile}`,
    LOCAL_FAKES_DIR: dataDir,
    S3_ENDPOINT: "http://127.0.0.1:0",
    SMTP_PORT: "0",
    MAIL_INBOX_URL: "http://127.0.0.1:0",
    GITHUB_BASE_URL: "http://127.0.0.1:0",
    GITHUB_API_URL: "http://127.0.0.1:0",
  };
}

/** The node options `npm start` gives the server ("… node --flag build/cli/start.js …"). */
function startScriptNodeOptions(): string[] {
  const script: string = JSON.parse(readFileSync(join(ROOT, "package.json"), "utf8")).scripts.start;
  const words = script.split("&&").at(-1)?.trim().split(/\s+/) ?? [];
  return words.slice(words.indexOf("node") + 1, words.indexOf("build/cli/start.js")).filter((w) => w.startsWith("--"));
}

/** Torqueleaf as `npm start` runs it, but as one node process (no npm wrapper) so its pid is the server's. */
export function startTorqueleaf(port: number, databaseFile: string, dataDir: string) {
  const args = [...startScriptNodeOptions(), "build/cli/start.js", "--local-demo"];
  return startServer("Torqueleaf", process.execPath, args, {
    cwd: ROOT,
    env: torqueleafEnv(port, databaseFile, dataDir),
    origin: `http://127.0.0.1:${port}`,
  });
}

/**
 * The migrated demo database with its photos, built once per content of the inputs that decide
 * it (through the app's own boot: migrations and the demo scenario) and kept in the temp dir;
 * each run gets a fresh copy of it.
 */
export async function demoCopy(key: string): Promise<{ databaseFile: string; dataDir: string }> {
  const source = join(tmpdir(), "torqueleaf-bench", `demo-${key}`);
  if (!existsSync(join(source, "ready"))) {
    mkdirSync(source, { recursive: true });
    const env = torqueleafEnv(0, join(source, "torqueleaf.db"), join(source, "data"));
    await run(process.execPath, ["--import", "tsx", "bench/demo-db.ts"], { cwd: ROOT, env });
    writeFileSync(join(source, "ready"), new Date().toISOString());
  }
  const target = mkdtempSync(join(tmpdir(), "torqueleaf-bench-run-"));
  cpSync(join(source, "torqueleaf.db"), join(target, "torqueleaf.db"));
  cpSync(join(source, "data"), join(target, "data"), { recursive: true });
  return { databaseFile: join(target, "torqueleaf.db"), dataDir: join(target, "data") };
}

/** Resident memory of a process now, and its peak (VmHWM) since start or since `resetPeak`. */
export function memory(pid: number): { rss: number; peak: number } {
  try {
    const status = readFileSync(`/proc/${pid}/status`, "utf8");
    return { rss: statusBytes(status, "VmRSS"), peak: statusBytes(status, "VmHWM") };
  } catch {
    return { rss: Number.NaN, peak: Number.NaN };
  }
}

/** Resets VmHWM to the current RSS (Linux `clear_refs` 5); false where that is not allowed. */
export function resetPeak(pid: number): boolean {
  try {
    writeFileSync(`/proc/${pid}/clear_refs`, "5");
    return true;
  } catch {
    return false;
  }
}

/** Samples VmRSS every `everyMs` until stopped; `stop()` gives the largest sample. */
export function sampleRss(pid: number, everyMs = 200) {
  let max = memory(pid).rss;
  const timer = setInterval(() => {
    const { rss } = memory(pid);
    if (rss > max || !Number.isFinite(max)) max = rss;
  }, everyMs);
  return {
    stop: () => {
      clearInterval(timer);
      return Math.max(max, memory(pid).rss);
    },
  };
}

/** Runs one load job in its own process on the load core and returns what it printed. */
export function runLoad(job: CannonJob): Promise<CannonResult>;
export function runLoad(job: ReadersJob): Promise<ReadersResult>;
export function runLoad(job: CannonJob | ReadersJob): Promise<CannonResult | ReadersResult> {
  const [cmd, argv] = pinned(LOAD_CORE, process.execPath, [
    "--import",
    "tsx",
    join(ROOT, "bench", "load.ts"),
    JSON.stringify(job),
  ]);
  return new Promise((done, fail) => {
    const child = spawn(cmd, argv, { cwd: ROOT, stdio: ["ignore", "pipe", "pipe"] });
    let stdout = "";
    let stderr = "";
    child.stdout.on("data", (chunk) => (stdout += chunk));
    child.stderr.on("data", (chunk) => (stderr += chunk));
    child.on("error", fail);
    child.on("exit", (code) => {
      const last = stdout.trim().split("\n").at(-1);
      if (code !== 0 || !last) fail(new Error(`the load generator failed (${code}): ${stderr.slice(-2000)}`));
      else done(JSON.parse(last));
    });
  });
}
