import { and, eq, like } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { startAppServer } from "../support/app-server";
import { useTestDatabase } from "../support/base-db";
import { expectFlash, TestClient, plainText, signedIn } from "../support/http-client";

// The vehicle catalogue's administration over HTTP on a database of its own (the changes would
// otherwise show in other files' Library counts), checked through the public catalogue, the
// Library, the guide editor's data and the audit log.
let app: Awaited<ReturnType<typeof startAppServer>>;

beforeAll(async () => {
  useTestDatabase("admin-catalogue");
  app = await startAppServer();
});
afterAll(async () => app?.stop());

type ApiVariant = { id: number; key: string; name: string; powertrain: string; batteryRunM: number; retired: boolean };
type ApiCatalogue = {
  makes: {
    name: string;
    slug: string;
    models: {
      name: string;
      slug: string;
      bodyStyle: string | null;
      generations: { name: string; slug: string; firstYear: number; lastYear: number | null; variants: ApiVariant[] }[];
    }[];
  }[];
};

async function publicCatalogue(): Promise<ApiCatalogue> {
  return (await (await new TestClient(app.origin).get("/api/catalogue")).json()) as ApiCatalogue;
}

async function db() {
  const { getDb } = await import("~/db/client.server");
  return getDb();
}

async function rowIds() {
  const { makes, models, generations, variants } = await import("~/db/schema");
  const d = await db();
  return {
    make: async (name: string) => (await d.select().from(makes).where(eq(makes.name, name)))[0],
    model: async (name: string) => (await d.select().from(models).where(eq(models.name, name)))[0],
    generation: async (modelId: number, name: string) =>
      (
        await d
          .select()
          .from(generations)
          .where(and(eq(generations.modelId, modelId), eq(generations.name, name)))
      )[0],
    variant: async (key: string) => (await d.select().from(variants).where(eq(variants.key, key)))[0],
    variantByName: async (generationId: number, name: string) =>
      (
        await d
          .select()
          .from(variants)
          .where(and(eq(variants.generationId, generationId), eq(variants.name, name)))
      )[0],
  };
}

async function catalogueAudit() {
  const { auditLog } = await import("~/db/schema");
  return (await db()).select().from(auditLog).where(like(auditLog.action, "catalogue.%"));
}

describe("/admin/catalogue", () => {
  it("is for admins only, reading and changing alike", async () => {
    const anonymous = new TestClient(app.origin);
    expect((await anonymous.get("/admin/catalogue")).headers.get("location")).toBe("/login?redirectTo=%2Fadmin%2Fcatalogue");
    expect((await anonymous.post("/admin/catalogue", { intent: "add-make", name: "Sneaky" })).status).toBe(302);
    for (const email of ["reader@torqueleaf.test", "author@torqueleaf.test", "editor@torqueleaf.test"]) {
      const client = await signedIn(app.origin, email);
      expect((await client.get("/admin/catalogue")).status, email).toBe(403);
      expect((await client.post("/admin/catalogue", { intent: "add-make", name: "Sneaky" })).status, email).toBe(403);
    }
    const ids = await rowIds();
    expect(await ids.make("Sneaky")).toBeUndefined();
    const admin = await signedIn(app.origin, "admin@torqueleaf.test");
    const page = plainText(await (await admin.get("/admin/catalogue")).text());
    // The demo catalogue, every level: make, model, generation with its years, a variant with its figures.
    expect(page).toContain("Vehicle catalogue");
    expect(page).toContain("Norvik Fjell");
    expect(page).toContain("F3 model years 2019–2025");
    expect(page).toContain("2.0 plug-in hybrid AWD");
  });

  it("adds and edits each level, with messages that name the field and keep what was typed", async () => {
    const admin = await signedIn(app.origin, "admin@torqueleaf.test");
    const before = (await catalogueAudit()).length;
    const ids = await rowIds();

    // Bad input: 400, each message names its field, the typed values come back in the form.
    const noName = await admin.post("/admin/catalogue", { intent: "add-make", formKey: "add-make", name: "  " });
    expect(noName.status).toBe(400);
    expect(plainText(await noName.text())).toContain("Make name: give a name");

    expect(await expectAdded(admin, { intent: "add-make", formKey: "add-make", name: "Tarvo" }, "Tarvo added.")).toBe(true);
    const make = await ids.make("Tarvo");
    await expectFlash(
      admin,
      await admin.post("/admin/catalogue", { intent: "add-model", makeId: String(make.id), name: "Brisk", bodyStyle: "estate" }),
      "/admin/catalogue",
      "Tarvo Brisk added.",
    );
    const model = await ids.model("Brisk");

    const badYears = await admin.post("/admin/catalogue", {
      intent: "add-generation",
      formKey: `add-generation-${model.id}`,
      modelId: String(model.id),
      name: "B1 typed",
      firstYear: "2023",
      lastYear: "2019",
    });
    expect(badYears.status).toBe(400);
    const badYearsPage = plainText(await badYears.text());
    expect(badYearsPage).toContain("Last model year: give a year no earlier than the first model year");
    expect(badYearsPage).not.toContain("First model year:");
    const badYearsHtml = await (
      await admin.post("/admin/catalogue", {
        intent: "add-generation",
        formKey: `add-generation-${model.id}`,
        modelId: String(model.id),
        name: "B1 typed",
        firstYear: "twenty",
      })
    ).text();
    expect(plainText(badYearsHtml)).toContain("First model year: give a year in digits");
    expect(badYearsHtml).toContain('value="B1 typed"');

    await expectFlash(
      admin,
      await admin.post("/admin/catalogue", {
        intent: "add-generation",
        modelId: String(model.id),
        name: "B1",
        firstYear: "2021",
      }),
      "/admin/catalogue",
      "Tarvo Brisk B1 (2021–) added.",
    );
    const generation = await ids.generation(model.id, "B1");
    expect([generation.firstYear, generation.lastYear]).toEqual([2021, null]);

    const badVariant = await admin.post("/admin/catalogue", {
      intent: "add-variant",
      formKey: `add-variant-${generation.id}`,
      generationId: String(generation.id),
      name: "1.6 gas FWD",
      powertrain: "steam",
      drivetrain: "FWD",
      batteryLocation: "engine-bay",
      batteryRunM: "40",
    });
    expect(badVariant.status).toBe(400);
    const badVariantText = plainText(await badVariant.text());
    expect(badVariantText).toContain("Powertrain: pick one from the list");
    expect(badVariantText).toContain("Battery-to-firewall run: give at most 15 m");
    await expectFlash(
      admin,
      await admin.post("/admin/catalogue", {
        intent: "add-variant",
        generationId: String(generation.id),
        name: "1.6 gas FWD",
        powertrain: "gas",
        drivetrain: "FWD",
        batteryLocation: "engine-bay",
        batteryRunM: "1.2",
      }),
      "/admin/catalogue",
      "Tarvo Brisk B1 · 1.6 gas FWD added.",
    );
    const variant = await ids.variantByName(generation.id, "1.6 gas FWD");

    // A second make of the same name is refused by field.
    const twice = await admin.post("/admin/catalogue", { intent: "add-make", formKey: "add-make", name: "tarvo" });
    expect(twice.status).toBe(409);
    expect(plainText(await twice.text())).toContain("Make name: there is a make called tarvo already");

    // Edits at each level; the public catalogue (kept per content stamp) shows each at once.
    const edits: [Record<string, string>, string][] = [
      [{ intent: "edit-make", id: String(make.id), name: "Tarvo Motors" }, "Tarvo Motors: make saved."],
      [
        { intent: "edit-model", id: String(model.id), name: "Brisk", bodyStyle: "estate car" },
        "Tarvo Motors Brisk: model saved.",
      ],
      [
        { intent: "edit-generation", id: String(generation.id), name: "B1", firstYear: "2021", lastYear: "2024" },
        "Tarvo Motors Brisk B1 (2021–2024): generation saved.",
      ],
      [
        {
          intent: "edit-variant",
          id: String(variant.id),
          name: "1.6 gas FWD",
          powertrain: "gas",
          drivetrain: "FWD",
          batteryLocation: "cargo-area",
          batteryRunM: "3.4",
        },
        "Tarvo Motors Brisk B1 · 1.6 gas FWD: variant saved.",
      ],
    ];
    for (const [form, text] of edits)
      await expectFlash(admin, await admin.post("/admin/catalogue", form), "/admin/catalogue", text);
    // Saving without a change records nothing.
    await expectFlash(
      admin,
      await admin.post("/admin/catalogue", { intent: "edit-make", id: String(make.id), name: "Tarvo Motors" }),
      "/admin/catalogue",
      "Nothing changed.",
    );

    const shown = (await publicCatalogue()).makes.find((m) => m.slug === "tarvo");
    expect(shown?.name).toBe("Tarvo Motors");
    expect(shown?.models[0]).toMatchObject({ name: "Brisk", bodyStyle: "estate car" });
    expect(shown?.models[0].generations[0]).toMatchObject({ name: "B1", firstYear: 2021, lastYear: 2024 });
    expect(shown?.models[0].generations[0].variants[0]).toMatchObject({
      name: "1.6 gas FWD",
      batteryLocation: "cargo-area",
      batteryRunM: 3.4,
      retired: false,
    });

    // Four additions and four edits, each with its audit row; the edits say what changed.
    const audit = (await catalogueAudit()).slice(before);
    expect(audit.map((a) => a.action)).toEqual([
      "catalogue.make-add",
      "catalogue.model-add",
      "catalogue.generation-add",
      "catalogue.variant-add",
      "catalogue.make-edit",
      "catalogue.model-edit",
      "catalogue.generation-edit",
      "catalogue.variant-edit",
    ]);
    const adminId = (await admin.me())?.id;
    expect(audit.every((a) => a.actorId === adminId)).toBe(true);
    expect(audit[3].subjectId).toBe(String(variant.id));
    expect(audit[7].data).toMatchObject({
      changes: { batteryLocation: { from: "engine-bay", to: "cargo-area" }, batteryRunM: { from: 1.2, to: 3.4 } },
    });
  });

  it("refuses to delete a variant a guide's fitment names (409, the guides named), and retires it instead", async () => {
    const admin = await signedIn(app.origin, "admin@torqueleaf.test");
    const ids = await rowIds();
    const f2 = await ids.variant("fjell-f2-gas-fwd");
    const { guides } = await import("~/db/schema");
    const { inArray } = await import("drizzle-orm");
    // The demo guides whose fitment lists the Fjell F2 (content-samples/guides).
    const users = await (await db())
      .select({ title: guides.title, slug: guides.slug })
      .from(guides)
      .where(inArray(guides.slug, ["fjell-f3-roof-crossbars", "fjell-hybrid-cargo-12v-outlet"]));
    expect(users).toHaveLength(2);
    const before = (await catalogueAudit()).length;

    const refused = await admin.post("/admin/catalogue", {
      intent: "delete-variant",
      id: String(f2.id),
      formKey: `variant-${f2.id}`,
    });
    expect(refused.status).toBe(409);
    const page = plainText(await refused.text());
    expect(page).toContain("Norvik Fjell F2 · 1.8 gas FWD cannot be deleted: the fitment of 2 guides names it");
    for (const g of users) expect(page).toContain(g.title);
    expect(page).toContain("Retire it instead");

    // The same intent as JSON (POST /api/catalogue) gets the API's error shape, the guides listed.
    const json = await admin.request("/api/catalogue", {
      method: "POST",
      headers: { "content-type": "application/json" },
      body: JSON.stringify({ intent: "delete-variant", id: f2.id }),
    });
    expect(json.status).toBe(409);
    const body = (await json.json()) as { error: { code: string; message: string; guides: { slug: string }[] } };
    expect(body.error.code).toBe("in-use");
    expect(body.error.guides.map((g) => g.slug).sort()).toEqual(users.map((g) => g.slug).sort());
    expect(await ids.variant("fjell-f2-gas-fwd")).toBeDefined();
    expect((await catalogueAudit()).length).toBe(before);

    // Before retiring: the Library offers the F2, and the author's editor offers its variant.
    const author = await signedIn(app.origin, "author@torqueleaf.test");
    const editorData = async () => (await author.get("/workbench/guides/7.data")).text();
    expect(await editorData()).toContain("fjell-f2-gas-fwd");
    const library = async () => (await new TestClient(app.origin).get("/")).text();
    expect(await library()).toContain('value="norvik.fjell.f2"');

    await expectFlash(
      admin,
      await admin.post("/admin/catalogue", { intent: "retire-variant", id: String(f2.id) }),
      "/admin/catalogue",
      "Norvik Fjell F2 · 1.8 gas FWD retired",
    );
    expect((await ids.variant("fjell-f2-gas-fwd")).retiredAt).not.toBeNull();
    expect(plainText(await (await admin.get("/admin/catalogue")).text())).toContain("1.8 gas FWD Retired");
    // No longer offered: not in the editor's matrix of a guide that does not list it, not in the Library's menu.
    expect(await editorData()).not.toContain("fjell-f2-gas-fwd");
    expect(await library()).not.toContain('value="norvik.fjell.f2"');
    // The public catalogue still names it (guides' fitment rows point at it), marked retired.
    const f2Public = (await publicCatalogue()).makes
      .flatMap((m) => m.models.flatMap((mo) => mo.generations.flatMap((g) => g.variants)))
      .find((v) => v.key === "fjell-f2-gas-fwd");
    expect(f2Public?.retired).toBe(true);
    // The guides that list it keep their row.
    const crossbars = (await (await new TestClient(app.origin).get("/api/guides/fjell-f3-roof-crossbars")).json()) as {
      fitment: { variantId: number; generation: string }[];
    };
    expect(crossbars.fitment.find((f) => f.variantId === f2.id)?.generation).toBe("F2");

    // Offered again on request; each step audited.
    await expectFlash(
      admin,
      await admin.post("/admin/catalogue", { intent: "restore-variant", id: String(f2.id) }),
      "/admin/catalogue",
      "is offered for fitment again.",
    );
    expect(await library()).toContain('value="norvik.fjell.f2"');
    const audit = (await catalogueAudit()).slice(before);
    expect(audit.map((a) => [a.action, a.subjectId])).toEqual([
      ["catalogue.variant-retire", String(f2.id)],
      ["catalogue.variant-restore", String(f2.id)],
    ]);
  });

  it("deletes unused variants, then the emptied generation, model and make, each audited", async () => {
    const admin = await signedIn(app.origin, "admin@torqueleaf.test");
    const ids = await rowIds();
    const make = await ids.make("Tarvo Motors");
    const model = await ids.model("Brisk");
    const generation = await ids.generation(model.id, "B1");
    const variant = await ids.variantByName(generation.id, "1.6 gas FWD");
    const before = (await catalogueAudit()).length;

    // Not while something is inside: the message says what to do first.
    const notEmpty = await admin.post("/admin/catalogue", {
      intent: "delete-generation",
      id: String(generation.id),
      formKey: `generation-${generation.id}`,
    });
    expect(notEmpty.status).toBe(409);
    expect(plainText(await notEmpty.text())).toContain(
      "Tarvo Motors Brisk B1 (2021–2024) still has 1 variant: delete them first.",
    );
    const modelNotEmpty = await admin.post("/admin/catalogue", { intent: "delete-model", id: String(model.id) });
    expect(modelNotEmpty.status).toBe(409);

    const steps: [Record<string, string>, string][] = [
      [{ intent: "delete-variant", id: String(variant.id) }, "Tarvo Motors Brisk B1 · 1.6 gas FWD deleted."],
      [{ intent: "delete-generation", id: String(generation.id) }, "Tarvo Motors Brisk B1 (2021–2024) deleted."],
      [{ intent: "delete-model", id: String(model.id) }, "Tarvo Motors Brisk deleted."],
      [{ intent: "delete-make", id: String(make.id) }, "Tarvo Motors deleted."],
    ];
    for (const [form, text] of steps)
      await expectFlash(admin, await admin.post("/admin/catalogue", form), "/admin/catalogue", text);
    expect((await publicCatalogue()).makes.some((m) => m.slug === "tarvo")).toBe(false);
    expect(await ids.make("Tarvo Motors")).toBeUndefined();

    const audit = (await catalogueAudit()).slice(before);
    expect(audit.map((a) => a.action)).toEqual([
      "catalogue.variant-delete",
      "catalogue.generation-delete",
      "catalogue.model-delete",
      "catalogue.make-delete",
    ]);
    expect(audit[0].data).toMatchObject({ label: "Tarvo Motors Brisk B1 · 1.6 gas FWD", values: { batteryRunM: 3.4 } });

    // The site's audit log reads them in plain words.
    const log = plainText(await (await admin.get("/admin/audit?action=catalogue.variant-delete")).text());
    expect(log).toContain("Deleted a variant: Tarvo Motors Brisk B1 · 1.6 gas FWD");
    // A row that is gone answers 404 on the page, not a server error.
    const gone = await admin.post("/admin/catalogue", { intent: "delete-variant", id: String(variant.id) });
    expect(gone.status).toBe(404);
    const unknown = await admin.post("/admin/catalogue", { intent: "delete-variant", id: "not-a-number" });
    expect(unknown.status).toBe(400);
  });
});

async function expectAdded(client: TestClient, form: Record<string, string>, text: string) {
  await expectFlash(client, await client.post("/admin/catalogue", form), "/admin/catalogue", text);
  return true;
}
