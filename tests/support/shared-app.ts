import { closeSync, mkdirSync, openSync, writeSync } from "node:fs";
import { join } from "node:path";
import { inject } from "vitest";
import { TMP_DIR } from "./base-db";
import { TestClient } from "./http-client";

const CLAIMS_DIR = join(TMP_DIR, "addresses");

/**
 * A loopback address no other test file of this run uses (127.0.1.1, 127.0.1.2, …), claimed by
 * creating a file named after it: creation fails when another file claimed it first.
 */
export function claimLoopbackAddress(owner: string): string {
  mkdirSync(CLAIMS_DIR, { recursive: true });
  for (let n = 256 + 1; n < 65_536; n++) {
    if (n % 256 === 0 || n % 256 === 255) continue;
    const address = `127.0.${n >> 8}.${n % 256}`;
    try {
      const fd = openSync(join(CLAIMS_DIR, address), "wx");
      writeSync(fd, `${owner}\n`);
      closeSync(fd);
      return address;
    } catch (error) {
      if ((error as NodeJS.ErrnoException).code !== "EEXIST") throw error;
    }
  }
  throw new Error("no free loopback address left for this run");
}

/**
 * The integration run's one app server (started by tests/global-setup.ts) on its shared database.
 * Call it at the top of a test file that needs no database of its own: this process then reads
 * and writes the same database as the server, and `client()` connects from a loopback address of
 * this file's own, so per-address abuse limits never mix test files. Shared state is shared:
 * make accounts of your own with `uniqueEmail`, and leave the demo accounts as they are.
 */
export function sharedApp(name: string) {
  const { origin, databaseFile } = inject("sharedApp");
  process.env.DATABASE_URL = `file:${databaseFile}`;
  process.env.APP_ORIGIN = origin;
  const localAddress = claimLoopbackAddress(name);
  return { origin, databaseFile, localAddress, client: () => new TestClient(origin, { localAddress }) };
}
