import { describe, expect, it } from "vitest";
import type { TestClient } from "../support/http-client";
import { sharedApp } from "../support/shared-app";

// The shared app server; every account these tests change is made here with a unique address.
const app = sharedApp("auth-github");

// The GitHub stand-in's invented identities (app/services/fakes/github.ts).
const TOVE = 710001; // verified address, no account here yet
const RUNE = 710002; // verified reader@torqueleaf.test, which belongs to the demo reader
const PIA = 710003; // unverified author@torqueleaf.test

/** Walks the OAuth round trip over HTTP: our start route, the stand-in's authorize page and button, our callback. */
async function throughGitHub(client: TestClient, identity: number, opts: { redirectTo?: string; tamperState?: boolean } = {}) {
  const start = await client.get(`/auth/github${opts.redirectTo ? `?redirectTo=${encodeURIComponent(opts.redirectTo)}` : ""}`);
  expect(start.status).toBe(302);
  const authorize = new URL(start.headers.get("location")!);
  expect(`${authorize.origin}${authorize.pathname}`).toBe(`${process.env.GITHUB_BASE_URL}/login/oauth/authorize`);
  expect(authorize.searchParams.get("redirect_uri")).toBe(`${app.origin}/auth/github/callback`);
  expect(authorize.searchParams.get("scope")).toBe("read:user user:email");
  const page = await (await fetch(authorize)).text();
  expect(page).toContain("Continue as");
  const state = authorize.searchParams.get("state")!;
  const chosen = await fetch(`${process.env.GITHUB_BASE_URL}/login/oauth/authorize`, {
    method: "POST",
    body: new URLSearchParams({
      redirect_uri: authorize.searchParams.get("redirect_uri")!,
      state: opts.tamperState ? `${state}x` : state,
      identity: String(identity),
    }),
    redirect: "manual",
  });
  const callback = new URL(chosen.headers.get("location")!);
  expect(callback.pathname).toBe("/auth/github/callback");
  return client.get(`${callback.pathname}${callback.search}`);
}

describe("sign-in with GitHub through the stand-in", () => {
  it("creates a reader account for a new identity with a verified address, and finds it again by GitHub's id", async () => {
    const client = app.client();
    const done = await throughGitHub(client, TOVE, { redirectTo: "/contributor-terms" });
    expect(done.status).toBe(302);
    expect(done.headers.get("location")).toBe("/contributor-terms");
    const me = await client.me();
    expect(me).toMatchObject({ name: "Tove Arnesen", email: "tove.arnesen@example.test", role: "reader" });

    const { getDb } = await import("~/db/client.server");
    const { auditLog } = await import("~/db/schema");
    const { and, eq } = await import("drizzle-orm");
    const [linked] = await (await getDb())
      .select()
      .from(auditLog)
      .where(and(eq(auditLog.subjectType, "user"), eq(auditLog.subjectId, String(me?.id))));
    expect(linked).toMatchObject({ action: "user.linked-provider", data: { provider: "github", providerUserId: String(TOVE) } });

    const again = app.client();
    await throughGitHub(again, TOVE);
    expect((await again.me())?.id).toBe(me?.id);
    // The account has no password, so the password form cannot open it.
    expect((await app.client().signIn("tove.arnesen@example.test", "anything at all")).status).toBe(401);
  });

  it("asks before linking to an existing account with the same verified address; cancelling changes nothing", async () => {
    const client = app.client();
    const done = await throughGitHub(client, RUNE);
    expect(done.headers.get("location")).toBe("/auth/github/link");
    expect(await client.me()).toBeNull();
    const page = await client.get("/auth/github/link");
    expect(page.status).toBe(200);
    const html = await page.text();
    expect(html).toContain("@<!-- -->dusty-relay");
    expect(html).toContain("Mina Solberg");

    const cancel = await client.post("/auth/github/link", { intent: "cancel" });
    expect(cancel.headers.get("location")).toBe("/login");
    expect(await client.me()).toBeNull();
    // Nothing was linked: the same identity is asked again.
    expect((await throughGitHub(app.client(), RUNE)).headers.get("location")).toBe("/auth/github/link");
  });

  it("links on confirmation, signs in as the existing reader, and signs straight in afterwards", async () => {
    const client = app.client();
    await throughGitHub(client, RUNE, { redirectTo: "/me/account" });
    const link = await client.post("/auth/github/link", { intent: "link" });
    expect(link.status).toBe(302);
    expect(link.headers.get("location")).toBe("/me/account");
    expect(await client.me()).toMatchObject({ email: "reader@torqueleaf.test", name: "Mina Solberg", role: "reader" });
    // The pending link was single-use.
    expect((await client.post("/auth/github/link", { intent: "link" })).headers.get("location")).toBe(
      "/login?notice=link-expired",
    );

    const later = app.client();
    const direct = await throughGitHub(later, RUNE);
    expect(direct.headers.get("location")).toBe("/");
    expect((await later.me())?.email).toBe("reader@torqueleaf.test");
  });

  it("refuses to link when GitHub does not report the matching address as verified", async () => {
    const client = app.client();
    const done = await throughGitHub(client, PIA);
    // The same refusal as for an identity with no verified address at all (see auth-github-claim.test.ts).
    expect(done.headers.get("location")).toBe("/login?notice=github-no-email");
    expect(await client.me()).toBeNull();
    expect(await (await client.get("/login?notice=github-no-email")).text()).toContain(
      "GitHub did not share a verified e-mail address",
    );
  });

  it("ends the trip when the state does not match the one this browser was given", async () => {
    const client = app.client();
    const done = await throughGitHub(client, TOVE, { tamperState: true });
    expect(done.headers.get("location")).toBe("/login?notice=github-failed");
    expect(await client.me()).toBeNull();
  });

  it("ignores a return address off the site", async () => {
    const client = app.client();
    const done = await throughGitHub(client, TOVE, { redirectTo: "//evil.example/steal" });
    expect(done.headers.get("location")).toBe("/");
  });
});
