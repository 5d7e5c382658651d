import { copyFileSync, existsSync, mkdirSync, rmSync } from "node:fs";
import { dirname, join, resolve } from "node:path";
import { fileURLToPath } from "node:url";

export const TMP_DIR = resolve(dirname(fileURLToPath(import.meta.url)), "../.tmp");
export const BASE_DB = join(TMP_DIR, "base.db");
/** The S3 stand-in's folder: the demo photos the base database points at. */
export const S3_DIR = join(TMP_DIR, "s3");
/** The copy of the base database that the integration run's shared app server uses. */
export const SHARED_DB = join(TMP_DIR, "shared.db");

/**
 * Gives the calling test file its own copy of the migrated demo database, so files never share
 * state. Must run before the first `getDb()` of the file.
 */
export function useTestDatabase(name: string) {
  if (!existsSync(BASE_DB)) throw new Error("The base database is missing: run the tests through vitest's global setup");
  mkdirSync(join(TMP_DIR, "files"), { recursive: true });
  const file = join(TMP_DIR, "files", `${name}-${process.pid}-${Date.now()}.db`);
  for (const suffix of ["-wal", "-shm"]) rmSync(file + suffix, { force: true });
  copyFileSync(BASE_DB, file);
  process.env.DATABASE_URL = `file:${file}`;
  return file;
}
