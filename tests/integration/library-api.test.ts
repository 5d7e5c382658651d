import { beforeAll, describe, expect, it } from "vitest";
import { useTestDatabase } from "../support/base-db";

// Route modules are imported after the database copy is in place.
type Loader = (args: { request: Request; params: Record<string, string>; context: unknown }) => Promise<Response>;
let guidesLoader: Loader;
let guideLoader: Loader;
let catalogueLoader: Loader;

const get = (loader: Loader, path: string, params: Record<string, string> = {}) =>
  loader({ request: new Request(`http://localhost${path}`), params, context: {} });

beforeAll(async () => {
  useTestDatabase("library-api");
  guidesLoader = (await import("~/routes/api.guides")).loader as unknown as Loader;
  guideLoader = (await import("~/routes/api.guide")).loader as unknown as Loader;
  catalogueLoader = (await import("~/routes/api.catalogue")).loader as unknown as Loader;
});

type GuideList = {
  guides: { slug: string; fitment: { powertrain: string; drivetrain: string; status: string; make: string }[] }[];
  total: number;
  facets: Record<string, Record<string, number>>;
};

describe("GET /api/guides", () => {
  it("lists only published guides, newest first, with fitment", async () => {
    const res = await get(guidesLoader, "/api/guides");
    expect(res.status).toBe(200);
    const body = (await res.json()) as GuideList;
    const slugs = body.guides.map((g) => g.slug);
    expect(slugs).toContain("kestrel-hood-auxiliary-lamps");
    expect(slugs).toContain("fjell-hybrid-cargo-12v-outlet");
    // The demo's in-review and draft guides must not leak into the Library.
    expect(slugs).not.toContain("fjell-phev-rear-usb-charger");
    expect(slugs).not.toContain("fjell-f3-hardwired-dash-camera");
    expect(body.total).toBe(slugs.length);
    for (const guide of body.guides) expect(guide.fitment.length).toBeGreaterThan(0);
  });

  it("filters by powertrain: every guide has a hybrid variant that fits", async () => {
    const body = (await (await get(guidesLoader, "/api/guides?powertrain=hybrid")).json()) as GuideList;
    expect(body.total).toBeGreaterThan(0);
    for (const guide of body.guides) {
      expect(guide.fitment.some((f) => f.powertrain === "hybrid" && f.status !== "does-not-fit")).toBe(true);
    }
    const all = (await (await get(guidesLoader, "/api/guides")).json()) as GuideList;
    expect(body.total).toBeLessThan(all.total);
    // The facet for the filtered dimension still counts the other powertrains.
    expect(body.facets.powertrain.hybrid).toBe(body.total);
    expect(Object.keys(body.facets.powertrain).length).toBeGreaterThan(1);
  });

  it("counts guides per difficulty and per generation beside the other facets", async () => {
    const all = (await (await get(guidesLoader, "/api/guides")).json()) as GuideList;
    const sum = (facet: Record<string, number>) => Object.values(facet).reduce((a, b) => a + b, 0);
    // Every guide has exactly one difficulty, so the counts add up to the total.
    expect(sum(all.facets.difficulty)).toBe(all.total);
    expect(all.facets.vehicle["norvik.fjell.f3"]).toBeGreaterThan(0);
    // Picking a generation does not hide the other generations' counts.
    const f3 = (await (await get(guidesLoader, "/api/guides?make=norvik&model=fjell&generation=f3")).json()) as GuideList;
    expect(f3.facets.vehicle["calder.kestrel.k2"]).toBe(all.facets.vehicle["calder.kestrel.k2"]);
    expect(f3.total).toBe(all.facets.vehicle["norvik.fjell.f3"]);
  });

  it("applies vehicle filters to the same variant", async () => {
    const body = (await (await get(guidesLoader, "/api/guides?powertrain=diesel&drivetrain=FWD")).json()) as GuideList;
    expect(body.total).toBe(0);
  });

  it("searches titles, summaries and step text, and treats search syntax as words", async () => {
    const relay = (await (await get(guidesLoader, "/api/guides?q=relay")).json()) as GuideList;
    expect(relay.guides.map((g) => g.slug)).toContain("kestrel-hood-auxiliary-lamps");
    const odd = await get(guidesLoader, `/api/guides?q=${encodeURIComponent('"crossbar* OR (NEAR')}`);
    expect(odd.status).toBe(200);
  });

  // Words from the demo guides' parts lists, tools and callouts (content-samples/guides) that are in
  // no guide's title, summary or step text, so only the parts, tools and callout columns find them.
  it.each([
    ["a part name", "glovebox", "kestrel-hood-auxiliary-lamps"],
    ["a part number", "HH02", "kestrel-hood-auxiliary-lamps"],
    ["a part number as printed", "XB-1200A", "fjell-f3-roof-crossbars"],
    ["a tool", "wire stripper", "fjell-hybrid-cargo-12v-outlet"],
    ["a caution callout's text", "penetrating", "kestrel-k2-front-skid-plate"],
    ["a warning callout's text", "lethal", "kestrel-rear-recovery-points"],
  ])("search finds %s (%s)", async (_what, q, slug) => {
    const body = (await (await get(guidesLoader, `/api/guides?q=${encodeURIComponent(q)}`)).json()) as GuideList;
    expect(body.guides.map((g) => g.slug)).toContain(slug);
  });

  it("keeps the index in step as a draft's parts, tools and callouts change", async () => {
    const { getDb } = await import("~/db/client.server");
    const { sql } = await import("drizzle-orm");
    const db = await getDb();
    const hits = async (word: string) =>
      (await db.all<{ n: number }>(sql`SELECT count(*) AS n FROM guide_search WHERE guide_search MATCH ${`"${word}"`}`))[0].n;
    const [draft] = await db.all<{ id: number; step: number }>(sql`
      SELECT r.id, (SELECT min(id) FROM steps WHERE revision_id = r.id) AS step FROM revisions r WHERE r.state = 'draft' LIMIT 1`);
    await db.run(
      sql`INSERT INTO parts (revision_id, position, name, part_number) VALUES (${draft.id}, 99, 'Quillbrace', 'QZ-771')`,
    );
    await db.run(sql`INSERT INTO tools (revision_id, position, name) VALUES (${draft.id}, 99, 'Zanderwrench')`);
    await db.run(
      sql`INSERT INTO callouts (step_id, position, kind, data) VALUES (${draft.step}, 99, 'tip', '{"text":"Murlwick"}')`,
    );
    expect([await hits("quillbrace"), await hits("qz"), await hits("zanderwrench"), await hits("murlwick")]).toEqual([
      1, 1, 1, 1,
    ]);
    await db.run(sql`UPDATE parts SET name = 'Fennibolt' WHERE name = 'Quillbrace'`);
    expect([await hits("quillbrace"), await hits("fennibolt")]).toEqual([0, 1]);
    await db.run(sql`DELETE FROM tools WHERE name = 'Zanderwrench'`);
    await db.run(sql`DELETE FROM callouts WHERE step_id = ${draft.step} AND position = 99`);
    expect([await hits("zanderwrench"), await hits("murlwick")]).toEqual([0, 0]);
    // A step's callouts leave the index with the step.
    await db.run(
      sql`INSERT INTO callouts (step_id, position, kind, data) VALUES (${draft.step}, 99, 'tip', '{"text":"Murlwick"}')`,
    );
    await db.run(sql`DELETE FROM steps WHERE id = ${draft.step}`);
    expect(await hits("murlwick")).toBe(0);
  });

  it("keeps unpublished guides out of search on their parts and tools", async () => {
    // DC-F1 is only in the draft dash-camera guide's parts list.
    const body = (await (await get(guidesLoader, "/api/guides?q=DC-F1")).json()) as GuideList;
    expect(body.guides.map((g) => g.slug)).not.toContain("fjell-f3-hardwired-dash-camera");
  });

  it.each([
    ['"'],
    ['""""'],
    ["NEAR(relay fuse, 2)"],
    ["relay NEAR fuse"],
    ["*"],
    ["relay*"],
    ["(relay OR fuse) AND NOT"],
    [")))((("],
    ["title:relay"],
    ["^relay"],
    ["relay -fuse +wire"],
    ["\u0000\u202e"],
    ["x".repeat(10 * 1024)],
    ["a ".repeat(5 * 1024)],
    ['"a" '.repeat(2 * 1024)],
  ])("a hostile search never fails the request: %#", async (q) => {
    const res = await get(guidesLoader, `/api/guides?q=${encodeURIComponent(q)}`);
    expect(res.status).toBe(200);
    const body = (await res.json()) as GuideList & { problems: Record<string, string> };
    expect(Array.isArray(body.guides)).toBe(true);
    if (q.trim().length > 200) expect(body.problems.q).toMatch(/first 200 characters/);
  });

  it("names a model year outside the catalogue and the years it covers, and does not filter by it", async () => {
    const all = (await (await get(guidesLoader, "/api/guides")).json()) as GuideList;
    const body = (await (await get(guidesLoader, "/api/guides?year=1930")).json()) as GuideList & {
      problems: Record<string, string>;
    };
    // The demo catalogue's generations start with the Fjell F2 in 2013 (content-samples/catalogue.ts).
    expect(body.problems.year).toMatch(/^Model year 1930 is outside the catalogue: it lists vehicles from 2013 to \d{4}\./);
    expect(body.total).toBe(all.total);
    const unreadable = (await (await get(guidesLoader, "/api/guides?year=twenty")).json()) as {
      problems: Record<string, string>;
    };
    expect(unreadable.problems.year).toMatch(/Model year must be a year in digits/);
    const inside = (await (await get(guidesLoader, "/api/guides?year=2021")).json()) as { problems: Record<string, string> };
    expect(inside.problems.year).toBeUndefined();
  });

  it("says when a page is past the end of the list", async () => {
    const body = (await (await get(guidesLoader, "/api/guides?page=2")).json()) as GuideList & {
      pages: number;
      problems: Record<string, string>;
    };
    expect(body.guides).toEqual([]);
    expect(body.pages).toBe(1);
    expect(body.problems.page).toBe("Page 2 is past the end of this list: it has 1 page.");
    const first = (await (await get(guidesLoader, "/api/guides?page=1")).json()) as { problems: Record<string, string> };
    expect(first.problems.page).toBeUndefined();
  });

  it("ignores unreadable filter values instead of failing", async () => {
    const res = await get(guidesLoader, "/api/guides?powertrain=steam&page=-3");
    expect(res.status).toBe(200);
  });
});

describe("GET /api/guides/:slug", () => {
  it("returns steps with torque, circuit and caution callouts and computed results", async () => {
    const res = await get(guideLoader, "/api/guides/kestrel-hood-auxiliary-lamps", { slug: "kestrel-hood-auxiliary-lamps" });
    expect(res.status).toBe(200);
    const guide = (await res.json()) as {
      revision: { number: number };
      steps: {
        html: string;
        photos: { variants: { url: string; format: string }[] }[];
        callouts: { kind: string; computed: unknown }[];
      }[];
      parts: unknown[];
      tools: unknown[];
    };
    const kinds = new Set(guide.steps.flatMap((s) => s.callouts.map((c) => c.kind)));
    expect([...kinds]).toEqual(expect.arrayContaining(["torque", "circuit", "caution"]));
    const circuit = guide.steps.flatMap((s) => s.callouts).find((c) => c.kind === "circuit") as {
      computed: { result: { currentA: number; recommendedFuseA: number } };
    };
    // Two lamps of 85 W on 12 V: I = P / V = 170 / 12 (engine.md §1); NEC 210.20(A) 125 % → next ISO 8820-3 rating.
    expect(circuit.computed.result.currentA).toBeCloseTo(170 / 12, 6);
    expect(circuit.computed.result.recommendedFuseA).toBe(20);
    expect(guide.steps[0].html).toMatch(/^<p>/);
    const photo = guide.steps.flatMap((s) => s.photos)[0];
    expect(photo.variants.map((v) => v.format)).toEqual(expect.arrayContaining(["webp", "jpeg"]));
    expect(guide.parts.length).toBeGreaterThan(0);
    expect(guide.tools.length).toBeGreaterThan(0);
  });

  it("answers 404 in the API's error shape for a guide that is not published", async () => {
    const res = await get(guideLoader, "/api/guides/fjell-phev-rear-usb-charger", { slug: "fjell-phev-rear-usb-charger" });
    expect(res.status).toBe(404);
    expect(((await res.json()) as { error: { code: string } }).error.code).toBe("not-found");
  });
});

describe("GET /api/catalogue", () => {
  it("returns makes → models → generations → variants with battery data", async () => {
    const body = (await (await get(catalogueLoader, "/api/catalogue")).json()) as {
      makes: {
        models: { generations: { variants: { powertrain: string; batteryLocation: string; batteryRunM: number }[] }[] }[];
      }[];
    };
    const variants = body.makes.flatMap((m) => m.models.flatMap((mo) => mo.generations.flatMap((g) => g.variants)));
    expect(body.makes.length).toBeGreaterThanOrEqual(2);
    expect(new Set(variants.map((v) => v.powertrain))).toEqual(
      new Set(["gas", "diesel", "hybrid", "plug-in-hybrid", "electric"]),
    );
    expect(variants.find((v) => v.powertrain === "hybrid")?.batteryLocation).toBe("cargo-area");
  });
});
