import { and, desc, eq, inArray, type SQL, sql } from "drizzle-orm";
import { z } from "zod";
import type { Db } from "~/db/client.server";
import { fitment, generations, guides, revisions, users } from "~/db/schema";
import { evaluateCallout, storedCallout } from "~/engine/callouts";
import type { Storage } from "~/services/storage.server";
import { BoundedCache } from "~/utils/bounded-cache";
import { CATEGORIES, DRIVETRAINS, POWERTRAINS } from "~/utils/vocab";
import { type ContentStamps, readContentStamps } from "./content-stamps.server";
import { type LoadedRevision, loadRevision, partsAndTools } from "./guides.server";
import { publicVariants } from "./media.server";

const SEARCH_MAX = 200;
/** More words than this add nothing a reader means, only work for the index. */
const SEARCH_TERMS_MAX = 16;

const slugParam = z
  .string()
  .trim()
  .regex(/^[a-z0-9-]{1,80}$/, "Use the slug from the catalogue")
  .optional()
  .catch(undefined);

/** A variant's id in the catalogue, as the address names it. */
const variantParam = z.coerce.number().int().min(1).max(2_147_483_647).optional().catch(undefined);

/**
 * The Library's orders besides a search's rank: newest first, most reports that a guide fitted
 * (readers' fitment reports, hidden ones left out), shortest time first; ties newest first.
 */
export const LIBRARY_SORTS = ["newest", "fits", "shortest"] as const;
export type LibrarySort = (typeof LIBRARY_SORTS)[number];

/** The Library's query string; anything unreadable is dropped rather than failing the page. */
export const libraryQuerySchema = z.object({
  make: slugParam,
  model: slugParam,
  generation: slugParam,
  // Any whole number is read, so a year outside the catalogue can be named back to the reader.
  year: z.coerce.number().int().min(1).max(9999).optional().catch(undefined),
  powertrain: z.enum(POWERTRAINS).optional().catch(undefined),
  drivetrain: z.enum(DRIVETRAINS).optional().catch(undefined),
  category: z.enum(CATEGORIES).optional().catch(undefined),
  difficulty: z.coerce.number().int().min(1).max(5).optional().catch(undefined),
  q: z.string().trim().max(SEARCH_MAX).optional().catch(undefined),
  /** Only guides that fit this variant (fits or fits with changes); each card says how it fits. */
  fits: variantParam,
  /** Each card says how the guide fits this variant, without filtering by it. */
  for: variantParam,
  sort: z.enum(LIBRARY_SORTS).optional().catch(undefined),
  page: z.coerce.number().int().min(1).max(1000).default(1).catch(1),
});
export type LibraryQuery = z.infer<typeof libraryQuerySchema> & {
  /** What was asked for but could not be used, by field, in words for the reader. */
  problems?: LibraryProblems;
};
export type LibraryProblems = Partial<Record<"year" | "q" | "page", string>>;

export function parseLibraryQuery(params: URLSearchParams): LibraryQuery {
  const raw = Object.fromEntries([...params.entries()].filter(([, v]) => v.trim() !== ""));
  const problems: LibraryProblems = {};
  // A search longer than the limit keeps its start rather than being dropped.
  if (typeof raw.q === "string" && raw.q.trim().length > SEARCH_MAX) {
    raw.q = raw.q.trim().slice(0, SEARCH_MAX);
    problems.q = `Search reads the first ${SEARCH_MAX} characters only.`;
  }
  const query: LibraryQuery = libraryQuerySchema.parse(raw);
  if (raw.year !== undefined && query.year === undefined) {
    problems.year = `Model year must be a year in digits, such as 2021; "${raw.year.slice(0, 20)}" is not one.`;
  }
  if (Object.keys(problems).length) query.problems = problems;
  return query;
}

/** The parameters of a Library address without the empty ones a plain form sends. */
export function withoutEmptyParams(params: URLSearchParams): URLSearchParams | null {
  const kept = new URLSearchParams([...params.entries()].filter(([, v]) => v.trim() !== ""));
  return kept.toString() === params.toString() ? null : kept;
}

export const PAGE_SIZE = 12;

/** Turns free text into an FTS5 query of quoted terms (the last one a prefix), so no input is syntax. */
export function ftsQuery(text: string) {
  const terms = (text.slice(0, 1000).match(/[\p{L}\p{N}]+/gu) ?? []).slice(0, SEARCH_TERMS_MAX);
  if (!terms.length) return null;
  return terms.map((t, i) => `"${t.replace(/"/g, '""')}"${i === terms.length - 1 ? "*" : ""}`).join(" ");
}

type Dimension = "powertrain" | "drivetrain" | "category" | "difficulty" | "vehicle";

/** Filters on one fitment row's variant (aliases v, gen, mo, mk), so every vehicle filter holds for the same variant. */
function vehicleConditions(query: LibraryQuery, without?: Dimension): SQL[] {
  const vehicle: SQL[] = [];
  if (query.make && without !== "vehicle") vehicle.push(sql`mk.slug = ${query.make}`);
  if (query.model && without !== "vehicle") vehicle.push(sql`mo.slug = ${query.model}`);
  if (query.generation && without !== "vehicle") vehicle.push(sql`gen.slug = ${query.generation}`);
  if (query.year) vehicle.push(sql`gen.first_year <= ${query.year} AND coalesce(gen.last_year, 9999) >= ${query.year}`);
  if (query.powertrain && without !== "powertrain") vehicle.push(sql`v.powertrain = ${query.powertrain}`);
  if (query.drivetrain && without !== "drivetrain") vehicle.push(sql`v.drivetrain = ${query.drivetrain}`);
  // Like the year, the variant is no facet's own filter: every count keeps it.
  if (query.fits) vehicle.push(sql`f.variant_id = ${query.fits}`);
  return vehicle;
}

/** The joins from a fitment row (alias f) to its variant and as much of the catalogue as the filters name. */
function variantJoins(query: LibraryQuery, left = false): SQL {
  const join = left ? sql.raw("LEFT JOIN") : sql.raw("JOIN");
  const joins = [sql`${join} variants v ON v.id = f.variant_id`];
  const make = !!query.make;
  const model = make || !!query.model;
  const generation = model || !!query.generation || !!query.year;
  if (generation) joins.push(sql`${join} generations gen ON gen.id = v.generation_id`);
  if (model) joins.push(sql`${join} models mo ON mo.id = gen.model_id`);
  if (make) joins.push(sql`${join} makes mk ON mk.id = mo.make_id`);
  return sql.join(joins, sql` `);
}

const all = (conditions: SQL[]) => (conditions.length ? sql.join(conditions, sql` AND `) : sql`1`);

/**
 * Filters on the guide's own columns (alias g): its state, and category and difficulty unless one
 * is the facet. Nearly every guide is published, so only the list (newest first) reads the state
 * index; the counts start from the narrower filters (`+` keeps SQLite from choosing that index).
 */
function guideConditions(query: LibraryQuery, without?: Dimension, list = false): SQL[] {
  const parts: SQL[] = [list ? sql`g.state = 'published'` : sql`+g.state = 'published'`];
  if (query.category && without !== "category") parts.push(sql`g.category = ${query.category}`);
  if (query.difficulty && without !== "difficulty") parts.push(sql`g.difficulty = ${query.difficulty}`);
  return parts;
}

/**
 * bm25 weights per guide_search column: title, summary, steps_text, parts_text, tools_text,
 * callouts_text (the row's rowid is its revision's id). A word in the title says most about a
 * guide; a part or a tool named in its lists says more than a word somewhere in the steps.
 */
export const SEARCH_WEIGHTS = "10, 4, 1, 3, 2, 1";

/**
 * The guides a query reads from (alias g): every guide, or with a search the index's matches
 * first (CROSS JOIN keeps that order), each found by its published revision; alias s has the rank.
 */
function guideSource(query: LibraryQuery): SQL {
  const match = query.q ? ftsQuery(query.q) : null;
  if (!match) return sql`guides g`;
  return sql`(SELECT rowid AS revision_id, bm25(guide_search, ${sql.raw(SEARCH_WEIGHTS)}) AS rank FROM guide_search WHERE guide_search MATCH ${match}) s
    CROSS JOIN guides g ON g.published_revision_id = s.revision_id`;
}

/** The WHERE clause for published guides matching the query, leaving out one facet's own filter. */
function conditions(query: LibraryQuery, without?: Dimension, list = false): SQL {
  const vehicle = vehicleConditions(query, without);
  const parts = guideConditions(query, without, list);
  if (vehicle.length) {
    // Not correlated: SQLite lists the fitting revisions once, then keeps the guides among them.
    parts.push(sql`g.published_revision_id IN (SELECT f.revision_id FROM fitment f ${variantJoins(query)}
      WHERE f.status <> 'does-not-fit' AND ${all(vehicle)})`);
  }
  return all(parts);
}

/** Counts per category or difficulty among guides that match every other filter. */
async function guideFacet(db: Db, query: LibraryQuery, dimension: "category" | "difficulty") {
  const rows = await db.all<{ value: string; n: number }>(sql`
    SELECT g.${sql.raw(dimension)} AS value, count(*) AS n FROM ${guideSource(query)}
    WHERE ${conditions(query, dimension)} GROUP BY g.${sql.raw(dimension)}`);
  return Object.fromEntries(rows.map((r) => [String(r.value), Number(r.n)]));
}

/**
 * Counts per powertrain and per drivetrain among guides that match every other filter on one
 * fitting variant, in one pass: per guide (grouped in the order the guides are read, so without a
 * sort), whether some fitting variant of each powertrain meets the vehicle filters but the
 * powertrain one, and likewise per drivetrain; then those flags summed.
 */
async function variantFacets(db: Db, query: LibraryQuery) {
  const flags = (dimension: "powertrain" | "drivetrain", values: readonly string[], prefix: string) =>
    values.map(
      (value, i) =>
        sql`max(v.${sql.raw(dimension)} = ${value} AND ${all(vehicleConditions(query, dimension))}) AS ${sql.raw(`${prefix}${i}`)}`,
    );
  const columns = [...POWERTRAINS.map((_, i) => `po${i}`), ...DRIVETRAINS.map((_, i) => `dr${i}`)];
  // Filters both facets keep (vehicle and year) narrow the rows read; the rest are in the flags.
  const shared = vehicleConditions({ ...query, powertrain: undefined, drivetrain: undefined });
  const [row] = await db.all<Record<string, number | null>>(sql`
    SELECT ${sql.join(
      columns.map((name) => sql`sum(${sql.raw(name)}) AS ${sql.raw(name)}`),
      sql`, `,
    )} FROM (
      SELECT ${sql.join([...flags("powertrain", POWERTRAINS, "po"), ...flags("drivetrain", DRIVETRAINS, "dr")], sql`, `)}
      FROM ${guideSource(query)}
      JOIN fitment f ON f.revision_id = g.published_revision_id AND f.status <> 'does-not-fit'
      ${variantJoins(query)}
      WHERE ${all([...guideConditions(query), ...shared])}
      GROUP BY g.id
    )`);
  // Values no guide has are left out, and the rest come in the order a GROUP BY on the value gives.
  const facet = (values: readonly string[], prefix: string) =>
    Object.fromEntries(
      values
        .map((value, i) => [value, Number(row?.[`${prefix}${i}`] ?? 0)] as const)
        .filter(([, n]) => n > 0)
        .sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0)),
    );
  return { powertrain: facet(POWERTRAINS, "po"), drivetrain: facet(DRIVETRAINS, "dr") };
}

/**
 * Counts per generation among guides that match every other filter, keyed like the Library's
 * vehicle menu ("make.model.generation"): counted per generation id, named once per generation.
 */
async function vehicleFacet(db: Db, query: LibraryQuery) {
  const rows = await db.all<{ value: string; n: number }>(sql`
    SELECT mk.slug || '.' || mo.slug || '.' || gen.slug AS value, c.n AS n FROM (
      SELECT v.generation_id AS generation_id, count(DISTINCT g.id) AS n
      FROM ${guideSource(query)}
      JOIN fitment f ON f.revision_id = g.published_revision_id AND f.status <> 'does-not-fit'
      ${variantJoins({ ...query, make: undefined, model: undefined, generation: undefined })}
      WHERE ${all([...guideConditions(query), ...vehicleConditions(query, "vehicle")])}
      GROUP BY v.generation_id
    ) c
    JOIN generations gen ON gen.id = c.generation_id JOIN models mo ON mo.id = gen.model_id JOIN makes mk ON mk.id = mo.make_id
    ORDER BY value`);
  return Object.fromEntries(rows.map((r) => [r.value, Number(r.n)]));
}

/** The model years these generations cover; one still built counts to next year's models. */
export function catalogueYearsOf(spans: { firstYear: number; lastYear: number | null }[]) {
  if (!spans.length) return null;
  const open = new Date().getFullYear() + 1;
  return {
    first: Math.min(...spans.map((g) => g.firstYear)),
    last: Math.max(...spans.map((g) => g.lastYear ?? open)),
  };
}

/** The model years the catalogue covers. */
export async function catalogueYears(db: Db) {
  return catalogueYearsOf(
    await db.select({ firstYear: generations.firstYear, lastYear: generations.lastYear }).from(generations),
  );
}

/** A guide as the Library lists it, before its fitment is added. */
export type LibraryRow = {
  id: number;
  slug: string;
  title: string;
  summary: string;
  category: string;
  difficulty: number;
  minutes: number;
  revisionId: number;
  author: string;
};

type Facets = Record<"powertrain" | "drivetrain" | "category" | "difficulty" | "vehicle", Record<string, number>>;

/**
 * The query as it can be used: a model year outside the catalogue is dropped, with a sentence
 * saying so among the problems.
 */
export function usableQuery(asked: LibraryQuery, years: { first: number; last: number } | null) {
  const problems: LibraryProblems = { ...asked.problems };
  if (asked.year === undefined || (years && asked.year >= years.first && asked.year <= years.last)) {
    return { query: asked, problems };
  }
  const range = years ? `it lists vehicles from ${years.first} to ${years.last}` : "it lists no vehicles yet";
  problems.year = `Model year ${asked.year} is outside the catalogue: ${range}. The list below is not filtered by year.`;
  return { query: { ...asked, year: undefined }, problems };
}

/** The Library's answer: a page of guides with their fitment, the total, the facets and the problems. */
export async function libraryAnswer(
  db: Db,
  query: LibraryQuery,
  page: {
    rows: LibraryRow[];
    total: number;
    facets: Facets;
    problems: LibraryProblems;
    relax: Awaited<ReturnType<typeof relaxFilters>>;
  },
  /** The fitment of the page's revisions, when the caller has it already. */
  fitmentOf?: (revisionIds: number[]) => Promise<LibraryFitment[]>,
) {
  const { rows, total, facets, problems, relax } = page;
  const revisionIds = rows.map((r) => r.revisionId);
  const match = query.q ? ftsQuery(query.q) : null;
  const [fitmentRows, highlights] = await Promise.all([
    fitmentOf ? fitmentOf(revisionIds) : fitmentFor(db, revisionIds),
    match ? searchHighlights(db, match, revisionIds) : null,
  ]);
  const variant = query.fits ?? query.for;
  const pages = Math.max(1, Math.ceil(total / PAGE_SIZE));
  if (total > 0 && query.page > pages) {
    problems.page = `Page ${query.page} is past the end of this list: it has ${pages} ${pages === 1 ? "page" : "pages"}.`;
  }
  return {
    guides: rows.map(({ id: _id, revisionId, ...g }) => {
      const fitment = fitmentRows.filter((f) => f.revisionId === revisionId).map(({ revisionId: _r, ...f }) => f);
      const listed = variant ? fitment.find((f) => f.variantId === variant) : undefined;
      return {
        ...g,
        fitment,
        /** How the guide fits the variant the address names (`fits` or `for`), with the author's note. */
        ...(variant ? { vehicleFit: { status: listed?.status ?? ("not-listed" as const), note: listed?.note ?? null } } : {}),
        /** With a search: the title, the summary and a passage of the steps as HTML, the matched words in <mark>. */
        ...(highlights ? { highlight: highlights.get(revisionId) ?? null } : {}),
      };
    }),
    total,
    page: query.page,
    pageSize: PAGE_SIZE,
    pages,
    facets,
    /** What in the query could not be used, by field (year, q, page), as a sentence for the reader. */
    problems,
    /** For an empty list: the filters that, left out one at a time, would list some guides. */
    relax,
  };
}

/** The SQL order of a query's list: its sort, else a search's rank, else newest; ties newest first. */
function listOrder(query: LibraryQuery): SQL {
  const newest = sql`g.published_at DESC, g.id DESC`;
  if (query.sort === "shortest") return sql`g.minutes ASC, ${newest}`;
  if (query.sort === "fits") {
    return sql`(SELECT count(*) FROM fitment_reports r WHERE r.guide_id = g.id AND r.status = 'fits' AND r.hidden_at IS NULL) DESC, ${newest}`;
  }
  if (!query.sort && query.q && ftsQuery(query.q)) return sql`s.rank, ${newest}`;
  return newest;
}

/** The filters a reader can take away from an empty list, one at a time, in the order the page shows them. */
export const RELAXABLE = ["q", "vehicle", "year", "fits", "powertrain", "drivetrain", "category", "difficulty"] as const;
export type Relaxable = (typeof RELAXABLE)[number];

/** The query without one filter, or null when it does not have that filter. */
export function withoutFilter(query: LibraryQuery, field: Relaxable): LibraryQuery | null {
  if (field === "vehicle") {
    if (!query.make && !query.model && !query.generation) return null;
    return { ...query, make: undefined, model: undefined, generation: undefined };
  }
  if (query[field] === undefined) return null;
  return { ...query, [field]: undefined };
}

/**
 * For an empty list, how many guides each filter left out on its own would bring back (only
 * those that bring some): the page offers them as links.
 */
export async function relaxFilters(query: LibraryQuery, total: number, count: (query: LibraryQuery) => Promise<number>) {
  const relax: { field: Relaxable; total: number }[] = [];
  if (total > 0) return relax;
  for (const field of RELAXABLE) {
    const without = withoutFilter(query, field);
    if (!without) continue;
    const n = await count({ ...without, page: 1 });
    if (n > 0) relax.push({ field, total: n });
  }
  return relax;
}

/** The number of published guides a query lists, by SQL. */
async function countPublishedGuides(db: Db, asked: LibraryQuery) {
  const { query } = usableQuery(asked, asked.year === undefined ? null : await catalogueYears(db));
  const [row] = await db.all<{ n: number }>(sql`SELECT count(*) AS n FROM ${guideSource(query)} WHERE ${conditions(query)}`);
  return Number(row?.n ?? 0);
}

export async function listPublishedGuides(db: Db, asked: LibraryQuery) {
  const { query, problems } = usableQuery(asked, asked.year === undefined ? null : await catalogueYears(db));
  const where = conditions(query);
  const listWhere = conditions(query, undefined, true);
  const order = listOrder(query);
  const offset = (query.page - 1) * PAGE_SIZE;
  const [rows, totalRows, { powertrain, drivetrain }, category, difficulty, vehicle] = await Promise.all([
    db.all<LibraryRow>(sql`SELECT g.id, g.slug, g.title, g.summary, g.category, g.difficulty, g.minutes,
        g.published_revision_id AS revisionId, u.name AS author
      FROM ${guideSource(query)} JOIN users u ON u.id = g.author_id
      WHERE ${listWhere} ORDER BY ${order} LIMIT ${PAGE_SIZE} OFFSET ${offset}`),
    db.all<{ n: number }>(sql`SELECT count(*) AS n FROM ${guideSource(query)} WHERE ${where}`),
    variantFacets(db, query),
    guideFacet(db, query, "category"),
    guideFacet(db, query, "difficulty"),
    vehicleFacet(db, query),
  ]);
  const total = Number(totalRows[0]?.n ?? 0);
  return libraryAnswer(db, query, {
    rows,
    total,
    facets: { powertrain, drivetrain, category, difficulty, vehicle },
    problems,
    relax: await relaxFilters(query, total, (q) => countPublishedGuides(db, q)),
  });
}

/** Private-use characters FTS5 puts around a match; no guide text the Library shows holds them. */
const MARK_OPEN = "\uE000";
const MARK_CLOSE = "\uE001";

const HTML_ESCAPES: Record<string, string> = { "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" };

/**
 * FTS5's marked text as HTML: every character escaped, the marked runs in <mark>. A stray or
 * unbalanced marker (text that held one itself) opens or closes nothing twice, and a run left open
 * is closed, so the result is always well formed.
 */
export function markedHtml(marked: string): string {
  let open = false;
  // A NUL is no character an HTML page may hold: it is dropped.
  const html = marked
    .split(String.fromCharCode(0))
    .join("")
    .replace(/[&<>"'\uE000\uE001]/g, (c) => {
      if (c === MARK_OPEN) {
        if (open) return "";
        open = true;
        return "<mark>";
      }
      if (c === MARK_CLOSE) {
        if (!open) return "";
        open = false;
        return "</mark>";
      }
      return HTML_ESCAPES[c];
    });
  return open ? `${html}</mark>` : html;
}

/** Words of a passage either side of the match. */
const SNIPPET_TOKENS = 20;

/**
 * The matched words of a search in the shown revisions' title, summary and steps (FTS5's
 * highlight and snippet, asked only for the page's revisions), as safe HTML.
 */
async function searchHighlights(db: Db, match: string, revisionIds: number[]) {
  const found = new Map<number, Highlight>();
  const missing: number[] = [];
  for (const id of revisionIds) {
    const kept = highlights.get(`${id} ${match}`);
    if (kept) found.set(id, kept);
    else missing.push(id);
  }
  if (!missing.length) return found;
  const open = sql`${MARK_OPEN}`;
  const close = sql`${MARK_CLOSE}`;
  // FTS5's marks cost a walk over the search's matches (for a common word, nearly every guide):
  // asked once for the page's revisions, and kept.
  const rows = await db.all<{ id: number; title: string; summary: string; steps: string }>(sql`
    SELECT rowid AS id, highlight(guide_search, 0, ${open}, ${close}) AS title,
      highlight(guide_search, 1, ${open}, ${close}) AS summary,
      snippet(guide_search, 2, ${open}, ${close}, '…', ${SNIPPET_TOKENS}) AS steps
    FROM guide_search WHERE guide_search MATCH ${match} AND rowid IN (${sql.join(
      missing.map((id) => sql`${id}`),
      sql`, `,
    )})`);
  for (const row of rows) {
    const highlight = {
      title: markedHtml(row.title ?? ""),
      summary: markedHtml(row.summary ?? ""),
      steps: row.steps?.includes(MARK_OPEN) ? markedHtml(row.steps) : null,
    };
    found.set(Number(row.id), highlight);
    highlights.set(`${row.id} ${match}`, highlight);
  }
  return found;
}

type Highlight = { title: string; summary: string; steps: string | null };

/**
 * A revision's marks for a search never change (a revision's text is frozen once published; a
 * draft preview does not search): kept by revision and search, a few KB each.
 */
const highlights = new BoundedCache<string, Highlight>(2048);

type FitmentWithVehicle = LoadedRevision["fitment"][number];

/** A fitment row as the Library and the guide page show it. */
function fitmentView(f: FitmentWithVehicle) {
  const generation = f.variant.generation;
  return {
    variantId: f.variantId,
    make: generation.model.make.name,
    model: generation.model.name,
    generation: generation.name,
    years: generation.lastYear ? `${generation.firstYear}–${generation.lastYear}` : `${generation.firstYear}–`,
    variant: f.variant.name,
    powertrain: f.variant.powertrain,
    drivetrain: f.variant.drivetrain,
    batteryLocation: f.variant.batteryLocation,
    batteryRunM: f.variant.batteryRunM,
    status: f.status,
    note: f.note,
  };
}

/** A fitment row of the Library's answer, with the revision it belongs to. */
export type LibraryFitment = ReturnType<typeof fitmentView> & { revisionId: number };

export async function fitmentFor(db: Db, revisionIds: number[]): Promise<LibraryFitment[]> {
  if (!revisionIds.length) return [];
  const rows = await db.query.fitment.findMany({
    where: inArray(fitment.revisionId, revisionIds),
    with: { variant: { with: { generation: { with: { model: { with: { make: true } } } } } } },
  });
  return rows.map((f) => ({ revisionId: f.revisionId, ...fitmentView(f) }));
}

/**
 * What a revision shows a reader, engine results included: the published guide page, and the
 * author's preview of a draft. A published revision never changes, so its view is computed once
 * per revision and catalogue stamp (the fitment rows name the catalogue's vehicles) and kept in a
 * bounded cache; callers must not change what they are given.
 */
export async function revisionView(db: Db, storage: Pick<Storage, "publicUrl">, revisionId: number) {
  const loaded = await loadRevision(db, revisionId);
  if (!loaded) return null;
  const { revision } = loaded;
  return {
    title: revision.title,
    summary: revision.summary,
    category: revision.category,
    difficulty: revision.difficulty,
    minutes: revision.minutes,
    revision: { number: revision.number, reviewedAt: revision.reviewedAt, changeSummary: revision.changeSummary },
    steps: loaded.steps.map((s) => ({
      title: s.title,
      html: s.bodyHtml,
      liftsVehicle: s.liftsVehicle,
      disconnectsBattery: s.disconnectsBattery,
      photos: s.photos.map((p) => ({
        alt: p.alt,
        caption: p.caption,
        width: p.media.width,
        height: p.media.height,
        variants: publicVariants(storage, p.media.variants),
      })),
      callouts: s.callouts.map((c) => {
        const callout = storedCallout(c);
        return { ...callout, result: evaluateCallout(callout) };
      }),
    })),
    ...partsAndTools(loaded),
    fitment: loaded.fitment.map(fitmentView),
  };
}

/** About 50 KB each for a long guide: a few MB for the guides readers open most. */
const REVISION_VIEWS_KEPT = 200;
const revisionViews = new BoundedCache<string, Awaited<ReturnType<typeof revisionView>>>(REVISION_VIEWS_KEPT);

/** Each published revision of a guide, newest first: what changed in each, and when it was reviewed and published. */
async function publishedHistory(db: Db, guideId: number) {
  return db
    .select({
      number: revisions.number,
      reviewedAt: revisions.reviewedAt,
      publishedAt: revisions.publishedAt,
      changeSummary: revisions.changeSummary,
    })
    .from(revisions)
    .where(and(eq(revisions.guideId, guideId), inArray(revisions.state, ["published", "superseded"])))
    .orderBy(desc(revisions.number))
    .limit(100);
}

/** A guide's history changes only when another revision is published, so it is kept by the published revision's id. */
const histories = new BoundedCache<number, Awaited<ReturnType<typeof publishedHistory>>>(REVISION_VIEWS_KEPT);

/** The guide's row by slug, with its author, found for a guides stamp: the same until that moves. */
async function guideBySlug(db: Db, slug: string) {
  const [guide] = await db
    .select({
      id: guides.id,
      slug: guides.slug,
      state: guides.state,
      publishedRevisionId: guides.publishedRevisionId,
      publishedAt: guides.publishedAt,
      author: { id: users.id, name: users.name, bio: users.bio },
    })
    .from(guides)
    .innerJoin(users, eq(users.id, guides.authorId))
    .where(eq(guides.slug, slug));
  return guide;
}

/** Published guides' rows, by guides stamp and slug; slugs that find none are not kept. */
const guideRows = new BoundedCache<string, NonNullable<Awaited<ReturnType<typeof guideBySlug>>>>(REVISION_VIEWS_KEPT);

/**
 * A published guide as the reader sees it, with every callout evaluated by the engine
 * (`stamps`: read by the caller for this request, before anything it shows).
 */
export async function getPublishedGuide(db: Db, storage: Pick<Storage, "publicUrl">, slug: string, stamps?: ContentStamps) {
  const now = stamps ?? (await readContentStamps(db));
  const rowKey = `${now.guides}:${slug}`;
  let guide = guideRows.get(rowKey);
  if (!guide) {
    guide = await guideBySlug(db, slug);
    if (guide?.state === "published") guideRows.set(rowKey, guide);
  }
  if (guide?.state !== "published" || !guide.publishedRevisionId) return null;
  const key = `${guide.publishedRevisionId}:${now.catalogue}`;
  let view = revisionViews.get(key);
  if (!view) {
    view = await revisionView(db, storage, guide.publishedRevisionId);
    if (view) revisionViews.set(key, view);
  }
  if (!view) return null;
  let history = histories.get(guide.publishedRevisionId);
  if (!history) {
    history = await publishedHistory(db, guide.id);
    histories.set(guide.publishedRevisionId, history);
  }
  return {
    id: guide.id,
    slug: guide.slug,
    title: view.title,
    summary: view.summary,
    category: view.category,
    difficulty: view.difficulty,
    minutes: view.minutes,
    author: guide.author,
    publishedAt: guide.publishedAt,
    revision: view.revision,
    history,
    steps: view.steps,
    parts: view.parts,
    tools: view.tools,
    fitment: view.fitment,
  };
}

export type PublishedGuide = NonNullable<Awaited<ReturnType<typeof getPublishedGuide>>>;
