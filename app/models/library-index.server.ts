import { sql } from "drizzle-orm";
import type { Db } from "~/db/client.server";
import { BoundedCache } from "~/utils/bounded-cache";
import { CATEGORIES, DRIVETRAINS, POWERTRAINS } from "~/utils/vocab";
import { type ContentStamps, readContentStamps } from "./content-stamps.server";
import {
  catalogueYearsOf,
  fitmentFor,
  ftsQuery,
  type LibraryFitment,
  type LibraryQuery,
  type LibraryRow,
  libraryAnswer,
  PAGE_SIZE,
  relaxFilters,
  SEARCH_WEIGHTS,
  usableQuery,
} from "./library.server";

/**
 * The Library's filters and facet counts over an index of every published guide and its fitting
 * variants, held in memory and built once per content stamp (a publication, a catalogue edit or a
 * renamed author makes a new one). A query then reads arrays instead of joining up to five rows
 * of the catalogue per fitment row: at 20,000 guides and 100,000 fitment rows a filter costs a few
 * milliseconds where SQLite's counts took 40–300. It answers exactly as `listPublishedGuides` does
 * (tests/integration/library-index.test.ts compares the two); search still asks the full-text
 * index for its matches and their rank, and the page's fitment comes from the database.
 */

type Guide = LibraryRow & { publishedAt: number };

/** Difficulty runs 1–5 (guide-input.ts). */
const DIFFICULTY_MAX = 5;

type Generation = { id: number; key: string; make: string; model: string; slug: string; firstYear: number; lastYear: number };

type Index = {
  /** Newest first (published_at, then id, descending): the Library's order without a search. */
  guides: Guide[];
  byRevision: Map<number, number>;
  /** Per guide: its category's place in CATEGORIES, and its difficulty (1–5), for the passes below. */
  guideCategory: Int8Array;
  guideDifficulty: Int8Array;
  /**
   * The fitting variants (status other than does-not-fit) as rows grouped by guide: guide `g`'s
   * rows are `rowStart[g]` up to `rowStart[g + 1]`.
   */
  rowStart: Int32Array;
  /** Index into `generations`. */
  rowGeneration: Int32Array;
  rowPowertrain: Int8Array;
  rowDrivetrain: Int8Array;
  /** The variant's id of each row, for the "fits this variant" filter. */
  rowVariant: Int32Array;
  /** Guides by time, shortest first, ties newest first: the "shortest" order. */
  byMinutes: Int32Array;
  /** Guides by readers' "fits" reports, most first, ties newest first, for a reports stamp. */
  byReports: { stamp: number; order: Int32Array } | null;
  generations: Generation[];
  years: { first: number; last: number } | null;
  /** Working arrays of one query, reused (a query fills and reads them without awaiting). */
  scratch: Scratch;
  /**
   * Each search's rank by guide (NaN: no match), kept with the index: the matches and their rank
   * change only with the content, and ranking every guide for a word they all contain takes
   * SQLite some 30 ms at 20,000 guides.
   */
  searches: BoundedCache<string, SearchHits>;
  /**
   * The fitment rows a page shows, by published revision: immutable with the revision, and named
   * from the catalogue, whose stamp is part of the index's key. A page then costs no query.
   */
  fitment: BoundedCache<number, LibraryFitment[]>;
};

/** Revisions whose fitment rows are kept: a few pages of every filter readers use. */
const FITMENT_REVISIONS_KEPT = 4096;

/** About 160 KB per search at 20,000 guides: the last hundred or so searches. */
const SEARCH_BYTES_KEPT = 16 * 1024 * 1024;

type Scratch = ReturnType<typeof scratchFor>;

/** A search's rank by guide (NaN: no match) and its matching guides in the index's order. */
type SearchHits = { rank: Float64Array; guides: Int32Array };

function scratchFor(guides: number, generations: number) {
  return {
    ok: new Uint8Array(guides),
    okButCategory: new Uint8Array(guides),
    okButDifficulty: new Uint8Array(guides),
    vehicleAll: new Uint8Array(guides),
    powertrainBits: new Uint8Array(guides),
    drivetrainBits: new Uint8Array(guides),
    generationCounts: new Int32Array(generations),
    generationLast: new Int32Array(generations),
    listed: new Uint8Array(guides),
  };
}

async function buildIndex(db: Db): Promise<Index> {
  const guideRows = await db.all<Guide>(sql`
    SELECT g.id, g.slug, g.title, g.summary, g.category, g.difficulty, g.minutes,
      g.published_revision_id AS revisionId, u.name AS author, g.published_at AS publishedAt
    FROM guides g JOIN users u ON u.id = g.author_id
    WHERE g.state = 'published' ORDER BY g.published_at DESC, g.id DESC`);
  const guides = guideRows.map((g) => ({ ...g, publishedAt: Number(g.publishedAt ?? 0) }));
  const byRevision = new Map(guides.map((g, i) => [g.revisionId, i]));
  const generationRows = await db.all<{
    id: number;
    make: string;
    model: string;
    slug: string;
    firstYear: number;
    lastYear: number | null;
  }>(sql`SELECT gen.id, mk.slug AS make, mo.slug AS model, gen.slug, gen.first_year AS firstYear, gen.last_year AS lastYear
    FROM generations gen JOIN models mo ON mo.id = gen.model_id JOIN makes mk ON mk.id = mo.make_id`);
  const generations = generationRows.map((g) => ({
    id: g.id,
    key: `${g.make}.${g.model}.${g.slug}`,
    make: g.make,
    model: g.model,
    slug: g.slug,
    firstYear: g.firstYear,
    lastYear: g.lastYear ?? 9999,
  }));
  const generationAt = new Map(generations.map((g, i) => [g.id, i]));
  const fitting = await db.all<{
    revisionId: number;
    variantId: number;
    generationId: number;
    powertrain: string;
    drivetrain: string;
  }>(sql`
    SELECT f.revision_id AS revisionId, f.variant_id AS variantId, v.generation_id AS generationId, v.powertrain, v.drivetrain
    FROM guides g JOIN fitment f ON f.revision_id = g.published_revision_id AND f.status <> 'does-not-fit'
    JOIN variants v ON v.id = f.variant_id WHERE g.state = 'published'`);
  // Rows grouped by guide, so a guide's rows come one after another when counting guides per value.
  const guideOfRow = fitting.map((row) => byRevision.get(row.revisionId) ?? -1);
  const order = fitting
    .map((_, i) => i)
    .filter((i) => guideOfRow[i] >= 0)
    .sort((a, b) => guideOfRow[a] - guideOfRow[b]);
  const rowGeneration = new Int32Array(order.length);
  const rowPowertrain = new Int8Array(order.length);
  const rowDrivetrain = new Int8Array(order.length);
  const rowVariant = new Int32Array(order.length);
  const rowStart = new Int32Array(guides.length + 1);
  for (const from of order) rowStart[guideOfRow[from] + 1]++;
  for (let g = 0; g < guides.length; g++) rowStart[g + 1] += rowStart[g];
  order.forEach((from, i) => {
    const row = fitting[from];
    rowGeneration[i] = generationAt.get(row.generationId) ?? -1;
    rowPowertrain[i] = (POWERTRAINS as readonly string[]).indexOf(row.powertrain);
    rowDrivetrain[i] = (DRIVETRAINS as readonly string[]).indexOf(row.drivetrain);
    rowVariant[i] = row.variantId;
  });
  const byMinutes = Int32Array.from(guides, (_, g) => g).sort((a, b) => guides[a].minutes - guides[b].minutes || a - b);
  return {
    guides,
    byRevision,
    guideCategory: Int8Array.from(guides, (g) => (CATEGORIES as readonly string[]).indexOf(g.category)),
    guideDifficulty: Int8Array.from(guides, (g) => g.difficulty),
    rowStart,
    rowGeneration,
    rowPowertrain,
    rowDrivetrain,
    rowVariant,
    byMinutes,
    byReports: null,
    generations,
    years: catalogueYearsOf(generationRows),
    scratch: scratchFor(guides.length, generations.length),
    searches: new BoundedCache(SEARCH_BYTES_KEPT, (hits) => hits.rank.byteLength + hits.guides.byteLength),
    fitment: new BoundedCache(FITMENT_REVISIONS_KEPT),
  };
}

/** The fitment of these revisions, in their order, asking the database only for those not kept. */
async function keptFitment(db: Db, index: Index, revisionIds: number[]): Promise<LibraryFitment[]> {
  const missing = revisionIds.filter((id) => index.fitment.get(id) === undefined);
  if (missing.length) {
    const fetched = await fitmentFor(db, missing);
    for (const id of missing)
      index.fitment.set(
        id,
        fetched.filter((f) => f.revisionId === id),
      );
  }
  return revisionIds.flatMap((id) => index.fitment.get(id) ?? []);
}

let current: { key: string; index: Promise<Index> } | undefined;

/** The index for the content as it is now: built on the first read after a stamp moved. */
function indexFor(db: Db, stamps: ContentStamps): Promise<Index> {
  const key = `${stamps.guides}.${stamps.catalogue}`;
  if (current?.key !== key) {
    const index = buildIndex(db);
    current = { key, index };
    // A failed build is not kept: the next read tries again.
    index.catch(() => {
      if (current?.index === index) current = undefined;
    });
  }
  return current.index;
}

/**
 * Per generation: whether it meets the query's make, model, generation and year filters (`all`),
 * and the year filter alone (`year`, for the vehicle facet, which leaves out its own filters).
 */
function generationFilters(index: Index, query: LibraryQuery) {
  const all = new Uint8Array(index.generations.length);
  const year = new Uint8Array(index.generations.length);
  index.generations.forEach((gen, i) => {
    const inYear = !query.year || (gen.firstYear <= query.year && gen.lastYear >= query.year);
    year[i] = inYear ? 1 : 0;
    const named =
      (!query.make || gen.make === query.make) &&
      (!query.model || gen.model === query.model) &&
      (!query.generation || gen.slug === query.generation);
    all[i] = inYear && named ? 1 : 0;
  });
  return { all, year };
}

const hasVehicleFilter = (query: LibraryQuery) =>
  !!(query.make || query.model || query.generation || query.year || query.powertrain || query.drivetrain || query.fits);

/** The guides in "most reported fits" order, made again only when the reports have changed. */
async function reportsOrder(db: Db, index: Index, stamp: number): Promise<Int32Array> {
  if (index.byReports?.stamp === stamp) return index.byReports.order;
  const rows = await db.all<{ guideId: number; n: number }>(sql`
    SELECT guide_id AS guideId, count(*) AS n FROM fitment_reports
    WHERE status = 'fits' AND hidden_at IS NULL GROUP BY guide_id`);
  const byId = new Map(index.guides.map((g, i) => [g.id, i]));
  const fits = new Int32Array(index.guides.length);
  for (const row of rows) {
    const g = byId.get(Number(row.guideId));
    if (g !== undefined) fits[g] = Number(row.n);
  }
  const order = Int32Array.from(index.guides, (_, g) => g).sort((a, b) => fits[b] - fits[a] || a - b);
  index.byReports = { stamp, order };
  return order;
}

/** The guides of `matching` at `offset`, a page of them, in the order `order` gives (every guide once). */
function pageInOrder(index: Index, matching: number[], order: Int32Array, offset: number): number[] {
  const { listed } = index.scratch;
  for (const g of matching) listed[g] = 1;
  const shown: number[] = [];
  let seen = 0;
  for (let k = 0; k < order.length && shown.length < PAGE_SIZE; k++) {
    const g = order[k];
    if (listed[g] !== 1) continue;
    if (seen++ >= offset) shown.push(g);
  }
  for (const g of matching) listed[g] = 0;
  return shown;
}

/**
 * The first `k` of `items` in the order `before` gives, without sorting the rest: a page of a
 * search needs the best dozen of up to every guide.
 */
export function firstInOrder<T>(items: readonly T[], k: number, before: (a: T, b: T) => boolean): T[] {
  const best: T[] = [];
  if (k <= 0) return best;
  for (const item of items) {
    if (best.length === k && !before(item, best[k - 1])) continue;
    let low = 0;
    let high = best.length;
    while (low < high) {
      const middle = (low + high) >> 1;
      if (before(item, best[middle])) high = middle;
      else low = middle + 1;
    }
    best.splice(low, 0, item);
    if (best.length > k) best.pop();
  }
  return best;
}

/** Counts keyed by value, only values some guide has, in the order a GROUP BY on the value gives. */
function sortedCounts(counts: Map<string, number>): Record<string, number> {
  return Object.fromEntries([...counts].filter(([, n]) => n > 0).sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0)));
}

/** The rank of every guide for a full-text query (NaN where it does not match), kept with the index. */
async function searchHits(db: Db, index: Index, match: string): Promise<SearchHits> {
  const rank = new Float64Array(index.guides.length).fill(Number.NaN);
  // Every match as "revision rank" in one string: a row per match would cost more to hand over
  // than SQLite takes to rank them. 17 significant digits give back the very double SQL compares.
  const [hits] = await db.all<{ matches: string | null }>(sql`
    WITH m AS MATERIALIZED (
      SELECT rowid AS id, bm25(guide_search, ${sql.raw(SEARCH_WEIGHTS)}) AS rank FROM guide_search WHERE guide_search MATCH ${match})
    SELECT group_concat(id || ' ' || printf('%.17g', rank)) AS matches FROM m`);
  for (const hit of hits?.matches ? hits.matches.split(",") : []) {
    const space = hit.indexOf(" ");
    const i = index.byRevision.get(Number(hit.slice(0, space)));
    if (i !== undefined) rank[i] = Number(hit.slice(space + 1));
  }
  const matched: number[] = [];
  rank.forEach((r, g) => {
    if (!Number.isNaN(r)) matched.push(g);
  });
  const found = { rank, guides: Int32Array.from(matched) };
  index.searches.set(match, found);
  return found;
}

/** `listPublishedGuides`, answered from the index (`stamps`: read by the caller for this request). */
export async function listFromIndex(db: Db, asked: LibraryQuery, stamps?: ContentStamps) {
  const now = stamps ?? (await readContentStamps(db));
  return answerFromIndex(db, await indexFor(db, now), now.reports, asked, false);
}

/** `reports`: the reports stamp read for this request, for the "most reported fits" order. */
async function answerFromIndex(db: Db, index: Index, reports: number, asked: LibraryQuery, totalOnly: true): Promise<number>;
async function answerFromIndex(
  db: Db,
  index: Index,
  reports: number,
  asked: LibraryQuery,
  totalOnly: false,
): Promise<Awaited<ReturnType<typeof libraryAnswer>>>;
async function answerFromIndex(db: Db, index: Index, reports: number, asked: LibraryQuery, totalOnly: boolean) {
  const { query, problems } = usableQuery(asked, index.years);
  const { guides, guideCategory, guideDifficulty } = index;
  const wantCategory = query.category ? CATEGORIES.indexOf(query.category) : -1;
  const count = guides.length;

  // With a search, only the index's matches count, each with its rank.
  const match = query.q ? ftsQuery(query.q) : null;
  const hits = match ? (index.searches.get(match) ?? (await searchHits(db, index, match))) : null;
  const rank = hits?.rank ?? null;
  // The guides a query can list: a search's matches, else all. Every pass below visits only these,
  // so a rare word costs a pass over its few matches, not over every guide.
  const candidates = hits?.guides ?? null;
  const candidateCount = candidates ? candidates.length : count;

  // Per guide: whether it meets the filters on its own columns (and the search), all of them or all
  // but the category or the difficulty (for those two facets).
  const { ok, okButCategory, okButDifficulty, vehicleAll, powertrainBits, drivetrainBits, generationCounts, generationLast } =
    index.scratch;
  for (const array of [ok, okButCategory, okButDifficulty, vehicleAll, powertrainBits, drivetrainBits, generationCounts]) {
    array.fill(0);
  }
  generationLast.fill(-1);
  for (let k = 0; k < candidateCount; k++) {
    const g = candidates ? candidates[k] : k;
    const category = wantCategory < 0 || guideCategory[g] === wantCategory;
    const difficulty = !query.difficulty || guideDifficulty[g] === query.difficulty;
    ok[g] = category && difficulty ? 1 : 0;
    okButCategory[g] = difficulty ? 1 : 0;
    okButDifficulty[g] = category ? 1 : 0;
  }

  // Per guide, from its fitting variants: whether one meets every vehicle filter, and which
  // powertrains (bits) and drivetrains have one meeting every vehicle filter but their own; per
  // generation, how many guides that meet every other filter have a variant of it.
  const vehicleFiltered = hasVehicleFilter(query);
  const { rowStart, rowGeneration, rowPowertrain, rowDrivetrain } = index;
  const generation = generationFilters(index, query);
  const wantPowertrain = query.powertrain ? POWERTRAINS.indexOf(query.powertrain) : -1;
  const wantDrivetrain = query.drivetrain ? DRIVETRAINS.indexOf(query.drivetrain) : -1;
  const wantVariant = query.fits ?? -1;
  const { rowVariant } = index;
  for (let k = 0; k < candidateCount; k++) {
    const g = candidates ? candidates[k] : k;
    for (let r = rowStart[g]; r < rowStart[g + 1]; r++) {
      const gen = rowGeneration[r];
      if (gen < 0) continue;
      const powertrain = wantPowertrain < 0 || rowPowertrain[r] === wantPowertrain;
      const drivetrain = wantDrivetrain < 0 || rowDrivetrain[r] === wantDrivetrain;
      const variant = wantVariant < 0 || rowVariant[r] === wantVariant;
      const named = generation.all[gen] === 1 && variant;
      if (named && powertrain && drivetrain) vehicleAll[g] = 1;
      if (named && drivetrain) powertrainBits[g] |= 1 << rowPowertrain[r];
      if (named && powertrain) drivetrainBits[g] |= 1 << rowDrivetrain[r];
      // Rows come grouped by guide: a guide is counted once per generation.
      if (ok[g] === 1 && generation.year[gen] === 1 && variant && powertrain && drivetrain && generationLast[gen] !== g) {
        generationLast[gen] = g;
        generationCounts[gen]++;
      }
    }
  }

  const matching: number[] = [];
  const categoryCounts = new Int32Array(CATEGORIES.length);
  const difficultyCounts = new Int32Array(DIFFICULTY_MAX + 1);
  const powertrainCounts = new Int32Array(POWERTRAINS.length);
  const drivetrainCounts = new Int32Array(DRIVETRAINS.length);
  for (let k = 0; k < candidateCount; k++) {
    const g = candidates ? candidates[k] : k;
    if (ok[g] === 1) {
      for (let v = 0; v < POWERTRAINS.length; v++) if (powertrainBits[g] & (1 << v)) powertrainCounts[v]++;
      for (let v = 0; v < DRIVETRAINS.length; v++) if (drivetrainBits[g] & (1 << v)) drivetrainCounts[v]++;
    }
    if (vehicleFiltered && vehicleAll[g] !== 1) continue;
    if (ok[g] === 1) matching.push(g);
    if (okButCategory[g] === 1) categoryCounts[guideCategory[g]]++;
    if (okButDifficulty[g] === 1) difficultyCounts[guideDifficulty[g]]++;
  }
  const variantFacet = (values: readonly string[], counts: Int32Array) =>
    sortedCounts(new Map(values.map((value, v) => [value, counts[v]])));
  const vehicleCounts = new Map<string, number>();
  generationCounts.forEach((n, gen) => {
    if (n > 0) vehicleCounts.set(index.generations[gen].key, n);
  });

  const total = matching.length;
  if (totalOnly) return total;
  // The sort asked for, else by rank with a search, else newest first (the guides' own order);
  // ties newest first.
  const offset = (query.page - 1) * PAGE_SIZE;
  const r = query.sort ? null : rank;
  const shown =
    query.sort === "shortest"
      ? pageInOrder(index, matching, index.byMinutes, offset)
      : query.sort === "fits"
        ? pageInOrder(index, matching, await reportsOrder(db, index, reports), offset)
        : r
          ? firstInOrder(matching, offset + PAGE_SIZE, (a, b) => r[a] < r[b] || (r[a] === r[b] && a < b)).slice(offset)
          : matching.slice(offset, offset + PAGE_SIZE);
  return libraryAnswer(
    db,
    query,
    {
      rows: shown.map((g) => {
        const { publishedAt: _p, ...row } = guides[g];
        return row;
      }),
      total,
      facets: {
        powertrain: variantFacet(POWERTRAINS, powertrainCounts),
        drivetrain: variantFacet(DRIVETRAINS, drivetrainCounts),
        category: sortedCounts(new Map(CATEGORIES.map((c, i) => [c, categoryCounts[i]]))),
        difficulty: sortedCounts(new Map([...difficultyCounts].map((n, d) => [String(d), n]))),
        vehicle: sortedCounts(vehicleCounts),
      },
      problems,
      relax: await relaxFilters(query, total, (without) => answerFromIndex(db, index, reports, without, true)),
    },
    (revisionIds) => keptFitment(db, index, revisionIds),
  );
}
