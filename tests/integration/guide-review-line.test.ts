import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { formatDate } from "~/utils/format";
import { startAppServer } from "../support/app-server";
import { useTestDatabase } from "../support/base-db";
import { TestClient, plainText } from "../support/http-client";
import { demoUser, guideBySlug } from "./revision-fixtures";

// Readers see the review: the guide page's review line and the history of its published revisions,
// on the demo data and after a second revision is published (a database of its own, since this
// file publishes). The page and the API are both cached per published revision: the second
// publication must show at once.
let app: Awaited<ReturnType<typeof startAppServer>>;
const SLUG = "kestrel-hood-auxiliary-lamps";

beforeAll(async () => {
  useTestDatabase("guide-review-line");
  app = await startAppServer();
});
afterAll(async () => app?.stop());

type ApiGuide = {
  revision: { number: number; reviewedAt: string };
  history: { number: number; reviewedAt: string; publishedAt: string; changeSummary: string | null }[];
};

async function db() {
  const { getDb } = await import("~/db/client.server");
  return getDb();
}

async function publishedRevision(slug: string) {
  const { revisions } = await import("~/db/schema");
  const { eq } = await import("drizzle-orm");
  const guide = await guideBySlug(await db(), slug);
  const [row] = await (await db()).select().from(revisions).where(eq(revisions.id, guide.publishedRevisionId!));
  return row;
}

describe("the guide page's review line and revision history", () => {
  it("shows who reviewed the demo guide's published revision, when, and what it changed", async () => {
    const reader = new TestClient(app.origin);
    const revision = await publishedRevision(SLUG);
    expect(revision.reviewedAt).not.toBeNull();
    const page = plainText(await (await reader.get(`/guides/${SLUG}`)).text());
    expect(page).toContain(`Safety-reviewed by an editor on ${formatDate(revision.reviewedAt!)} · revision 1`);
    expect(page).toContain("Revision history");
    expect(page).toContain(`Revision 1 · ${formatDate(revision.publishedAt!)}`);
    // The demo guide's change summary (content-samples/guides/kestrel-hood-auxiliary-lamps.ts).
    expect(page).toContain("the fuse holder on the battery-tray stud");

    const api = (await (await reader.get(`/api/guides/${SLUG}`)).json()) as ApiGuide;
    expect(api.revision.number).toBe(1);
    expect(api.revision.reviewedAt).toBe(revision.reviewedAt!.toISOString());
    expect(api.history).toEqual([
      {
        number: 1,
        reviewedAt: revision.reviewedAt!.toISOString(),
        publishedAt: revision.publishedAt!.toISOString(),
        changeSummary: revision.changeSummary,
      },
    ]);
  });

  it("lists every published revision, newest first, once a second one is published", async () => {
    const reader = new TestClient(app.origin);
    // Read once so that revision 1's view is in the caches.
    expect((await reader.get(`/guides/${SLUG}`)).status).toBe(200);
    const { startNextRevision, submitRevision, revisionCautions, signOffCaution, approveRevision } = await import(
      "~/models/review.server"
    );
    const d = await db();
    const author = await demoUser(d, "author@torqueleaf.test");
    const editor = await demoUser(d, "editor@torqueleaf.test");
    const guide = await guideBySlug(d, SLUG);
    await startNextRevision(d, guide.id, author);
    const { revisionId } = await submitRevision(d, guide.id, author, "Added the torque for the hinge bolts in lbf·ft.");
    for (const caution of await revisionCautions(d, revisionId)) {
      await signOffCaution(d, revisionId, editor, { cautionId: caution.id });
    }
    await approveRevision(d, revisionId, editor);
    const second = await publishedRevision(SLUG);
    expect(second.number).toBe(2);

    const page = plainText(await (await reader.get(`/guides/${SLUG}`)).text());
    expect(page).toContain(`Safety-reviewed by an editor on ${formatDate(second.reviewedAt!)} · revision 2`);
    const history = page.slice(page.indexOf("Revision history"));
    expect(history.indexOf("Revision 2")).toBeGreaterThan(-1);
    expect(history.indexOf("Revision 2")).toBeLessThan(history.indexOf("Revision 1"));
    expect(history).toContain("Added the torque for the hinge bolts in lbf·ft.");
    expect(history).toContain("the fuse holder on the battery-tray stud");

    const api = (await (await reader.get(`/api/guides/${SLUG}`)).json()) as ApiGuide;
    expect(api.revision.number).toBe(2);
    expect(api.history.map((h) => [h.number, h.changeSummary])).toEqual([
      [2, "Added the torque for the hinge bolts in lbf·ft."],
      [1, expect.stringContaining("the fuse holder on the battery-tray stud")],
    ]);

    // The guide's audit history has the new revision's steps, each with the guide.
    const admin = new TestClient(app.origin);
    expect((await admin.signIn("admin@torqueleaf.test", "torqueleaf-demo")).status).toBe(302);
    const log = plainText(await (await admin.get(`/admin/audit?guide=${guide.id}`)).text());
    expect(log).toContain("Started revision 2 from the published one");
    expect(log).toContain("Sent revision 2 for safety review");
    expect(log).toContain("Approved and published revision 2");
  });
});
