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

export type ScaleCaseJob = { file: string; query: string; runs: number; budgetMs: number };

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
const index = summarize(await timeRuns(job.runs, () => listFromIndex(db, query), 1, job.budgetMs));
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
process.stdout.write(`${JSON.stringify({ index, buildMs, same, model, raw, statements: statements.length })}\n`);
