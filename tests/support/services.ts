import { rmSync } from "node:fs";
import { sql } from "drizzle-orm";
import { join } from "node:path";
import { type LocalFakes, startLocalFakes } from "~/services/fakes";
import { BASE_DB, TMP_DIR } from "./base-db";

/**
 * Starts the real local stand-ins on free ports and builds the migrated base database with the
 * demo scenario loaded through the app's own code (photos go through the S3 stand-in).
 */
export async function startTestServices(): Promise<LocalFakes> {
  rmSync(TMP_DIR, { recursive: true, force: true });
  const fakes = await startLocalFakes({
    directory: join(TMP_DIR, "s3"),
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
  return fakes;
}
