import { createHash } from "node:crypto";
import { copyFileSync, cpSync, existsSync, mkdirSync, readdirSync, readFileSync, renameSync, rmSync } from "node:fs";
import { join, relative } from "node:path";
import { sql } from "drizzle-orm";
import { type LocalFakes, startLocalFakes } from "~/services/fakes";
import { BASE_DB, S3_DIR, TMP_DIR } from "./base-db";
import { filesUnder, importClosure, ROOT } from "./imports";

/** Built base databases with their photos, one folder per key (see `baseDataKey`). */
export const CACHE_DIR = join(TMP_DIR, "cache");

/**
 * Every file that decides what the base database and its photos hold: the migrations, the demo
 * scenario, the code that loads it (the whole import graph of the loader, the database client,
 * the storage and the S3 stand-in, this file included) and the locked package versions.
 */
export function baseDataInputs(): string[] {
  const files = new Set([
    ...importClosure([
      "app/cli/demo-data.ts",
      "app/db/client.server.ts",
      "app/db/schema.ts",
      "app/services/storage.server.ts",
      "app/services/fakes/index.ts",
      "tests/support/services.ts",
      ...filesUnder(join(ROOT, "app/models")),
    ]),
    ...filesUnder(join(ROOT, "drizzle"), /./),
    ...filesUnder(join(ROOT, "content-samples"), /./),
    join(ROOT, "package-lock.json"),
  ]);
  return [...files].sort();
}

/** A hash of the names and contents of `baseDataInputs()`: any change there builds the base anew. */
export function baseDataKey(): string {
  const hash = createHash("sha256");
  for (const file of baseDataInputs()) {
    hash.update(`${relative(ROOT, file)}\0`);
    hash.update(readFileSync(file));
    hash.update("\0");
  }
  return hash.digest("hex").slice(0, 24);
}

/**
 * Starts the real local stand-ins on free ports and provides the migrated base database with the
 * demo scenario loaded through the app's own code (photos go through the S3 stand-in). The
 * database and the stand-in's folder are kept together under tests/.tmp/cache and reused while
 * `baseDataKey()` stays the same; `TORQUELEAF_TEST_CACHE=0` builds them afresh regardless.
 */
export async function startTestServices(): Promise<LocalFakes & { baseFromCache: boolean }> {
  const key = baseDataKey();
  const cached = join(CACHE_DIR, key);
  // Everything from the previous run goes, except the cache.
  mkdirSync(TMP_DIR, { recursive: true });
  for (const entry of readdirSync(TMP_DIR)) {
    if (entry !== "cache") rmSync(join(TMP_DIR, entry), { recursive: true, force: true });
  }
  const baseFromCache =
    process.env.TORQUELEAF_TEST_CACHE !== "0" && existsSync(join(cached, "base.db")) && existsSync(join(cached, "s3"));
  if (baseFromCache) {
    copyFileSync(join(cached, "base.db"), BASE_DB);
    cpSync(join(cached, "s3"), S3_DIR, { recursive: true });
  }
  const fakes = await startLocalFakes({
    directory: S3_DIR,
    bucket: "torqueleaf-test",
    s3Port: 0,
    smtpPort: 0,
    inboxPort: 0,
    githubPort: 0,
    githubClientId: "torqueleaf-test",
    githubClientSecret: "torqueleaf-test-secret",
  });
  Object.assign(process.env, fakes.settings, {
    NODE_ENV: "test",
    LOCAL_FAKES: "0",
    S3_BUCKET: "torqueleaf-test",
    GITHUB_CLIENT_ID: "torqueleaf-test",
    GITHUB_CLIENT_SECRET: "torqueleaf-test-secret",
    DATABASE_URL: `file:${BASE_DB}`,
  });
  if (!baseFromCache) {
    // Imported late so that they read the settings above.
    const { getDb, migrateDb } = await import("~/db/client.server");
    const { getStorage } = await import("~/services/storage.server");
    const { loadDemoData } = await import("~/cli/demo-data");
    const db = await getDb();
    await migrateDb(db);
    await getStorage().ensureBucket();
    await loadDemoData(db, getStorage());
    // Fold the WAL into the main file so a plain copy is a whole database.
    await db.run(sql`PRAGMA wal_checkpoint(TRUNCATE)`);
    // Store the pair under a temporary name first, so a run stopped halfway leaves no partial entry.
    const staging = `${cached}.${process.pid}.partial`;
    mkdirSync(staging, { recursive: true });
    copyFileSync(BASE_DB, join(staging, "base.db"));
    cpSync(S3_DIR, join(staging, "s3"), { recursive: true });
    for (const entry of readdirSync(CACHE_DIR)) {
      if (entry !== `${key}.${process.pid}.partial`) rmSync(join(CACHE_DIR, entry), { recursive: true, force: true });
    }
    renameSync(staging, cached);
  }
  return { ...fakes, baseFromCache };
}
