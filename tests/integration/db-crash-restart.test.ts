import { createClient } from "@libsql/client";
import { afterEach, describe, expect, it, vi } from "vitest";
import { useTestDatabase as copyTestDatabase } from "../support/base-db";
import { type SecondProcess, startSecondProcess } from "../support/db-processes";

// After a writer dies holding a long write-ahead log, the next connection to find no live wal-index
// rebuilds it from the log (WAL recovery, https://www.sqlite.org/walformat.html#recovery); while it
// does, other connections are refused with SQLITE_BUSY_RECOVERY
// (https://www.sqlite.org/rescode.html#busy_recovery). The app must wait that out at start-up.
const TRIALS = 3;

const running: SecondProcess[] = [];
afterEach(async () => {
  for (const p of running.splice(0)) await p.stop("SIGKILL");
});

/** Kills a writer mid-stream, then starts a reader; resolves as the reader opens its first connection. */
async function crashThenAnotherProcessReads(file: string) {
  const writer = startSecondProcess("db-crash-writer.ts", [file]);
  running.push(writer);
  await writer.next("writing");
  await new Promise((r) => setTimeout(r, 1500)); // let the log grow to tens of megabytes
  await writer.stop("SIGKILL");
  const reader = startSecondProcess("db-busy-reader.ts", [file]);
  running.push(reader);
  await reader.next("opening");
  return reader;
}

describe("start-up after a writer was killed while another process reads", () => {
  it(`opens, configures and migrates the database (${TRIALS} trials)`, { timeout: 120_000 }, async () => {
    const outcomes: string[] = [];
    for (let trial = 0; trial < TRIALS; trial++) {
      const file = copyTestDatabase(`db-crash-restart-${trial}`);
      const reader = await crashThenAnotherProcessReads(file);
      // A fresh module graph is a fresh process-wide database, as after a restart.
      vi.resetModules();
      const { getDb, migrateDb } = await import("~/db/client.server");
      try {
        const db = await getDb();
        await migrateDb(db);
        outcomes.push("ok");
        db.$client.close();
      } catch (error) {
        const e = error as { code?: string; extendedCode?: string; cause?: { extendedCode?: string } };
        outcomes.push(e.extendedCode ?? e.cause?.extendedCode ?? e.code ?? String(error));
      }
      await reader.stop("SIGKILL");
      // What the crashed writer committed is all there and the file is sound.
      const check = createClient({ url: `file:${file}`, timeout: 5000 });
      const [quick, probe] = await check.batch(["PRAGMA quick_check", "SELECT count(*) FROM crash_probe"]);
      check.close();
      expect(quick.rows[0][0]).toBe("ok");
      expect(Number(probe.rows[0][0])).toBeGreaterThan(0);
    }
    expect(outcomes).toEqual(Array(TRIALS).fill("ok"));
  });
});
