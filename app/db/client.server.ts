import { mkdirSync } from "node:fs";
import { dirname } from "node:path";
import { createClient, type Client } from "@libsql/client";
import { drizzle } from "drizzle-orm/libsql";
import { migrate } from "drizzle-orm/libsql/migrator";
import { env } from "~/utils/env.server";
import * as schema from "./schema";

export type Db = ReturnType<typeof createDb>["db"];

export function createDb(url: string, authToken?: string) {
  if (url.startsWith("file:")) {
    mkdirSync(dirname(url.slice("file:".length)), { recursive: true });
  }
  const client: Client = createClient({ url, authToken });
  const db = drizzle(client, { schema, casing: "snake_case" });
  return { client, db };
}

/**
 * WAL lets readers run beside the one writer; FULL sync keeps a committed review decision
 * on disk after a power cut; the busy timeout lets a second process wait instead of failing.
 */
export async function configure(client: Client, url: string) {
  if (!url.startsWith("file:")) return;
  await client.execute("PRAGMA journal_mode = WAL");
  await client.execute("PRAGMA synchronous = FULL");
  await client.execute("PRAGMA foreign_keys = ON");
  await client.execute("PRAGMA busy_timeout = 5000");
}

export async function migrateDb(db: Db, migrationsFolder = "./drizzle") {
  await migrate(db, { migrationsFolder });
}

let instance: { client: Client; db: Db; ready: Promise<void> } | undefined;

/** The process-wide database, configured and migrated before first use. */
export async function getDb(): Promise<Db> {
  if (!instance) {
    const { DATABASE_URL, DATABASE_AUTH_TOKEN } = env();
    const { client, db } = createDb(DATABASE_URL, DATABASE_AUTH_TOKEN);
    instance = { client, db, ready: configure(client, DATABASE_URL) };
  }
  await instance.ready;
  return instance.db;
}
