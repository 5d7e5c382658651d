import { parse } from "csv-parse/sync";
import { beforeAll, describe, expect, it } from "vitest";
import type { DraftInput } from "~/models/guide-input";
import { expectFlash, plainText, type TestClient, uniqueEmail } from "../support/http-client";
import { sharedApp } from "../support/shared-app";
import { type ApiError, sendJson } from "./authoring-support";
import { currentRevision, demoUser, draftFrom } from "./revision-fixtures";

// The parts checklist API over HTTP on the shared app server, against guides this file publishes
// itself (a new author's), so the demo guides stay as they are.
const app = sharedApp("checklists");

type Item = {
  id: number;
  name: string;
  quantity: number;
  checked: boolean;
  note: string | null;
  own: boolean;
  kind: string;
  partNumber: string | null;
  step: number | null;
  removed: boolean;
};
type Checklist = {
  id: number;
  guide: { slug: string; title: string };
  revisionNumber: number;
  latestRevisionNumber: number | null;
  newerRevision: boolean;
  items: Item[];
};

async function models() {
  const { getDb } = await import("~/db/client.server");
  const { createGuide, saveDraft } = await import("~/models/guides.server");
  const review = await import("~/models/review.server");
  const { createUser } = await import("~/models/users.server");
  return { db: await getDb(), createGuide, saveDraft, createUser, ...review };
}

async function newAccount(role: "reader" | "author", name: string) {
  const { db, createUser } = await models();
  const email = uniqueEmail(`checklist-${role}`);
  const password = "ticking the parts off";
  const user = await createUser(db, { email, name, password, role, verified: true });
  const client = app.client();
  expect((await client.signIn(email, password)).status).toBe(302);
  return { user, client };
}

/** Publishes `content` as the guide's next revision, as an editor approves it (cautions signed off). */
async function publish(guideId: number, author: { id: number; role: "author" }, content: DraftInput, first: boolean) {
  const m = await models();
  const editor = await demoUser(m.db, "editor@torqueleaf.test");
  if (!first) await m.startNextRevision(m.db, guideId, author);
  const { loadRevision } = await import("~/models/guides.server");
  const { guides } = await import("~/db/schema");
  const { eq } = await import("drizzle-orm");
  const [guide] = await m.db.select().from(guides).where(eq(guides.id, guideId));
  const working = await loadRevision(m.db, guide.workingRevisionId!);
  await m.saveDraft(m.db, guideId, author, { ...content, version: working!.revision.version });
  const { revisionId } = await m.submitRevision(m.db, guideId, author, first ? "First revision" : "Parts changed");
  for (const caution of await m.revisionCautions(m.db, revisionId))
    await m.signOffCaution(m.db, revisionId, editor, { cautionId: caution.id });
  await m.approveRevision(m.db, revisionId, editor);
}

let slug = "";
let guideId = 0;
let author: { id: number; role: "author" };
let content: DraftInput;

beforeAll(async () => {
  const m = await models();
  const made = await newAccount("author", "Runa Velt");
  author = { id: made.user.id, role: "author" };
  content = draftFrom(await currentRevision(m.db, "kestrel-hood-auxiliary-lamps"));
  content.steps = content.steps.map((s) => ({ ...s, photos: [] }));
  content.parts = [
    { name: "Lamp pair, 12 V", quantity: 1, partNumber: "TL-LMP-12", notes: null, stepIndex: 0 },
    { name: "Relay, 30 A", quantity: 1, partNumber: "TL-RLY-30", notes: null, stepIndex: 1 },
    { name: "Heat-shrink butt connectors", quantity: 8, partNumber: null, notes: null, stepIndex: null },
  ];
  content.tools = [{ name: "Crimping tool" }, { name: "Multimeter" }];
  const created = await m.createGuide(m.db, author, { ...content, title: `Cab lamps ${Date.now().toString(36)}` });
  guideId = created.id;
  slug = created.slug;
  await publish(guideId, author, content, true);
  // Publishing runs the review engine and hashes a password: slow on a busy machine.
}, 180_000);

async function save(client: TestClient, guideSlug = slug) {
  return sendJson<Checklist>(client, "POST", "/api/checklists", { guideSlug });
}

async function patch(client: TestClient, path: string, body: unknown) {
  const response = await client.request(path, {
    method: "PATCH",
    headers: { "content-type": "application/json" },
    body: typeof body === "string" ? body : JSON.stringify(body),
  });
  const text = await response.text();
  return { status: response.status, body: text ? JSON.parse(text) : null };
}

describe("parts checklists", () => {
  it("copies the guide's parts and tools, and answers the same checklist when saved again", async () => {
    const { client } = await newAccount("reader", "Oskar Lind");
    const first = await save(client);
    expect(first.status).toBe(201);
    expect(first.body.guide.slug).toBe(slug);
    expect(first.body.revisionNumber).toBe(1);
    expect(first.body.items.map((i) => [i.name, i.quantity, i.partNumber, i.step, i.kind])).toEqual([
      ["Lamp pair, 12 V", 1, "TL-LMP-12", 1, "part"],
      ["Relay, 30 A", 1, "TL-RLY-30", 2, "part"],
      ["Heat-shrink butt connectors", 8, null, null, "part"],
      ["Crimping tool", 1, null, null, "tool"],
      ["Multimeter", 1, null, null, "tool"],
    ]);
    const again = await save(client);
    expect(again.status).toBe(200);
    expect(again.body.id).toBe(first.body.id);

    const list = await sendJson<{ checklists: { id: number; total: number; checked: number }[] }>(
      client,
      "GET",
      "/api/checklists",
    );
    expect(list.body.checklists).toEqual([expect.objectContaining({ id: first.body.id, total: 5, checked: 0 })]);
  });

  it("is its owner's only: anonymous 401, another reader 403, a missing one 404", async () => {
    const { client } = await newAccount("reader", "Mira Holm");
    const { body } = await save(client);
    const item = body.items[0];
    const { client: other } = await newAccount("reader", "Teo Brandt");
    const anonymous = app.client();
    const paths = {
      get: `/api/checklists/${body.id}`,
      csv: `/api/checklists/${body.id}.csv`,
      item: `/api/checklists/${body.id}/items/${item.id}`,
      items: `/api/checklists/${body.id}/items`,
    };
    for (const [who, caller, status] of [
      ["anonymous", anonymous, 401],
      ["other reader", other, 403],
    ] as const) {
      const answers = [
        (await caller.get(paths.get)).status,
        (await caller.get(paths.csv)).status,
        (await caller.get("/me/checklists/" + body.id + "/csv")).status,
        (await patch(caller, paths.item, { checked: true })).status,
        (await sendJson(caller, "POST", paths.items, { name: "Zip ties", quantity: 10 })).status,
        (await caller.request(paths.item, { method: "DELETE" })).status,
        (await caller.request(paths.get, { method: "DELETE" })).status,
      ];
      // The CSV page sends an anonymous visitor to sign in (a page, not the API).
      const expected = [status, status, who === "anonymous" ? 302 : 403, status, status, status, status];
      expect(answers, who).toEqual(expected);
    }
    // A stranger's malformed body is refused for the owner check first: nothing learned from field errors.
    expect((await patch(other, paths.item, { checked: "maybe" })).status).toBe(403);
    expect((await client.get("/api/checklists/999999999")).status).toBe(404);
    expect((await client.get("/api/checklists/not-a-number")).status).toBe(404);
    expect((await patch(client, `/api/checklists/${body.id}/items/999999999`, { checked: true })).status).toBe(404);
    // The owner's checklist is untouched by the refused calls.
    const after = await sendJson<Checklist>(client, "GET", paths.get);
    expect(after.body.items.map((i) => i.checked)).toEqual(body.items.map(() => false));
    expect(after.body.items).toHaveLength(body.items.length);
    // The owner deletes it; then it is gone.
    expect((await client.request(paths.get, { method: "DELETE" })).status).toBe(204);
    expect((await client.get(paths.get)).status).toBe(404);
  });

  it("keeps the ticks of two clients ticking different items at the same time", async () => {
    const { client } = await newAccount("reader", "Ines Sato");
    const { body } = await save(client);
    // The same reader on a phone and a laptop: two sessions.
    const phone = client;
    const laptop = app.client();
    for (const [k, v] of client.cookies) laptop.cookies.set(k, v);
    const ids = body.items.map((i) => i.id);
    const answers = await Promise.all(
      ids.map((id, n) => patch(n % 2 ? laptop : phone, `/api/checklists/${body.id}/items/${id}`, { checked: true })),
    );
    expect(answers.map((a) => a.status)).toEqual(ids.map(() => 200));
    // Quantity from one, note from the other, on the same item: both stay, and the tick too.
    await Promise.all([
      patch(phone, `/api/checklists/${body.id}/items/${ids[2]}`, { quantity: 12 }),
      patch(laptop, `/api/checklists/${body.id}/items/${ids[2]}`, { note: "Buy the 20-pack" }),
    ]);
    const after = await sendJson<Checklist>(client, "GET", `/api/checklists/${body.id}`);
    expect(after.body.items.every((i) => i.checked)).toBe(true);
    expect(after.body.items[2]).toMatchObject({ quantity: 12, note: "Buy the 20-pack", checked: true });
  });

  it("refuses malformed input with 4xx naming the field, and keeps the item as it was", async () => {
    const { client } = await newAccount("reader", "Pia Korhonen");
    const { body } = await save(client);
    const path = `/api/checklists/${body.id}/items/${body.items[0].id}`;
    const cases: [unknown, number, string][] = [
      [{ checked: "yes" }, 400, "checked"],
      [{ quantity: 0 }, 400, "quantity"],
      [{ quantity: 2.5 }, 400, "quantity"],
      [{ quantity: 1_000_000 }, 400, "quantity"],
      [{ note: "x".repeat(501) }, 400, "note"],
      [{ note: 42 }, 400, "note"],
      [{}, 400, "_"],
      [[], 400, "_"],
    ];
    for (const [input, status, field] of cases) {
      const answer = await patch(client, path, input);
      expect(answer.status, JSON.stringify(input)).toBe(status);
      expect(Object.keys((answer.body as ApiError).error.fields ?? {}), JSON.stringify(input)).toContain(field);
    }
    expect((await patch(client, path, "{not json")).status).toBe(400);
    expect((await patch(client, path, JSON.stringify({ note: "y".repeat(20_000) }))).status).toBe(413);
    const wrongType = await client.request(path, {
      method: "PATCH",
      headers: { "content-type": "text/plain" },
      body: "checked=1",
    });
    expect(wrongType.status).toBe(415);
    const own = await sendJson<ApiError>(client, "POST", `/api/checklists/${body.id}/items`, { name: "  ", quantity: 1 });
    expect(own.status).toBe(400);
    expect(own.body.error.fields).toHaveProperty("name");
    const noGuide = await sendJson<ApiError>(client, "POST", "/api/checklists", { guideSlug: "" });
    expect(noGuide.status).toBe(400);
    expect(noGuide.body.error.fields).toHaveProperty("guideSlug");
    const unknownGuide = await sendJson<ApiError>(client, "POST", "/api/checklists", { guideSlug: "no-such-guide-here" });
    expect(unknownGuide.status).toBe(404);
    // A guide's own item cannot be deleted (only ticked off); the item is unchanged by all of the above.
    expect((await client.request(path, { method: "DELETE" })).status).toBe(409);
    const after = await sendJson<Checklist>(client, "GET", `/api/checklists/${body.id}`);
    expect(after.body.items[0]).toMatchObject({ checked: false, quantity: 1, note: null });
  });

  it("writes a CSV with the contract's columns that escapes commas, quotes, line breaks and formulas", async () => {
    const { client } = await newAccount("reader", "Lena Aro");
    const { body } = await save(client);
    const first = body.items[0];
    await patch(client, `/api/checklists/${body.id}/items/${first.id}`, {
      checked: true,
      note: 'Ask for the "wide" beam,\nnot the spot',
    });
    const added = await sendJson<Item>(client, "POST", `/api/checklists/${body.id}/items`, {
      name: '=HYPERLINK("x")',
      quantity: 3,
    });
    expect(added.status).toBe(201);
    await sendJson<Item>(client, "POST", `/api/checklists/${body.id}/items`, { name: "+1 spare fuse, 10 A", quantity: 1 });

    for (const path of [`/api/checklists/${body.id}.csv`, `/me/checklists/${body.id}/csv`]) {
      const response = await client.get(path);
      expect(response.status, path).toBe(200);
      expect(response.headers.get("content-type")).toMatch(/^text\/csv/);
      expect(response.headers.get("content-disposition")).toMatch(/^attachment; filename="checklist-[a-z0-9-]+\.csv"$/);
      expect(response.headers.get("cache-control")).toContain("no-store");
      const text = await response.text();
      // RFC 4180 §2: records end in CRLF; csv-parse (npm) reads the file as a spreadsheet would.
      expect(text).toContain("\r\n");
      const rows = parse(text, { bom: true, relax_column_count: false }) as string[][];
      expect(rows[0]).toEqual(["item", "quantity", "part number", "step", "checked", "note"]);
      expect(rows[1]).toEqual(["Lamp pair, 12 V", "1", "TL-LMP-12", "1", "yes", 'Ask for the "wide" beam,\nnot the spot']);
      expect(rows).toHaveLength(1 + body.items.length + 2);
      // OWASP "CSV Injection": a cell starting with = + - @ is prefixed with ' so it is never a formula.
      expect(rows.at(-2)).toEqual(['\'=HYPERLINK("x")', "3", "", "", "no", ""]);
      expect(rows.at(-1)?.[0]).toBe("'+1 spare fuse, 10 A");
      for (const row of rows) expect(row).toHaveLength(6);
    }
  });

  it("merges a newer revision: added parts appear, removed ones are marked, ticks, quantities, notes and own items stay", async () => {
    const { client } = await newAccount("reader", "Arvid Nyström");
    const { body } = await save(client);
    const [lamp, relay, connectors] = body.items;
    await patch(client, `/api/checklists/${body.id}/items/${lamp.id}`, { checked: true, note: "Bought" });
    await patch(client, `/api/checklists/${body.id}/items/${relay.id}`, { checked: true });
    await patch(client, `/api/checklists/${body.id}/items/${connectors.id}`, { quantity: 10 });
    const own = await sendJson<Item>(client, "POST", `/api/checklists/${body.id}/items`, { name: "Cable ties", quantity: 20 });

    // The author drops the relay and adds a fuse holder; the connectors' step and count change.
    await publish(
      guideId,
      author,
      {
        ...content,
        parts: [
          content.parts[0],
          { ...content.parts[2], quantity: 6, stepIndex: 1 },
          { name: "Inline fuse holder", quantity: 1, partNumber: "TL-FH-10", notes: null, stepIndex: 1 },
        ],
      },
      false,
    );
    const told = await sendJson<Checklist>(client, "GET", `/api/checklists/${body.id}`);
    expect(told.body.newerRevision).toBe(true);
    expect(told.body.latestRevisionNumber).toBe(told.body.revisionNumber + 1);

    // A stale client: it ticks the connectors while the merge runs, on the state it read before the merge.
    const laptop = app.client();
    for (const [k, v] of client.cookies) laptop.cookies.set(k, v);
    const [merged, ticked] = await Promise.all([
      sendJson<{ added: number; removed: number; checklist: Checklist }>(client, "POST", `/api/checklists/${body.id}/merge`),
      patch(laptop, `/api/checklists/${body.id}/items/${connectors.id}`, { checked: true }),
    ]);
    expect(merged.status).toBe(200);
    expect(ticked.status).toBe(200);
    expect(merged.body).toMatchObject({ added: 1, removed: 1 });

    const after = (await sendJson<Checklist>(client, "GET", `/api/checklists/${body.id}`)).body;
    expect(after.newerRevision).toBe(false);
    const byName = new Map(after.items.map((i) => [i.name, i]));
    expect(byName.get("Lamp pair, 12 V")).toMatchObject({ checked: true, note: "Bought", removed: false });
    expect(byName.get("Relay, 30 A")).toMatchObject({ checked: true, removed: true });
    expect(byName.get("Heat-shrink butt connectors")).toMatchObject({ checked: true, quantity: 10, step: 2, removed: false });
    expect(byName.get("Inline fuse holder")).toMatchObject({ checked: false, quantity: 1, partNumber: "TL-FH-10", own: false });
    expect(byName.get("Cable ties")).toMatchObject({ id: own.body.id, own: true, quantity: 20 });
    // Merging again changes nothing.
    const again = await sendJson<{ added: number; removed: number }>(client, "POST", `/api/checklists/${body.id}/merge`);
    expect(again.body).toMatchObject({ added: 0, removed: 0 });
    // Progress on the list leaves out the removed relay: 6 items now, 2 of them ticked (the lamp and the connectors).
    const list = await sendJson<{ checklists: { id: number; total: number; checked: number }[] }>(
      client,
      "GET",
      "/api/checklists",
    );
    expect(list.body.checklists.find((c) => c.id === body.id)).toMatchObject({ total: 6, checked: 2 });
    // The removed relay may now be deleted; the reader's own item too.
    expect((await client.request(`/api/checklists/${body.id}/items/${relay.id}`, { method: "DELETE" })).status).toBe(204);
    expect((await client.request(`/api/checklists/${body.id}/items/${own.body.id}`, { method: "DELETE" })).status).toBe(204);
  });

  it("works as plain forms without JavaScript: save from the guide page, tick, note, own item, print, delete", async () => {
    // Someone not signed in is sent to sign in and back to the guide's parts.
    const anonymous = await app.client().post("/me/checklists", { guideSlug: slug });
    expect(anonymous.status).toBe(302);
    expect(anonymous.headers.get("location")).toBe(`/login?redirectTo=${encodeURIComponent(`/guides/${slug}#parts`)}`);
    expect(plainText(await (await app.client().get(`/guides/${slug}`)).text())).toContain("Save a parts checklist");

    const { client } = await newAccount("reader", "Sven Ekdahl");
    const saved = await client.post("/me/checklists", { guideSlug: slug });
    expect(saved.status).toBe(302);
    const page = saved.headers.get("location") ?? "";
    expect(page).toMatch(/^\/me\/checklists\/\d+$/);
    await expectFlash(client, saved, page, "Tick them off as you buy them");
    const id = Number(page.split("/").at(-1));
    const checklist = (await sendJson<Checklist>(client, "GET", `/api/checklists/${id}`)).body;
    const [first] = checklist.items;

    expect((await client.post(page, { intent: "tick", itemId: String(first.id), checked: "true" })).status).toBe(302);
    expect((await client.post(page, { intent: "item", itemId: String(first.id), quantity: "3", note: "Shelf B" })).status).toBe(
      302,
    );
    expect((await client.post(page, { intent: "add", name: "Grommet, 20 mm", quantity: "2" })).status).toBe(302);
    const refused = await client.post(page, { intent: "add", name: "Loom tape", quantity: "0" });
    expect(refused.status).toBe(400);
    const refusedText = plainText(await refused.text());
    expect(refusedText).toContain("quantity: at least 1");
    // What was typed comes back into the form.
    expect(refusedText).not.toContain("Loom tape ×");
    expect(await (await client.post(page, { intent: "add", name: "Loom tape", quantity: "0" })).text()).toContain(
      'value="Loom tape"',
    );
    const fetched = await client.post(page, { intent: "tick", itemId: String(first.id), checked: "true", via: "fetcher" });
    expect(fetched.status).toBe(200);

    const shown = plainText(await (await client.get(page)).text());
    expect(shown).toContain("3× Lamp pair, 12 V");
    expect(shown).toContain("Shelf B");
    expect(shown).toContain("2× Grommet, 20 mm");
    expect(shown).toContain("1 of 6 ticked");
    expect(plainText(await (await client.get("/me/checklists")).text())).toContain("1 of 6 ticked");
    const print = plainText(await (await client.get(`${page}?print=1`)).text());
    expect(print).toContain("✓ ticked");
    expect(print).toContain("Grommet, 20 mm");

    // Another reader cannot open it, and the page sends an anonymous visitor to sign in.
    const { client: other } = await newAccount("reader", "Ada Marsh");
    expect((await other.get(page)).status).toBe(403);
    expect((await other.post(page, { intent: "tick", itemId: String(first.id), checked: "false" })).status).toBe(403);
    expect((await app.client().get(page)).status).toBe(302);

    // Deleting it from the page goes back to the list.
    const deleted = await client.post(page, { intent: "delete" });
    await expectFlash(client, deleted, "/me/checklists", "The checklist is deleted.");
  });
});
