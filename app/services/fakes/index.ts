import { type ChildProcess, fork } from "node:child_process";
import { fileURLToPath } from "node:url";
import type { FakeOptions } from "./servers";

export type { FakeOptions } from "./servers";
export type LocalFakes = Awaited<ReturnType<typeof startLocalFakes>>;

/** Bundled by `npm run build` (build/cli/child.js beside start.js), or the source run through tsx. */
const BUNDLED = import.meta.url.endsWith(".js");
const CHILD = fileURLToPath(new URL(BUNDLED ? "./child.js" : "./child.ts", import.meta.url));
const portOf = (url: string) => Number(new URL(url).port || 80);

function spawnFakes(options: FakeOptions): Promise<{ child: ChildProcess; settings: Record<string, string> }> {
  return new Promise((resolve, reject) => {
    const child = fork(CHILD, [], {
      execArgv: BUNDLED ? [] : ["--import", "tsx"],
      stdio: ["ignore", "inherit", "inherit", "ipc"],
      serialization: "json",
    });
    const onExit = (code: number | null) => reject(new Error(`The local stand-ins exited during start-up (code ${code})`));
    child.once("exit", onExit);
    child.once("error", reject);
    child.once("message", (message: { ready?: Record<string, string>; failed?: string }) => {
      child.off("exit", onExit);
      if (message.ready) resolve({ child, settings: message.ready });
      else reject(new Error(`The local stand-ins did not start: ${message.failed}`));
    });
    child.send(options);
  });
}

/**
 * Starts the local stand-ins for S3, SMTP and GitHub on 127.0.0.1, in a process of their own so
 * that a request that crashes one of them cannot take the app down; a crashed set is started again
 * on the same ports. Port 0 picks free ports; the returned settings are what the app must be given.
 */
export async function startLocalFakes(options: FakeOptions) {
  const first = await spawnFakes(options);
  const settings = first.settings;
  let child = first.child;
  // Restarts reuse the ports the first start settled on, so the app's settings stay valid.
  const again: FakeOptions = {
    ...options,
    s3Port: settings.S3_ENDPOINT ? portOf(settings.S3_ENDPOINT) : options.s3Port,
    smtpPort: settings.SMTP_PORT ? Number(settings.SMTP_PORT) : options.smtpPort,
    inboxPort: settings.MAIL_INBOX_URL ? portOf(settings.MAIL_INBOX_URL) : options.inboxPort,
    githubPort: settings.GITHUB_BASE_URL ? portOf(settings.GITHUB_BASE_URL) : options.githubPort,
  };
  let stopping = false;
  const restarts: number[] = [];
  const watch = (running: ChildProcess) => {
    running.once("exit", (code, signal) => {
      if (stopping) return;
      const now = Date.now();
      restarts.push(now);
      while (restarts.length && restarts[0] < now - 60_000) restarts.shift();
      if (restarts.length > 5) {
        console.error("The local stand-ins keep stopping; not starting them again.");
        return;
      }
      console.error(`The local stand-ins stopped (${signal ?? `code ${code}`}); starting them again.`);
      spawnFakes(again).then(
        (next) => {
          child = next.child;
          if (stopping) child.kill();
          else watch(child);
        },
        (error: Error) => console.error(error.message),
      );
    });
  };
  watch(child);
  return {
    settings,
    /** The stand-ins' process (it changes after a restart). */
    pid: () => child.pid,
    stop: async () => {
      stopping = true;
      if (child.exitCode !== null || child.signalCode !== null) return;
      await new Promise<void>((resolve) => {
        child.once("exit", () => resolve());
        child.kill("SIGTERM");
      });
    },
  };
}
