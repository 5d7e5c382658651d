/**
 * `npm run bench -- --scale PATH`: the Library at scale, on a copy of a `npm run bench:data`
 * database. For each filter and search:
 *   model — `listPublishedGuides` in-process (page of guides, total, five facets, their fitment);
 *   raw   — the very statements that call sent to SQLite (captured through Drizzle's logger),
 *           replayed straight on the libSQL client: what the model costs above its own SQL;
 *   HTTP  — GET /api/guides with the same query string, one request at a time, against the
 *           production server (`npm start`'s settings) on the same copy.
 * Then the server's resident memory after start-up, and after the HTTP runs.
 */
import { copyFileSync, existsSync, mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import type { InArgs } from "@libsql/client";
import { sql } from "drizzle-orm";
import { drizzle } from "drizzle-orm/libsql";
import { memory, runLoad, startTorqueleaf } from "./servers";
import { formatMiB, formatMs, formatRatio, formatTable, goalMark, ratio, summarize } from "./stats";
import { timeRuns } from "./timing";

/** The product's goals for the Library at 20,000 guides. */
export const GOALS = { filterP99Ms: 15, searchP99Ms: 30, overRaw: 1.5, rssBytes: 300 * 1024 * 1024 };

type Case = { label: string; kind: "filter" | "search"; query: string };

export async function runScale(path: string, options: { port: number; runs: number; httpSeconds: number }) {
  if (!existsSync(path))
    throw new Error(`${path} does not exist: write it with npm run bench:data -- --guides 20000 --db ${path}`);
  const dir = mkdtempSync(join(tmpdir(), "torqueleaf-bench-scale-"));
  try {
    const file = join(dir, "torqueleaf.db");
    copyFileSync(path, file);
    if (existsSync(`${path}-wal`)) copyFileSync(`${path}-wal`, `${file}-wal`);
    const cases = await measureInProcess(file, options.runs);
    await measureHttp(cases, file, join(dir, "data"), options);
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

type Measured = Case & { model: { p50: number; p99: number }; raw: { p50: number; p99: number }; statements: number };

async function measureInProcess(file: string, runs: number): Promise<Measured[]> {
  const { createDb, configure } = await import("~/db/client.server");
  const schema = await import("~/db/schema");
  const { listPublishedGuides, parseLibraryQuery } = await import("~/models/library.server");
  const { client } = createDb(`file:${file}`);
  await configure(client, `file:${file}`);
  let capture: { sql: string; args: InArgs }[] | null = null;
  const db = drizzle(client, {
    schema,
    casing: "snake_case",
    logger: { logQuery: (query, params) => capture?.push({ sql: query, args: params as InArgs }) },
  });

  // The busiest vehicle (generation and powertrain) of the catalogue, and a year it covers.
  const top = await db.get<{
    make: string;
    model: string;
    generation: string;
    powertrain: string;
    year: number;
    guides: number;
  }>(sql`
    SELECT mk.slug AS make, mo.slug AS model, gen.slug AS generation, v.powertrain, gen.first_year + 1 AS year,
      count(DISTINCT g.id) AS guides
    FROM guides g JOIN fitment f ON f.revision_id = g.published_revision_id
    JOIN variants v ON v.id = f.variant_id JOIN generations gen ON gen.id = v.generation_id
    JOIN models mo ON mo.id = gen.model_id JOIN makes mk ON mk.id = mo.make_id
    WHERE g.state = 'published' GROUP BY v.id ORDER BY guides DESC LIMIT 1`);
  const [{ n: guides } = { n: 0 }] = await db.all<{ n: number }>(sql`SELECT count(*) AS n FROM guides WHERE state = 'published'`);
  if (!top) throw new Error("the scale database has no published guide with fitment");
  const vehicle = `make=${top.make}&model=${top.model}&generation=${top.generation}`;
  const cases: Case[] = [
    {
      label: "vehicle + powertrain + category",
      kind: "filter",
      query: `${vehicle}&powertrain=${top.powertrain}&category=lighting`,
    },
    { label: "year", kind: "filter", query: `year=${top.year}` },
    { label: "facet: vehicle", kind: "filter", query: vehicle },
    { label: "facet: powertrain", kind: "filter", query: `powertrain=${top.powertrain}` },
    { label: "facet: drivetrain", kind: "filter", query: "drivetrain=AWD" },
    { label: "facet: category", kind: "filter", query: "category=lighting" },
    { label: "facet: difficulty", kind: "filter", query: "difficulty=3" },
    { label: "no filter", kind: "filter", query: "" },
    { label: "search, common term (harness)", kind: "search", query: "q=harness" },
    { label: "search, common term + filter", kind: "search", query: `q=harness&powertrain=${top.powertrain}` },
    { label: "search, rare term (snowlatch)", kind: "search", query: "q=snowlatch" },
    { label: "search, two terms (relay bracket)", kind: "search", query: "q=relay+bracket" },
  ];
  console.log(
    `\nScale: ${guides} published guides; vehicle ${top.make}/${top.model}/${top.generation} (${top.powertrain}, ${top.guides} guides on its busiest variant); ${runs} runs each in-process\n`,
  );

  const measured: Measured[] = [];
  for (const c of cases) {
    const query = parseLibraryQuery(new URLSearchParams(c.query));
    const statements: { sql: string; args: InArgs }[] = [];
    capture = statements;
    await listPublishedGuides(db, query);
    capture = null;
    const model = summarize(await timeRuns(runs, () => listPublishedGuides(db, query)));
    const raw = summarize(
      await timeRuns(runs, async () => {
        for (const statement of statements) await client.execute(statement);
      }),
    );
    measured.push({ ...c, model, raw, statements: statements.length });
  }
  client.close();

  const rows = measured.map((m) => {
    const goal = m.kind === "filter" ? GOALS.filterP99Ms : GOALS.searchP99Ms;
    const over = ratio(m.model.p99, m.raw.p99);
    return [
      m.label,
      formatMs(m.model.p50),
      formatMs(m.model.p99),
      formatMs(m.raw.p50),
      formatMs(m.raw.p99),
      String(m.statements),
      formatRatio(over),
      `≤ ${goal} ms: ${goalMark(m.model.p99, goal)}`,
      `≤ ${GOALS.overRaw}×: ${goalMark(over, GOALS.overRaw)}`,
    ];
  });
  console.log(
    formatTable(
      ["Library query", "model p50", "model p99", "raw p50", "raw p99", "stmts", "p99 ÷ raw", "goal p99", "goal ÷ raw"],
      rows,
    ),
  );
  console.log("(milliseconds; raw = the same statements replayed on the libSQL client, one after the other)");
  return measured;
}

async function measureHttp(cases: Measured[], file: string, dataDir: string, options: { port: number; httpSeconds: number }) {
  const app = await startTorqueleaf(options.port, file, dataDir);
  try {
    const loaded = memory(app.pid);
    const rows: string[][] = [];
    for (const c of cases) {
      const path = `/api/guides${c.query ? `?${c.query}` : ""}`;
      await runLoad({ kind: "readers", origin: app.origin, paths: [path], readers: 1, thinkMs: 0, seconds: 1 });
      const r = await runLoad({
        kind: "readers",
        origin: app.origin,
        paths: [path],
        readers: 1,
        thinkMs: 0,
        seconds: options.httpSeconds,
      });
      const goal = c.kind === "filter" ? GOALS.filterP99Ms : GOALS.searchP99Ms;
      rows.push([
        c.label,
        String(r.requests),
        String(r.errors),
        formatMs(r.p50),
        formatMs(r.p99),
        formatMs(c.model.p99),
        formatRatio(ratio(r.p99, c.model.p99)),
        `≤ ${goal} ms: ${goalMark(r.p99, goal)}`,
      ]);
    }
    const after = memory(app.pid);
    console.log(
      `\nThe same over HTTP: GET /api/guides?…, one request at a time, ${options.httpSeconds} s each (Torqueleaf, production build)\n`,
    );
    console.log(
      formatTable(["Library query", "requests", "errors", "p50 ms", "p99 ms", "model p99", "HTTP ÷ model p99", "goal p99"], rows),
    );
    const goal = GOALS.rssBytes;
    console.log(
      `\nserver RSS after loading the database (start-up, first page): ${formatMiB(loaded.rss)} (goal ≤ ${formatMiB(goal)}: ${goalMark(loaded.rss, goal)}); ` +
        `after the HTTP runs: ${formatMiB(after.rss)} (${goalMark(after.rss, goal)}), peak ${formatMiB(after.peak)} (${goalMark(after.peak, goal)})`,
    );
  } finally {
    await app.stop();
  }
}
