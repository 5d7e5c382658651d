/**
 * A second process that keeps taking the database's write lock, as a backup job, a seed run or a
 * second app process would: BEGIN IMMEDIATE, hold it for HOLD_MS, COMMIT, pause for GAP_MS, again.
 * Prints "locked" each time it holds the lock, so a test can time its writes against it.
 *
 *   node --import tsx tests/support/db-lock-holder.ts <file> [holdMs] [gapMs]
 */
import { setTimeout as sleep } from "node:timers/promises";
import { createClient } from "@libsql/client";

const [file, holdArg = "250", gapArg = "100"] = process.argv.slice(2);
if (!file) throw new Error("usage: db-lock-holder.ts <file> [holdMs] [gapMs]");
const holdMs = Number(holdArg);
const gapMs = Number(gapArg);

// This process waits for the app's writes in turn, as any well-behaved SQLite program does.
const client = createClient({ url: `file:${file}`, timeout: 30_000 });
let stopping = false;
process.on("SIGTERM", () => {
  stopping = true;
});

while (!stopping) {
  const tx = await client.transaction("write");
  process.stdout.write("locked\n");
  await sleep(holdMs);
  await tx.commit();
  await sleep(gapMs);
}
client.close();
