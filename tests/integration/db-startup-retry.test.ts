import { afterEach, describe, expect, it } from "vitest";
import { BUSY_TIMEOUT_MS, connectDb } from "~/db/client.server";
import { useTestDatabase as copyTestDatabase } from "../support/base-db";
import { type SecondProcess, startSecondProcess } from "../support/db-processes";

// While another connection holds an EXCLUSIVE lock, SQLite refuses even reads with SQLITE_BUSY
// once the busy timeout runs out (https://www.sqlite.org/lockingv3.html,
// https://www.sqlite.org/pragma.html#pragma_locking_mode). Start-up must retry past one timeout,
// and give up with a clear message when the lock stays.

const running: SecondProcess[] = [];
afterEach(async () => {
  for (const p of running.splice(0)) await p.stop("SIGKILL");
});

async function holdExclusively(file: string, holdMs: number) {
  const holder = startSecondProcess("db-exclusive-holder.ts", [file, String(holdMs)]);
  running.push(holder);
  await holder.next("held");
  return holder;
}

describe("start-up while another process locks the file", () => {
  it("retries past the busy timeout and opens once the lock is released", { timeout: 30_000 }, async () => {
    const file = copyTestDatabase("db-startup-retry-ok");
    await holdExclusively(file, BUSY_TIMEOUT_MS + 2000);
    const started = Date.now();
    const { client, db } = await connectDb(`file:${file}`);
    const elapsed = Date.now() - started;
    const [row] = await db.$client.execute("SELECT count(*) AS n FROM exclusive_probe").then((r) => r.rows);
    client.close();
    expect(Number(row.n)).toBe(1);
    // One whole busy timeout ran out before the retry got in.
    expect(elapsed).toBeGreaterThan(BUSY_TIMEOUT_MS);
  });

  it("gives up after its retry window with a message naming the cause", { timeout: 30_000 }, async () => {
    const file = copyTestDatabase("db-startup-retry-fail");
    await holdExclusively(file, 0);
    const started = Date.now();
    const failure = await connectDb(`file:${file}`, undefined, { retryForMs: 1000 }).then(
      () => null,
      (error: Error) => error,
    );
    expect(failure?.message).toMatch(/^The database file:.* stayed locked for \d+\.\d s \(1 attempt, SQLITE_BUSY\)\./);
    expect(failure?.message).toContain("stop that process or wait for it, then start again");
    expect(Date.now() - started).toBeLessThan(BUSY_TIMEOUT_MS + 3000);
  });
});
