/**
 * `npm run bench -- --scale PATH`: the Library at scale, on a copy of a `npm run bench:data`
 * database. For each filter and search:
 *   served — the answer the app serves: `listFromIndex`, the Library's in-memory index (page of
 *            guides, total, five facets, their fitment), after the first call has built it;
 *   model  — `listPublishedGuides`, the same answer computed by SQL, checked equal to it;
 *   raw    — the very statements the model sent to SQLite (captured through Drizzle's logger),
 *            replayed straight on the libSQL client: the SQL for the same query;
 *   HTTP  — GET /api/guides with the same query string, one request at a time, against the
 *           production server (`npm start`'s settings) on the same copy.
 * Each in-process case runs in a child process (bench/scale-case.ts) ended past a time limit, since
 * a slow SQLite statement cannot be interrupted. Then the server's resident memory after start-up,
 * and after the HTTP runs.
 */
import { spawn } from "node:child_process";
import { copyFileSync, existsSync, mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { sql } from "drizzle-orm";
import type { ScaleCaseJob } from "./scale-case";
import { memory, ROOT, runLoad, type Server, startTorqueleaf } from "./servers";
import { formatMiB, formatMs, formatRatio, formatTable, goalMark, ratio, type Summary } from "./stats";

/** The product's goals for the Library at 20,000 guides. */
export const GOALS = { filterP99Ms: 15, searchP99Ms: 30, overRaw: 1.5, rssBytes: 300 * 1024 * 1024 };

type Case = { label: string; kind: "filter" | "search"; query: string };

export async function runScale(
  path: string,
  options: {
    port: number;
    runs: number;
    budgetMs: number;
    caseLimitMs: number;
    httpSeconds: number;
    /** Starts the bare React Router app (bench/bare, built), measured beside the HTTP runs. */
    bare: () => Promise<Server>;
    onCleanup: (step: () => void) => void;
  },
) {
  if (!existsSync(path))
    throw new Error(`${path} does not exist: write it with npm run bench:data -- --guides 20000 --db ${path}`);
  const dir = mkdtempSync(join(tmpdir(), "torqueleaf-bench-scale-"));
  options.onCleanup(() => rmSync(dir, { recursive: true, force: true }));
  try {
    const file = join(dir, "torqueleaf.db");
    copyFileSync(path, file);
    if (existsSync(`${path}-wal`)) copyFileSync(`${path}-wal`, `${file}-wal`);
    const cases = await measureInProcess(file, options.runs, options.budgetMs, options.caseLimitMs);
    await measureHttp(cases, file, join(dir, "data"), options);
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

type Measured = Case & {
  index: Summary;
  buildMs: number;
  /** The slowest of this query's warm-up calls (made before it is measured). */
  coldMs: number;
  same: boolean;
  model: Summary;
  raw: Summary;
  statements: number;
  timedOut?: boolean;
};

async function measureInProcess(file: string, runs: number, budgetMs: number, caseLimitMs: number): Promise<Measured[]> {
  const { createDb, configure, migrateDb } = await import("~/db/client.server");
  const { client, db } = createDb(`file:${file}`);
  await configure(client, `file:${file}`);
  // A database written before the newest migrations gets them, as the server would at start-up.
  await migrateDb(db);

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
    `\nScale: ${guides} published guides; vehicle ${top.make}/${top.model}/${top.generation} (${top.powertrain}, ${top.guides} guides on its busiest variant); up to ${runs} runs (or ${budgetMs / 1000} s) each in a process of its own, after the warm-up, each case ended after ${caseLimitMs / 1000} s\n`,
  );

  client.close();
  const measured: Measured[] = [];
  for (const c of cases) {
    process.stderr.write(`  ${c.label}…\n`);
    measured.push({
      ...c,
      ...(await measureCase({ file, query: c.query, runs, budgetMs, warmup: cases.map((other) => other.query) }, caseLimitMs)),
    });
  }

  const rows = measured.map((m) => {
    const goal = m.kind === "filter" ? GOALS.filterP99Ms : GOALS.searchP99Ms;
    const over = ratio(m.index.p99, m.raw.p99);
    return [
      m.label,
      m.timedOut ? `> ${caseLimitMs / 1000} s` : String(m.index.n),
      formatMs(m.index.p50),
      formatMs(m.index.p99),
      formatMs(m.coldMs),
      m.timedOut ? "?" : m.same ? "yes" : "NO",
      formatMs(m.model.p99),
      formatMs(m.raw.p50),
      formatMs(m.raw.p99),
      String(m.statements),
      formatRatio(over),
      `≤ ${goal} ms: ${m.timedOut ? "MISSED" : goalMark(m.index.p99, goal)}`,
      `≤ ${GOALS.overRaw}×: ${goalMark(over, GOALS.overRaw)}`,
    ];
  });
  console.log(
    formatTable(
      [
        "Library query",
        "n",
        "served p50",
        "served p99",
        "warm-up max",
        "same as SQL",
        "SQL model p99",
        "raw SQL p50",
        "raw SQL p99",
        "stmts",
        "served ÷ raw",
        "goal p99",
        "goal ÷ raw",
      ],
      rows,
    ),
  );
  const builds = measured.filter((m) => !m.timedOut).map((m) => m.buildMs);
  console.log(
    `(milliseconds; served = the in-memory index, built once per content stamp in ${formatMs(Math.max(...builds))} ms at most on its first call, not counted; measured after every query above was answered 5 times (warm-up max: the slowest of this query's, while V8 still compiles); SQL model = listPublishedGuides; raw SQL = its statements replayed on the libSQL client, one after the other; n = runs measured, "> ${caseLimitMs / 1000} s" = ended unfinished)`,
  );
  return measured;
}

const NOT_MEASURED: Summary = { n: 0, p50: Number.NaN, p99: Number.NaN, mean: Number.NaN };

/** Runs one case in its own process; past `limitMs` it is ended and reported as timed out. */
function measureCase(
  job: ScaleCaseJob,
  limitMs: number,
): Promise<Pick<Measured, "index" | "buildMs" | "coldMs" | "same" | "model" | "raw" | "statements" | "timedOut">> {
  return new Promise((done, fail) => {
    const child = spawn(process.execPath, ["--import", "tsx", join(ROOT, "bench", "scale-case.ts"), JSON.stringify(job)], {
      cwd: ROOT,
      stdio: ["ignore", "pipe", "pipe"],
    });
    let stdout = "";
    let stderr = "";
    let timedOut = false;
    child.stdout.on("data", (chunk) => (stdout += chunk));
    child.stderr.on("data", (chunk) => (stderr += chunk));
    const timer = setTimeout(() => {
      timedOut = true;
      child.kill("SIGKILL");
    }, limitMs);
    child.on("error", fail);
    child.on("exit", (code) => {
      clearTimeout(timer);
      if (timedOut)
        done({
          index: NOT_MEASURED,
          buildMs: Number.NaN,
          coldMs: Number.NaN,
          same: false,
          model: NOT_MEASURED,
          raw: NOT_MEASURED,
          statements: 0,
          timedOut: true,
        });
      else if (code !== 0) fail(new Error(`measuring ${job.query} failed (${code}): ${stderr.slice(-2000)}`));
      else done(JSON.parse(stdout.trim().split("\n").at(-1) ?? "{}"));
    });
  });
}

async function measureHttp(
  cases: Measured[],
  file: string,
  dataDir: string,
  options: { port: number; httpSeconds: number; bare: () => Promise<Server> },
) {
  const app = await startTorqueleaf(options.port, file, dataDir);
  try {
    const loaded = memory(app.pid);
    const one = (origin: string, path: string, seconds: number) =>
      runLoad({ kind: "readers", origin, paths: [path], readers: 1, thinkMs: 0, seconds });
    const pathOf = (c: Measured) => `/api/guides${c.query ? `?${c.query}` : ""}`;
    // Every address is asked for a while first, as every query is answered 5 times before the
    // in-process runs: the server's code is compiled and its start-up garbage collected by then.
    const served = cases.filter((c) => !c.timedOut);
    for (const c of served) await one(app.origin, pathOf(c), 1);
    const rows: string[][] = [];
    for (const c of cases) {
      if (c.timedOut) {
        // Its statements would hold the server's only thread for minutes and stall every case after it.
        rows.push([c.label, "–", "–", "–", "–", "–", "–", "not run: ended unfinished in-process"]);
        continue;
      }
      const r = await one(app.origin, pathOf(c), options.httpSeconds);
      const goal = c.kind === "filter" ? GOALS.filterP99Ms : GOALS.searchP99Ms;
      rows.push([
        c.label,
        String(r.requests),
        String(r.errors),
        formatMs(r.p50),
        formatMs(r.p99),
        formatMs(c.index.p99),
        formatRatio(ratio(r.p99, c.index.p99)),
        `≤ ${goal} ms: ${goalMark(r.p99, goal)}`,
      ]);
    }
    const after = memory(app.pid);
    // The same load on the bare React Router app's one static page, on the same core in the same
    // run: what this machine gives a page that does next to nothing.
    const bare = await options.bare();
    try {
      await one(bare.origin, "/", 1);
      const r = await one(bare.origin, "/", options.httpSeconds);
      rows.push([
        "(bare React Router page, for scale)",
        String(r.requests),
        String(r.errors),
        formatMs(r.p50),
        formatMs(r.p99),
        "–",
        "–",
        "–",
      ]);
    } finally {
      await bare.stop();
    }
    console.log(
      `\nThe same over HTTP: GET /api/guides?…, one request at a time, ${options.httpSeconds} s each, after every address was asked for 1 s (Torqueleaf, production build; the same query again is answered as it was noted, before React Router runs, until the content changes)\n`,
    );
    console.log(
      formatTable(
        ["Library query", "requests", "errors", "p50 ms", "p99 ms", "served p99", "HTTP ÷ served p99", "goal p99"],
        rows,
      ),
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
