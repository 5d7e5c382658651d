import { count, desc, eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { startAppServer } from "../support/app-server";
import { useTestDatabase } from "../support/base-db";
import { TestClient, plainText, signedIn } from "../support/http-client";

// The audit log over HTTP, on a database of its own so that counts and pages are this file's:
// the demo data's own history (written by the seed through the model functions), a role change
// made here through /admin/users, and every filter of the address.
let app: Awaited<ReturnType<typeof startAppServer>>;

beforeAll(async () => {
  useTestDatabase("admin-audit");
  app = await startAppServer();
});
afterAll(async () => app?.stop());

async function db() {
  const { getDb } = await import("~/db/client.server");
  return getDb();
}

async function ids() {
  const { findUserByEmail } = await import("~/models/users.server");
  const { guides } = await import("~/db/schema");
  const d = await db();
  const user = async (email: string) => (await findUserByEmail(d, email))!;
  const guide = async (slug: string) => (await d.select().from(guides).where(eq(guides.slug, slug)))[0];
  return { user, guide };
}

/** A page of the log: its status, its words, the count it gives, and the words of the list alone (after the filter menus). */
async function shownCount(client: TestClient, query: string) {
  const response = await client.get(`/admin/audit${query}`);
  const text = plainText(await response.text());
  const counted = text.match(/(\d+) entr(?:y|ies)( match)?/);
  const total = Number(counted?.[1] ?? Number.NaN);
  const list = counted ? text.slice((counted.index ?? 0) + counted[0].length) : "";
  return { status: response.status, text, total, list };
}

const today = () => new Date().toISOString().slice(0, 10);

describe("/admin/audit", () => {
  it("is for admins only", async () => {
    expect((await new TestClient(app.origin).get("/admin/audit")).headers.get("location")).toBe(
      "/login?redirectTo=%2Fadmin%2Faudit",
    );
    for (const email of ["reader@torqueleaf.test", "author@torqueleaf.test", "editor@torqueleaf.test"]) {
      expect((await (await signedIn(app.origin, email)).get("/admin/audit")).status, email).toBe(403);
    }
    expect((await (await signedIn(app.origin, "admin@torqueleaf.test")).get("/admin/audit")).status).toBe(200);
  });

  it("shows a guide's review history in plain words, found by the guide", async () => {
    const admin = await signedIn(app.origin, "admin@torqueleaf.test");
    const { guide, user } = await ids();
    const lamps = await guide("kestrel-hood-auxiliary-lamps");
    const editor = await user("editor@torqueleaf.test");
    const { list: text, total } = await shownCount(admin, `?guide=${lamps.id}`);
    // The seed wrote, submitted, signed off and published the demo guide (app/cli/demo-data.ts).
    expect(text).toContain("Started the guide");
    expect(text).toContain("Sent revision 1 for safety review");
    expect(text).toContain("Signed off a caution");
    expect(text).toContain(`${editor.name}`);
    expect(text).toContain("Approved and published revision 1");
    expect(text).toContain("What changed: First published revision: the fuse holder on the battery-tray stud");
    expect(text).not.toContain("Accepted the contributor terms");
    const { auditLog } = await import("~/db/schema");
    const [{ n }] = await (await db()).select({ n: count() }).from(auditLog).where(eq(auditLog.guideId, lamps.id));
    expect(total).toBe(n);
    expect(n).toBeGreaterThanOrEqual(4);
  });

  it("shows role changes with who, when and why, and filters by actor and action", async () => {
    const admin = await signedIn(app.origin, "admin@torqueleaf.test");
    const { user } = await ids();
    const reader = await user("reader@torqueleaf.test");
    const adminUser = await user("admin@torqueleaf.test");
    const changed = await admin.post("/admin/users", {
      intent: "set-role",
      userId: String(reader.id),
      role: "author",
      reason: "Writes the winch guides with us",
    });
    expect(changed.status).toBe(302);

    const byAction = await shownCount(admin, "?action=user.role-changed");
    expect(byAction.total).toBe(1);
    expect(byAction.list).toContain(`Changed ${reader.name}'s role from Reader to Author`);
    expect(byAction.list).toContain("Why: Writes the winch guides with us");
    expect(byAction.list).toContain(`${adminUser.name}`);
    expect(byAction.list).toMatch(/\d{1,2} [A-Z][a-z]{2} \d{4}, \d{2}:\d{2} UTC/);

    // By actor: the editor's rows are sign-offs and approvals only, and none is the admin's.
    const editor = await user("editor@torqueleaf.test");
    const { auditLog } = await import("~/db/schema");
    const rows = await (await db()).select().from(auditLog).where(eq(auditLog.actorId, editor.id));
    expect(new Set(rows.map((r) => r.action))).toEqual(new Set(["caution.sign-off", "revision.approve-publish"]));
    const byEditor = await shownCount(admin, `?actor=${editor.id}`);
    expect(byEditor.total).toBe(rows.length);
    expect(byEditor.list).not.toContain("Changed");
    expect(byEditor.list).toContain("Signed off a caution");
    // Both filters at once: the admin did no sign-off.
    expect((await shownCount(admin, `?actor=${adminUser.id}&action=caution.sign-off`)).total).toBe(0);
    // Empty fields from a plain GET form filter nothing.
    const all = await shownCount(admin, "?actor=&action=&guide=&from=&to=");
    expect(all.status).toBe(200);
    const [{ n }] = await (await db()).select({ n: count() }).from(auditLog);
    expect(all.total).toBe(n);
  });

  it("filters by dates (whole UTC days, both ends included) and pages newest first", async () => {
    const admin = await signedIn(app.origin, "admin@torqueleaf.test");
    const { auditLog } = await import("~/db/schema");
    const d = await db();
    const [{ n }] = await d.select({ n: count() }).from(auditLog);
    const { min, max } = await import("drizzle-orm");
    const [span] = await d.select({ first: min(auditLog.createdAt), last: max(auditLog.createdAt) }).from(auditLog);
    const day = (date: Date | null, offset = 0) =>
      new Date((date?.getTime() ?? 0) + offset * 86_400_000).toISOString().slice(0, 10);
    expect((await shownCount(admin, `?from=${day(span.first)}&to=${day(span.last)}`)).total).toBe(n);
    expect((await shownCount(admin, `?from=${day(span.last, 1)}`)).total).toBe(0);
    expect((await shownCount(admin, `?to=${day(span.first, -1)}`)).total).toBe(0);
    // One day alone: exactly the entries written on that UTC day.
    const rows = await d.select({ at: auditLog.createdAt }).from(auditLog);
    const onLast = rows.filter((r) => day(r.at) === day(span.last)).length;
    expect((await shownCount(admin, `?from=${day(span.last)}&to=${day(span.last)}`)).total).toBe(onLast);

    // More entries than one page holds: the second page goes on where the first stopped.
    expect(n).toBeGreaterThan(25);
    const newest = await d.select().from(auditLog).orderBy(desc(auditLog.createdAt), desc(auditLog.id)).limit(30);
    const first = await (await admin.get("/admin/audit")).text();
    const second = await (await admin.get("/admin/audit?page=2")).text();
    const times = (html: string) => [...html.matchAll(/<time dateTime="([^"]+)"/g)].map((m) => m[1]);
    expect(times(first)).toHaveLength(25);
    expect(times(first)).toEqual(newest.slice(0, 25).map((r) => r.createdAt.toISOString()));
    expect(times(second).slice(0, 5)).toEqual(newest.slice(25, 30).map((r) => r.createdAt.toISOString()));
    const pages = Math.ceil(n / 25);
    expect(plainText(first)).toContain(`Page 1 of ${pages}`);
    expect(plainText(second)).toContain(`Page 2 of ${pages}`);
    // The pager keeps the filters.
    expect(await (await admin.get(`/admin/audit?from=${today()}&page=1`)).text()).toContain(`from=${today()}&amp;page=2`);
  });

  it("answers filters that do not parse with 400 and a message naming each, never a server error", async () => {
    const admin = await signedIn(app.origin, "admin@torqueleaf.test");
    const cases: [string, string][] = [
      ["?actor=someone", "Who: pick a person from the list"],
      ["?action=DROP%20TABLE", "What: pick an action from the list"],
      ["?guide=-3", "Guide: pick a guide from the list"],
      ["?from=2024-02-30", "From: this date does not exist"],
      ["?to=yesterday", "To: give a date as YYYY-MM-DD"],
      ["?from=2025-05-02&to=2025-05-01", "To: the end date comes before the start date"],
      ["?page=0", "Page: pages start at 1"],
      ["?page=2.5", "Page: give a whole page number"],
      [`?action=${"a".repeat(5000)}`, "What: pick an action from the list"],
    ];
    for (const [query, message] of cases) {
      const { status, text } = await shownCount(admin, query);
      expect(status, query.slice(0, 40)).toBe(400);
      expect(text, query.slice(0, 40)).toContain(message);
    }
    // What was typed stays in the form to be corrected.
    expect(await (await admin.get("/admin/audit?from=2024-02-30")).text()).toContain('value="2024-02-30"');
  });

  it("shows the guide's own history on its Workbench page", async () => {
    const author = await signedIn(app.origin, "author@torqueleaf.test");
    // The demo author's draft (the seed's seventh guide) and one of their published guides.
    const draft = plainText(await (await author.get("/workbench/guides/7")).text());
    expect(draft).toContain("History");
    expect(draft).toContain("Started the guide");
    const { guide } = await ids();
    const lamps = await guide("kestrel-hood-auxiliary-lamps");
    const published = plainText(await (await author.get(`/workbench/guides/${lamps.id}`)).text());
    expect(published).toContain("Approved and published revision 1");
    expect(published).not.toContain("Changed");
  });
});
