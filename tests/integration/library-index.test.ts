import { sql } from "drizzle-orm";
import fc from "fast-check";
import { beforeAll, describe, expect, it } from "vitest";
import type { Db } from "~/db/client.server";
import { getCatalogue } from "~/models/catalogue.server";
import { listFromIndex } from "~/models/library-index.server";
import { type LibraryQuery, listPublishedGuides } from "~/models/library.server";
import { CATEGORIES, DRIVETRAINS, POWERTRAINS } from "~/utils/vocab";
import { useTestDatabase } from "../support/base-db";

/**
 * The Library answered from the in-memory index must be the Library answered by SQL, for any
 * query: the SQL of `listPublishedGuides` is the reference (SQLite as the independent engine), on
 * a copy of the demo database, over queries drawn by fast-check from the catalogue's own values,
 * years inside and outside it, every facet value and search terms that match some, one or no guide.
 */
let db: Db;
let vehicles: { make: string; model: string; generation: string }[];
let variantIds: number[];

beforeAll(async () => {
  useTestDatabase("library-index");
  db = await (await import("~/db/client.server")).getDb();
  const catalogue = await getCatalogue(db);
  vehicles = catalogue.flatMap((make) =>
    make.models.flatMap((model) => model.generations.map((g) => ({ make: make.slug, model: model.slug, generation: g.slug }))),
  );
  variantIds = catalogue.flatMap((make) => make.models.flatMap((m) => m.generations.flatMap((g) => g.variants.map((v) => v.id))));
  // Invented readers' reports, so "most reported fits" has something to order by: per published
  // guide and variant a status drawn from a fixed pattern, some hidden, some by other readers.
  await db.run(sql`
    INSERT INTO fitment_reports (guide_id, variant_id, user_id, status, note, hidden_at, hidden_reason)
    SELECT g.id, v.id, u.id,
      CASE (g.id + v.id + u.id) % 3 WHEN 0 THEN 'fits' WHEN 1 THEN 'fits-with-changes' ELSE 'does-not-fit' END,
      'invented report',
      CASE WHEN (g.id * 7 + v.id + u.id) % 5 = 0 THEN 1700000000000 END,
      CASE WHEN (g.id * 7 + v.id + u.id) % 5 = 0 THEN 'off-topic' END
    FROM guides g JOIN variants v JOIN users u
    WHERE g.state = 'published' AND (g.id * 31 + v.id * 17 + u.id * 13) % 4 = 0`);
});

const optional = <T>(arb: fc.Arbitrary<T>) => fc.option(arb, { nil: undefined });

function queries() {
  return fc.record({
    vehicle: optional(fc.nat({ max: 1000 })),
    depth: fc.integer({ min: 1, max: 3 }),
    year: optional(fc.integer({ min: 1995, max: 2030 })),
    powertrain: optional(fc.constantFrom(...POWERTRAINS)),
    drivetrain: optional(fc.constantFrom(...DRIVETRAINS)),
    category: optional(fc.constantFrom(...CATEGORIES)),
    difficulty: optional(fc.integer({ min: 1, max: 5 })),
    q: optional(fc.constantFrom("lamp", "relay", "fuse", "bracket", "harness", "cargo outlet", "zzqx", "12")),
    page: fc.integer({ min: 1, max: 3 }),
    sort: optional(fc.constantFrom("newest", "fits", "shortest") as fc.Arbitrary<"newest" | "fits" | "shortest">),
    // A variant by its place in the catalogue, or an id no variant has.
    fits: optional(fc.oneof(fc.nat({ max: 1000 }), fc.constant(-1))),
    for: optional(fc.nat({ max: 1000 })),
  });
}

function toQuery(drawn: ReturnType<typeof queries> extends fc.Arbitrary<infer T> ? T : never): LibraryQuery {
  const vehicle = drawn.vehicle === undefined || !vehicles.length ? undefined : vehicles[drawn.vehicle % vehicles.length];
  return {
    make: vehicle?.make,
    model: vehicle && drawn.depth >= 2 ? vehicle.model : undefined,
    generation: vehicle && drawn.depth >= 3 ? vehicle.generation : undefined,
    year: drawn.year,
    powertrain: drawn.powertrain,
    drivetrain: drawn.drivetrain,
    category: drawn.category,
    difficulty: drawn.difficulty,
    q: drawn.q,
    page: drawn.page,
    sort: drawn.sort,
    fits: drawn.fits === undefined ? undefined : drawn.fits < 0 ? 999_999 : variantIds[drawn.fits % variantIds.length],
    for: drawn.for === undefined ? undefined : variantIds[drawn.for % variantIds.length],
  };
}

describe("the Library's in-memory index", () => {
  it("answers every query exactly as the SQL does: page, total, facets and problems", async () => {
    await fc.assert(
      fc.asyncProperty(queries(), async (drawn) => {
        const query = toQuery(drawn);
        expect(await listFromIndex(db, query)).toEqual(await listPublishedGuides(db, query));
      }),
      { numRuns: 400 },
    );
  });

  it("answers the unfiltered Library and a model year outside the catalogue as the SQL does", async () => {
    for (const query of [{ page: 1 }, { page: 1, year: 1901 }, { page: 9, q: "lamp" }] as LibraryQuery[]) {
      const answer = await listFromIndex(db, query);
      expect(answer).toEqual(await listPublishedGuides(db, query));
    }
    expect((await listFromIndex(db, { page: 1 })).total).toBeGreaterThan(0);
    expect((await listFromIndex(db, { page: 1, year: 1901 })).problems.year).toMatch(/outside the catalogue/);
  });
});
