import { eq, sql } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import type { Db } from "~/db/client.server";
import { findings, guides, reviews, revisions } from "~/db/schema";
import type { User } from "~/db/schema";
import { createGuide, loadRevision, saveDraft } from "~/models/guides.server";
import { getPublishedGuide } from "~/models/library.server";
import {
  acknowledgeFinding,
  approveRevision,
  decideReview,
  requestChanges,
  revisionCautions,
  signOffCaution,
  startNextRevision,
  submitRevision,
} from "~/models/review.server";
import { reviewDecisionSchema } from "~/models/review-input";
import type { Storage } from "~/services/storage.server";
import { useTestDatabase } from "../support/base-db";
import { currentRevision, demoUser, draftFrom, guideBySlug, rejection } from "./revision-fixtures";

// The lifecycle of docs/decisions/0003-revision-model.md, through the model functions the app and
// the seed use, against a copy of the demo database. Status codes follow design/api.md.

let db: Db;
let storage: Pick<Storage, "publicUrl">;
let author: User;
let editor: User;

beforeAll(async () => {
  useTestDatabase("revision-lifecycle");
  db = await (await import("~/db/client.server")).getDb();
  storage = (await import("~/services/storage.server")).getStorage();
  author = await demoUser(db, "author@torqueleaf.test");
  editor = await demoUser(db, "editor@torqueleaf.test");
});

const DRAFT_SLUG = "fjell-f3-hardwired-dash-camera";
const IN_REVIEW_SLUG = "fjell-phev-rear-usb-charger";
const PUBLISHED_SLUG = "kestrel-hood-auxiliary-lamps";

/** A new guide by the demo author carrying a copy of a published demo guide's content (her own photos). */
async function guideLike(slug: string, title: string, change?: (input: ReturnType<typeof draftFrom>) => void) {
  const source = await currentRevision(db, slug);
  const created = await createGuide(db, author, { ...source.revision, title });
  const input = { ...draftFrom(source), title, version: created.draft.version };
  change?.(input);
  await saveDraft(db, created.id, author, input);
  return created;
}

describe("saving a draft", () => {
  it("moves the version on by one, and refuses a stale version with 409 without changing anything", async () => {
    const guide = await guideBySlug(db, DRAFT_SLUG);
    const input = draftFrom(await currentRevision(db, DRAFT_SLUG));
    const saved = await saveDraft(db, guide.id, author, { ...input, title: `${input.title}, second pass` });
    expect(saved.version).toBe(input.version + 1);

    // A second tab still holding the old version.
    const stale = await rejection(saveDraft(db, guide.id, author, { ...input, title: "Lost update", steps: [] }));
    expect(stale).toMatchObject({ status: 409, code: "stale-version" });
    const after = await currentRevision(db, DRAFT_SLUG);
    expect(after.revision.title).toBe(`${input.title}, second pass`);
    expect(after.revision.version).toBe(saved.version);
    expect(after.steps).toHaveLength(input.steps.length);
  });

  it("refuses a submitted revision with 409 even with the right version", async () => {
    const guide = await guideBySlug(db, IN_REVIEW_SLUG);
    const before = await currentRevision(db, IN_REVIEW_SLUG);
    expect(before.revision.state).toBe("in-review");
    const frozen = await rejection(saveDraft(db, guide.id, author, { ...draftFrom(before), tools: [] }));
    expect(frozen).toMatchObject({ status: 409, code: "wrong-state" });
    const after = await currentRevision(db, IN_REVIEW_SLUG);
    expect(after.tools).toHaveLength(before.tools.length);
    expect(after.revision.version).toBe(before.revision.version);
  });
});

describe("submitting", () => {
  it("refuses an incomplete draft with 422 and lists what is missing", async () => {
    const created = await createGuide(db, author, {
      title: "Bare skid plate bracket",
      summary: "Short",
      category: "protection",
      difficulty: 2,
      minutes: 30,
    });
    const empty = await rejection(submitRevision(db, created.id, author, "First version"));
    expect(empty).toMatchObject({ status: 422, code: "incomplete", extra: { missing: ["summary", "steps", "fitment"] } });

    const variant = await db.query.variants.findFirst();
    if (!variant) throw new Error("the demo catalogue has no variants");
    await saveDraft(db, created.id, author, {
      version: created.draft.version,
      title: "Bare skid plate bracket",
      summary: "Bolts a plain bracket under the front bumper.",
      category: "protection",
      difficulty: 2,
      minutes: 30,
      steps: [
        {
          title: "Offer up the bracket",
          body: { type: "doc", content: [{ type: "paragraph" }] },
          liftsVehicle: false,
          disconnectsBattery: false,
          photos: [],
          callouts: [],
        },
      ],
      fitment: [{ variantId: variant.id, status: "fits", note: null }],
      parts: [],
      tools: [],
    });
    const blankStep = await rejection(submitRevision(db, created.id, author, "First version"));
    expect(blankStep).toMatchObject({ status: 422, extra: { missing: ["steps.body"] } });
    const revision = await db.query.revisions.findFirst({ where: eq(revisions.id, created.draft.revisionId) });
    expect(revision?.state).toBe("draft");
  });
});

describe("approval", () => {
  it("is refused with 409 while a caution is unsigned, and publishes once every caution is signed", async () => {
    const created = await guideLike(PUBLISHED_SLUG, "Auxiliary lamps, second fitting");
    const { revisionId } = await submitRevision(db, created.id, author, "First version");
    const cautions = await revisionCautions(db, revisionId);
    expect(cautions.length).toBeGreaterThan(1);

    const unsigned = await rejection(approveRevision(db, revisionId, editor));
    expect(unsigned).toMatchObject({
      status: 409,
      code: "not-ready",
      extra: { blockingFindings: 0, unsignedCautions: cautions.map((c) => c.id) },
    });

    const [last, ...rest] = cautions;
    for (const caution of rest) await signOffCaution(db, revisionId, editor, { cautionId: caution.id });
    const oneLeft = await rejection(approveRevision(db, revisionId, editor));
    expect(oneLeft).toMatchObject({ status: 409, extra: { unsignedCautions: [last.id] } });

    // Through the dispatcher, as the review desk will call it with a parsed form.
    await decideReview(db, revisionId, editor, reviewDecisionSchema.parse({ intent: "sign-off", cautionId: String(last.id) }));
    await decideReview(db, revisionId, editor, { intent: "approve" });
    const guide = await guideBySlug(db, created.slug);
    expect(guide).toMatchObject({ state: "published", publishedRevisionId: revisionId, workingRevisionId: null });
    expect((await getPublishedGuide(db, storage, created.slug))?.title).toBe("Auxiliary lamps, second fitting");
  });

  it("is refused with 409 while a blocking finding remains, which no acknowledgement clears", async () => {
    const raise = (input: ReturnType<typeof draftFrom>) => {
      input.steps.push({
        title: "Raise the front",
        body: { type: "doc", content: [{ type: "paragraph", content: [{ type: "text", text: "Jack up the front." }] }] },
        liftsVehicle: true,
        disconnectsBattery: false,
        photos: [],
        callouts: [],
      });
    };
    // engine/rules.ts: a step that lifts the vehicle needs a caution about stands (common practice).
    // The author can fix that, so submitting refuses it and says where.
    const unsupported = await guideLike(PUBLISHED_SLUG, "Auxiliary lamps with the front raised", raise);
    const refusedSubmit = await rejection(submitRevision(db, unsupported.id, author, "First version"));
    expect(refusedSubmit).toMatchObject({ status: 422, extra: { missing: ["findings"] } });
    expect(Object.keys(refusedSubmit.fields ?? {})).toEqual([expect.stringMatching(/^steps\.\d+\.callouts$/)]);

    // A blocking finding can still be on the desk: one stored with the revision after it was
    // submitted (a rule that changed meanwhile). Approval must not pass it either.
    const created = await guideLike(PUBLISHED_SLUG, "Auxiliary lamps, checked again");
    const { revisionId } = await submitRevision(db, created.id, author, "First version");
    await db.insert(findings).values({
      revisionId,
      rule: "support-caution-missing",
      severity: "blocking",
      stepIndex: 0,
      message: "Step 1 lifts the vehicle but carries no caution about supporting it on stands.",
    });
    const stored = await db.query.findings.findMany({ where: eq(findings.revisionId, revisionId) });
    const blocking = stored.filter((f) => f.severity === "blocking");
    expect(blocking.map((f) => f.rule)).toContain("support-caution-missing");

    for (const caution of await revisionCautions(db, revisionId)) {
      await signOffCaution(db, revisionId, editor, { cautionId: caution.id });
    }
    const refused = await rejection(approveRevision(db, revisionId, editor));
    expect(refused).toMatchObject({
      status: 409,
      code: "not-ready",
      extra: { blockingFindings: blocking.length, unsignedCautions: [] },
    });
    const acknowledged = await rejection(
      acknowledgeFinding(db, revisionId, editor, { findingId: blocking[0].id, note: "Looks fine to me" }),
    );
    expect(acknowledged).toMatchObject({ status: 409, code: "blocking" });
    expect((await guideBySlug(db, created.slug)).state).toBe("in-review");
  });
});

describe("requesting changes", () => {
  const REVISION_CHILDREN = ["steps", "fitment", "parts", "tools"];
  const STEP_CHILDREN = ["callouts", "step_photos"];
  /** Identity and review bookkeeping of the revision row: the only columns a copy may not carry over. */
  const REVISION_OWN = [
    "id",
    "number",
    "state",
    "version",
    "created_by_id",
    "change_summary",
    "submitted_at",
    "reviewed_at",
    "reviewed_by_id",
    "published_at",
    "created_at",
    "updated_at",
  ];

  const columnsOf = async (table: string) =>
    (await db.all<{ name: string }>(sql.raw(`PRAGMA table_info(${table})`))).map((c) => c.name);

  /**
   * Every column of every child table, read from the database itself, less only the row id and the
   * link to the revision or step (which a copy must change). Steps are matched by position.
   */
  async function contentOf(revisionId: number) {
    const id = Number(revisionId);
    const out: Record<string, Record<string, unknown>[]> = {};
    for (const table of REVISION_CHILDREN) {
      const columns = (await columnsOf(table)).filter((c) => c !== "id" && c !== "revision_id");
      const list = columns.map((c) => `"${c}"`).join(", ");
      out[table] = await db.all(sql.raw(`SELECT ${list} FROM ${table} WHERE revision_id = ${id} ORDER BY ${list}`));
    }
    for (const table of STEP_CHILDREN) {
      const columns = (await columnsOf(table)).filter((c) => c !== "id" && c !== "step_id");
      const list = ["s.position AS step_position", ...columns.map((c) => `t."${c}"`)].join(", ");
      out[table] = await db.all(
        sql.raw(`SELECT ${list} FROM ${table} t JOIN steps s ON s.id = t.step_id WHERE s.revision_id = ${id}
          ORDER BY ${columns.map((_, i) => i + 1).join(", ")}, ${columns.length + 1}`),
      );
    }
    const own = (await columnsOf("revisions")).filter((c) => !REVISION_OWN.includes(c));
    [out.revision] = await db.all(sql.raw(`SELECT ${own.map((c) => `"${c}"`).join(", ")} FROM revisions WHERE id = ${id}`));
    return out;
  }

  it("keeps the reviewed revision as it was and copies it column for column into the author's new draft", async () => {
    const guide = await guideBySlug(db, IN_REVIEW_SLUG);
    const reviewedId = guide.workingRevisionId;
    if (!reviewedId) throw new Error("the demo in-review guide has no working revision");
    const before = await contentOf(reviewedId);
    for (const table of [...REVISION_CHILDREN, ...STEP_CHILDREN]) expect(before[table].length, table).toBeGreaterThan(0);
    expect(Object.keys(before.revision)).toEqual(expect.arrayContaining(["title", "summary", "category", "minutes"]));

    await requestChanges(db, reviewedId, editor, { note: "Add the fuse rating to step 3, please." });

    const after = await guideBySlug(db, IN_REVIEW_SLUG);
    expect(after.state).toBe("changes-requested");
    const draftId = after.workingRevisionId;
    expect(draftId).not.toBe(reviewedId);
    if (!draftId) throw new Error("no new draft");
    expect(await contentOf(draftId)).toEqual(before);
    expect(await contentOf(reviewedId)).toEqual(before);

    const [reviewed, draft] = await Promise.all([loadRevision(db, reviewedId), loadRevision(db, draftId)]);
    expect(reviewed?.revision).toMatchObject({ state: "changes-requested", reviewedById: editor.id });
    expect(draft?.revision).toMatchObject({ state: "draft", version: 1, number: (reviewed?.revision.number ?? 0) + 1 });
    const notes = await db.query.reviews.findMany({ where: eq(reviews.revisionId, reviewedId) });
    expect(notes.map((r) => r.decision)).toEqual(["request-changes"]);

    // The author carries on in the copy, and can submit again.
    if (!draft) throw new Error("no new draft");
    await saveDraft(db, guide.id, author, draftFrom(draft));
    expect((await submitRevision(db, guide.id, author, "Fuse rating added")).revisionId).toBe(draftId);
  });
});

describe("drafting the next revision of a published guide", () => {
  it("keeps the published revision live on the guide page while the copy changes", async () => {
    const guide = await guideBySlug(db, PUBLISHED_SLUG);
    const page = await getPublishedGuide(db, storage, PUBLISHED_SLUG);
    expect(page).not.toBeNull();

    const draftId = await startNextRevision(db, guide.id, author);
    expect(draftId).not.toBe(guide.publishedRevisionId);
    expect(await startNextRevision(db, guide.id, author)).toBe(draftId);
    if (!draftId) throw new Error("no draft started");
    const draft = await loadRevision(db, draftId);
    if (!draft) throw new Error("no draft started");
    const input = draftFrom(draft);
    await saveDraft(db, guide.id, author, { ...input, title: "Auxiliary lamps, rewritten", steps: input.steps.slice(1) });

    expect(await getPublishedGuide(db, storage, PUBLISHED_SLUG)).toEqual(page);
    const row = await db.query.guides.findFirst({ where: eq(guides.id, guide.id) });
    expect(row).toMatchObject({ state: "published", publishedRevisionId: guide.publishedRevisionId, workingRevisionId: draftId });
    const published = await db.query.revisions.findFirst({ where: eq(revisions.id, guide.publishedRevisionId ?? 0) });
    expect(published?.state).toBe("published");
  });
});

describe("review decisions as input", () => {
  it("reads each intent, coerces form ids and limits notes", () => {
    expect(reviewDecisionSchema.parse({ intent: "acknowledge", findingId: "12", note: " Checked the run length " })).toEqual({
      intent: "acknowledge",
      findingId: 12,
      note: "Checked the run length",
    });
    expect(reviewDecisionSchema.parse({ intent: "approve" })).toEqual({ intent: "approve" });
    const long = reviewDecisionSchema.safeParse({ intent: "request-changes", note: "x".repeat(2001) });
    expect(long.success).toBe(false);
    expect(long.error?.issues[0].path).toEqual(["note"]);
    expect(reviewDecisionSchema.safeParse({ intent: "request-changes", note: "ok" }).success).toBe(false);
    expect(reviewDecisionSchema.safeParse({ intent: "publish-anyway" }).success).toBe(false);
    expect(reviewDecisionSchema.safeParse({ intent: "sign-off", cautionId: "abc" }).success).toBe(false);
  });
});
