import { and, eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { plainText, type TestClient, uniqueEmail } from "../support/http-client";
import { sharedApp } from "../support/shared-app";
import { currentRevision, demoUser, draftFrom } from "./revision-fixtures";

// My vehicles and fitment reports over HTTP on the shared app server, with accounts of their own;
// a guide of this file's own is published through the review model so its author's mail can be checked.
const app = sharedApp("garage");
const PASSWORD = "torque wrench on the wheel nuts";
const DEMO_SLUG = "kestrel-hood-auxiliary-lamps";

const json = (client: TestClient, method: string, path: string, body: unknown, type = "application/json") =>
  client.request(path, {
    method,
    headers: { "content-type": type },
    body: typeof body === "string" ? body : JSON.stringify(body),
  });

async function db() {
  const { getDb } = await import("~/db/client.server");
  return getDb();
}

/** A new signed-in account (reader unless told). */
async function member(label: string, role: "reader" | "author" = "reader") {
  const { createUser } = await import("~/models/users.server");
  const email = uniqueEmail(label);
  const user = await createUser(await db(), { email, name: `Tess ${label}`, password: PASSWORD, role, verified: true });
  const client = app.client();
  expect((await client.signIn(email, PASSWORD)).status).toBe(302);
  return { client, user, email };
}

type Variant = { id: number; firstYear: number; lastYear: number | null; steps: string };
let variants: Variant[] = [];
let demoFitment: { variantId: number; status: string; note: string | null }[] = [];

beforeAll(async () => {
  const { getCatalogue } = await import("~/models/catalogue.server");
  const tree = await getCatalogue(await db());
  // `steps`: the picker's address for the variant's make, model and generation.
  variants = tree.flatMap((m) =>
    m.models.flatMap((mo) =>
      mo.generations.flatMap((g) =>
        g.variants
          .filter((v) => !v.retiredAt)
          .map((v) => ({
            id: v.id,
            firstYear: g.firstYear,
            lastYear: g.lastYear,
            steps: `vmake=${m.id}&vmodel=${mo.id}&vgen=${g.id}`,
          })),
      ),
    ),
  );
  const guide = (await (await app.client().get(`/api/guides/${DEMO_SLUG}`)).json()) as { fitment: typeof demoFitment };
  demoFitment = guide.fitment;
  expect(variants.length).toBeGreaterThan(2);
  expect(demoFitment.length).toBeGreaterThan(0);
});

const variantById = (id: number) => variants.find((v) => v.id === id)!;

describe("My vehicles over the API", () => {
  it("refuses anonymous callers with 401 on every method", async () => {
    const anon = app.client();
    expect((await anon.get("/api/me/vehicles")).status).toBe(401);
    expect((await json(anon, "POST", "/api/me/vehicles", { variantId: 1, year: 2020 })).status).toBe(401);
    expect((await anon.request("/api/me/vehicles/1", { method: "DELETE" })).status).toBe(401);
  });

  it("saves vehicles with exactly one current, and names the field of bad input", async () => {
    const { client } = await member("vehicles");
    const [a, b] = variants;
    const first = await json(client, "POST", "/api/me/vehicles", { variantId: a.id, year: a.firstYear, nickname: "Blue one" });
    expect(first.status).toBe(201);
    expect(first.headers.get("cache-control")).toBe("private, no-store");
    const second = await json(client, "POST", "/api/me/vehicles", { variantId: b.id, year: b.firstYear, nickname: "" });
    expect(second.status).toBe(201);
    type List = { vehicles: { id: number; variantId: number; year: number; nickname: string; current: boolean }[] };
    let list = (await (await client.get("/api/me/vehicles")).json()) as List;
    expect(list.vehicles).toHaveLength(2);
    // The first saved is current, the second is not.
    expect(list.vehicles.filter((v) => v.current).map((v) => v.nickname)).toEqual(["Blue one"]);
    expect(Object.keys(list.vehicles[0]).sort()).toEqual(["current", "id", "nickname", "variantId", "year"]);

    const third = await json(client, "POST", "/api/me/vehicles", {
      variantId: b.id,
      year: b.firstYear,
      nickname: "Now",
      current: true,
    });
    expect(third.status).toBe(201);
    list = (await (await client.get("/api/me/vehicles")).json()) as List;
    expect(list.vehicles.filter((v) => v.current).map((v) => v.nickname)).toEqual(["Now"]);

    // Bad input: 400 with a message per field that names it.
    const bad = async (body: unknown) => {
      const response = await json(client, "POST", "/api/me/vehicles", body);
      expect(response.status).toBe(400);
      return ((await response.json()) as { error: { fields: Record<string, string> } }).error.fields;
    };
    expect((await bad({ variantId: "x", year: a.firstYear })).variantId).toMatch(/^Variant:/);
    expect((await bad({ variantId: 987654321, year: a.firstYear })).variantId).toMatch(/^Variant:/);
    expect((await bad({ variantId: a.id, year: a.firstYear - 1 })).year).toMatch(/^Model year:/);
    expect((await bad({ variantId: a.id, year: "soon" })).year).toMatch(/^Model year:/);
    expect((await bad({ variantId: a.id, year: a.firstYear, nickname: "n".repeat(41) })).nickname).toMatch(/^Nickname:/);
    // Not JSON, or not JSON at all: 4xx, never 5xx.
    expect((await json(client, "POST", "/api/me/vehicles", "{oops")).status).toBe(400);
    expect((await json(client, "POST", "/api/me/vehicles", "variantId=1", "text/plain")).status).toBe(415);
    expect((await json(client, "POST", "/api/me/vehicles", { pad: "x".repeat(10_000) })).status).toBe(413);

    // Deleting the current vehicle makes the newest remaining one current.
    const current = list.vehicles.find((v) => v.current)!;
    const deleted = await client.request(`/api/me/vehicles/${current.id}`, { method: "DELETE" });
    expect(deleted.status).toBe(200);
    const after = (await deleted.json()) as List;
    expect(after.vehicles).toHaveLength(2);
    expect(after.vehicles.filter((v) => v.current)).toHaveLength(1);
  });

  it("keeps another reader's vehicle out of reach (403) and answers 404 for none", async () => {
    const owner = await member("owner");
    const stranger = await member("stranger");
    const v = variants[0];
    const saved = (await (
      await json(owner.client, "POST", "/api/me/vehicles", { variantId: v.id, year: v.firstYear })
    ).json()) as {
      id: number;
    };
    expect((await stranger.client.request(`/api/me/vehicles/${saved.id}`, { method: "DELETE" })).status).toBe(403);
    expect((await stranger.client.request("/api/me/vehicles/999999999", { method: "DELETE" })).status).toBe(404);
    expect((await stranger.client.request("/api/me/vehicles/not-a-number", { method: "DELETE" })).status).toBe(404);
    // The stranger's list does not show it; the owner's still does.
    expect(((await (await stranger.client.get("/api/me/vehicles")).json()) as { vehicles: unknown[] }).vehicles).toEqual([]);
    expect(((await (await owner.client.get("/api/me/vehicles")).json()) as { vehicles: unknown[] }).vehicles).toHaveLength(1);
    // Nor can the stranger make it current through the page.
    expect((await stranger.client.post("/me/vehicles", { intent: "current", vehicleId: String(saved.id) })).status).toBe(403);
  });
});

describe("My vehicles page and the picker", () => {
  it("adds, makes current and deletes through plain forms, keeping the nickname on a bad post", async () => {
    const { client } = await member("page");
    expect((await app.client().get("/me/vehicles")).headers.get("location")).toMatch(/^\/login\?redirectTo=/);
    const [a, b] = variants;
    // Posted as the picker's form posts: to the page at its last step.
    const refused = await client.post(`/me/vehicles?${a.steps}`, {
      intent: "add",
      variantId: String(a.id),
      year: "1800",
      nickname: "Kept name",
    });
    expect(refused.status).toBe(400);
    const refusedHtml = await refused.text();
    expect(plainText(refusedHtml)).toContain("Model year:");
    expect(refusedHtml).toContain('value="Kept name"');
    for (const [v, name] of [
      [a, "Work truck"],
      [b, "Weekend car"],
    ] as const) {
      const added = await client.post("/me/vehicles", {
        intent: "add",
        variantId: String(v.id),
        year: String(v.firstYear),
        nickname: name,
      });
      expect(added.status).toBe(302);
    }
    const page = plainText(await (await client.get("/me/vehicles")).text());
    expect(page).toContain("Work truck");
    expect(page).toContain("Weekend car");
    const { listVehicles } = await import("~/models/vehicles.server");
    const list = (await (await client.get("/api/me/vehicles")).json()) as {
      vehicles: { id: number; nickname: string; current: boolean }[];
    };
    const weekend = list.vehicles.find((v) => v.nickname === "Weekend car")!;
    expect(weekend.current).toBe(false);
    expect((await client.post("/me/vehicles", { intent: "current", vehicleId: String(weekend.id) })).status).toBe(302);
    const me = await client.me();
    const rows = await listVehicles(await db(), me!.id);
    expect(rows.filter((r) => r.current).map((r) => r.nickname)).toEqual(["Weekend car"]);
    expect((await client.post("/me/vehicles", { intent: "delete", vehicleId: String(weekend.id) })).status).toBe(302);
    const left = await listVehicles(await db(), me!.id);
    expect(left.map((r) => [r.nickname, r.current])).toEqual([["Work truck", true]]);
  });

  it("keeps an anonymous visitor's pick in a signed cookie, makes the page private, and offers it at sign-in", async () => {
    const row = demoFitment.find((f) => f.status === "fits") ?? demoFitment[0];
    const v = variantById(row.variantId);
    const visitor = app.client();
    const plain = await visitor.get(`/guides/${DEMO_SLUG}`);
    expect(plain.headers.get("cache-control")).toMatch(/\bpublic\b/);
    expect(plainText(await plain.text())).toContain("Does this fit your vehicle?");

    const picked = await visitor.post("/pick-vehicle", {
      intent: "pick",
      variantId: String(v.id),
      year: String(v.firstYear),
      returnTo: `/guides/${DEMO_SLUG}?vmake=1`,
    });
    expect(picked.status).toBe(302);
    expect(picked.headers.get("location")).toBe(`/guides/${DEMO_SLUG}`);
    const cookieName = [...visitor.cookies.keys()].find((k) => k.includes("tl_vehicle"));
    expect(cookieName).toBeTruthy();

    const page = await visitor.get(`/guides/${DEMO_SLUG}`);
    // Per-visitor content: never kept by a shared cache.
    expect(page.headers.get("cache-control")).toBe("private, no-store");
    const text = plainText(await page.text());
    const words = { fits: "Fits your", "fits-with-changes": "Fits with changes on your", "does-not-fit": "Does not fit your" }[
      row.status
    ];
    expect(text).toContain(words);
    if (row.status === "fits-with-changes" && row.note) expect(text).toContain(row.note);

    // A tampered cookie is ignored: the picker shows again.
    const forged = app.client();
    forged.cookies.set(cookieName!, `${visitor.cookies.get(cookieName!)!.slice(0, -4)}AAAA`);
    expect(plainText(await (await forged.get(`/guides/${DEMO_SLUG}`)).text())).toContain("Does this fit your vehicle?");

    // A year outside the generation is refused with the field named, and no cookie is set.
    const other = app.client();
    const wrong = await other.post("/pick-vehicle", {
      intent: "pick",
      variantId: String(v.id),
      year: String(v.firstYear - 1),
      returnTo: "/",
    });
    expect(wrong.status).toBe(302);
    expect([...other.cookies.keys()].some((k) => k.includes("tl_vehicle"))).toBe(false);

    // Signing in with the cookie leads to My vehicles, which offers to save it.
    const { createUser } = await import("~/models/users.server");
    const email = uniqueEmail("picked");
    await createUser(await db(), { email, name: "Pia Picked", password: PASSWORD, verified: true });
    const signed = await visitor.signIn(email, PASSWORD);
    expect(signed.headers.get("location")).toBe("/me/vehicles");
    expect(plainText(await (await visitor.get("/me/vehicles")).text())).toContain("Before you signed in you picked");
    expect((await visitor.post("/me/vehicles", { intent: "save-picked" })).status).toBe(302);
    const list = (await (await visitor.get("/api/me/vehicles")).json()) as {
      vehicles: { variantId: number; year: number; current: boolean }[];
    };
    expect(list.vehicles).toEqual([expect.objectContaining({ variantId: v.id, year: v.firstYear, current: true })]);
    expect([...visitor.cookies.keys()].some((k) => k.includes("tl_vehicle"))).toBe(false);
  });
});

/** A guide of this file's own, by an author of its own, published through the review model. */
async function publishedGuideOf(authorEmail: string, title: string) {
  const { createGuide, saveDraft } = await import("~/models/guides.server");
  const { submitRevision, approveRevision, revisionCautions, signOffCaution } = await import("~/models/review.server");
  const { findUserByEmail } = await import("~/models/users.server");
  const { guides } = await import("~/db/schema");
  const database = await db();
  const author = (await findUserByEmail(database, authorEmail))!;
  const editor = await demoUser(database, "editor@torqueleaf.test");
  const content = draftFrom(await currentRevision(database, DEMO_SLUG));
  content.steps = content.steps.map((s) => ({ ...s, photos: [] }));
  const created = await createGuide(database, author, { ...content, title });
  await saveDraft(database, created.id, author, { ...content, title, version: 1 });
  const { revisionId } = await submitRevision(database, created.id, author, "First revision");
  for (const caution of await revisionCautions(database, revisionId))
    await signOffCaution(database, revisionId, editor, { cautionId: caution.id });
  await approveRevision(database, revisionId, editor);
  const [guide] = await database.select().from(guides).where(eq(guides.id, created.id));
  return guide;
}

describe("fitment reports", () => {
  type Tally = { variantId: number; fits: number; fitsWithChanges: number; doesNotFit: number };
  const talliesOf = async (slug: string) =>
    ((await (await app.client().get(`/api/guides/${slug}`)).json()) as { fitmentReports: Tally[] }).fitmentReports;

  it("replaces a reader's earlier report, counts it once, mails the author and hides with an audit row", async () => {
    const { fitmentReports, outbox, auditLog } = await import("~/db/schema");
    const author = await member("report-author", "author");
    const guide = await publishedGuideOf(author.email, "Cab lamps for the garage test");
    const reader = await member("reporter");
    const v = variantById(demoFitment[0].variantId);
    const saved = (await (
      await json(reader.client, "POST", "/api/me/vehicles", { variantId: v.id, year: v.firstYear })
    ).json()) as { id: number };
    const path = `/api/guides/${guide.slug}/fitment-reports`;

    const anonPage = await app.client().get(`/guides/${guide.slug}`);
    const etagBefore = anonPage.headers.get("etag");
    expect(await talliesOf(guide.slug)).toEqual([]);

    const first = await json(reader.client, "POST", path, { vehicleId: saved.id, outcome: "fits", note: "" });
    expect(first.status).toBe(201);
    const second = await json(reader.client, "POST", path, {
      vehicleId: saved.id,
      outcome: "does-not-fit",
      note: "The bracket hits the washer tank.",
    });
    expect(second.status).toBe(201);
    const report = ((await second.json()) as { report: { id: number; replaced: boolean } }).report;
    expect(report.replaced).toBe(true);

    const database = await db();
    const rows = await database.select().from(fitmentReports).where(eq(fitmentReports.guideId, guide.id));
    expect(rows).toHaveLength(1);
    expect(rows[0]).toMatchObject({
      status: "does-not-fit",
      userId: reader.user.id,
      variantId: v.id,
      vehicleId: saved.id,
      year: v.firstYear,
    });
    expect(await talliesOf(guide.slug)).toEqual([{ variantId: v.id, fits: 0, fitsWithChanges: 0, doesNotFit: 1 }]);

    // The author was mailed for the new report and for the changed outcome, to their own address.
    const mails = await database
      .select()
      .from(outbox)
      .where(and(eq(outbox.kind, "fitment-report"), eq(outbox.userId, author.user.id)));
    expect(mails).toHaveLength(2);
    expect(mails.every((m) => m.to === author.email)).toBe(true);
    expect(mails[1].text).toContain("does not fit");

    // The guide page shows the tally and the note at once; the anonymous page's ETag changed.
    const shown = await app.client().get(`/guides/${guide.slug}`);
    expect(shown.headers.get("etag")).not.toBe(etagBefore);
    const shownText = plainText(await shown.text());
    expect(shownText).toContain("0 fit · 0 fit with changes · 1 did not fit");
    expect(shownText).toContain("The bracket hits the washer tank.");

    // Only an editor may hide it; the reason goes to the audit log in the same transaction.
    expect(
      (
        await reader.client.post(`/guides/${guide.slug}/fitment-reports`, {
          intent: "hide",
          reportId: String(report.id),
          reason: "mine",
        })
      ).status,
    ).toBe(403);
    const editor = app.client();
    expect((await editor.signIn("editor@torqueleaf.test", "torqueleaf-demo")).status).toBe(302);
    const noReason = await editor.post(`/guides/${guide.slug}/fitment-reports`, {
      intent: "hide",
      reportId: String(report.id),
      reason: "",
    });
    expect(noReason.status).toBe(400);
    expect(plainText(await noReason.text())).toContain("Reason:");
    const hidden = await editor.post(`/guides/${guide.slug}/fitment-reports`, {
      intent: "hide",
      reportId: String(report.id),
      reason: "Off-topic advertising",
    });
    expect(hidden.status).toBe(302);
    const [audit] = await database
      .select()
      .from(auditLog)
      .where(and(eq(auditLog.action, "fitment-report.hide"), eq(auditLog.subjectId, String(report.id))));
    expect(audit).toMatchObject({ reason: "Off-topic advertising", guideId: guide.id, subjectType: "fitment-report" });
    const [after] = await database.select().from(fitmentReports).where(eq(fitmentReports.id, report.id));
    expect(after.hiddenReason).toBe("Off-topic advertising");
    expect(after.hiddenAt).not.toBeNull();
    expect(await talliesOf(guide.slug)).toEqual([]);
    expect(plainText(await (await app.client().get(`/guides/${guide.slug}`)).text())).not.toContain(
      "The bracket hits the washer tank.",
    );

    // The Workbench lists reports on the author's guides; a hidden one is not among them.
    const other = await member("second-reporter");
    await json(other.client, "POST", path, { variantId: v.id, outcome: "fits-with-changes", note: "Trimmed the grille clip." });
    const bench = plainText(await (await author.client.get("/workbench")).text());
    expect(bench).toContain("Trimmed the grille clip.");
    expect(bench).not.toContain("The bracket hits the washer tank.");
  });

  it("sends the author no mail once they turned fitment-report mail off", async () => {
    const { outbox } = await import("~/db/schema");
    const { optOutByLink } = await import("~/models/mail-preferences.server");
    const author = await member("quiet-author", "author");
    const guide = await publishedGuideOf(author.email, "Roof bars for the quiet author");
    await optOutByLink(await db(), author.user.id, "fitment-report", "page");
    const reader = await member("quiet-reporter");
    const v = variantById(demoFitment[0].variantId);
    const response = await json(reader.client, "POST", `/api/guides/${guide.slug}/fitment-reports`, {
      variantId: v.id,
      outcome: "fits",
      note: "",
    });
    expect(response.status).toBe(201);
    const mails = await (await db())
      .select()
      .from(outbox)
      .where(and(eq(outbox.kind, "fitment-report"), eq(outbox.userId, author.user.id)));
    expect(mails).toEqual([]);
    expect(await talliesOf(guide.slug)).toEqual([{ variantId: v.id, fits: 1, fitsWithChanges: 0, doesNotFit: 0 }]);
  });

  it("answers malformed or unauthorised reports with 4xx naming the field", async () => {
    const reader = await member("malformed");
    const stranger = await member("malformed-other");
    const v = variantById(demoFitment[0].variantId);
    const theirs = (await (
      await json(stranger.client, "POST", "/api/me/vehicles", { variantId: v.id, year: v.firstYear })
    ).json()) as { id: number };
    const path = `/api/guides/${DEMO_SLUG}/fitment-reports`;
    const fields = async (body: unknown) => {
      const response = await json(reader.client, "POST", path, body);
      expect(response.status).toBe(400);
      return ((await response.json()) as { error: { fields: Record<string, string> } }).error.fields;
    };
    expect((await fields({ variantId: v.id, outcome: "maybe", note: "" })).outcome).toMatch(/^Outcome:/);
    expect((await fields({ outcome: "fits", note: "" })).vehicleId).toMatch(/^Vehicle:/);
    expect((await fields({ variantId: v.id, outcome: "fits", note: "n".repeat(501) })).note).toMatch(/^Note:/);
    expect((await fields({ variantId: v.id, outcome: "fits-with-changes", note: " " })).note).toMatch(/^Note:/);
    expect((await fields({ variantId: 987654321, outcome: "fits", note: "" })).variantId).toMatch(/^Variant:/);
    expect((await fields({ variantId: [1], outcome: "fits" })).variantId).toMatch(/^Variant:/);
    expect((await json(reader.client, "POST", path, "{")).status).toBe(400);
    expect((await json(reader.client, "POST", path, "outcome=fits", "text/plain")).status).toBe(415);
    expect((await json(reader.client, "POST", path, { vehicleId: theirs.id, outcome: "fits", note: "" })).status).toBe(403);
    expect(
      (await json(reader.client, "POST", "/api/guides/no-such-guide/fitment-reports", { variantId: v.id, outcome: "fits" }))
        .status,
    ).toBe(404);
    expect((await json(app.client(), "POST", path, { variantId: v.id, outcome: "fits" })).status).toBe(401);
    expect((await reader.client.get(path)).status).toBe(405);
    // The page form keeps what was typed when a field needs attention.
    const page = await reader.client.post(`/guides/${DEMO_SLUG}/fitment-reports`, {
      intent: "report",
      variantId: String(v.id),
      outcome: "fits-with-changes",
      note: "",
    });
    expect(page.status).toBe(400);
    expect(plainText(await page.text())).toContain("Note: say what you had to change.");
  });
});
