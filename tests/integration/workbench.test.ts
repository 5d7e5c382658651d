import { describe, expect, it } from "vitest";
import { latestMail, linkPath, uniqueEmail, plainText } from "../support/http-client";
import { sharedApp } from "../support/shared-app";
import { currentRevision, demoUser, draftFrom } from "./revision-fixtures";

// The Workbench and the new-guide page over HTTP on the shared app server, as a new author who
// joins through the contributor terms; the editor's part is played through the model functions.
const app = sharedApp("workbench");

async function newAuthor() {
  const email = uniqueEmail("workbench");
  const password = "wiring the fog lamps";
  const client = app.client();
  expect((await client.post("/signup", { name: "Ilse Varga", email, password })).status).toBe(200);
  const path = linkPath(await latestMail(email, /Confirm your e-mail/), /https?:\/\/\S+\/verify\/[\w-]+/);
  expect((await client.post(path, {})).status).toBe(302);
  expect((await client.signIn(email, password)).status).toBe(302);
  return { client, email };
}

describe("the Workbench", () => {
  it("leads a reader to the contributor terms, then lists what the new author writes", async () => {
    const { client, email } = await newAuthor();
    const asReader = plainText(await (await client.get("/workbench")).text());
    expect(asReader).toContain("accept the contributor terms");
    expect((await client.get("/workbench/guides/new")).status).toBe(403);

    expect((await client.post("/contributor-terms", { agree: "yes" })).status).toBe(302);
    expect(plainText(await (await client.get("/workbench")).text())).toContain("You have no guides yet");

    // Bad input: a message per field, and what was typed comes back.
    const refused = await client.post("/workbench/guides/new", {
      title: "Fog",
      summary: "Kept summary",
      category: "",
      difficulty: "9",
      minutes: "2",
    });
    expect(refused.status).toBe(400);
    const page = plainText(await refused.text());
    expect(page).toContain("Give the guide a title of at least 4 characters");
    expect(page).toContain("Pick a category");
    expect(page).toContain("Difficulty runs from 1 to 5");
    expect(page).toContain("An install takes at least 5 minutes");
    expect(page).toContain("Kept summary");

    const created = await client.post("/workbench/guides/new", {
      title: "Fog lamps on the front bumper",
      summary: "Two lamps behind the grille with a relay.",
      category: "lighting",
      difficulty: "3",
      minutes: "150",
    });
    expect(created.status).toBe(302);
    const editorPath = created.headers.get("location") ?? "";
    expect(editorPath).toMatch(/^\/workbench\/guides\/\d+$/);
    const guideId = Number(editorPath.split("/").at(-1));

    const listed = plainText(await (await client.get("/workbench")).text());
    expect(listed).toContain("Fog lamps on the front bumper");
    expect(listed).toContain("Draft");

    // The editor's side: the guide goes to review with content copied from a demo guide, then comes back.
    const { getDb } = await import("~/db/client.server");
    const { saveDraft } = await import("~/models/guides.server");
    const { submitRevision, requestChanges } = await import("~/models/review.server");
    const { findUserByEmail } = await import("~/models/users.server");
    const db = await getDb();
    const author = (await findUserByEmail(db, email))!;
    const editor = await demoUser(db, "editor@torqueleaf.test");
    const source = await currentRevision(db, "kestrel-hood-auxiliary-lamps");
    const content = draftFrom(source);
    // Photos stay their uploader's: this author has none.
    content.steps = content.steps.map((s) => ({ ...s, photos: [] }));
    await saveDraft(db, guideId, author, { ...content, title: "Fog lamps on the front bumper", version: 1 });
    const submitted = await submitRevision(db, guideId, author, "First revision");
    expect(plainText(await (await client.get("/workbench")).text())).toContain("In review with the editors");
    // The frozen revision offers nothing to edit.
    expect(plainText(await (await client.get(editorPath)).text())).toContain("cannot be edited while they review it");

    await requestChanges(db, submitted.revisionId, editor, { note: "Give the relay's terminal numbers in step 3." });
    const returned = plainText(await (await client.get("/workbench")).text());
    expect(returned).toContain("Changes requested");
    expect(returned).toContain("Give the relay's terminal numbers in step 3.");
    // The fresh draft opens in the editor with the note; another author may not open it.
    const reopened = plainText(await (await client.get(editorPath)).text());
    expect(reopened).toContain("The editor asked for changes");
    const other = app.client();
    expect((await other.signIn("author2@torqueleaf.test", "torqueleaf-demo")).status).toBe(302);
    expect((await other.get(editorPath)).status).toBe(403);
  });

  it("starts a new revision of a published guide while the published one stays live", async () => {
    const { client, email } = await newAuthor();
    expect((await client.post("/contributor-terms", { agree: "yes" })).status).toBe(302);
    const { getDb } = await import("~/db/client.server");
    const { createGuide, saveDraft } = await import("~/models/guides.server");
    const { submitRevision, approveRevision, revisionCautions, signOffCaution } = await import("~/models/review.server");
    const { findUserByEmail } = await import("~/models/users.server");
    const { guides } = await import("~/db/schema");
    const { eq } = await import("drizzle-orm");
    const db = await getDb();
    const author = (await findUserByEmail(db, email))!;
    const editor = await demoUser(db, "editor@torqueleaf.test");
    const content = draftFrom(await currentRevision(db, "kestrel-hood-auxiliary-lamps"));
    content.steps = content.steps.map((s) => ({ ...s, photos: [] }));
    const created = await createGuide(db, author, { ...content, title: "Work lamps on the cab rack" });
    await saveDraft(db, created.id, author, { ...content, title: "Work lamps on the cab rack", version: 1 });
    const { revisionId } = await submitRevision(db, created.id, author, "First revision");
    for (const caution of await revisionCautions(db, revisionId))
      await signOffCaution(db, revisionId, editor, { cautionId: caution.id });
    await approveRevision(db, revisionId, editor);
    const [published] = await db.select().from(guides).where(eq(guides.id, created.id));

    expect(plainText(await (await client.get("/workbench")).text())).toContain("Start a new revision");
    const started = await client.post("/workbench", { intent: "start-revision", guideId: String(published.id) });
    expect(started.status).toBe(302);
    expect(started.headers.get("location")).toBe(`/workbench/guides/${published.id}`);
    expect(plainText(await (await client.get("/workbench")).text())).toContain("Published — a newer draft is open");
    expect((await app.client().get(`/guides/${published.slug}`)).status).toBe(200);

    // Someone else's guide cannot be continued.
    const [othersGuide] = await db.select().from(guides).where(eq(guides.slug, "fjell-f3-roof-crossbars"));
    const refused = await client.post("/workbench", { intent: "start-revision", guideId: String(othersGuide.id) });
    expect(refused.status).toBe(403);
  });
});
