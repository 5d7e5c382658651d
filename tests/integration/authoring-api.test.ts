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
