import { unzipSync, strFromU8 } from "fflate";
import { unit } from "mathjs";
import sharp from "sharp";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Db } from "~/db/client.server";
import { storedCallout } from "~/engine/callouts";
import type { DraftExport } from "~/models/guide-export.server";
import { type LoadedRevision, loadRevision } from "~/models/guides.server";
import { startAppServer } from "../support/app-server";
import { useTestDatabase } from "../support/base-db";
import type { TestClient } from "../support/http-client";
import { type ApiError, sendJson, signedIn } from "./authoring-support";

// The author's export (issue 11 §6) over real HTTP: the zip's Markdown against the stored guide,
// its photos read back from the local S3 stand-in, and the JSON's round trip through import.

let app: Awaited<ReturnType<typeof startAppServer>>;
let db: Db;
let author: TestClient;
let author2: TestClient;
let editor: TestClient;
let reader: TestClient;

/** The demo author's published guides (content-samples: the auxiliary lamps, the skid plate with an estimated torque). */
const LAMPS_ID = 1;
const SKID_PLATE_ID = 4;

beforeAll(async () => {
  useTestDatabase("authoring-export");
  app = await startAppServer();
  db = await (await import("~/db/client.server")).getDb();
  [author, author2, editor, reader] = await Promise.all(
    ["author", "author2", "editor", "reader"].map((name) => signedIn(app.origin, `${name}@torqueleaf.test`)),
  );
});
afterAll(async () => app?.stop());

async function loaded(guideId: number): Promise<LoadedRevision> {
  const guide = await db.query.guides.findFirst({ where: (g, { eq }) => eq(g.id, guideId) });
  const revision = guide && (await loadRevision(db, guide.workingRevisionId ?? guide.publishedRevisionId ?? 0));
  if (!revision) throw new Error(`demo guide ${guideId} has no revision`);
  return revision;
}

async function zipOf(client: TestClient, guideId: number) {
  const response = await client.get(`/api/guides/${guideId}/export?format=markdown`);
  expect(response.status).toBe(200);
  expect(response.headers.get("content-type")).toBe("application/zip");
  expect(response.headers.get("content-disposition")).toMatch(/^attachment; filename="[a-z0-9-]+\.zip"$/);
  return unzipSync(new Uint8Array(await response.arrayBuffer()));
}

/** The Markdown with its backslash escapes read back (CommonMark §2.4), so it compares with what the author typed. */
const unescaped = (markdown: string) => markdown.replace(/\\([\\`*_[\]<>|])/g, "$1");

/** mathjs names for the product's torque units; its unit definitions of lbf, ft and in are exact (NIST SP 811, App. B). */
const MATHJS_UNIT = { N·m: "N m", lbf·ft: "lbf ft", lbf·in: "lbf in" } as const;
/** Rounded as people read it in the export: one decimal, trailing zeros dropped. */
const shown = (value: number) => String(Number(value.toFixed(1)));

describe("Markdown export", () => {
  it.each([LAMPS_ID, SKID_PLATE_ID])(
    "writes every step title, torque in N·m and lbf·ft, and every caution's signal word (guide %i)",
    async (guideId) => {
      const revision = await loaded(guideId);
      const files = await zipOf(author, guideId);
      const markdown = unescaped(strFromU8(files["guide.md"]));

      for (const step of revision.steps) expect(markdown).toContain(step.title);
      const callouts = revision.steps.flatMap((s) => s.callouts.map(storedCallout));
      let torques = 0;
      for (const callout of callouts) {
        if (callout.kind === "torque" && callout.value !== undefined && callout.unit !== undefined) {
          const value = unit(callout.value, MATHJS_UNIT[callout.unit]);
          expect(markdown).toContain(`${shown(value.toNumber("N m"))} N·m`);
          expect(markdown).toContain(`${shown(value.toNumber("lbf ft"))} lbf·ft`);
          expect(markdown).toContain(`${shown(value.toNumber("lbf in"))} lbf·in`);
          torques++;
        }
        if (callout.kind === "torque" && callout.estimate) expect(markdown).toContain(`Torque: ${callout.fastener}`);
        if (callout.kind === "caution") expect(markdown).toContain(`**${callout.signalWord}**\n>\n> ${callout.text}`);
      }
      expect(torques).toBeGreaterThan(0);
      expect(callouts.some((c) => c.kind === "caution")).toBe(true);
      for (const part of revision.parts) expect(markdown).toContain(part.name);
      for (const tool of revision.tools) expect(markdown).toContain(`- ${tool.name}`);
      for (const row of revision.fitment) expect(markdown).toContain(row.variant.name);
      expect(markdown).toMatch(/vehicle maker's instructions/);
    },
  );

  it("holds each photo once, as a JPEG of one width read from the store, linked from guide.md", async () => {
    const revision = await loaded(LAMPS_ID);
    const files = await zipOf(author, LAMPS_ID);
    const markdown = strFromU8(files["guide.md"]);
    const photos = Object.keys(files).filter((name) => name.startsWith("photos/"));
    expect(photos).toHaveLength(revision.steps.flatMap((s) => s.photos).length);
    for (const name of photos) {
      expect(markdown).toContain(`](${name})`);
      const meta = await sharp(Buffer.from(files[name])).metadata();
      expect(meta.format).toBe("jpeg");
      expect(meta.width).toBe(960);
    }
    for (const photo of revision.steps.flatMap((s) => s.photos)) expect(unescaped(markdown)).toContain(`![${photo.alt}]`);
  });

  it("is for the author and the editors only", async () => {
    expect((await editor.get(`/api/guides/${LAMPS_ID}/export?format=markdown`)).status).toBe(200);
    expect((await author2.get(`/api/guides/${LAMPS_ID}/export?format=markdown`)).status).toBe(403);
    expect((await reader.get(`/api/guides/${LAMPS_ID}/export?format=json`)).status).toBe(403);
    expect((await fetch(`${app.origin}/api/guides/${LAMPS_ID}/export?format=json`)).status).toBe(401);
    const bad = await sendJson<ApiError>(author, "GET", `/api/guides/${LAMPS_ID}/export?format=pdf`);
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields).toHaveProperty("format");
  });
});

describe("JSON export and import", () => {
  it("round-trips: export → import → export is identical apart from ids", async () => {
    const first = await sendJson<DraftExport>(author, "GET", `/api/guides/${LAMPS_ID}/export?format=json`);
    expect(first.status).toBe(200);
    expect(first.body).toMatchObject({ format: "torqueleaf-draft", formatVersion: 1 });
    expect(first.body).not.toHaveProperty("version");
    const imported = await sendJson<{ id: number; slug: string; draft: { revisionId: number; version: number } }>(
      author,
      "POST",
      "/api/guides/import",
      first.body,
    );
    expect(imported.status).toBe(201);
    expect(imported.body.id).not.toBe(LAMPS_ID);
    const view = await sendJson<{ guide: { authorId: number; state: string } }>(
      author,
      "GET",
      `/api/guides/${imported.body.id}/draft`,
    );
    expect(view.body.guide).toMatchObject({ authorId: (await author.me())?.id, state: "draft" });
    const second = await sendJson<DraftExport>(author, "GET", `/api/guides/${imported.body.id}/export?format=json`);
    expect(second.body).toEqual(first.body);
  });

  it("refuses someone else's photos, naming each field, and creates nothing", async () => {
    const exported = (await sendJson<DraftExport>(author, "GET", `/api/guides/${LAMPS_ID}/export?format=json`)).body;
    const before = (await db.query.guides.findMany()).length;
    const refused = await sendJson<ApiError>(author2, "POST", "/api/guides/import", exported);
    expect(refused.status).toBe(400);
    const photoFields = exported.steps.flatMap((s, i) => s.photos.map((_, j) => `steps.${i}.photos.${j}.mediaId`));
    expect(Object.keys(refused.body.error.fields ?? {}).sort()).toEqual(photoFields.sort());
    expect((await db.query.guides.findMany()).length).toBe(before);
  });

  it("refuses readers, and bodies that are not a draft export", async () => {
    const exported = (await sendJson<DraftExport>(author, "GET", `/api/guides/${LAMPS_ID}/export?format=json`)).body;
    expect((await sendJson(reader, "POST", "/api/guides/import", exported)).status).toBe(403);
    const wrong = await sendJson<ApiError>(author, "POST", "/api/guides/import", { ...exported, format: "something-else" });
    expect(wrong.status).toBe(400);
    expect(wrong.body.error.fields).toHaveProperty("format");
    const newer = await sendJson<ApiError>(author, "POST", "/api/guides/import", { ...exported, formatVersion: 2 });
    expect(newer.body.error.fields).toHaveProperty("formatVersion");
  });
});
