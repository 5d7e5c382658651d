import { plainText as text } from "../support/http-client";
import { and, eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Db } from "~/db/client.server";
import { auditLog, outbox, revisions, type User } from "~/db/schema";
import { createGuide, saveDraft } from "~/models/guides.server";
import type { ReviewDeskView } from "~/models/review-desk.server";
import { revisionCautions, signOffCaution, submitRevision } from "~/models/review.server";
import { startAppServer } from "../support/app-server";
import { useTestDatabase } from "../support/base-db";
import type { TestClient } from "../support/http-client";
import { type ApiError, sendJson, signedIn } from "./authoring-support";
import { currentRevision, demoUser, draftFrom, guideBySlug } from "./revision-fixtures";

// The review desk of design/api.md over real HTTP: the queue, a revision's page and JSON, every
// decision, the author's view of the comments, 403 on an editor's own guide, 409 for the second of
// two editors, 410 after unpublishing, the outbox rows each change writes. The development server
// runs on a copy of the demo database, which this file also reads and writes directly.

let app: Awaited<ReturnType<typeof startAppServer>>;
let db: Db;
let editor: TestClient;
let admin: TestClient;
let author: TestClient;
let reader: TestClient;
let authorUser: User;
let editorUser: User;

const IN_REVIEW_SLUG = "fjell-phev-rear-usb-charger";
const PUBLISHED_SLUG = "kestrel-hood-auxiliary-lamps";

beforeAll(async () => {
  useTestDatabase("review-desk");
  app = await startAppServer();
  db = await (await import("~/db/client.server")).getDb();
  [editor, admin, author, reader] = await Promise.all(
    ["editor", "admin", "author", "reader"].map((name) => signedIn(app.origin, `${name}@torqueleaf.test`)),
  );
  authorUser = await demoUser(db, "author@torqueleaf.test");
  editorUser = await demoUser(db, "editor@torqueleaf.test");
});
afterAll(async () => app?.stop());

/** A new guide by `by` with a copy of a published demo guide's content, submitted for review. */
async function submittedLike(by: User, title: string, change?: (input: ReturnType<typeof draftFrom>) => void) {
  const source = await currentRevision(db, PUBLISHED_SLUG);
  const created = await createGuide(db, by, { ...source.revision, title });
  const input = { ...draftFrom(source), title, version: created.draft.version };
  // Photos stay their uploader's: another account's guide carries none.
  if (by.id !== authorUser.id) input.steps = input.steps.map((s) => ({ ...s, photos: [] }));
  change?.(input);
  await saveDraft(db, created.id, by, input);
  const { revisionId } = await submitRevision(db, created.id, by, "");
  return { ...created, revisionId };
}

async function signAll(revisionId: number) {
  for (const c of await revisionCautions(db, revisionId)) await signOffCaution(db, revisionId, editorUser, { cautionId: c.id });
}

const decide = (client: TestClient, revisionId: number, body: unknown) =>
  sendJson<ApiError & { ok?: boolean; state?: string }>(client, "POST", `/api/review/${revisionId}`, body);

const mailsFor = (userId: number, kind: string) =>
  db.query.outbox.findMany({ where: and(eq(outbox.userId, userId), eq(outbox.kind, kind as "account")) });

describe("the queue", () => {
  it("lists revisions in review oldest first with their counts, marks an editor's own guide, and filters by the address", async () => {
    const own = await submittedLike(editorUser, "Auxiliary lamps, the editor's own fitting");
    const queue = await sendJson<{ items: ReviewDeskQueueItem[]; vehicles: { key: string }[]; total: number }>(
      editor,
      "GET",
      "/api/review/queue",
    );
    expect(queue.status).toBe(200);
    const { items } = queue.body;
    const times = items.map((i) => new Date(i.submittedAt).getTime());
    expect(times).toEqual([...times].sort((a, b) => a - b));
    const demo = items.find((i) => i.guide.slug === IN_REVIEW_SLUG);
    // content-samples/guides/fjell-phev-rear-usb-charger.ts: two cautions, two warnings, nothing blocking.
    expect(demo).toMatchObject({ blocking: 0, unsignedCautions: 2, cautions: 2, openWarnings: 2, ownGuide: false });
    expect(demo?.author.name).toBeTruthy();
    expect(demo?.vehicles.map((v) => v.key)).toEqual(["norvik.fjell"]);
    expect(items.find((i) => i.revisionId === own.revisionId)).toMatchObject({ ownGuide: true });
    // The admin (another editor) may review it.
    const asAdmin = await sendJson<{ items: ReviewDeskQueueItem[] }>(admin, "GET", "/api/review/queue");
    expect(asAdmin.body.items.find((i) => i.revisionId === own.revisionId)).toMatchObject({ ownGuide: false });

    const kestrel = await sendJson<{ items: ReviewDeskQueueItem[] }>(editor, "GET", "/api/review/queue?vehicle=calder.kestrel");
    expect(kestrel.body.items.map((i) => i.revisionId)).toEqual([own.revisionId]);
    const blocking = await sendJson<{ items: ReviewDeskQueueItem[] }>(editor, "GET", "/api/review/queue?blocking=1");
    expect(blocking.body.items).toEqual([]);

    const page = await editor.get("/review?vehicle=norvik.fjell");
    expect(page.status).toBe(200);
    const shown = text(await page.text());
    expect(shown).toContain("USB-C charger for the rear seats");
    expect(shown).not.toContain("the editor's own fitting");
    expect(text(await (await editor.get("/review")).text())).toContain("Your guide: another editor reviews it");
  });

  it("is for editors only, checked on the server", async () => {
    expect((await sendJson(reader, "GET", "/api/review/queue")).status).toBe(403);
    expect((await sendJson(author, "GET", "/api/review/queue")).status).toBe(403);
    expect((await fetch(`${app.origin}/api/review/queue`)).status).toBe(401);
    expect((await author.get("/review")).status).toBe(403);
    expect((await fetch(`${app.origin}/review`, { redirect: "manual" })).status).toBe(302);
    const demo = await guideBySlug(db, IN_REVIEW_SLUG);
    expect((await sendJson(author, "GET", `/api/review/${demo.workingRevisionId}`)).status).toBe(403);
    expect((await decide(reader, demo.workingRevisionId ?? 0, { intent: "approve" })).status).toBe(403);
  });
});

type ReviewDeskQueueItem = {
  revisionId: number;
  submittedAt: string;
  guide: { slug: string };
  author: { name: string };
  vehicles: { key: string }[];
  blocking: number;
  unsignedCautions: number;
  cautions: number;
  openWarnings: number;
  ownGuide: boolean;
};
type ViewJson = ReviewDeskView & { diff: NonNullable<ReviewDeskView["diff"]> | null };

describe("a revision under review", () => {
  it("shows the reader's view beside findings with their sources, cautions, and takes each decision to publication", async () => {
    const demo = await guideBySlug(db, IN_REVIEW_SLUG);
    const revisionId = demo.workingRevisionId ?? 0;
    const got = await sendJson<ViewJson>(editor, "GET", `/api/review/${revisionId}`);
    expect(got.status).toBe(200);
    const view = got.body;
    expect(view.revision).toMatchObject({ id: revisionId, state: "in-review", guide: { slug: IN_REVIEW_SLUG } });
    expect(view.findings.map((f) => [f.rule, f.severity, f.status])).toEqual([
      ["fuse-above-ampacity", "warning", "open"],
      ["battery-disconnect-missing", "warning", "open"],
    ]);
    expect(view.findings[0].numbers).toMatchObject({ fuseA: 15 });
    expect(view.cautions.map((c) => c.signalWord)).toEqual(["WARNING", "CAUTION"]);
    expect(view.diff).toBeNull();
    expect(view.can).toEqual({ review: true, decide: true, unpublish: false });

    const page = text(await (await editor.get(`/review/${revisionId}`)).text());
    expect(page).toContain("Read the high-voltage precautions");
    expect(page).toContain("fuse-above-ampacity");
    expect(page).toContain("Sign off this wording");

    // Approval waits for both cautions, and says what remains.
    const early = await decide(editor, revisionId, { intent: "approve" });
    expect(early.status).toBe(409);
    expect(early.body.error).toMatchObject({ code: "not-ready", blockingFindings: 0 });
    expect(early.body.error.message).toContain("2 cautions without a sign-off");

    // Malformed decisions: 400 naming the field, nothing changed.
    const noNote = await decide(editor, revisionId, { intent: "acknowledge", findingId: view.findings[0].id });
    expect(noNote.status).toBe(400);
    expect(noNote.body.error.fields).toHaveProperty("note");
    const noIntent = await decide(editor, revisionId, { findingId: 1 });
    expect(noIntent.status).toBe(400);
    expect(noIntent.body.error.fields).toHaveProperty("intent");
    const badId = await decide(editor, revisionId, { intent: "sign-off", cautionId: "first" });
    expect(badId.status).toBe(400);
    expect(badId.body.error.fields).toHaveProperty("cautionId");
    const badStep = await decide(editor, revisionId, { intent: "comment", stepIndex: 99, body: "Which step?" });
    expect(badStep.status).toBe(400);
    expect(badStep.body.error.fields).toHaveProperty("stepIndex");
    const notJson = await editor.request(`/api/review/${revisionId}`, { method: "POST", body: "intent=approve" });
    expect(notJson.status).toBe(415);
    const broken = await editor.request(`/api/review/${revisionId}`, {
      method: "POST",
      headers: { "content-type": "application/json" },
      body: "{",
    });
    expect(broken.status).toBe(400);
    expect((await sendJson(editor, "GET", "/api/review/not-a-number")).status).toBe(404);

    for (const f of view.findings) {
      const ack = await decide(editor, revisionId, { intent: "acknowledge", findingId: f.id, note: "Short cabin run, checked." });
      expect(ack.status).toBe(200);
    }
    // The first caution over the API, the second through the page's form.
    expect((await decide(editor, revisionId, { intent: "sign-off", cautionId: view.cautions[0].id })).status).toBe(200);
    const signed = await editor.post(`/review/${revisionId}`, { intent: "sign-off", cautionId: String(view.cautions[1].id) });
    expect(signed.status).toBe(302);
    const comment = await decide(editor, revisionId, { intent: "comment", stepIndex: 3, body: "Fuse holder placement is good." });
    expect(comment.status).toBe(200);

    const after = (await sendJson<ViewJson>(editor, "GET", `/api/review/${revisionId}`)).body;
    expect(after.findings.every((f) => f.status === "acknowledged" && f.note === "Short cabin run, checked.")).toBe(true);
    expect(after.cautions.every((c) => c.signedOffBy === editorUser.id)).toBe(true);
    expect(after.comments).toMatchObject([{ stepIndex: 3, body: "Fuse holder placement is good." }]);
    expect(after.remaining).toEqual({ blockingFindings: 0, unsignedCautions: [] });

    const approved = await decide(editor, revisionId, { intent: "approve" });
    expect(approved.body).toMatchObject({ ok: true, state: "published" });
    expect((await sendJson(reader, "GET", `/api/guides/${IN_REVIEW_SLUG}`)).status).toBe(200);
    const [published] = await mailsFor(authorUser.id, "guide-published").then((m) =>
      m.filter((x) => x.subject.includes("USB-C")),
    );
    expect(published).toMatchObject({ to: "author@torqueleaf.test", state: "pending" });
    expect(published.text).toContain(`${app.origin}/guides/${IN_REVIEW_SLUG}`);
    expect(published.html).toContain(`href="${app.origin}/guides/${IN_REVIEW_SLUG}"`);

    // Every decision is in the audit log with the guide.
    const audit = await db.query.auditLog.findMany({ where: eq(auditLog.guideId, demo.id) });
    expect(audit.map((a) => a.action)).toEqual(
      expect.arrayContaining(["finding.acknowledge", "caution.sign-off", "review.comment", "revision.approve-publish"]),
    );
    expect(audit.filter((a) => a.action === "caution.sign-off")).toHaveLength(2);

    // Decided: no further decision, with a word on why.
    const again = await decide(admin, revisionId, { intent: "approve" });
    expect(again.status).toBe(409);
    expect(again.body.error.message).toContain("no longer waiting for review");
  });

  it("writes a mail to every editor when an author submits, none to the author", async () => {
    const before = await db.query.outbox.findMany({ where: eq(outbox.kind, "revision-submitted") });
    const { revisionId } = await submittedLike(authorUser, "Auxiliary lamps, for the mail count");
    const rows = (await db.query.outbox.findMany({ where: eq(outbox.kind, "revision-submitted") })).slice(before.length);
    expect(rows.map((r) => r.to).sort()).toEqual(["admin@torqueleaf.test", "editor@torqueleaf.test"]);
    expect(rows[0].text).toContain(`${app.origin}/review/${revisionId}`);
  });

  it("refuses every decision on an editor's own guide with 403, whatever the body", async () => {
    const own = await submittedLike(editorUser, "Auxiliary lamps, the editor's second fitting");
    for (const body of [
      { intent: "approve" },
      { intent: "request-changes", note: "Please change this part." },
      { nonsense: 1 },
    ]) {
      const refused = await decide(editor, own.revisionId, body);
      expect(refused.status).toBe(403);
      expect(refused.body.error.message).toContain("cannot review their own guides");
    }
    const view = (await sendJson<ViewJson>(editor, "GET", `/api/review/${own.revisionId}`)).body;
    expect(view.can).toMatchObject({ review: false, decide: false });
    expect((await editor.post(`/review/${own.revisionId}`, { intent: "approve" })).status).toBe(403);
  });
});

describe("two editors at once", () => {
  it("approve and approve: one publishes, the other gets 409 with a message; one published revision", async () => {
    const { id, revisionId } = await submittedLike(authorUser, "Auxiliary lamps, approved twice");
    await signAll(revisionId);
    const answers = await Promise.all([
      decide(editor, revisionId, { intent: "approve" }),
      decide(admin, revisionId, { intent: "approve" }),
    ]);
    expect(answers.map((a) => a.status).sort()).toEqual([200, 409]);
    const loser = answers.find((a) => a.status === 409);
    expect(loser?.body.error.message).toMatch(/no longer waiting for review|another editor/i);
    const published = await db.query.revisions.findMany({
      where: and(eq(revisions.guideId, id), eq(revisions.state, "published")),
    });
    expect(published).toHaveLength(1);
    expect(
      await db.$count(
        outbox,
        and(eq(outbox.kind, "guide-published"), eq(outbox.subject, "Published: Auxiliary lamps, approved twice")),
      ),
    ).toBe(1);
  });

  it("approve and request changes: exactly one wins, and the guide is in one consistent state", async () => {
    const { id, revisionId } = await submittedLike(authorUser, "Auxiliary lamps, decided twice");
    await signAll(revisionId);
    const answers = await Promise.all([
      decide(editor, revisionId, { intent: "approve" }),
      decide(admin, revisionId, { intent: "request-changes", note: "Move the relay away from the washer bottle." }),
    ]);
    expect(answers.map((a) => a.status).sort()).toEqual([200, 409]);
    const guide = await db.query.guides.findFirst({ where: (g, { eq }) => eq(g.id, id) });
    const state = (await db.query.revisions.findFirst({ where: eq(revisions.id, revisionId) }))?.state;
    if (state === "published")
      expect(guide).toMatchObject({ state: "published", publishedRevisionId: revisionId, workingRevisionId: null });
    else {
      expect(state).toBe("changes-requested");
      expect(guide?.publishedRevisionId).toBeNull();
      expect(guide?.workingRevisionId).not.toBeNull();
    }
  });
});

describe("requesting changes", () => {
  it("needs a note, sends the comments to the author by mail and to the Workbench, and the resubmission shows the diff", async () => {
    const created = await submittedLike(authorUser, "Auxiliary lamps, sent back");
    await signAll(created.revisionId);
    const refused = await editor.post(`/review/${created.revisionId}`, { intent: "request-changes", note: "" });
    expect(refused.status).toBe(400);
    expect(text(await refused.text())).toContain("Tell the author what to change");
    await decide(editor, created.revisionId, { intent: "comment", stepIndex: 1, body: "Say which relay terminal is 87." });
    const sent = await editor.post(`/review/${created.revisionId}`, {
      intent: "request-changes",
      note: "Please name the relay terminals in step 2.",
    });
    expect(sent.status).toBe(302);
    expect(sent.headers.get("location")).toBe("/review");

    const [mail] = await mailsFor(authorUser.id, "changes-requested").then((m) =>
      m.filter((x) => x.subject.includes("sent back")),
    );
    expect(mail.text).toContain("Please name the relay terminals in step 2.");
    expect(mail.text).toContain("Step 2: Say which relay terminal is 87.");
    expect(mail.text).toContain(`${app.origin}/workbench/guides/${created.id}`);

    const workbench = text(await (await author.get(`/workbench/guides/${created.id}`)).text());
    expect(workbench).toContain("Please name the relay terminals in step 2.");
    expect(workbench).toContain("Step 2: Say which relay terminal is 87.");

    // The author changes a fuse on the fresh draft and resubmits; the desk compares with the sent-back revision.
    const draft = await currentRevision(db, created.slug);
    const input = draftFrom(draft);
    const circuitStep = input.steps.findIndex((s) => s.callouts.some((c) => c.kind === "circuit"));
    const circuit = input.steps[circuitStep].callouts.find((c) => c.kind === "circuit");
    if (circuit?.kind !== "circuit") throw new Error("the demo guide has no circuit callout");
    const oldFuse = circuit.fuseA;
    circuit.fuseA = 25;
    // One caution reworded: its sign-off was for other words.
    const cautionStep = input.steps.find((s) => s.callouts.some((c) => c.kind === "caution"));
    const caution = cautionStep?.callouts.find((c) => c.kind === "caution");
    if (caution?.kind !== "caution") throw new Error("the demo guide has no caution");
    const rewordedText = `${caution.text} Keep the bonnet stay locked while you work.`;
    caution.text = rewordedText;
    await saveDraft(db, created.id, authorUser, input);
    const { revisionId } = await submitRevision(db, created.id, authorUser, "Named the relay terminals");
    const view = (await sendJson<ViewJson>(editor, "GET", `/api/review/${revisionId}`)).body;
    expect(view.diff?.against).toMatchObject({ revisionId: created.revisionId, why: "sent-back" });
    const changed = view.diff?.steps.find((s) => s.to === circuitStep);
    expect(changed?.callouts[0].values).toContainEqual({ field: "fuseA", label: "fuse", from: `${oldFuse} A`, to: "25 A" });
    // A caution with the same words keeps the sign-off given in the revision sent back; the reworded one needs a new one.
    const reworded = view.cautions.filter((c) => c.text === rewordedText);
    expect(reworded).toHaveLength(1);
    expect(reworded[0]).toMatchObject({ signedOffBy: null, carriedFrom: null });
    const kept = view.cautions.filter((c) => c.text !== rewordedText);
    expect(kept.length).toBeGreaterThan(0);
    for (const c of kept) expect(c).toMatchObject({ signedOffBy: editorUser.id, carriedFrom: 1 });
    expect(view.remaining.unsignedCautions).toEqual([reworded[0].id]);
    const page = text(await (await editor.get(`/review/${revisionId}`)).text());
    expect(page).toContain(`fuse ${oldFuse} A → changed to 25 A`);
  });
});

describe("unpublishing", () => {
  it("takes the guide out of the Library with a reason: its page and API answer 410, the author is told", async () => {
    const guide = await guideBySlug(db, PUBLISHED_SLUG);
    const revisionId = guide.publishedRevisionId ?? 0;
    // The demo author's published guide: the editor may take it down.
    expect((await sendJson<ViewJson>(editor, "GET", `/api/review/${revisionId}`)).body.can.unpublish).toBe(true);
    const short = await decide(editor, revisionId, { intent: "unpublish", reason: "Bad" });
    expect(short.status).toBe(400);
    expect(short.body.error.fields).toHaveProperty("reason");
    const reason = "The relay bracket in step 3 was found to crack; withdrawn until it is revised.";
    expect((await decide(editor, revisionId, { intent: "unpublish", reason })).status).toBe(200);

    const pageAnswer = await fetch(`${app.origin}/guides/${PUBLISHED_SLUG}`);
    expect(pageAnswer.status).toBe(410);
    expect(text(await pageAnswer.text())).toContain(reason);
    const apiAnswer = await fetch(`${app.origin}/api/guides/${PUBLISHED_SLUG}`);
    expect(apiAnswer.status).toBe(410);
    expect(((await apiAnswer.json()) as ApiError & { error: { reason: string } }).error.reason).toBe(reason);
    const library = (await (await fetch(`${app.origin}/api/guides`)).json()) as { guides: { slug: string }[] };
    expect(library.guides.map((g) => g.slug)).not.toContain(PUBLISHED_SLUG);
    const libraryPage = text(await (await fetch(`${app.origin}/`)).text());
    expect(libraryPage).not.toContain("Hood-hinge auxiliary lamps");

    const [mail] = await mailsFor(authorUser.id, "guide-unpublished");
    expect(mail.text).toContain(reason);
    expect(await db.$count(auditLog, and(eq(auditLog.action, "guide.unpublish"), eq(auditLog.guideId, guide.id)))).toBe(1);
    // A second unpublish finds nothing live to take down.
    expect((await decide(admin, revisionId, { intent: "unpublish", reason })).status).toBe(409);
  });
});
