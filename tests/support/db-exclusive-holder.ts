/**
 * A second process that locks the whole database file against every other connection, readers
 * included (locking_mode = EXCLUSIVE, then a write), as a maintenance or restore tool may, for
 * HOLD_MS (or until it is killed). Prints "held" once it has the lock.
 *
 *   node --import tsx tests/support/db-exclusive-holder.ts <file> [holdMs]
 */
import { setTimeout as sleep } from "node:timers/promises";
import { createClient } from "@libsql/client";

const [file, holdArg = "0"] = process.argv.slice(2);
if (!file) throw new Error("usage: db-exclusive-holder.ts <file> [holdMs]");
const holdMs = Number(holdArg);

// One connection, so the pragma and the lock belong to the same one.
const client = createClient({ url: `file:${file}`, timeout: 30_000, concurrency: 1 });
await client.execute("PRAGMA locking_mode = EXCLUSIVE");
await client.execute("CREATE TABLE IF NOT EXISTS exclusive_probe (at INTEGER NOT NULL)");
await client.execute({ sql: "INSERT INTO exclusive_probe (at) VALUES (?)", args: [Date.now()] });
process.stdout.write("held\n");
await sleep(holdMs > 0 ? holdMs : 3_600_000);
client.close();
