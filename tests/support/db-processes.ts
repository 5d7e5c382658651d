import { type ChildProcess, spawn } from "node:child_process";
import { once } from "node:events";
import { dirname, join } from "node:path";
import { fileURLToPath } from "node:url";

const HERE = dirname(fileURLToPath(import.meta.url));

export type SecondProcess = {
  child: ChildProcess;
  /** Resolves when the process next prints `line` on its own (counting only lines printed after this call). */
  next: (line: string) => Promise<void>;
  /** Every line it printed on stderr so far. */
  errors: string[];
  /** Ends it with `signal` and waits for it to be gone. */
  stop: (signal?: NodeJS.Signals) => Promise<void>;
};

/**
 * Starts one of the tests/support/db-*.ts scripts as a real, separate Node process (through tsx),
 * so it holds its own SQLite connections and file locks, as another program on the machine would.
 */
export function startSecondProcess(script: string, args: string[]): SecondProcess {
  const child = spawn(process.execPath, ["--import", "tsx", join(HERE, script), ...args], {
    stdio: ["ignore", "pipe", "pipe"],
  });
  const waiting: { line: string; resolve: () => void }[] = [];
  const errors: string[] = [];
  let buffered = "";
  child.stdout?.setEncoding("utf8").on("data", (chunk: string) => {
    buffered += chunk;
    const lines = buffered.split("\n");
    buffered = lines.pop() ?? "";
    for (const line of lines) {
      for (const w of waiting.filter((w) => w.line === line)) {
        waiting.splice(waiting.indexOf(w), 1);
        w.resolve();
      }
    }
  });
  child.stderr?.setEncoding("utf8").on("data", (chunk: string) => errors.push(...chunk.split("\n").filter(Boolean)));
  const exited = once(child, "exit");
  return {
    child,
    errors,
    next: (line) =>
      new Promise<void>((resolve, reject) => {
        if (child.exitCode !== null) return reject(new Error(`${script} has exited: ${errors.join(" ")}`));
        waiting.push({ line, resolve });
        exited.then(() => reject(new Error(`${script} exited before printing "${line}": ${errors.join(" ")}`)));
      }),
    stop: async (signal = "SIGTERM") => {
      if (child.exitCode === null && child.signalCode === null) child.kill(signal);
      await exited;
    },
  };
}
