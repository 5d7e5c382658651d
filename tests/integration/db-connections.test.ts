import type { Client, ResultSet } from "@libsql/client";
import { sql } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Db } from "~/db/client.server";
import { useTestDatabase } from "../support/base-db";

// Values as SQLite reports them (https://www.sqlite.org/pragma.html): busy_timeout in milliseconds,
// foreign_keys 1 = ON, synchronous 2 = FULL. 5000 ms is the app's chosen wait (common practice).
const EXPECTED = { busy_timeout: 5000, foreign_keys: 1, synchronous: 2 };
const PRAGMAS = Object.keys(EXPECTED).map((name) => `PRAGMA ${name}`);

type Settings = Record<keyof typeof EXPECTED, number>;
const settingsOf = (rows: ResultSet[]): Settings => ({
  busy_timeout: Number(rows[0].rows[0][0]),
  foreign_keys: Number(rows[1].rows[0][0]),
  synchronous: Number(rows[2].rows[0][0]),
});

let db: Db;
let client: Client;

beforeAll(async () => {
  useTestDatabase("db-connections");
  const { getDb } = await import("~/db/client.server");
  db = await getDb();
  client = db.$client;
});

afterAll(() => client?.close());

describe("every pooled connection is configured", () => {
  it("holds on connections opened for transactions held at the same time", async () => {
    // Each open transaction holds its own connection, so these are five distinct connections.
    const txs = await Promise.all(Array.from({ length: 5 }, () => client.transaction("read")));
    try {
      for (const tx of txs) {
        const rows = [];
        for (const pragma of PRAGMAS) rows.push(await tx.execute(pragma));
        expect(settingsOf(rows)).toEqual(EXPECTED);
      }
    } finally {
      for (const tx of txs) tx.close();
    }
  });

  it("holds inside a batch and inside a write transaction", async () => {
    expect(settingsOf(await client.batch(PRAGMAS))).toEqual(EXPECTED);
    expect(settingsOf(await client.batch(PRAGMAS, "write"))).toEqual(EXPECTED);
    const tx = await client.transaction("write");
    try {
      expect(settingsOf(await tx.batch(PRAGMAS))).toEqual(EXPECTED);
    } finally {
      await tx.rollback();
    }
  });

  it("holds for calls arriving at once (each may open another connection)", async () => {
    const results = await Promise.all(Array.from({ length: 12 }, () => client.execute("PRAGMA busy_timeout")));
    expect(results.map((r) => Number(r.rows[0][0]))).toEqual(Array(12).fill(EXPECTED.busy_timeout));
  });

  it("holds through drizzle's batch and transaction", async () => {
    const [timeout] = await db.batch([db.all(sql`PRAGMA busy_timeout`)]);
    expect((timeout as { timeout: number }[]).map((r) => r.timeout)).toEqual([EXPECTED.busy_timeout]);
    const inTx = await db.transaction(async (tx) => tx.all(sql`PRAGMA foreign_keys`));
    expect(inTx.map((r) => Number(Object.values(r as object)[0]))).toEqual([EXPECTED.foreign_keys]);
  });

  it("keeps the file in WAL mode", async () => {
    const rs = await client.execute("PRAGMA journal_mode");
    expect(rs.rows[0][0]).toBe("wal");
  });
});
