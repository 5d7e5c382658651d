/**
 * A second process that reads the database over and over, as a reporting or backup tool polling
 * the file would. Started after a writer crashed, its first connection finds no live wal-index and
 * rebuilds it from the write-ahead log (WAL recovery); meanwhile any other connection is refused
 * with SQLITE_BUSY_RECOVERY unless it waits. Prints "opening" just before that first connection and
 * "reading" after its first read.
 *
 *   node --import tsx tests/support/db-busy-reader.ts <file>
 */
import { createClient } from "@libsql/client";

const [file] = process.argv.slice(2);
if (!file) throw new Error("usage: db-busy-reader.ts <file>");

process.stdout.write("opening\n");
const client = createClient({ url: `file:${file}`, timeout: 30_000 });
let announced = false;
for (;;) {
  try {
    await client.execute("SELECT count(*) FROM sqlite_schema");
    if (!announced) {
      process.stdout.write("reading\n");
      announced = true;
    }
  } catch (error) {
    process.stderr.write(`read failed: ${String(error)}\n`);
  }
  await new Promise((r) => setImmediate(r));
}
