import { createHash } from "node:crypto";
import { describe, expect, it } from "vitest";
import { expectFlash, latestMail, linkPath, mailsTo, uniqueEmail } from "../support/http-client";
import { sharedApp } from "../support/shared-app";

// The shared app server; every account these tests change is made here with a unique address.
const app = sharedApp("auth-accounts");

/** Signs up through the form and confirms the address through the mailed link. */
async function joinAndConfirm(name: string, email: string, password: string) {
  const client = app.client();
  const signup = await client.post("/signup", { name, email, password });
  expect(signup.status).toBe(200);
  const mail = await latestMail(email, /Confirm your e-mail/);
  const path = linkPath(mail, /https?:\/\/\S+\/verify\/[\w-]+/);
  expect((await client.get(path)).status).toBe(200);
  const confirmed = await client.post(path, {});
  expect(confirmed.status).toBe(302);
  expect(confirmed.headers.get("location")).toBe("/login?notice=verified");
  return client;
}

describe("sign-up, confirmation and sign-in", () => {
  it("a new member signs up, confirms by the mailed link, signs in as a reader and signs out", async () => {
    const email = uniqueEmail("new-member");
    const client = app.client();
    const signup = await client.post("/signup", { name: "Aino Brask", email, password: "brass fittings at dawn" });
    expect(signup.status).toBe(200);
    expect(await signup.text()).toContain("Check your inbox");

    const mail = await latestMail(email, /Confirm your e-mail/);
    expect(mail.text).toContain("Hello Aino Brask");
    expect(mail.html).toContain("Confirm my address");
    const path = linkPath(mail, /https?:\/\/\S+\/verify\/[\w-]+/);

    // Before confirming, the right password still does not open the account.
    const early = await client.signIn(email, "brass fittings at dawn");
    expect(early.status).toBe(403);
    expect(await early.text()).toContain("Confirm your e-mail address first");

    expect((await client.post(path, {})).headers.get("location")).toBe("/login?notice=verified");
    // The link is single-use.
    const again = await client.post(path, {});
    expect(again.status).toBe(400);
    expect(await again.text()).toContain("expired or was used already");

    const signIn = await client.signIn(email, "brass fittings at dawn");
    expect(signIn.status).toBe(302);
    expect(signIn.headers.get("location")).toBe("/");
    const me = await client.me();
    expect(me).toMatchObject({ email, name: "Aino Brask", role: "reader" });
    expect(me?.permissions).toContain("save:vehicle:own");
    expect(me?.permissions).not.toContain("create:guide");

    const signOut = await client.post("/logout", {});
    expect(signOut.status).toBe(302);
    expect(await client.me()).toBeNull();
  });

  it("keeps what was typed and names the bad field, without ever echoing the password", async () => {
    const client = app.client();
    const response = await client.post("/signup", {
      name: "Aino Brask",
      email: "not-an-address",
      password: "s3cret-typed-value",
    });
    expect(response.status).toBe(400);
    const html = await response.text();
    expect(html).toContain("Enter an e-mail address like name@example.com.");
    expect(html).toContain('value="Aino Brask"');
    expect(html).toContain('value="not-an-address"');
    expect(html).not.toContain("s3cret-typed-value");
  });

  it("refuses short and common passwords with the reason beside the field", async () => {
    const client = app.client();
    const short = await client.post("/signup", { name: "A", email: uniqueEmail("short"), password: "gear" });
    expect(short.status).toBe(400);
    expect(await short.text()).toContain("Use at least 8 characters");
    const common = await client.post("/signup", { name: "A", email: uniqueEmail("common"), password: "Password123" });
    expect(common.status).toBe(400);
    expect(await common.text()).toContain("one of the most common ones");
  });

  it("answers a sign-up for a taken address exactly like a new one, and tells the owner by mail instead", async () => {
    const client = app.client();
    const earlier = await mailsTo("reader@torqueleaf.test");
    const before = earlier.length;
    const newest = Math.max(0, ...earlier.map((m) => m.id));
    const taken = await client.post("/signup", {
      name: "Someone",
      email: "reader@torqueleaf.test",
      password: "another long phrase",
    });
    const fresh = await client.post("/signup", { name: "Someone", email: uniqueEmail("fresh"), password: "another long phrase" });
    expect(taken.status).toBe(fresh.status);
    // Each answer has its own CSP nonce; everything else must be the same.
    const strip = (html: string) =>
      html
        .replace(/<strong>[^<]*<\/strong>/g, "")
        .replace(/[\w.-]+@[\w.-]+/g, "")
        .replace(/nonce="[^"]*"/g, "");
    expect(strip(await taken.text())).toBe(strip(await fresh.text()));
    const notice = await latestMail("reader@torqueleaf.test", /already have a Torqueleaf account/, newest);
    expect((await mailsTo("reader@torqueleaf.test")).length).toBe(before + 1);
    expect(notice.text).not.toMatch(/\/verify\//);
  });

  it("answers a wrong password and an unknown address alike", async () => {
    const client = app.client();
    const wrong = await client.signIn("reader@torqueleaf.test", "not the password");
    const unknown = await client.signIn(uniqueEmail("nobody"), "not the password");
    expect(wrong.status).toBe(401);
    expect(unknown.status).toBe(401);
    const message = (html: string) => html.match(/role="alert"[^>]*>([^<]*)</)?.[1];
    const shown = message(await wrong.text());
    expect(shown).toContain("do not match an account");
    expect(message(await unknown.text())).toBe(shown);
  });

  it("sends a fresh confirmation link on request, answering alike for unknown addresses", async () => {
    const email = uniqueEmail("resend");
    const client = app.client();
    await client.post("/signup", { name: "Resend Test", email, password: "wire sized by drop" });
    const first = await latestMail(email, /Confirm/);
    const resend = await client.post("/login", { intent: "resend", email });
    const unknown = await client.post("/login", { intent: "resend", email: uniqueEmail("ghost") });
    expect(resend.status).toBe(200);
    expect(unknown.status).toBe(200);
    const second = await latestMail(email, /Confirm/, first.id);
    expect(second.id).not.toBe(first.id);
    // Only the newest link works.
    expect((await client.post(linkPath(first, /https?:\/\/\S+\/verify\/[\w-]+/), {})).status).toBe(400);
    expect((await client.post(linkPath(second, /https?:\/\/\S+\/verify\/[\w-]+/), {})).status).toBe(302);
  });
});

describe("mailed links", () => {
  it("stop working once their time is up", async () => {
    const email = uniqueEmail("late");
    const client = app.client();
    await client.post("/signup", { name: "Late Reader", email, password: "opened the mail too late" });
    const path = linkPath(await latestMail(email, /Confirm/), /https?:\/\/\S+\/verify\/[\w-]+/);
    const { getDb } = await import("~/db/client.server");
    const { userTokens, users } = await import("~/db/schema");
    const { eq } = await import("drizzle-orm");
    const db = await getDb();
    const [user] = await db.select().from(users).where(eq(users.email, email));
    // As if the day had passed.
    await db
      .update(userTokens)
      .set({ expiresAt: new Date(Date.now() - 1000) })
      .where(eq(userTokens.userId, user.id));
    const late = await client.post(path, {});
    expect(late.status).toBe(400);
    expect(await late.text()).toContain("expired or was used already");
    const [after] = await db.select().from(users).where(eq(users.email, email));
    expect(after.emailVerifiedAt).toBeNull();
  });

  it("are stored only as hashes", async () => {
    const email = uniqueEmail("hashed");
    await app.client().post("/signup", { name: "Hash Check", email, password: "nothing in plain text" });
    const token = linkPath(await latestMail(email, /Confirm/), /https?:\/\/\S+\/verify\/[\w-]+/)
      .split("/")
      .at(-1)!;
    const { getDb } = await import("~/db/client.server");
    const { userTokens } = await import("~/db/schema");
    const rows = await (await getDb()).select().from(userTokens);
    expect(rows.some((r) => r.tokenHash === token)).toBe(false);
    expect(rows.some((r) => r.tokenHash === createHash("sha256").update(token).digest("hex"))).toBe(true);
  });
});

describe("password reset", () => {
  it("mails a single-use link, sets the new password and ends every session of the account", async () => {
    const email = uniqueEmail("reset");
    await joinAndConfirm("Reset Tester", email, "first long password");
    const laptop = app.client();
    expect((await laptop.signIn(email, "first long password")).status).toBe(302);
    expect(await laptop.me()).not.toBeNull();

    const stranger = app.client();
    const request = await stranger.post("/reset", { email });
    const unknown = await stranger.post("/reset", { email: uniqueEmail("nobody") });
    expect(request.status).toBe(200);
    expect(unknown.status).toBe(200);
    expect(await request.text()).toContain("a link is on its way");

    const mail = await latestMail(email, /new Torqueleaf password/);
    expect(mail.text).toContain("30 minutes");
    const path = linkPath(mail, /https?:\/\/\S+\/reset\/[\w-]+/);
    expect((await stranger.get(path)).status).toBe(200);
    const weak = await stranger.post(path, { password: "qwerty123" });
    expect(weak.status).toBe(400);
    expect(await weak.text()).toContain("most common");
    const done = await stranger.post(path, { password: "second long password" });
    expect(done.headers.get("location")).toBe("/login?notice=reset");

    expect(await laptop.me()).toBeNull();
    expect((await stranger.signIn(email, "first long password")).status).toBe(401);
    expect((await stranger.signIn(email, "second long password")).status).toBe(302);
    const reused = await stranger.post(path, { password: "third long password" });
    expect(reused.status).toBe(400);
    expect(await reused.text()).toContain("expired or was used already");
    await latestMail(email, /password was changed/);
  });
});

describe("account settings", () => {
  it("changes the name, and a password change ends the other sessions but keeps this one", async () => {
    const email = uniqueEmail("settings");
    await joinAndConfirm("Settings Tester", email, "my first passphrase");
    const phone = app.client();
    const desk = app.client();
    await phone.signIn(email, "my first passphrase");
    await desk.signIn(email, "my first passphrase");

    const rename = await desk.post("/me/account", { intent: "profile", name: "  Settings Renamed " });
    await expectFlash(desk, rename, "/me/account", "Your name is saved.");
    expect((await desk.me())?.name).toBe("Settings Renamed");

    const wrongCurrent = await desk.post("/me/account", {
      intent: "password",
      currentPassword: "nope",
      newPassword: "my second passphrase",
    });
    expect(wrongCurrent.status).toBe(400);
    expect(await wrongCurrent.text()).toContain("That is not your current password.");

    const change = await desk.post("/me/account", {
      intent: "password",
      currentPassword: "my first passphrase",
      newPassword: "my second passphrase",
    });
    await expectFlash(desk, change, "/me/account", "Every other device was signed out.");
    expect(await desk.me()).not.toBeNull();
    expect(await phone.me()).toBeNull();
  });

  it("lists the sessions, signs out one device, then signs out everywhere", async () => {
    const email = uniqueEmail("sessions");
    await joinAndConfirm("Session Tester", email, "a long enough phrase");
    const a = app.client();
    const b = app.client();
    await a.signIn(email, "a long enough phrase");
    await b.signIn(email, "a long enough phrase");
    const page = await (await a.get("/me/account")).text();
    const rows = page.split("<li").filter((part) => part.includes('name="sessionId"'));
    expect(rows.length).toBe(2);
    const idOf = (row: string) => row.match(/name="sessionId" value="([0-9a-f]{64})"/)?.[1];
    expect(rows.filter((row) => row.includes("This browser")).length).toBe(1);
    const other = idOf(rows.find((row) => !row.includes("This browser"))!);

    // Sign out the other device from this one.
    const revoke = await a.post("/me/account", { intent: "revoke", sessionId: other! });
    await expectFlash(a, revoke, "/me/account", "That device is signed out.");
    expect(await b.me()).toBeNull();
    expect(await a.me()).not.toBeNull();

    await b.signIn(email, "a long enough phrase");
    const everywhere = await a.post("/me/account", { intent: "everywhere" });
    expect(everywhere.headers.get("location")).toBe("/login?notice=everywhere");
    expect(await a.me()).toBeNull();
    expect(await b.me()).toBeNull();
  });

  it("sends anonymous visitors to sign in and back", async () => {
    const response = await app.client().get("/me/account");
    expect(response.status).toBe(302);
    expect(response.headers.get("location")).toBe("/login?redirectTo=%2Fme%2Faccount");
  });
});

describe("contributor terms", () => {
  it("a reader who accepts becomes an author, recorded in the audit log", async () => {
    const email = uniqueEmail("terms");
    await joinAndConfirm("Terms Tester", email, "writing my first guide");
    const client = app.client();
    await client.signIn(email, "writing my first guide");
    const unticked = await client.post("/contributor-terms", {});
    expect(unticked.status).toBe(400);
    expect(await unticked.text()).toContain("Tick the box");
    const accepted = await client.post("/contributor-terms", { agree: "yes" });
    expect(accepted.status).toBe(302);
    const me = await client.me();
    expect(me?.role).toBe("author");
    expect(me?.permissions).toContain("create:guide");
    const again = await client.post("/contributor-terms", { agree: "yes" });
    expect(again.status).toBe(409);

    const { getDb } = await import("~/db/client.server");
    const { auditLog } = await import("~/db/schema");
    const { eq } = await import("drizzle-orm");
    const rows = await (await getDb())
      .select()
      .from(auditLog)
      .where(eq(auditLog.subjectId, String(me?.id)));
    expect(rows.map((r) => r.action)).toContain("user.accepted-contributor-terms");
  });
});
