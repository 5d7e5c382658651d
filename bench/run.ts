/**
 * Prints figures for the read path, measured side by side in one run on the demo database:
 * the Library query (unfiltered, filtered, full-text) and the guide page's model, plus what
 * rendering step bodies per request would cost against serving the HTML stored at save time.
 * No assertions: read the ratios.
 */
import { performance } from "node:perf_hooks";
import { startTestServices } from "../tests/support/services";

const fakes = await startTestServices();
const { getDb } = await import("~/db/client.server");
const { getStorage } = await import("~/services/storage.server");
const { listPublishedGuides, parseLibraryQuery, getPublishedGuide } = await import("~/models/library.server");
const { renderBody } = await import("~/services/richtext.server");
const db = await getDb();
const storage = getStorage();

async function time(label: string, runs: number, fn: () => Promise<unknown> | unknown) {
  for (let i = 0; i < 20; i++) await fn();
  const start = performance.now();
  for (let i = 0; i < runs; i++) await fn();
  const ms = (performance.now() - start) / runs;
  console.log(`${label.padEnd(48)} ${ms.toFixed(3).padStart(8)} ms/op`);
  return ms;
}

const q = (s: string) => parseLibraryQuery(new URLSearchParams(s));
await time("library: no filters", 300, () => listPublishedGuides(db, q("")));
await time("library: powertrain=hybrid", 300, () => listPublishedGuides(db, q("powertrain=hybrid")));
await time("library: q=relay fuse", 300, () => listPublishedGuides(db, q("q=relay+fuse")));
const page = await time("guide page model (stored HTML)", 300, () =>
  getPublishedGuide(db, storage, "kestrel-hood-auxiliary-lamps"),
);

const guide = await getPublishedGuide(db, storage, "kestrel-hood-auxiliary-lamps");
const { loadRevision } = await import("~/models/guides.server");
const { guides } = await import("~/db/schema");
const { eq } = await import("drizzle-orm");
const row = await db.query.guides.findFirst({ where: eq(guides.slug, "kestrel-hood-auxiliary-lamps") });
const loaded = row?.publishedRevisionId ? await loadRevision(db, row.publishedRevisionId) : null;
const bodies = loaded?.steps.map((s) => s.body) ?? [];
const render = await time(`render ${bodies.length} step bodies per request`, 300, () => bodies.map((b) => renderBody(b)));
console.log(
  `\nrendering per request would add ${(render / page).toFixed(2)} × the page model's own time (${guide?.steps.length} steps)`,
);

await fakes.stop();
