/**
 * A second process that writes as fast as it can in large transactions, with automatic checkpoints
 * off so the write-ahead log grows, until it is killed with SIGKILL: what a crashed writer leaves
 * behind (a long WAL that the next connection has to recover). Prints "writing" once its first
 * transaction has committed.
 *
 *   node --import tsx tests/support/db-crash-writer.ts <file>
 */
import { createClient } from "@libsql/client";

const [file] = process.argv.slice(2);
if (!file) throw new Error("usage: db-crash-writer.ts <file>");

const client = createClient({ url: `file:${file}`, timeout: 30_000 });
await client.execute("PRAGMA wal_autocheckpoint = 0");
await client.execute("CREATE TABLE IF NOT EXISTS crash_probe (id INTEGER PRIMARY KEY, body BLOB NOT NULL)");
const body = new Uint8Array(4096).fill(7).buffer;
let announced = false;
for (;;) {
  const rows = Array.from({ length: 200 }, () => ({ sql: "INSERT INTO crash_probe (body) VALUES (?)", args: [body] }));
  await client.batch(rows, "write");
  if (!announced) {
    process.stdout.write("writing\n");
    announced = true;
  }
}
