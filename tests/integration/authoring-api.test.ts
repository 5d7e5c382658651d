import fc from "fast-check";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { DraftView } from "~/models/drafts.server";
import { startAppServer } from "../support/app-server";
import { useTestDatabase } from "../support/base-db";
import type { TestClient } from "../support/http-client";
import { type ApiError, sendJson, signedIn } from "./authoring-support";

// The authoring API of design/api.md over real HTTP, on the development server with a copy of the
// demo database and the local S3 stand-in. Status codes follow the contract's error table.

let app: Awaited<ReturnType<typeof startAppServer>>;
let author: TestClient;
let author2: TestClient;
let editor: TestClient;
let reader: TestClient;

/** The demo author's draft and another author's published guide (the seed writes guides in content-samples order). */
const DEMO_DRAFT_ID = 7;
const OTHER_AUTHORS_GUIDE_ID = 2;

beforeAll(async () => {
  useTestDatabase("authoring-api");
  app = await startAppServer();
  [author, author2, editor, reader] = await Promise.all(
    ["author", "author2", "editor", "reader"].map((name) => signedIn(app.origin, `${name}@torqueleaf.test`)),
  );
});
afterAll(async () => app?.stop());

describe("reading a draft", () => {
  it("gives the author the working revision in the shape the PUT takes, and a GET → PUT round trip saves", async () => {
    const got = await sendJson<DraftView>(author, "GET", `/api/guides/${DEMO_DRAFT_ID}/draft`);
    expect(got.status).toBe(200);
    const view = got.body;
    expect(view.guide).toMatchObject({ id: DEMO_DRAFT_ID, slug: "fjell-f3-hardwired-dash-camera", state: "draft" });
    expect(view.revision).toMatchObject({ state: "draft", version: view.draft.version });
    expect(view.draft.steps.length).toBeGreaterThan(0);
    const photo = view.draft.steps.flatMap((s) => s.photos)[0];
    expect(photo.variants.map((v) => v.width)).toEqual(expect.arrayContaining([480, 960, 1600]));
    expect(view.reviewNote).toBeNull();

    const saved = await sendJson<{ version: number; findings: unknown[] }>(
      author,
      "PUT",
      `/api/guides/${DEMO_DRAFT_ID}/draft`,
      view.draft,
    );
    expect(saved.status).toBe(200);
    expect(saved.body.version).toBe(view.draft.version + 1);
    const again = await sendJson<DraftView>(author, "GET", `/api/guides/${DEMO_DRAFT_ID}/draft`);
    expect({ ...again.body.draft, version: 0 }).toEqual({ ...view.draft, version: 0 });
  });

  it("lets editors read it, and refuses other authors, readers and anonymous callers", async () => {
    expect((await sendJson(editor, "GET", `/api/guides/${DEMO_DRAFT_ID}/draft`)).status).toBe(200);
    const stranger = await sendJson<ApiError>(author2, "GET", `/api/guides/${DEMO_DRAFT_ID}/draft`);
    expect(stranger.status).toBe(403);
    expect(stranger.body.error.message).toMatch(/author and the editors/);
    expect((await sendJson(reader, "GET", `/api/guides/${DEMO_DRAFT_ID}/draft`)).status).toBe(403);
    expect((await sendJson(author, "GET", `/api/guides/${OTHER_AUTHORS_GUIDE_ID}/draft`)).status).toBe(403);
    const anonymous = await fetch(`${app.origin}/api/guides/${DEMO_DRAFT_ID}/draft`);
    expect(anonymous.status).toBe(401);
    expect((await sendJson(author, "GET", "/api/guides/999999/draft")).status).toBe(404);
    expect((await sendJson(author, "GET", "/api/guides/abc/draft")).status).toBe(404);
  });
});

type Created = { id: number; slug: string; draft: { revisionId: number; version: number } };
type Saved = { version: number; findings: { rule: string; severity: string; stepIndex: number; calloutIndex?: number }[] };

const META = {
  title: "Rear fog lamp on the tow bar",
  summary: "Adds a rear fog lamp wired through a relay.",
  category: "lighting",
  difficulty: 3,
  minutes: 90,
};
const paragraph = (text: string) => ({ type: "doc", content: [{ type: "paragraph", content: [{ type: "text", text }] }] });

async function create(client: TestClient, body: Record<string, unknown> = META): Promise<Created> {
  const created = await sendJson<Created>(client, "POST", "/api/guides", body);
  if (created.status !== 201) throw new Error(`create answered ${created.status}: ${JSON.stringify(created.body)}`);
  return created.body;
}

/** A photo the demo author uploaded (the seed's), and a variant from the demo catalogue. */
async function demoMaterial() {
  const view = (await sendJson<DraftView>(author, "GET", `/api/guides/${DEMO_DRAFT_ID}/draft`)).body;
  return { mediaId: view.draft.steps.flatMap((s) => s.photos)[0].mediaId, variantId: view.draft.fitment[0].variantId };
}

describe("creating a guide", () => {
  it("gives an author a draft of their own, ignoring posted authorId, state, role and publishedRevisionId", async () => {
    const me = await author.me();
    const them = await author2.me();
    const created = await create(author, {
      ...META,
      authorId: them?.id,
      state: "published",
      role: "admin",
      publishedRevisionId: 1,
    });
    expect(created).toMatchObject({ id: expect.any(Number), slug: "rear-fog-lamp-on-the-tow-bar", draft: { version: 1 } });
    const view = (await sendJson<DraftView>(author, "GET", `/api/guides/${created.id}/draft`)).body;
    expect(view.guide).toMatchObject({
      authorId: me?.id,
      state: "draft",
      publishedRevisionId: null,
      workingRevisionId: created.draft.revisionId,
    });
    expect(view.revision).toMatchObject({ id: created.draft.revisionId, number: 1, state: "draft", version: 1 });
    expect(view.draft).toMatchObject({ ...META, steps: [], fitment: [], parts: [], tools: [] });
    // The library still does not list it: it is nobody's published guide.
    expect((await sendJson(reader, "GET", `/api/guides/${created.slug}`)).status).toBe(404);
  });

  it("refuses readers (403) and anonymous callers (401), and names the fields of a bad body (400)", async () => {
    const refused = await sendJson<ApiError>(reader, "POST", "/api/guides", META);
    expect(refused.status).toBe(403);
    const anonymous = await fetch(`${app.origin}/api/guides`, {
      method: "POST",
      headers: { origin: app.origin, "content-type": "application/json" },
      body: JSON.stringify(META),
    });
    expect(anonymous.status).toBe(401);
    const bad = await sendJson<ApiError>(author, "POST", "/api/guides", { ...META, title: "x", difficulty: 9 });
    expect(bad.status).toBe(400);
    expect(Object.keys(bad.body.error.fields ?? {}).sort()).toEqual(["difficulty", "title"]);
  });
});

describe("save, conflict and submit", () => {
  it("saves, refuses a stale save with the server's draft, and submits once every field to fix is fixed", async () => {
    const { mediaId, variantId } = await demoMaterial();
    const created = await create(author, { ...META, title: "Rear fog lamp, relay-switched" });
    const path = `/api/guides/${created.id}/draft`;
    const circuit = { kind: "circuit", label: "Fog lamp feed", loadWatts: 21, oneWayLengthM: 4.5, feed: "battery" };
    const first = {
      version: created.draft.version,
      ...META,
      steps: [
        {
          title: "Run the feed to the tow bar",
          body: paragraph("Route the feed along the left chassis rail."),
          photos: [{ mediaId, alt: "", caption: null }],
          callouts: [circuit],
        },
        { title: "Raise the rear", body: paragraph("Lift the rear on the jacking points."), liftsVehicle: true },
      ],
      fitment: [],
      parts: [{ name: "Fog lamp", quantity: 1, stepIndex: 1 }],
      tools: [{ name: "Crimping tool" }],
    };
    const saved = await sendJson<Saved>(author, "PUT", path, first);
    expect(saved.status).toBe(200);
    expect(saved.body.version).toBe(2);
    // engine/rules.ts: lifting without a stands caution blocks; a battery feed with no earlier disconnect warns.
    expect(saved.body.findings).toEqual(
      expect.arrayContaining([
        expect.objectContaining({ rule: "support-caution-missing", severity: "blocking", stepIndex: 1 }),
        expect.objectContaining({ rule: "battery-disconnect-missing", stepIndex: 0, calloutIndex: 0 }),
      ]),
    );

    // A second tab still holding version 1.
    const stale = await sendJson<ApiError>(author, "PUT", path, { ...first, title: "Lost update" });
    expect(stale.status).toBe(409);
    expect(stale.body.error.code).toBe("stale-version");
    const current = (await sendJson<DraftView>(author, "GET", path)).body.draft;
    expect(stale.body.error.current).toEqual(current);
    expect(current.title).toBe(META.title);

    const early = await sendJson<ApiError>(author, "POST", `/api/guides/${created.id}/submit`, { changeSummary: "" });
    expect(early.status).toBe(422);
    expect(early.body.error.code).toBe("incomplete");
    expect(early.body.error.missing).toEqual(
      expect.arrayContaining(["fitment", "steps.photos.alt", "steps.callouts", "findings"]),
    );
    expect(Object.keys(early.body.error.fields ?? {}).sort()).toEqual(
      [
        "fitment",
        "steps.0.photos.0.alt",
        "steps.0.callouts.0.wire",
        "steps.0.callouts.0.fuseA",
        "steps.0.callouts.0.relay",
        "steps.0.callouts.0.fuseDistanceMm",
        "steps.1.callouts",
      ].sort(),
    );
    // Never published: no change summary is asked for yet.
    expect(early.body.error.fields).not.toHaveProperty("changeSummary");

    const fixed = {
      ...current,
      steps: [
        {
          ...current.steps[0],
          disconnectsBattery: true,
          photos: [{ mediaId, alt: "The feed clipped along the left chassis rail", caption: null }],
          callouts: [{ ...circuit, wire: { awg: 16 }, fuseA: 5, relay: true, fuseDistanceMm: 120 }],
        },
        {
          ...current.steps[1],
          callouts: [
            { kind: "caution", signalWord: "WARNING", text: "Support the vehicle on rated stands before going under it." },
          ],
        },
      ],
      fitment: [{ variantId, status: "fits", note: null }],
    };
    expect((await sendJson(author, "PUT", path, fixed)).status).toBe(200);
    const submitted = await sendJson(author, "POST", `/api/guides/${created.id}/submit`, { changeSummary: "First version" });
    expect(submitted).toEqual({ status: 200, body: { state: "in-review", revisionId: created.draft.revisionId } });

    // Frozen: the editors have it.
    const frozen = await sendJson<ApiError>(author, "PUT", path, { ...fixed, version: fixed.version + 1 });
    expect(frozen.status).toBe(409);
    expect(frozen.body.error.message).toMatch(/with the editors/);
    const view = (await sendJson<DraftView>(author, "GET", path)).body;
    expect(view.revision.state).toBe("in-review");
    expect(view.guide.state).toBe("in-review");
    expect((await sendJson(author, "POST", `/api/guides/${created.id}/revision`)).status).toBe(409);
  });

  it("keeps another author, a reader and an editor out of someone's draft", async () => {
    const created = await create(author, { ...META, title: "Rear fog lamp, private draft" });
    const view = (await sendJson<DraftView>(author, "GET", `/api/guides/${created.id}/draft`)).body;
    for (const [who, client] of [
      ["author2", author2],
      ["reader", reader],
      ["editor", editor],
    ] as const) {
      const put = await sendJson<ApiError>(client, "PUT", `/api/guides/${created.id}/draft`, {
        ...view.draft,
        title: "Taken over",
      });
      expect(put.status, who).toBe(403);
      expect(put.body.error.fields, who).toBeUndefined();
      expect((await sendJson(client, "POST", `/api/guides/${created.id}/submit`, { changeSummary: "" })).status, who).toBe(403);
      expect((await sendJson(client, "POST", `/api/guides/${created.id}/revision`)).status, who).toBe(403);
    }
    expect((await sendJson(author2, "GET", `/api/guides/${created.id}/draft`)).status).toBe(403);
    expect((await sendJson(author2, "GET", `/api/guides/${created.id}/export?format=json`)).status).toBe(403);
    const after = (await sendJson<DraftView>(author, "GET", `/api/guides/${created.id}/draft`)).body;
    expect(after.draft).toEqual(view.draft);
  });

  it("refuses a photo another account uploaded, naming the field", async () => {
    const { mediaId } = await demoMaterial();
    const created = await create(author2, { ...META, title: "Rear fog lamp, borrowed photo" });
    const put = await sendJson<ApiError>(author2, "PUT", `/api/guides/${created.id}/draft`, {
      version: 1,
      ...META,
      steps: [{ title: "Fit the lamp", body: paragraph("Bolt it on."), photos: [{ mediaId, alt: "Lamp", caption: null }] }],
      fitment: [],
      parts: [],
      tools: [],
    });
    expect(put.status).toBe(400);
    expect(put.body.error.fields).toEqual({ "steps.0.photos.0.mediaId": expect.stringMatching(/another account/) });
  });
});

describe("rich text over HTTP", () => {
  it("names the step of a refused body, and drops __proto__ keys from what is stored", async () => {
    const created = await create(author, { ...META, title: "Rear fog lamp, hostile text" });
    const path = `/api/guides/${created.id}/draft`;
    const base = { version: 1, ...META, fitment: [], parts: [], tools: [] };
    const good = { title: "Plain step", body: paragraph("Fine.") };
    const evil = {
      title: "Sneaky step",
      body: {
        type: "doc",
        content: [
          {
            type: "paragraph",
            content: [{ type: "text", text: "x", marks: [{ type: "link", attrs: { href: "JaVa\tScRiPt:alert(1)" } }] }],
          },
        ],
      },
    };
    const refused = await sendJson<ApiError>(author, "PUT", path, { ...base, steps: [good, good, good, evil] });
    expect(refused.status).toBe(400);
    expect(Object.keys(refused.body.error.fields ?? {})).toEqual(["steps.3.body"]);
    expect(refused.body.error.fields?.["steps.3.body"]).toMatch(/^Step 4: .*scripts/);

    // Sent as raw text: JSON.stringify would not write a __proto__ key of an object literal.
    const raw = `{"version":1,"title":"${META.title}","summary":"${META.summary}","category":"lighting","difficulty":3,"minutes":90,
      "__proto__":{"isAdmin":true},"fitment":[],"parts":[],"tools":[],
      "steps":[{"title":"Step","body":{"type":"doc","content":[{"type":"paragraph","attrs":{"__proto__":{"x":1},"constructor":{"prototype":{"y":2}}},"content":[{"type":"text","text":"ok"}]}]}}]}`;
    const response = await author.request(path, { method: "PUT", headers: { "content-type": "application/json" }, body: raw });
    expect(response.status).toBe(200);
    const stored = (await sendJson<DraftView>(author, "GET", path)).body.draft.steps[0].body;
    expect(JSON.stringify(stored)).not.toMatch(/__proto__|constructor|prototype|isAdmin/);
  });

  it("refuses a body past the size limit with 413", async () => {
    const created = await create(author, { ...META, title: "Rear fog lamp, oversized" });
    const huge = JSON.stringify({
      version: 1,
      ...META,
      steps: [],
      fitment: [],
      parts: [],
      tools: [],
      padding: "x".repeat(2 * 1024 * 1024),
    });
    const response = await author.request(`/api/guides/${created.id}/draft`, {
      method: "PUT",
      headers: { "content-type": "application/json" },
      body: huge,
    });
    expect(response.status).toBe(413);
  });

  it("answers any JSON value sent as a draft with 200 or 400, never a 5xx (fast-check)", async () => {
    const created = await create(author, { ...META, title: "Rear fog lamp, property" });
    const path = `/api/guides/${created.id}/draft`;
    const shaped = fc.record({
      steps: fc.array(
        fc.record({ title: fc.string(), body: fc.jsonValue({ maxDepth: 4 }), photos: fc.jsonValue({ maxDepth: 2 }) }),
        { maxLength: 3 },
      ),
      fitment: fc.jsonValue({ maxDepth: 2 }),
      title: fc.oneof(fc.string(), fc.constant(META.title)),
    });
    const statuses = new Set<number>();
    await fc.assert(
      fc.asyncProperty(fc.oneof(fc.jsonValue(), shaped), async (value) => {
        const version = (await sendJson<DraftView>(author, "GET", path)).body.draft.version;
        const body =
          value && typeof value === "object" && !Array.isArray(value) && "steps" in value
            ? { ...META, parts: [], tools: [], ...value, version }
            : value;
        const answer = await sendJson(author, "PUT", path, body);
        statuses.add(answer.status);
        expect([200, 400]).toContain(answer.status);
      }),
      { numRuns: 120 },
    );
    expect(statuses.has(400)).toBe(true);
  }, 120_000);
});

describe("revisions of a published guide", () => {
  it("opens a copy while the published one stays live, wants a change summary, and shows the editor's note after changes are requested", async () => {
    const PUBLISHED_ID = 1;
    const page = await sendJson(reader, "GET", "/api/guides/kestrel-hood-auxiliary-lamps");
    expect(page.status).toBe(200);
    const opened = await sendJson<{ revisionId: number; version: number }>(
      author,
      "POST",
      `/api/guides/${PUBLISHED_ID}/revision`,
    );
    expect(opened.status).toBe(201);
    expect(opened.body.version).toBe(1);
    const again = await sendJson<{ revisionId: number }>(author, "POST", `/api/guides/${PUBLISHED_ID}/revision`);
    expect(again).toMatchObject({ status: 200, body: { revisionId: opened.body.revisionId } });
    expect(await sendJson(reader, "GET", "/api/guides/kestrel-hood-auxiliary-lamps")).toEqual(page);

    const view = (await sendJson<DraftView>(author, "GET", `/api/guides/${PUBLISHED_ID}/draft`)).body;
    expect(view.revision).toMatchObject({ id: opened.body.revisionId, state: "draft", number: 2 });
    expect(view.guide).toMatchObject({ state: "published", publishedRevisionId: 1, workingRevisionId: opened.body.revisionId });
    const noSummary = await sendJson<ApiError>(author, "POST", `/api/guides/${PUBLISHED_ID}/submit`, {});
    expect(noSummary.status).toBe(422);
    expect(noSummary.body.error.fields).toEqual({ changeSummary: expect.any(String) });
    expect(noSummary.body.error.missing).toEqual(["changeSummary"]);

    const submitted = await sendJson(author, "POST", `/api/guides/${PUBLISHED_ID}/submit`, {
      changeSummary: "Relay moved to the inner wing",
    });
    expect(submitted.status).toBe(200);
    const { getDb } = await import("~/db/client.server");
    const { requestChanges } = await import("~/models/review.server");
    const { findUserByEmail } = await import("~/models/users.server");
    const db = await getDb();
    const editorUser = await findUserByEmail(db, "editor@torqueleaf.test");
    if (!editorUser) throw new Error("no demo editor");
    await requestChanges(db, opened.body.revisionId, editorUser, { note: "Give the relay's mounting bolt a torque value." });
    const back = (await sendJson<DraftView>(author, "GET", `/api/guides/${PUBLISHED_ID}/draft`)).body;
    expect(back.revision).toMatchObject({ state: "draft", number: 3 });
    expect(back.reviewNote).toBe("Give the relay's mounting bolt a torque value.");
  });
});
