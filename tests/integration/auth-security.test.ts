import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { startAppServer } from "../support/app-server";
import { useTestDatabase } from "../support/base-db";
import { TestClient, signedIn, uniqueEmail } from "../support/http-client";

let app: Awaited<ReturnType<typeof startAppServer>>;
const DEMO_PASSWORD = "torqueleaf-demo";

beforeAll(async () => {
  useTestDatabase("auth-security");
  app = await startAppServer();
});
afterAll(async () => app?.stop());

const sessionCookieOf = (client: TestClient) => [...client.cookies].find(([name]) => name.endsWith("tl_session"))!;

describe("sessions", () => {
  it("sets an HttpOnly, SameSite=Lax cookie holding an opaque signed id", async () => {
    const client = new TestClient(app.origin);
    const response = await client.signIn("reader@torqueleaf.test", DEMO_PASSWORD);
    const header = response.headers.getSetCookie().find((c) => c.includes("tl_session="))!;
    expect(header).toMatch(/HttpOnly/i);
    expect(header).toMatch(/SameSite=Lax/i);
    expect(header).toMatch(/Path=\//);
    // Nothing about the user travels in the cookie.
    const value = decodeURIComponent(sessionCookieOf(client)[1]);
    expect(Buffer.from(value.split(".")[0], "base64").toString()).not.toMatch(/reader|role|Mina/);
  });

  it("issues a new id at sign-in and ends a session planted beforehand (fixation)", async () => {
    const attacker = await signedIn(app.origin, "reader@torqueleaf.test");
    const [name, planted] = sessionCookieOf(attacker);
    const victim = new TestClient(app.origin);
    victim.cookies.set(name, planted);
    expect((await victim.me())?.email).toBe("reader@torqueleaf.test");

    const response = await victim.signIn("editor@torqueleaf.test", DEMO_PASSWORD);
    expect(response.status).toBe(302);
    expect(sessionCookieOf(victim)[1]).not.toBe(planted);
    expect((await victim.me())?.email).toBe("editor@torqueleaf.test");
    // The planted id no longer works for anyone, so the attacker cannot ride the victim's sign-in.
    expect(await attacker.me()).toBeNull();
  });

  it("revokes the session at sign-out, so a copied cookie stops working", async () => {
    const client = await signedIn(app.origin, "author@torqueleaf.test");
    const [name, value] = sessionCookieOf(client);
    const copy = new TestClient(app.origin);
    copy.cookies.set(name, value);
    expect((await copy.me())?.role).toBe("author");

    const out = await client.post("/logout", {});
    expect(out.status).toBe(302);
    expect(out.headers.getSetCookie().some((c) => c.startsWith(`${name}=;`) && /Max-Age=0/i.test(c))).toBe(true);
    expect(await copy.me()).toBeNull();
    // The answer above cleared the dead cookie in the copy; a stubborn client sends it again.
    copy.cookies.set(name, value);
    const page = await copy.get("/me/account");
    expect(page.status).toBe(302);
    // The dead cookie is cleared on the way.
    expect(page.headers.getSetCookie().some((c) => c.startsWith(`${name}=;`))).toBe(true);
  });

  it("treats a tampered cookie as no cookie and clears it", async () => {
    const client = await signedIn(app.origin, "admin@torqueleaf.test");
    const [name, value] = sessionCookieOf(client);
    const forged = new TestClient(app.origin);
    const [payload, signature] = decodeURIComponent(value).split(".");
    const otherPayload = Buffer.from(JSON.stringify("x".repeat(43))).toString("base64");
    for (const tampered of [`${otherPayload}.${signature}`, `${payload}.${signature.slice(0, -4)}AAAA`, payload, "garbage"]) {
      forged.cookies.set(name, encodeURIComponent(tampered));
      const response = await forged.get("/api/me");
      expect(((await response.json()) as { user: unknown }).user).toBeNull();
      expect(response.headers.getSetCookie().some((c) => c.startsWith(`${name}=;`))).toBe(true);
      forged.cookies.set(name, encodeURIComponent(tampered));
    }
    expect((await client.me())?.role).toBe("admin");
  });
});

describe("cross-site protection", () => {
  const evil = "http://evil.example";

  it("refuses a page form posted from another origin with 403, and the action does not run", async () => {
    const client = await signedIn(app.origin, "reader@torqueleaf.test");
    const response = await client.post("/logout", {}, { origin: evil });
    expect(response.status).toBe(403);
    expect(await response.text()).toContain("did not come from a Torqueleaf page");
    expect(await client.me()).not.toBeNull();
  });

  it("refuses cross-site writes to the JSON API and resource routes in the API's error shape", async () => {
    const client = new TestClient(app.origin);
    for (const path of ["/api/circuit", "/api/guides", "/api/me"]) {
      const response = await client.request(path, {
        method: "POST",
        origin: evil,
        headers: { "content-type": "application/json" },
        body: "{}",
      });
      expect(response.status, path).toBe(403);
      expect(((await response.json()) as { error: { code: string } }).error.code).toBe("cross-site");
    }
    expect((await client.request("/media/photos/x.webp", { method: "DELETE", origin: evil })).status).toBe(403);
    expect((await client.request("/auth/github", { method: "POST", origin: evil })).status).toBe(403);
  });

  it("refuses a write with no Origin and no fetch metadata, and a data request from elsewhere", async () => {
    const client = new TestClient(app.origin);
    const bare = await client.post("/login", { email: "reader@torqueleaf.test", password: DEMO_PASSWORD }, { origin: null });
    expect(bare.status).toBe(403);
    const nullOrigin = await client.post(
      "/login",
      { email: "reader@torqueleaf.test", password: DEMO_PASSWORD },
      { origin: "null" },
    );
    expect(nullOrigin.status).toBe(403);
    const crossSite = await client.post("/signup", { name: "x" }, { origin: null, headers: { "sec-fetch-site": "cross-site" } });
    expect(crossSite.status).toBe(403);
    const data = await client.post("/login.data", { email: "reader@torqueleaf.test", password: DEMO_PASSWORD }, { origin: evil });
    expect(data.status).toBe(403);
    expect(client.cookies.size).toBe(0);
  });

  it("accepts a write vouched for by Sec-Fetch-Site: same-origin when Origin is absent", async () => {
    const client = new TestClient(app.origin);
    const response = await client.post(
      "/login",
      { email: "reader@torqueleaf.test", password: DEMO_PASSWORD },
      { origin: null, headers: { "sec-fetch-site": "same-origin" } },
    );
    expect(response.status).toBe(302);
  });
});

describe("redirects after sign-in", () => {
  it("follows same-site paths and refuses every way off the site", async () => {
    const cases: [string, string][] = [
      ["/guides/kestrel-hood-auxiliary-lamps?print=1", "/guides/kestrel-hood-auxiliary-lamps?print=1"],
      ["//evil.example", "/"],
      ["/\\evil.example", "/"],
      ["javascript:alert(document.cookie)", "/"],
      ["https://evil.example/", "/"],
      ["/\t/evil.example", "/"],
    ];
    for (const [target, expected] of cases) {
      const client = new TestClient(app.origin);
      const response = await client.signIn("reader@torqueleaf.test", DEMO_PASSWORD, target);
      expect(response.headers.get("location"), target).toBe(expected);
      const signedInVisit = await client.get(`/login?redirectTo=${encodeURIComponent(target)}`);
      expect(signedInVisit.headers.get("location"), target).toBe(expected);
    }
  });
});

describe("abuse limits", () => {
  it("stops password guessing on one account with 429 and a clear message, even for the right password", async () => {
    const client = new TestClient(app.origin);
    const target = "author2@torqueleaf.test";
    for (let i = 0; i < 10; i++) expect((await client.signIn(target, `wrong guess ${i}`)).status).toBe(401);
    const limited = await client.signIn(target, DEMO_PASSWORD);
    expect(limited.status).toBe(429);
    expect(Number(limited.headers.get("retry-after"))).toBeGreaterThan(0);
    const html = await limited.text();
    expect(html).toContain("Too many sign-in attempts");
    expect(html).toContain('value="author2@torqueleaf.test"');
    // Another account from the same address is not affected by that account's limit.
    expect((await client.signIn("editor@torqueleaf.test", DEMO_PASSWORD)).status).toBe(302);
  });

  it("limits reset requests per account and sign-ups per client address", async () => {
    const client = new TestClient(app.origin);
    for (let i = 0; i < 3; i++) expect((await client.post("/reset", { email: "reader@torqueleaf.test" })).status).toBe(200);
    const reset = await client.post("/reset", { email: "reader@torqueleaf.test" });
    expect(reset.status).toBe(429);
    expect(await reset.text()).toContain("Too many password reset requests");

    for (let i = 0; i < 10; i++) {
      expect(
        (await client.post("/signup", { name: "Flood", email: uniqueEmail("flood"), password: "a fine long phrase" })).status,
      ).toBe(200);
    }
    const signup = await client.post("/signup", { name: "Flood", email: uniqueEmail("flood"), password: "a fine long phrase" });
    expect(signup.status).toBe(429);
    expect(await signup.text()).toContain("Too many sign-ups");
  });

  it("counts in fixed windows that start again once they have passed", async () => {
    const { getDb } = await import("~/db/client.server");
    const { hit } = await import("~/models/rate-limit.server");
    const db = await getDb();
    const key = `test:window:${Date.now()}`;
    expect((await hit(db, key, 2, 300)).allowed).toBe(true);
    expect((await hit(db, key, 2, 300)).allowed).toBe(true);
    const third = await hit(db, key, 2, 300);
    expect(third.allowed).toBe(false);
    expect(third.retryAfter).toBe(1);
    await new Promise((r) => setTimeout(r, 350));
    expect((await hit(db, key, 2, 300)).allowed).toBe(true);
  });

  it("limits attempts at confirmation links per client address", async () => {
    const client = new TestClient(app.origin);
    let last = 0;
    for (let i = 0; i < 31; i++) last = (await client.post(`/verify/guess-${i}`, {})).status;
    expect(last).toBe(429);
  });
});

describe("the guards that loaders and actions call", () => {
  it("answer the API with 401 and 403 in its error shape, and pages with sign-in or 403", async () => {
    const { requirePermission, requireUser } = await import("~/services/auth/guards.server");
    // The author (not the reader, whose sign-in budget the tests above used up).
    const author = await signedIn(app.origin, "author@torqueleaf.test");
    const cookie = author.cookieHeader();
    const thrown = async (fn: () => Promise<unknown>) => {
      try {
        await fn();
      } catch (error) {
        return error;
      }
      throw new Error("the guard let the caller through");
    };

    const anonymousApi = (await thrown(() => requireUser({ request: new Request(`${app.origin}/api/checklists`) }))) as Response;
    expect(anonymousApi.status).toBe(401);
    expect(((await anonymousApi.json()) as { error: { code: string } }).error.code).toBe("unauthorized");

    const forbiddenApi = (await thrown(() =>
      requirePermission(
        { request: new Request(`${app.origin}/api/review/queue`, { headers: { cookie } }) },
        "review:revision:any",
      ),
    )) as Response;
    expect(forbiddenApi.status).toBe(403);
    expect(((await forbiddenApi.json()) as { error: { code: string } }).error.code).toBe("forbidden");

    const anonymousPage = (await thrown(() => requireUser({ request: new Request(`${app.origin}/review?x=1`) }))) as Response;
    expect(anonymousPage.status).toBe(302);
    expect(anonymousPage.headers.get("location")).toBe("/login?redirectTo=%2Freview%3Fx%3D1");

    const forbiddenPage = (await thrown(() =>
      requirePermission({ request: new Request(`${app.origin}/review`, { headers: { cookie } }) }, "review:revision:any"),
    )) as { init: ResponseInit };
    expect(forbiddenPage.init.status).toBe(403);

    const user = await requirePermission(
      { request: new Request(`${app.origin}/me/vehicles`, { headers: { cookie } }) },
      "save:vehicle:own",
    );
    expect(user.email).toBe("author@torqueleaf.test");
  });
});
