import { eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import type { Db } from "~/db/client.server";
import { cautionSignoffs, media, type User } from "~/db/schema";
import { createGuide, saveDraft } from "~/models/guides.server";
import { uploadPhoto } from "~/models/media.server";
import {
  acknowledgeFinding,
  approveRevision,
  requestChanges,
  revisionCautions,
  signOffCaution,
  startNextRevision,
  submitRevision,
} from "~/models/review.server";
import type { Storage } from "~/services/storage.server";
import { useTestDatabase } from "../support/base-db";
import { currentRevision, demoUser, draftFrom, guideBySlug, rejection } from "./revision-fixtures";

// Who may change what (design/api.md: a draft's owner saves and submits it; an editor who is not
// the author reviews it), checked in the model functions themselves.

let db: Db;
let storage: Storage;
let author: User;
let author2: User;
let reader: User;
let editor: User;
let admin: User;

beforeAll(async () => {
  useTestDatabase("revision-permissions");
  db = await (await import("~/db/client.server")).getDb();
  storage = (await import("~/services/storage.server")).getStorage();
  author = await demoUser(db, "author@torqueleaf.test");
  author2 = await demoUser(db, "author2@torqueleaf.test");
  reader = await demoUser(db, "reader@torqueleaf.test");
  editor = await demoUser(db, "editor@torqueleaf.test");
  admin = await demoUser(db, "admin@torqueleaf.test");
});

// Written by author@ in the demo data.
const DRAFT_SLUG = "fjell-f3-hardwired-dash-camera";
const PUBLISHED_SLUG = "kestrel-hood-auxiliary-lamps";

describe("photos in a draft", () => {
  it("refuses another author's photo with 400 naming the field, and saves nothing", async () => {
    // author2's own guide, with one of author@'s uploads slipped into step 1.
    const theirs = await db.query.media.findFirst({ where: eq(media.ownerId, author.id) });
    const own = await db.query.media.findFirst({ where: eq(media.ownerId, author2.id) });
    if (!theirs || !own) throw new Error("the demo data has no photos for both authors");
    const created = await createGuide(db, author2, {
      title: "Roof bars, second set",
      summary: "Fits a second set of crossbars.",
      category: "racks",
      difficulty: 2,
      minutes: 45,
    });
    const step = (mediaIds: number[]) => ({
      title: "Place the feet",
      body: { type: "doc", content: [{ type: "paragraph", content: [{ type: "text", text: "Set the feet on the rails." }] }] },
      liftsVehicle: false,
      disconnectsBattery: false,
      photos: mediaIds.map((mediaId) => ({ mediaId, alt: "Crossbar foot on the roof rail", caption: null })),
      callouts: [],
    });
    const draft = {
      version: created.draft.version,
      title: "Roof bars, second set",
      summary: "Fits a second set of crossbars.",
      category: "racks" as const,
      difficulty: 2,
      minutes: 45,
      fitment: [],
      parts: [],
      tools: [],
    };
    const refused = await rejection(
      saveDraft(db, created.id, author2, { ...draft, steps: [step([own.id]), step([own.id, theirs.id])] }),
    );
    expect(refused).toMatchObject({ status: 400, code: "invalid" });
    expect(Object.keys(refused.fields ?? {})).toEqual(["steps.1.photos.1.mediaId"]);
    const after = await currentRevision(db, created.slug);
    expect(after.revision.version).toBe(created.draft.version);
    expect(after.steps).toHaveLength(0);

    // Their own photo alone is fine.
    await saveDraft(db, created.id, author2, { ...draft, steps: [step([own.id])] });
    expect((await currentRevision(db, created.slug)).steps[0].photos.map((p) => p.mediaId)).toEqual([own.id]);
  });

  it("keeps the existing refusal for a photo id nobody uploaded", async () => {
    const guide = await guideBySlug(db, DRAFT_SLUG);
    const input = draftFrom(await currentRevision(db, DRAFT_SLUG));
    input.steps[0].photos = [{ mediaId: 999_999, alt: "A photo that does not exist", caption: null }];
    const refused = await rejection(saveDraft(db, guide.id, author, input));
    expect(refused).toMatchObject({ status: 400, fields: { "steps.0.photos.0.mediaId": "This photo was not uploaded" } });
  });

  it("lets only an account that may upload add photos", async () => {
    const refused = await rejection(uploadPhoto(db, storage, reader, Buffer.from("not even an image"), "x.jpg"));
    expect(refused).toMatchObject({ status: 403 });
    expect(await db.$count(media, eq(media.ownerId, reader.id))).toBe(0);
  });
});

describe("someone else's draft", () => {
  it("cannot be saved, submitted or continued by a reader, another author or an editor", async () => {
    const guide = await guideBySlug(db, DRAFT_SLUG);
    const before = await currentRevision(db, DRAFT_SLUG);
    const input = { ...draftFrom(before), title: "Taken over" };
    for (const actor of [reader, author2, editor, admin]) {
      expect((await rejection(saveDraft(db, guide.id, actor, input))).status, actor.email).toBe(403);
      expect((await rejection(submitRevision(db, guide.id, actor, "Not mine"))).status, actor.email).toBe(403);
    }
    const published = await guideBySlug(db, PUBLISHED_SLUG);
    for (const actor of [reader, author2]) {
      expect((await rejection(startNextRevision(db, published.id, actor))).status, actor.email).toBe(403);
    }
    expect((await guideBySlug(db, PUBLISHED_SLUG)).workingRevisionId).toBeNull();
    const after = await currentRevision(db, DRAFT_SLUG);
    expect(after.revision).toMatchObject({ title: before.revision.title, version: before.revision.version, state: "draft" });
  });

  it("cannot be started by a reader at all", async () => {
    const refused = await rejection(
      createGuide(db, reader, { title: "A reader's guide", summary: "", category: "power", difficulty: 1, minutes: 10 }),
    );
    expect(refused).toMatchObject({ status: 403 });
  });
});

describe("reviewing", () => {
  it("refuses an editor every decision on their own guide, and lets another editor decide", async () => {
    // The editor writes a guide of her own (editors hold every author permission).
    const created = await createGuide(db, editor, {
      title: "Editor's own dash camera feed",
      summary: "A fused feed for a dash camera from the cabin fuse box.",
      category: "electronics",
      difficulty: 2,
      minutes: 60,
    });
    const source = await currentRevision(db, DRAFT_SLUG);
    const input = draftFrom(source);
    // Her own draft may show only her own photos: none here.
    await saveDraft(db, created.id, editor, {
      ...input,
      title: "Editor's own dash camera feed",
      version: created.draft.version,
      steps: input.steps.map((s) => ({ ...s, photos: [] })),
    });
    const { revisionId } = await submitRevision(db, created.id, editor, "First version");
    const stored = await db.query.findings.findMany({ where: (f, { eq }) => eq(f.revisionId, revisionId) });
    const cautions = await revisionCautions(db, revisionId);
    expect(cautions.length).toBeGreaterThan(0);

    const attempts = [
      () => signOffCaution(db, revisionId, editor, { cautionId: cautions[0].id }),
      () => requestChanges(db, revisionId, editor, { note: "Looks good to me, myself." }),
      () => approveRevision(db, revisionId, editor),
      ...stored.map((f) => () => acknowledgeFinding(db, revisionId, editor, { findingId: f.id, note: "Fine by me" })),
    ];
    for (const attempt of attempts) {
      expect(await rejection(attempt())).toMatchObject({ status: 403, message: "Editors cannot review their own guides." });
    }
    for (const actor of [author, reader]) {
      expect((await rejection(approveRevision(db, revisionId, actor))).status).toBe(403);
    }
    expect(await db.$count(cautionSignoffs, eq(cautionSignoffs.calloutId, cautions[0].id))).toBe(0);

    // Another editor (the admin holds every editor permission) may.
    for (const caution of cautions) await signOffCaution(db, revisionId, admin, { cautionId: caution.id });
    expect(stored.filter((f) => f.severity === "blocking")).toEqual([]);
    await approveRevision(db, revisionId, admin);
    expect((await guideBySlug(db, created.slug)).state).toBe("published");
  });
});
