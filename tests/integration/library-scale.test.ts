import { sql } from "drizzle-orm";
import fc from "fast-check";
import { beforeAll, describe, expect, it } from "vitest";
import type { Db } from "~/db/client.server";
import { listFromIndex } from "~/models/library-index.server";
import { type LibraryQuery, type LibrarySort, PAGE_SIZE, parseLibraryQuery } from "~/models/library.server";
import { CATEGORIES, DRIVETRAINS, POWERTRAINS } from "~/utils/vocab";
import { useTestDatabase } from "../support/base-db";
import { HOSTILE_TITLE, isRare, RARE_WORD, writeCatalogue } from "./library-catalogue";

/**
 * The Library's filters, counts, sorts and pages checked against a brute-force count written here:
 * every published guide and fitment row read back with plain SELECTs and filtered in a loop, with
 * nothing from the app's own query code. First on the demo data, then on the demo data plus a
 * generated catalogue of 20,000 guides and 100,000 fitment rows (tests/integration/library-catalogue.ts).
 */
let db: Db;

type Row = {
  variantId: number;
  make: string;
  model: string;
  generation: string;
  first: number;
  last: number;
  powertrain: string;
  drivetrain: string;
  status: string;
};
type Guide = {
  id: number;
  slug: string;
  category: string;
  difficulty: number;
  minutes: number;
  publishedAt: number;
  fits: number;
  rows: Row[];
  rare: boolean;
};

let guides: Guide[];
let catalogueYears: { first: number; last: number };

async function readBack() {
  const list = await db.all<{
    id: number;
    slug: string;
    category: string;
    difficulty: number;
    minutes: number;
    publishedAt: number;
    summary: string;
  }>(sql`
    SELECT id, slug, category, difficulty, minutes, published_at AS publishedAt, summary FROM guides WHERE state = 'published'`);
  const rows = await db.all<Row & { guideId: number; last: number | null }>(sql`
    SELECT g.id AS guideId, f.variant_id AS variantId, mk.slug AS make, mo.slug AS model, gen.slug AS generation,
      gen.first_year AS first, gen.last_year AS last, v.powertrain, v.drivetrain, f.status
    FROM guides g JOIN fitment f ON f.revision_id = g.published_revision_id JOIN variants v ON v.id = f.variant_id
    JOIN generations gen ON gen.id = v.generation_id JOIN models mo ON mo.id = gen.model_id JOIN makes mk ON mk.id = mo.make_id
    WHERE g.state = 'published'`);
  const reports = await db.all<{ guideId: number; status: string; hiddenAt: number | null }>(sql`
    SELECT guide_id AS guideId, status, hidden_at AS hiddenAt FROM fitment_reports`);
  const spans = await db.all<{ first: number; last: number | null }>(
    sql`SELECT first_year AS first, last_year AS last FROM generations`,
  );
  catalogueYears = {
    first: Math.min(...spans.map((s) => s.first)),
    last: Math.max(...spans.map((s) => s.last ?? new Date().getFullYear() + 1)),
  };
  const byId = new Map<number, Guide>(
    list.map((g) => [
      Number(g.id),
      {
        id: Number(g.id),
        slug: g.slug,
        category: g.category,
        difficulty: Number(g.difficulty),
        minutes: Number(g.minutes),
        publishedAt: Number(g.publishedAt),
        fits: 0,
        rows: [],
        rare: g.summary.includes(RARE_WORD),
      },
    ]),
  );
  for (const r of rows) byId.get(Number(r.guideId))?.rows.push({ ...r, variantId: Number(r.variantId), last: r.last ?? 9999 });
  for (const r of reports) {
    const g = byId.get(Number(r.guideId));
    if (g && r.status === "fits" && r.hiddenAt === null) g.fits++;
  }
  guides = [...byId.values()];
}

type Facet = "powertrain" | "drivetrain" | "category" | "difficulty" | "vehicle";

/** Whether a fitment row meets the query's vehicle filters, all of them or all but one facet's. */
function rowMeets(row: Row, q: LibraryQuery, without?: Facet) {
  if (row.status === "does-not-fit") return false;
  if (
    without !== "vehicle" &&
    ((q.make && row.make !== q.make) || (q.model && row.model !== q.model) || (q.generation && row.generation !== q.generation))
  )
    return false;
  if (q.year !== undefined && (row.first > q.year || row.last < q.year)) return false;
  if (without !== "powertrain" && q.powertrain && row.powertrain !== q.powertrain) return false;
  if (without !== "drivetrain" && q.drivetrain && row.drivetrain !== q.drivetrain) return false;
  if (q.fits !== undefined && row.variantId !== q.fits) return false;
  return true;
}

function guideMeets(g: Guide, q: LibraryQuery, without?: Facet) {
  if (q.q && !g.rare) return false;
  if (without !== "category" && q.category && g.category !== q.category) return false;
  if (without !== "difficulty" && q.difficulty && g.difficulty !== q.difficulty) return false;
  const vehicle =
    (without !== "vehicle" && (q.make || q.model || q.generation)) ||
    q.year !== undefined ||
    (without !== "powertrain" && q.powertrain) ||
    (without !== "drivetrain" && q.drivetrain) ||
    q.fits !== undefined;
  return !vehicle || g.rows.some((r) => rowMeets(r, q, without));
}

const newest = (a: Guide, b: Guide) => b.publishedAt - a.publishedAt || b.id - a.id;
const ORDERS: Record<LibrarySort, (a: Guide, b: Guide) => number> = {
  newest,
  shortest: (a, b) => a.minutes - b.minutes || newest(a, b),
  fits: (a, b) => b.fits - a.fits || newest(a, b),
};

/** The answer worked out by hand: the list in order, and every facet's counts. */
function bruteForce(q: LibraryQuery) {
  const listed = guides.filter((g) => guideMeets(g, q)).sort(ORDERS[q.sort ?? "newest"]);
  // One pass per facet: each guide that meets every other filter adds one to each value it has.
  const count = (values: (g: Guide) => Iterable<string>, without: Facet) => {
    const counts = new Map<string, number>();
    for (const g of guides) {
      if (!guideMeets(g, q, without)) continue;
      for (const value of new Set(values(g))) counts.set(value, (counts.get(value) ?? 0) + 1);
    }
    return Object.fromEntries([...counts].sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0)));
  };
  const rowsMeeting = (g: Guide, without: Facet) => g.rows.filter((r) => rowMeets(r, q, without));
  return {
    listed,
    facets: {
      powertrain: count((g) => rowsMeeting(g, "powertrain").map((r) => r.powertrain), "powertrain"),
      drivetrain: count((g) => rowsMeeting(g, "drivetrain").map((r) => r.drivetrain), "drivetrain"),
      category: count((g) => [g.category], "category"),
      difficulty: count((g) => [String(g.difficulty)], "difficulty"),
      vehicle: count((g) => rowsMeeting(g, "vehicle").map((r) => `${r.make}.${r.model}.${r.generation}`), "vehicle"),
    },
  };
}

/** One query's answer against the brute force: total, facets, and the page in order (without a search's rank). */
async function check(q: LibraryQuery) {
  const answer = await listFromIndex(db, q);
  const expected = bruteForce(q);
  const label = JSON.stringify(q);
  expect(answer.total, label).toBe(expected.listed.length);
  expect(answer.facets, label).toEqual(expected.facets);
  const slugs = answer.guides.map((g) => g.slug);
  if (!q.q || q.sort) {
    const offset = (q.page - 1) * PAGE_SIZE;
    expect(slugs, label).toEqual(expected.listed.slice(offset, offset + PAGE_SIZE).map((g) => g.slug));
  } else {
    const allowed = new Set(expected.listed.map((g) => g.slug));
    for (const slug of slugs) expect(allowed.has(slug), label).toBe(true);
  }
  if (q.fits !== undefined) {
    for (const g of answer.guides) expect(["fits", "fits-with-changes"], label).toContain(g.vehicleFit?.status);
  }
  if (answer.total === 0) {
    // Each suggestion to leave a filter out names the count that leaving it out gives.
    for (const r of answer.relax) expect(r.total, `${label} without ${r.field}`).toBeGreaterThan(0);
  }
  return answer;
}

function vehiclesOf() {
  const seen = new Map<string, Row>();
  for (const g of guides) for (const r of g.rows) seen.set(`${r.make}.${r.model}.${r.generation}`, r);
  return [...seen.values()];
}

const optional = <T>(arb: fc.Arbitrary<T>) => fc.option(arb, { nil: undefined });

/** Queries drawn from the catalogue's own values, the sorts, pages and the planted search word. */
function queries() {
  const vehicles = vehiclesOf();
  const variantIds = [...new Set(guides.flatMap((g) => g.rows.map((r) => r.variantId)))];
  return fc
    .record({
      vehicle: optional(fc.constantFrom(...vehicles)),
      depth: fc.integer({ min: 1, max: 3 }),
      year: optional(fc.integer({ min: catalogueYears.first, max: catalogueYears.last })),
      powertrain: optional(fc.constantFrom(...POWERTRAINS)),
      drivetrain: optional(fc.constantFrom(...DRIVETRAINS)),
      category: optional(fc.constantFrom(...CATEGORIES)),
      difficulty: optional(fc.integer({ min: 1, max: 5 })),
      fits: optional(fc.constantFrom(...variantIds)),
      q: optional(fc.constant(RARE_WORD)),
      sort: optional(fc.constantFrom<LibrarySort>("newest", "fits", "shortest")),
      page: fc.integer({ min: 1, max: 4 }),
    })
    .map(
      (d): LibraryQuery => ({
        make: d.vehicle?.make,
        model: d.vehicle && d.depth >= 2 ? d.vehicle.model : undefined,
        generation: d.vehicle && d.depth >= 3 ? d.vehicle.generation : undefined,
        year: d.year,
        powertrain: d.powertrain,
        drivetrain: d.drivetrain,
        category: d.category,
        difficulty: d.difficulty,
        fits: d.fits,
        q: d.q,
        sort: d.sort,
        page: d.page,
      }),
    );
}

/** Every filter value on its own, with each sort. */
function singleFilters(): LibraryQuery[] {
  const vehicles = vehiclesOf();
  const one: LibraryQuery[] = [
    { page: 1 },
    ...POWERTRAINS.map((powertrain) => ({ page: 1, powertrain })),
    ...DRIVETRAINS.map((drivetrain) => ({ page: 1, drivetrain })),
    ...CATEGORIES.map((category) => ({ page: 1, category })),
    ...[1, 2, 3, 4, 5].map((difficulty) => ({ page: 1, difficulty })),
    ...vehicles.slice(0, 8).flatMap((v) => [
      { page: 1, make: v.make },
      { page: 1, make: v.make, model: v.model },
      { page: 1, make: v.make, model: v.model, generation: v.generation },
      { page: 1, fits: v.variantId },
    ]),
    ...[catalogueYears.first, Math.round((catalogueYears.first + catalogueYears.last) / 2), catalogueYears.last].map((year) => ({
      page: 1,
      year,
    })),
    { page: 1, q: RARE_WORD },
  ];
  return one.flatMap((q) => [q, { ...q, sort: "fits" as const }, { ...q, sort: "shortest" as const }]);
}

/** Every page of a list in turn: together they are the whole list once, in order. */
async function walkPages(q: Omit<LibraryQuery, "page">) {
  const expected = bruteForce({ ...q, page: 1 }).listed.map((g) => g.slug);
  const seen: string[] = [];
  for (let page = 1; page <= Math.ceil(expected.length / PAGE_SIZE); page++) {
    const answer = await listFromIndex(db, { ...q, page });
    seen.push(...answer.guides.map((g) => g.slug));
  }
  expect(seen, JSON.stringify(q)).toEqual(expected);
}

beforeAll(async () => {
  useTestDatabase("library-scale");
  db = await (await import("~/db/client.server")).getDb();
  // A few invented reports on the demo guides, so "most reported fits" has something to order.
  await db.run(sql`
    INSERT INTO fitment_reports (guide_id, variant_id, user_id, status, hidden_at, hidden_reason)
    SELECT g.id, v.id, u.id, CASE (g.id + v.id) % 3 WHEN 0 THEN 'does-not-fit' ELSE 'fits' END,
      CASE WHEN (g.id + u.id) % 4 = 0 THEN 1700000000000 END, CASE WHEN (g.id + u.id) % 4 = 0 THEN 'off-topic' END
    FROM guides g JOIN variants v JOIN users u WHERE g.state = 'published' AND (g.id * 5 + v.id * 3 + u.id) % 7 = 0`);
  await readBack();
});

describe("the Library against a brute-force count", () => {
  it("on the demo data: every filter value with each sort, and drawn combinations", async () => {
    expect(guides.length).toBeGreaterThan(4);
    for (const q of singleFilters()) await check(q);
    await fc.assert(
      fc.asyncProperty(queries(), async (q) => {
        await check(q);
      }),
      { numRuns: 300 },
    );
    for (const sort of [undefined, "fits", "shortest"] as const) await walkPages({ sort });
  });

  it("reads a year through the generations that cover it", async () => {
    // Demo data (content-samples): a year inside one generation's span and outside another's.
    for (let year = catalogueYears.first; year <= catalogueYears.last; year++) await check({ page: 1, year });
    const answer = await listFromIndex(db, parseLibraryQuery(new URLSearchParams("year=1950")));
    expect(answer.problems.year).toMatch(/outside the catalogue/);
  });

  it("at 20,000 guides and 100,000 fitment rows: totals, facets, sorts and pages", { timeout: 240_000 }, async () => {
    const started = performance.now();
    await writeCatalogue(db, { guides: 20_000, fitmentPerGuide: 5, reports: 30_000 });
    const written = performance.now() - started;
    await readBack();
    const fitmentRows = guides.reduce((n, g) => n + g.rows.length, 0);
    expect(guides.length).toBeGreaterThanOrEqual(20_000);
    expect(fitmentRows).toBeGreaterThanOrEqual(100_000);
    console.info(`library-scale: wrote 20,000 guides and ${fitmentRows} fitment rows in ${Math.round(written)} ms`);
    expect(guides.filter((g) => g.rare).length).toBe(Array.from({ length: 20_000 }, (_, i) => i).filter(isRare).length);

    for (const q of singleFilters()) await check(q);
    await fc.assert(
      fc.asyncProperty(queries(), async (q) => {
        await check(q);
      }),
      { numRuns: 60 },
    );

    // Pages of a narrow list walked to the end, in each order; the same page asked twice is the same.
    const narrow = { category: CATEGORIES[0], difficulty: 2 };
    for (const sort of [undefined, "fits", "shortest"] as const) await walkPages({ ...narrow, sort });
    await walkPages({ q: RARE_WORD, sort: "shortest" });
    const again = await listFromIndex(db, { page: 3, sort: "shortest" });
    expect((await listFromIndex(db, { page: 3, sort: "shortest" })).guides).toEqual(again.guides);
  });

  it("marks the search's words in titles as escaped HTML, nothing else as markup", async () => {
    const answer = await listFromIndex(db, { page: 1, q: RARE_WORD, sort: "newest" });
    const hostile = answer.guides.find((g) => g.title === HOSTILE_TITLE) ?? (await findHostile());
    const html = hostile?.highlight?.title ?? "";
    expect(html).toContain(`<mark>${RARE_WORD}</mark>`);
    // Without the <mark> tags no markup is left: every <, >, & and quote is an entity.
    const bare = html.replace(/<\/?mark>/g, "");
    expect(bare).not.toMatch(/[<>"']/);
    // Reading the entities back gives the title (entities per the HTML Standard's named character references).
    const decoded = bare.replace(
      /&lt;|&gt;|&quot;|&#39;|&amp;/g,
      (e) => ({ "&lt;": "<", "&gt;": ">", "&quot;": '"', "&#39;": "'", "&amp;": "&" })[e] ?? e,
    );
    expect(decoded).toBe(HOSTILE_TITLE);
  });
});

async function findHostile() {
  for (let page = 1; page <= 30; page++) {
    const answer = await listFromIndex(db, { page, q: RARE_WORD, sort: "newest" });
    const found = answer.guides.find((g) => g.title === HOSTILE_TITLE);
    if (found) return found;
  }
  return undefined;
}
