import { mkdirSync } from "node:fs";
import { dirname } from "node:path";
import { setTimeout as sleep } from "node:timers/promises";
import { type Client, createClient, type InArgs, type InStatement, type TransactionMode } from "@libsql/client";
import { ConnectionPool, Sqlite3Client } from "@libsql/client/sqlite3";
import { expandConfig } from "@libsql/core/config";
import { drizzle } from "drizzle-orm/libsql";
import { migrate } from "drizzle-orm/libsql/migrator";
import { env } from "~/utils/env.server";
import * as schema from "./schema";

export type Db = ReturnType<typeof drizzleOn>;

/** How long a connection waits for another connection's (or process's) lock before SQLITE_BUSY. */
export const BUSY_TIMEOUT_MS = 5000;
/** How long start-up keeps retrying while the file is locked or being recovered after a crash. */
export const STARTUP_RETRY_MS = 10_000;

/**
 * What every connection runs before its first statement: foreign keys are checked, and a committed
 * review decision survives a power cut (FULL sync). The busy timeout comes earlier still: libSQL
 * applies the `timeout` option inside its open call, before any statement can touch the file.
 */
const CONNECTION_PRAGMAS = ["PRAGMA foreign_keys = ON", "PRAGMA synchronous = FULL"];

type Connection = ReturnType<ConnectionPool["acquireSync"]>;

/**
 * The libSQL client keeps a pool of connections to a `file:` database and opens another one
 * whenever calls overlap (each `execute` borrows one across an await; a transaction holds one until
 * it settles; a connection that failed to roll back is dropped and replaced). Settings sent with
 * `client.execute` therefore reach one of them only. This pool runs CONNECTION_PRAGMAS on each
 * connection the moment it is opened, before the caller's statement, so no connection ever works
 * without them. Patching at creation keeps the client's own pooling; a single connection with a
 * queue would also work, but the client refuses (rather than queues) calls while a transaction
 * holds its only connection, and still replaces a dropped connection with a bare one.
 */
class ConfiguredPool extends ConnectionPool {
  readonly #configured = new WeakSet<Connection>();

  override acquireSync(forTransaction?: boolean): Connection {
    const connection = super.acquireSync(forTransaction);
    if (this.#configured.has(connection)) return connection;
    try {
      for (const pragma of CONNECTION_PRAGMAS) connection.exec(pragma);
    } catch (error) {
      connection.close(); // a closed connection is dropped by release(), never pooled half-configured
      this.release(connection);
      throw error;
    }
    this.#configured.add(connection);
    return connection;
  }
}

/**
 * Batches begin IMMEDIATE (take the write lock first) instead of the client's default DEFERRED.
 * A deferred transaction that reads and then writes cannot wait for the lock: SQLite answers the
 * read-to-write upgrade with SQLITE_BUSY at once, without the busy timeout, when another process
 * is writing. Every batch in this app is a write.
 */
class FileClient extends Sqlite3Client {
  override batch(stmts: Array<InStatement | [string, InArgs?]>, mode: TransactionMode = "write") {
    return super.batch(stmts, mode);
  }
}

function openFileClient(url: string): Client {
  const config = expandConfig({ url, timeout: BUSY_TIMEOUT_MS }, true);
  const host = config.authority?.host.toLowerCase();
  if (host && host !== "localhost") throw new Error(`DATABASE_URL: a file: URL cannot name a host (${host})`);
  if (config.path !== ":memory:") mkdirSync(dirname(config.path), { recursive: true });
  const pool = new ConfiguredPool(config.path, { timeout: BUSY_TIMEOUT_MS }, Math.max(1, config.concurrency ?? 20));
  // Open (and configure) the first connection now, so a file that cannot be opened fails here.
  pool.release(pool.acquireSync());
  return new FileClient(pool, config.intMode);
}

function drizzleOn(client: Client) {
  return drizzle(client, { schema, casing: "snake_case" });
}

export function createDb(url: string, authToken?: string) {
  const client = url.startsWith("file:") ? openFileClient(url) : createClient({ url, authToken });
  return { client, db: drizzleOn(client) };
}

/** WAL lets readers run beside the one writer; it is a property of the file, set once at start-up. */
export async function configure(client: Client, url: string) {
  if (!url.startsWith("file:")) return;
  await client.execute("PRAGMA journal_mode = WAL");
}

/** SQLITE_BUSY and its extended codes (SQLITE_BUSY_RECOVERY, SQLITE_BUSY_SNAPSHOT, …). */
function isBusy(error: unknown) {
  const e = error as { code?: unknown; extendedCode?: unknown };
  return [e?.code, e?.extendedCode].some((code) => typeof code === "string" && code.startsWith("SQLITE_BUSY"));
}

/**
 * Opens and configures the database, retrying with backoff while the file is locked or another
 * process is recovering it after a crash (SQLITE_BUSY, SQLITE_BUSY_RECOVERY at open or at the first
 * pragma), for up to `retryForMs`; then fails with a message saying what to do.
 */
export async function connectDb(url: string, authToken?: string, options: { retryForMs?: number } = {}) {
  const retryForMs = options.retryForMs ?? STARTUP_RETRY_MS;
  const started = Date.now();
  for (let attempt = 1, pause = 50; ; attempt++, pause = Math.min(pause * 2, 1000)) {
    let opened: ReturnType<typeof createDb> | undefined;
    try {
      opened = createDb(url, authToken);
      await configure(opened.client, url);
      return opened;
    } catch (error) {
      opened?.client.close();
      const elapsed = Date.now() - started;
      if (!isBusy(error)) throw error;
      if (elapsed + pause > retryForMs) {
        const code = (error as { extendedCode?: string; code?: string }).extendedCode ?? (error as { code?: string }).code;
        throw new Error(
          `The database ${url} stayed locked for ${(elapsed / 1000).toFixed(1)} s (${attempt} attempt${attempt === 1 ? "" : "s"}, ${code}). ` +
            "Another process is holding it or recovering it after a crash: stop that process or wait for it, then start again.",
          { cause: error },
        );
      }
      await sleep(pause);
    }
  }
}

export async function migrateDb(db: Db, migrationsFolder = "./drizzle") {
  await migrate(db, { migrationsFolder });
}

let instance: Promise<Db> | undefined;

/** The process-wide database, configured before first use (a failed start-up is retried on the next call). */
export async function getDb(): Promise<Db> {
  if (!instance) {
    const { DATABASE_URL, DATABASE_AUTH_TOKEN } = env();
    instance = connectDb(DATABASE_URL, DATABASE_AUTH_TOKEN).then(
      ({ db }) => db,
      (error) => {
        instance = undefined;
        throw error;
      },
    );
  }
  return instance;
}
