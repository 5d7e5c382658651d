import { type ChildProcess, spawn, spawnSync } from "node:child_process";
import { copyFileSync, existsSync, mkdirSync, readdirSync, rmSync, statSync } from "node:fs";
import { createServer } from "node:net";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import { BASE_DB, TMP_DIR } from "../support/base-db";

const ROOT = fileURLToPath(new URL("../..", import.meta.url));
/** What `npm run build` writes: the app's server bundle and the server (app/cli/start.ts) as plain JavaScript. */
const BUILT = [join(ROOT, "build/server/index.js"), join(ROOT, "build/cli/start.js")];

function newestSource(dir: string): number {
  let newest = 0;
  for (const entry of readdirSync(dir, { withFileTypes: true })) {
    const path = join(dir, entry.name);
    newest = Math.max(newest, entry.isDirectory() ? newestSource(path) : statSync(path).mtimeMs);
  }
  return newest;
}

/** Builds the app as `npm start` does, unless a build newer than every source file is there. */
export async function ensureBuild() {
  const lock = join(TMP_DIR, "build.lock");
  mkdirSync(TMP_DIR, { recursive: true });
  for (;;) {
    try {
      mkdirSync(lock);
      break;
    } catch {
      await new Promise((r) => setTimeout(r, 500));
    }
  }
  try {
    const newest = newestSource(join(ROOT, "app"));
    if (BUILT.every((file) => existsSync(file) && statSync(file).mtimeMs > newest)) return;
    const built = spawnSync("npm", ["run", "build"], { cwd: ROOT, encoding: "utf8" });
    if (built.status !== 0) throw new Error(`npm run build failed:\n${built.stdout}\n${built.stderr}`);
  } finally {
    rmSync(lock, { recursive: true, force: true });
  }
}

export async function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const server = createServer();
    server.once("error", reject);
    server.listen(0, "127.0.0.1", () => {
      const { port } = server.address() as { port: number };
      server.close(() => resolve(port));
    });
  });
}

export type BuiltApp = {
  url: string;
  port: number;
  /** The app's database file, for a test that changes content behind the app's back. */
  database: string;
  output: () => string;
  exited: Promise<number | null>;
  stop: () => Promise<void>;
  /** Ends the process at once (SIGKILL: no shutdown code runs), as a crash or a power cut would. */
  kill: () => Promise<void>;
};

/**
 * Starts `build/cli/start.js` (the built app behind Express, as `npm start` runs it) in its own process with exactly the
 * settings given on top of a clean environment, on a free port, and waits until it answers or exits.
 * `database`: "empty" (a new file) or "demo" (a copy of the migrated demo database); `databaseFile`
 * reuses the file of an app started before (a restart).
 */
export async function startBuiltApp(
  settings: Record<string, string>,
  options: { database?: "empty" | "demo"; databaseFile?: string; args?: string[]; wait?: boolean } = {},
): Promise<BuiltApp> {
  const port = await freePort();
  const dir = join(TMP_DIR, "built", `${port}-${Date.now()}`);
  mkdirSync(dir, { recursive: true });
  const database = options.databaseFile ?? join(dir, "app.db");
  if (options.database === "demo" && !options.databaseFile) copyFileSync(BASE_DB, database);
  const child: ChildProcess = spawn(process.execPath, ["build/cli/start.js", ...(options.args ?? [])], {
    cwd: ROOT,
    env: {
      PATH: process.env.PATH,
      HOME: process.env.HOME,
      PORT: String(port),
      DATABASE_URL: `file:${database}`,
      LOCAL_FAKES_DIR: dir,
      ...settings,
    },
    stdio: ["ignore", "pipe", "pipe"],
  });
  let output = "";
  child.stdout?.on("data", (chunk) => {
    output += chunk;
  });
  child.stderr?.on("data", (chunk) => {
    output += chunk;
  });
  const exited = new Promise<number | null>((resolve) => child.once("exit", (code) => resolve(code)));
  const url = `http://127.0.0.1:${port}`;
  const app: BuiltApp = {
    url,
    port,
    database,
    output: () => output,
    exited,
    stop: async () => {
      if (child.exitCode === null && child.signalCode === null) {
        child.kill("SIGTERM");
        await exited;
      }
    },
    kill: async () => {
      if (child.exitCode === null && child.signalCode === null) {
        child.kill("SIGKILL");
        await exited;
      }
    },
  };
  if (options.wait === false) return app;
  const deadline = Date.now() + 90_000;
  for (;;) {
    if (child.exitCode !== null) throw new Error(`The app exited during start-up (code ${child.exitCode}):\n${output}`);
    try {
      if ((await fetch(`${url}/api/guides`)).ok) return app;
    } catch {
      // not listening yet
    }
    if (Date.now() > deadline) {
      await app.stop();
      throw new Error(`The app did not answer within 90 s:\n${output}`);
    }
    await new Promise((r) => setTimeout(r, 250));
  }
}

/** The settings of the run's shared stand-ins (tests/global-setup.ts), as real services seen from another app. */
export function sharedServices() {
  const keys = [
    "S3_ENDPOINT",
    "S3_BUCKET",
    "SMTP_HOST",
    "SMTP_PORT",
    "MAIL_INBOX_URL",
    "GITHUB_CLIENT_ID",
    "GITHUB_CLIENT_SECRET",
    "GITHUB_BASE_URL",
    "GITHUB_API_URL",
  ];
  return Object.fromEntries(keys.map((k) => [k, process.env[k] ?? ""]));
}
