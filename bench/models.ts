/**
 * `npm run bench -- --models`: the read path's model functions in-process on a copy of the demo
 * database — the Library query (unfiltered, filtered, full-text) and the guide page's model — plus
 * what rendering step bodies per request would cost against serving the HTML stored at save time.
 */
import { formatMs, formatRatio, formatTable, ratio, summarize } from "./stats";
import { timeRuns } from "./timing";

export async function runModels(databaseFile: string, runs: number) {
  // Read by env() on first use: set before the app's modules load.
  process.env.DATABASE_URL = `file:${databaseFile}`;
  const { getDb } = await import("~/db/client.server");
  const { getStorage } = await import("~/services/storage.server");
  const { listPublishedGuides, parseLibraryQuery, getPublishedGuide } = await import("~/models/library.server");
  const { loadRevision } = await import("~/models/guides.server");
  const { renderBody } = await import("~/services/richtext.server");
  const { guides } = await import("~/db/schema");
  const { eq } = await import("drizzle-orm");
  const db = await getDb();
  const storage = getStorage();
  const slug = "kestrel-hood-auxiliary-lamps";
  const q = (s: string) => parseLibraryQuery(new URLSearchParams(s));

  const row = await db.query.guides.findFirst({ where: eq(guides.slug, slug) });
  const loaded = row?.publishedRevisionId ? await loadRevision(db, row.publishedRevisionId) : null;
  const bodies = loaded?.steps.map((s) => s.body) ?? [];

  const cases: [string, () => unknown][] = [
    ["library: no filters", () => listPublishedGuides(db, q(""))],
    ["library: powertrain=hybrid", () => listPublishedGuides(db, q("powertrain=hybrid"))],
    ["library: q=relay fuse", () => listPublishedGuides(db, q("q=relay+fuse"))],
    ["guide page model (stored HTML)", () => getPublishedGuide(db, storage, slug)],
    [`render ${bodies.length} step bodies per request`, () => bodies.map((b) => renderBody(b))],
  ];
  const rows: string[][] = [];
  const p50s: number[] = [];
  for (const [label, fn] of cases) {
    const { p50, p99, mean } = summarize(await timeRuns(runs, fn));
    p50s.push(p50);
    rows.push([label, formatMs(p50), formatMs(p99), formatMs(mean)]);
  }
  console.log(`\nModel functions in-process (demo database, ${runs} runs each)\n`);
  console.log(formatTable(["case", "p50 ms", "p99 ms", "mean ms"], rows));
  console.log(
    `\nrendering per request would add ${formatRatio(ratio(p50s[4], p50s[3]))} the page model's own time (p50, ${bodies.length} steps)`,
  );
}
