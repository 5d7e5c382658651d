import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { startAppServer } from "../support/app-server";
import { useTestDatabase } from "../support/base-db";
import { latestMail, TestClient } from "../support/http-client";

let app: Awaited<ReturnType<typeof startAppServer>>;

beforeAll(async () => {
  useTestDatabase("auth-github-claim");
  app = await startAppServer();
  // The first request compiles the routes; pay for it here rather than inside a test's time limit.
  await new TestClient(app.origin).get("/login");
});
afterAll(async () => app?.stop());

// The GitHub stand-in's invented identities (app/services/fakes/github.ts).
const TOVE = 710001; // verified tove.arnesen@example.test, no account here when the suite starts
const PIA = 710003; // unverified author@torqueleaf.test
const TOVE_EMAIL = "tove.arnesen@example.test";
const ATTACKER_PASSWORD = "attacker chose this phrase";

/** The OAuth round trip over HTTP: our start route, the stand-in's authorize button, our callback. */
async function throughGitHub(client: TestClient, identity: number) {
  const start = await client.get("/auth/github");
  expect(start.status).toBe(302);
  const authorize = new URL(start.headers.get("location")!);
  const chosen = await fetch(`${process.env.GITHUB_BASE_URL}/login/oauth/authorize`, {
    method: "POST",
    body: new URLSearchParams({
      redirect_uri: authorize.searchParams.get("redirect_uri")!,
      state: authorize.searchParams.get("state")!,
      identity: String(identity),
    }),
    redirect: "manual",
  });
  const callback = new URL(chosen.headers.get("location")!);
  return client.get(`${callback.pathname}${callback.search}`);
}

async function dbModules() {
  const { getDb } = await import("~/db/client.server");
  const schema = await import("~/db/schema");
  const { and, eq } = await import("drizzle-orm");
  return { db: await getDb(), ...schema, and, eq };
}

describe("an account pre-created with someone else's address", () => {
  it("is taken back by the address's GitHub owner: the creator's password and sessions stop working, the owner is told", async () => {
    // 1. Someone who does not own the address signs up with it and a password of their choosing.
    const attacker = new TestClient(app.origin);
    expect(
      (await attacker.post("/signup", { name: "Tove Arnesen", email: TOVE_EMAIL, password: ATTACKER_PASSWORD })).status,
    ).toBe(200);
    // Unconfirmed, the password does not open the account yet.
    expect((await attacker.signIn(TOVE_EMAIL, ATTACKER_PASSWORD)).status).toBe(403);

    // A session the account already holds (one started before the claim, by whatever route): the
    // claim must end it as well. It is opened through the app's own session code.
    const { db, users, auditLog, and, eq } = await dbModules();
    const account = (await db.query.users.findFirst({ where: eq(users.email, TOVE_EMAIL) }))!;
    expect(account.emailVerifiedAt).toBeNull();
    const { createSession } = await import("~/models/sessions.server");
    const { sessionCookie } = await import("~/services/auth/cookie.server");
    const { env } = await import("~/utils/env.server");
    const planted = await createSession(db, account.id, { userAgent: "planted", ipAddress: "127.0.0.2" }, 30);
    const cookie = sessionCookie(env());
    const [pair] = (await cookie.serialize(planted.token)).split(";");
    attacker.cookies.set(cookie.name, pair.slice(cookie.name.length + 1));
    expect((await attacker.me())?.email).toBe(TOVE_EMAIL);

    // 2. The address's owner signs in with GitHub, which vouches for it, and is asked to link.
    const owner = new TestClient(app.origin);
    const callback = await throughGitHub(owner, TOVE);
    expect(callback.headers.get("location")).toBe("/auth/github/link");
    const page = await (await owner.get("/auth/github/link")).text();
    // Told before saying yes what linking does to an unconfirmed account.
    expect(page).toContain("removes the password");

    // 3. The owner confirms the link and lands on the account page, which says what happened.
    const linked = await owner.post("/auth/github/link", { intent: "link" });
    expect(linked.status).toBe(302);
    expect(linked.headers.get("location")).toBe("/me/account?notice=password-cleared");
    const accountPage = await owner.get("/me/account?notice=password-cleared");
    expect(accountPage.status).toBe(200);
    const accountHtml = await accountPage.text();
    expect(accountHtml).toContain("removed the password");
    // No password any more: the page offers to set one without asking for the old one.
    expect(accountHtml).toContain("Set a password");
    expect((await owner.me())?.email).toBe(TOVE_EMAIL);

    // ... and by mail.
    const mail = await latestMail(TOVE_EMAIL, /password was removed/);
    expect(mail.text).toContain("@wrench-owl");
    expect(mail.text).toContain("/me/account");

    // 4. The creator's password no longer opens the account, and their session has ended.
    expect((await new TestClient(app.origin).signIn(TOVE_EMAIL, ATTACKER_PASSWORD)).status).toBe(401);
    expect(await attacker.me()).toBeNull();

    // The account is confirmed now, keyed to the GitHub identity, and the change is in the audit log.
    const after = (await db.query.users.findFirst({ where: eq(users.id, account.id) }))!;
    expect(after.emailVerifiedAt).not.toBeNull();
    expect(after.passwordHash).toBeNull();
    const entries = await db
      .select({ action: auditLog.action })
      .from(auditLog)
      .where(and(eq(auditLog.subjectType, "user"), eq(auditLog.subjectId, String(account.id))));
    expect(entries.map((e) => e.action).sort()).toEqual(["user.linked-provider", "user.unconfirmed-password-cleared"]);

    // The owner comes back through GitHub straight into the same account.
    const later = new TestClient(app.origin);
    expect((await throughGitHub(later, TOVE)).headers.get("location")).toBe("/");
    expect((await later.me())?.id).toBe(account.id);
  });

  it("keeps the password of a confirmed account that links GitHub", async () => {
    // The demo reader is confirmed; linking must not cost them their password (dusty-relay, 710002).
    const owner = new TestClient(app.origin);
    await throughGitHub(owner, 710002);
    const page = await (await owner.get("/auth/github/link")).text();
    expect(page).not.toContain("removes the password");
    const linked = await owner.post("/auth/github/link", { intent: "link" });
    expect(linked.headers.get("location")).toBe("/");
    expect((await new TestClient(app.origin).signIn("reader@torqueleaf.test", "torqueleaf-demo")).status).toBe(302);
  });
});

describe("GitHub sign-in does not tell who has an account", () => {
  it("answers an unverified address that matches an account exactly as one that matches none", async () => {
    const matching = await throughGitHub(new TestClient(app.origin), PIA);
    const matchingPage = await (await new TestClient(app.origin).get(matching.headers.get("location")!)).text();

    // Move the matching account's address away: now Pia's unverified address matches nobody.
    const { db, users, eq } = await dbModules();
    await db.update(users).set({ email: "author-moved@torqueleaf.test" }).where(eq(users.email, "author@torqueleaf.test"));
    const unmatched = await throughGitHub(new TestClient(app.origin), PIA);
    const unmatchedPage = await (await new TestClient(app.origin).get(unmatched.headers.get("location")!)).text();
    await db.update(users).set({ email: "author@torqueleaf.test" }).where(eq(users.email, "author-moved@torqueleaf.test"));

    expect(matching.headers.get("location")).toBe(unmatched.headers.get("location"));
    expect(matching.headers.get("location")).toBe("/login?notice=github-no-email");
    const notice = (html: string) => html.match(/role="alert"[^>]*>([^<]*)</)?.[1];
    expect(notice(matchingPage)).toBeTruthy();
    expect(notice(matchingPage)).toBe(notice(unmatchedPage));
    // The old notice that said an account uses the address is gone.
    expect(await (await new TestClient(app.origin).get("/login?notice=github-unverified")).text()).not.toContain(
      "already uses that GitHub identity",
    );
  });
});
