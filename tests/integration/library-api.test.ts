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
