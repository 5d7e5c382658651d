/**
 * One Library query of the scale benchmark, measured in a process of its own so that the caller
 * can bound it in time (a pathological query cannot be interrupted inside SQLite): the answer the
 * app serves (`listFromIndex`, the in-memory index, built by its first call), then the SQL model
 * `listPublishedGuides`, then the statements that sent (captured through Drizzle's logger) replayed
 * straight on the libSQL client; and whether the two answers are the same. Reads one JSON job from
 * argv, prints one JSON result line.
 */
import type { InArgs } from "@libsql/client";
import { drizzle } from "drizzle-orm/libsql";
import { configure, createDb } from "~/db/client.server";
import * as schema from "~/db/schema";
import { isDeepStrictEqual } from "node:util";
import { listFromIndex } from "~/models/library-index.server";
import { listPublishedGuides, parseLibraryQuery } from "~/models/library.server";
import { summarize } from "./stats";
import { timeRuns } from "./timing";

/** `warmup`: every case's query, each answered a few times before this one is measured (see below). */
export type ScaleCaseJob = { file: string; query: string; runs: number; budgetMs: number; warmup: string[] };

const job = JSON.parse(process.argv[2] ?? "{}") as ScaleCaseJob;
const url = `file:${job.file}`;
const { client } = createDb(url);
await configure(client, url);
let capture: { sql: string; args: InArgs }[] | null = null;
const db = drizzle(client, {
  schema,
  casing: "snake_case",
  logger: { logQuery: (query, params) => capture?.push({ sql: query, args: params as InArgs }) },
});
const query = parseLibraryQuery(new URLSearchParams(job.query));
const built = performance.now();
const served = await listFromIndex(db, query);
const buildMs = performance.now() - built;
// A server answers many kinds of query for hours; its first few calls after start run the index's
// code in V8's interpreter and baseline tiers (measured: a call took 30–45 ms for its first five
// runs, then 8 ms). The served path is measured as a running server serves it: after every case's
// query has been answered WARM_CALLS times. The first call of all (the build) is reported apart.
const WARM_CALLS = 5;
const firstCalls: number[] = [];
for (const other of job.warmup) {
  const warmQuery = parseLibraryQuery(new URLSearchParams(other));
  for (let i = 0; i < WARM_CALLS; i++) {
    const before = performance.now();
    await listFromIndex(db, warmQuery);
    if (other === job.query) firstCalls.push(performance.now() - before);
  }
}
const index = summarize(await timeRuns(job.runs, () => listFromIndex(db, query), 1, job.budgetMs));
const coldMs = Math.max(0, ...firstCalls);
const statements: { sql: string; args: InArgs }[] = [];
capture = statements;
const first = performance.now();
const reference = await listPublishedGuides(db, query);
capture = null;
// A call slower than the whole budget is measured once more, without a warm-up.
const warmup = performance.now() - first > job.budgetMs ? 0 : 1;
const model = summarize(await timeRuns(job.runs, () => listPublishedGuides(db, query), warmup, job.budgetMs));
const raw = summarize(
  await timeRuns(
    job.runs,
    async () => {
      for (const statement of statements) await client.execute(statement);
    },
    warmup,
    job.budgetMs,
  ),
);
client.close();
const same = isDeepStrictEqual(served, reference);
process.stdout.write(`${JSON.stringify({ index, buildMs, coldMs, same, model, raw, statements: statements.length })}\n`);
