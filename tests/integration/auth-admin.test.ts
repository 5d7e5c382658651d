import { and, eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { startAppServer } from "../support/app-server";
import { useTestDatabase } from "../support/base-db";
import { expectFlash, TestClient, signedIn } from "../support/http-client";

let app: Awaited<ReturnType<typeof startAppServer>>;
const DEMO_PASSWORD = "torqueleaf-demo";

beforeAll(async () => {
  useTestDatabase("auth-admin");
  app = await startAppServer();
});
afterAll(async () => app?.stop());

async function userId(email: string) {
  const { getDb } = await import("~/db/client.server");
  const { findUserByEmail } = await import("~/models/users.server");
  return (await findUserByEmail(await getDb(), email))!.id;
}

async function auditFor(id: number, action: string) {
  const { getDb } = await import("~/db/client.server");
  const { auditLog } = await import("~/db/schema");
  return (await getDb())
    .select()
    .from(auditLog)
    .where(and(eq(auditLog.subjectType, "user"), eq(auditLog.subjectId, String(id)), eq(auditLog.action, action)));
}

describe("admin → users", () => {
  it("is for admins only", async () => {
    expect((await new TestClient(app.origin).get("/admin/users")).headers.get("location")).toBe(
      "/login?redirectTo=%2Fadmin%2Fusers",
    );
    for (const email of ["reader@torqueleaf.test", "author@torqueleaf.test", "editor@torqueleaf.test"]) {
      const client = await signedIn(app.origin, email);
      expect((await client.get("/admin/users")).status, email).toBe(403);
      expect(
        (await client.post("/admin/users", { intent: "disable", userId: "1", reason: "should not work" })).status,
        email,
      ).toBe(403);
    }
  });

  it("searches by name or address, filters by role and pages through the accounts", async () => {
    const { getDb } = await import("~/db/client.server");
    const { createUser } = await import("~/models/users.server");
    const db = await getDb();
    for (let i = 0; i < 25; i++) {
      await createUser(db, {
        name: `Paging Member ${String(i).padStart(2, "0")}`,
        email: `paging-${i}@example.test`,
        password: null,
      });
    }
    const admin = await signedIn(app.origin, "admin@torqueleaf.test");
    const search = await (await admin.get("/admin/users?q=solberg")).text();
    expect(search).toContain("Mina Solberg");
    expect(search).not.toContain("Rhea Castellane");
    const editors = await (await admin.get("/admin/users?role=editor")).text();
    expect(editors).toContain("editor@torqueleaf.test");
    expect(editors).not.toContain("reader@torqueleaf.test");
    const first = await (await admin.get("/admin/users?q=paging")).text();
    expect(first).toContain("25 accounts");
    expect(first).toContain("Page 1 of 2");
    expect(first.match(/>Paging Member \d\d</g)?.length).toBe(20);
    const second = await (await admin.get("/admin/users?q=paging&page=2")).text();
    expect(second.match(/>Paging Member \d\d</g)?.length).toBe(5);
    // Unreadable query values fall back instead of failing.
    expect((await admin.get("/admin/users?role=pilot&page=-4")).status).toBe(200);
  });

  it("changes a role only with a reason, keeps what was typed otherwise, and audits who, what and why", async () => {
    const admin = await signedIn(app.origin, "admin@torqueleaf.test");
    const readerId = await userId("reader@torqueleaf.test");
    const reader = await signedIn(app.origin, "reader@torqueleaf.test");

    const missing = await admin.post("/admin/users", {
      intent: "set-role",
      userId: String(readerId),
      role: "editor",
      reason: "",
    });
    expect(missing.status).toBe(400);
    expect(await missing.text()).toContain("Say why in a few words");

    const ok = await admin.post("/admin/users", {
      intent: "set-role",
      userId: String(readerId),
      role: "editor",
      reason: "Passed the electrical review course",
    });
    await expectFlash(admin, ok, "/admin/users", "Mina Solberg is now an editor.");
    // Her open session sees the new permissions on the next request.
    const me = await reader.me();
    expect(me?.role).toBe("editor");
    expect(me?.permissions).toContain("review:revision:any");

    const [entry] = await auditFor(readerId, "user.role-changed");
    expect(entry.actorId).toBe(await userId("admin@torqueleaf.test"));
    expect(entry.reason).toBe("Passed the electrical review course");
    expect(entry.data).toEqual({ from: "reader", to: "editor" });
    expect(entry.createdAt).toBeInstanceOf(Date);

    const own = await admin.post("/admin/users", {
      intent: "set-role",
      userId: String(await userId("admin@torqueleaf.test")),
      role: "reader",
      reason: "trying to lock myself out",
    });
    expect(own.status).toBe(409);
  });

  it("disables an account (refused on its very next request) and enables it again", async () => {
    const admin = await signedIn(app.origin, "admin@torqueleaf.test");
    const author = await signedIn(app.origin, "author2@torqueleaf.test");
    const authorId = await userId("author2@torqueleaf.test");
    expect(await author.me()).not.toBeNull();

    const disable = await admin.post("/admin/users", {
      intent: "disable",
      userId: String(authorId),
      reason: "Posting spam links",
    });
    await expectFlash(admin, disable, "/admin/users", "can no longer sign in.");
    expect(await author.me()).toBeNull();
    const refused = await new TestClient(app.origin).signIn("author2@torqueleaf.test", DEMO_PASSWORD);
    expect(refused.status).toBe(403);
    expect(await refused.text()).toContain("disabled by an administrator");

    const enable = await admin.post("/admin/users", {
      intent: "enable",
      userId: String(authorId),
      reason: "Cleared after review",
    });
    await expectFlash(admin, enable, "/admin/users", "can sign in again.");
    expect((await new TestClient(app.origin).signIn("author2@torqueleaf.test", DEMO_PASSWORD)).status).toBe(302);
    expect((await auditFor(authorId, "user.disabled"))[0].reason).toBe("Posting spam links");
    expect((await auditFor(authorId, "user.enabled"))[0].reason).toBe("Cleared after review");
  });
});
