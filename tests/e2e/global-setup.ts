import { type ChildProcess, spawn } from "node:child_process";
import { createWriteStream } from "node:fs";
import { join } from "node:path";
import type { TestProject } from "vitest/node";
import { TMP_DIR } from "../support/base-db";
import { startTestServices } from "../support/services";

let server: ChildProcess | undefined;

/**
 * Builds the demo database, then starts the built app as `npm start` would (its own local
 * stand-ins included, on free ports, over the same S3 folder) and waits until it answers.
 */
export async function setup(project: TestProject) {
  const fakes = await startTestServices();
  await fakes.stop();
  const port = 3900 + Math.floor(Math.random() * 90);
  const origin = `http://localhost:${port}`;
  server = spawn(process.execPath, ["build/cli/start.js"], {
    env: {
      ...process.env,
      NODE_ENV: "production",
      SESSION_SECRET: "e2e-secret-0123456789abcdef",
      PORT: String(port),
      APP_ORIGIN: origin,
      LOCAL_FAKES: "1",
      LOCAL_FAKES_DIR: TMP_DIR,
      DEMO_DATA: "0",
      DATABASE_URL: `file:${join(TMP_DIR, "e2e.db")}`,
      S3_ENDPOINT: "http://127.0.0.1:0",
      SMTP_PORT: "0",
      MAIL_INBOX_URL: "http://127.0.0.1:0",
      GITHUB_BASE_URL: "http://127.0.0.1:0",
      GITHUB_API_URL: "http://127.0.0.1:0",
    },
    stdio: ["ignore", "pipe", "pipe"],
  });
  // The server's own log, for reading after a failed run.
  const log = createWriteStream(join(TMP_DIR, "e2e-server.log"));
  let output = "";
  for (const stream of [server.stdout, server.stderr]) {
    stream?.on("data", (chunk) => {
      output += chunk;
      log.write(chunk);
    });
  }
  const { copyFileSync } = await import("node:fs");
  copyFileSync(join(TMP_DIR, "base.db"), join(TMP_DIR, "e2e.db"));
  const deadline = Date.now() + 60_000;
  for (;;) {
    if (server.exitCode !== null) throw new Error(`The app exited during start-up:\n${output}`);
    try {
      if ((await fetch(`${origin}/api/guides`)).ok) break;
    } catch {
      // not listening yet
    }
    if (Date.now() > deadline) throw new Error(`The app did not answer within 60 s:\n${output}`);
    await new Promise((r) => setTimeout(r, 250));
  }
  project.provide("origin", origin);
}

export async function teardown() {
  server?.kill("SIGTERM");
}

declare module "vitest" {
  export interface ProvidedContext {
    origin: string;
  }
}
