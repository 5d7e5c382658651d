/**
 * Builds the demo database the benchmark copies: the app's own boot (as `npm start --local-demo`
 * does on an empty database: migrations, the stand-ins, the demo scenario with its photos), then
 * the WAL folded into the file so that a plain copy is whole. Settings come from the environment.
 */
import { sql } from "drizzle-orm";
import { boot } from "~/cli/boot";
import { getDb } from "~/db/client.server";

const { fakes } = await boot({ localDemo: true });
const db = await getDb();
await db.run(sql`PRAGMA wal_checkpoint(TRUNCATE)`);
await fakes?.stop();
process.exit(0);
