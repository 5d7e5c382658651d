import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Db } from "~/db/client.server";
import { guides, users } from "~/db/schema";
import { useTestDatabase } from "../support/base-db";
import { type SecondProcess, startSecondProcess } from "../support/db-processes";

// A second process on the same file takes SQLite's write lock (BEGIN IMMEDIATE) for 250 ms at a
// time with 100 ms gaps. SQLite lets one writer in at a time (https://www.sqlite.org/lockingv3.html,
// https://www.sqlite.org/wal.html#concurrency), so each write below has to wait for the lock; with
// the busy timeout on every connection it waits instead of failing with SQLITE_BUSY.
const HOLD_MS = 250;
const GAP_MS = 100;

/** SQLite's code for a failed write (drizzle wraps the driver's error as its cause). */
const errorCode = (error: unknown) => {
  const e = error as { code?: string; cause?: { code?: string }; message?: string };
  return e.code ?? e.cause?.code ?? String(e.message ?? error).slice(0, 80);
};

let file: string;
let db: Db;
let holder: SecondProcess | undefined;

beforeAll(async () => {
  file = useTestDatabase("db-lock-contention");
  const { getDb } = await import("~/db/client.server");
  db = await getDb();
});

afterAll(async () => {
  await holder?.stop();
  db?.$client.close();
});

describe("writes while another process holds the write lock", () => {
  it("all 20 succeed: batches, single inserts and upserts wait for the lock", async () => {
    const { createGuide } = await import("~/models/guides.server");
    const { createSession } = await import("~/models/sessions.server");
    const { hit } = await import("~/models/rate-limit.server");
    const [author] = await db.select({ id: users.id, role: users.role }).from(users).where(eq(users.role, "author")).limit(1);
    expect(author).toBeDefined();

    holder = startSecondProcess("db-lock-holder.ts", [file, String(HOLD_MS), String(GAP_MS)]);
    const writes = [
      (i: number) =>
        createGuide(db, author, {
          title: `Lock wait check ${i}`,
          summary: "",
          category: "lighting",
          difficulty: 1,
          minutes: 30,
        }),
      () => createSession(db, author.id, { userAgent: "lock-wait-check", ipAddress: "127.0.0.2" }, 1),
      (i: number) => hit(db, `lock-wait-check:${i}`, 10, 60_000),
    ];
    // Five rounds of four writes started together, as concurrent requests arrive: calls that overlap
    // may each be given a different pooled connection, and every one of them must wait.
    const outcomes: string[] = [];
    let waited = 0;
    for (let round = 0; round < 5; round++) {
      await holder.next("locked"); // the other process holds the lock from now for HOLD_MS
      const started = performance.now();
      const settled = await Promise.allSettled([0, 1, 2, 3].map((k) => writes[(round * 4 + k) % writes.length](round * 4 + k)));
      waited += performance.now() - started;
      for (const s of settled) {
        outcomes.push(s.status === "fulfilled" ? "ok" : errorCode(s.reason));
      }
    }
    expect(outcomes).toEqual(Array(20).fill("ok"));
    // The writes really met the lock: on average they waited a good part of each hold.
    expect(waited / 5).toBeGreaterThan(HOLD_MS / 4);
    const created = await db.select({ id: guides.id }).from(guides).where(eq(guides.authorId, author.id));
    expect(created.length).toBeGreaterThanOrEqual(7);
    expect(holder.errors).toEqual([]);
  });

  it("a batch that reads before it writes waits too (it takes the write lock first)", async () => {
    const { batch } = await import("~/db/batch.server");
    const { rateLimits } = await import("~/db/schema");
    if (!holder) holder = startSecondProcess("db-lock-holder.ts", [file, String(HOLD_MS), String(GAP_MS)]);
    const outcomes: string[] = [];
    for (let i = 0; i < 5; i++) {
      await holder.next("locked");
      // A read as the first statement would start a read transaction, and SQLite refuses to turn a
      // read transaction into a write one while another connection writes (SQLITE_BUSY at once,
      // without the busy wait: https://www.sqlite.org/lang_transaction.html#deferred_immediate_and_exclusive_transactions).
      try {
        await batch(db, [
          db.select({ key: rateLimits.key }).from(rateLimits).limit(1),
          db.insert(rateLimits).values({ key: `read-then-write:${i}`, windowStart: new Date(), count: 1 }),
        ]);
        outcomes.push("ok");
      } catch (error) {
        outcomes.push(errorCode(error));
      }
    }
    expect(outcomes).toEqual(Array(5).fill("ok"));
  });
});
