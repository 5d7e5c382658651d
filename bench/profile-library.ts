/**
 * `tsx bench/profile-library.ts PATH [runs]`: every Library case of the scale bench, in one process,
 * timed call by call, for profiling the served path (`node --cpu-prof`, `--trace-gc`).
 */
import { sql } from "drizzle-orm";
import { configure, createDb } from "~/db/client.server";
import { listFromIndex } from "~/models/library-index.server";
import { parseLibraryQuery } from "~/models/library.server";
import { summarize } from "./stats";

const [path, runsArg] = process.argv.slice(2);
const runs = Number(runsArg ?? 200);
const url = `file:${path}`;
const { client, db } = createDb(url);
await configure(client, url);
const top = await db.get<{ make: string; model: string; generation: string; powertrain: string; year: number }>(sql`
  SELECT mk.slug AS make, mo.slug AS model, gen.slug AS generation, v.powertrain, gen.first_year + 1 AS year
  FROM guides g JOIN fitment f ON f.revision_id = g.published_revision_id
  JOIN variants v ON v.id = f.variant_id JOIN generations gen ON gen.id = v.generation_id
  JOIN models mo ON mo.id = gen.model_id JOIN makes mk ON mk.id = mo.make_id
  WHERE g.state = 'published' GROUP BY v.id ORDER BY count(DISTINCT g.id) DESC LIMIT 1`);
if (!top) throw new Error("no published guide with fitment");
const vehicle = `make=${top.make}&model=${top.model}&generation=${top.generation}`;
const cases = [
  `${vehicle}&powertrain=${top.powertrain}&category=lighting`,
  `year=${top.year}`,
  vehicle,
  `powertrain=${top.powertrain}`,
  "drivetrain=AWD",
  "category=lighting",
  "difficulty=3",
  "",
  "q=harness",
  `q=harness&powertrain=${top.powertrain}`,
  "q=snowlatch",
  "q=relay+bracket",
];
for (const c of cases) {
  const query = parseLibraryQuery(new URLSearchParams(c));
  await listFromIndex(db, query);
  const times: number[] = [];
  for (let i = 0; i < runs; i++) {
    const start = performance.now();
    await listFromIndex(db, query);
    times.push(performance.now() - start);
  }
  const s = summarize(times);
  console.log(
    `${(c || "(none)").padEnd(60)} p50 ${s.p50.toFixed(2)}  p99 ${s.p99.toFixed(2)}  max ${Math.max(...times).toFixed(2)}`,
  );
}
client.close();
