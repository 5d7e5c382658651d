import { describe, expect, it } from "vitest";
import { clientAddress, PEER_ADDRESS_HEADER } from "./client-address.server";
import { cookieIsSecure, cookieName } from "./cookie.server";
import { isAllowedWrite } from "./origin.server";
import { safeRedirect } from "./redirect";

describe("redirect targets after sign-in", () => {
  it("keeps paths on this site, with their query and fragment", () => {
    expect(safeRedirect("/guides/kestrel-hood-auxiliary-lamps?print=1#step-3")).toBe(
      "/guides/kestrel-hood-auxiliary-lamps?print=1#step-3",
    );
    expect(safeRedirect("/me/account")).toBe("/me/account");
  });

  it("refuses every way of leaving the site", () => {
    for (const hostile of [
      "//evil.example",
      "/\\evil.example",
      "\\\\evil.example",
      "javascript:alert(1)",
      "https://evil.example/",
      "/\t/evil.example",
      "/\n/evil.example",
      " //evil.example",
      "evil.example",
      "",
    ]) {
      expect(safeRedirect(hostile), JSON.stringify(hostile)).toBe("/");
    }
    expect(safeRedirect(undefined, "/login")).toBe("/login");
    expect(safeRedirect(["/x"])).toBe("/");
  });
});

const post = (headers: Record<string, string>) => new Request("http://localhost:3000/login", { method: "POST", headers });

describe("the cross-site check", () => {
  const origin = "http://localhost:3000";
  it("lets reads through and writes from our own origin", () => {
    expect(isAllowedWrite(new Request("http://localhost:3000/"), origin)).toBe(true);
    expect(isAllowedWrite(post({ origin }), origin)).toBe(true);
    expect(isAllowedWrite(post({ "sec-fetch-site": "same-origin" }), origin)).toBe(true);
  });

  it("refuses writes from elsewhere, from an opaque origin, or with no sign of where they came from", () => {
    expect(isAllowedWrite(post({ origin: "http://evil.example" }), origin)).toBe(false);
    expect(isAllowedWrite(post({ origin: "http://localhost:3001" }), origin)).toBe(false);
    expect(isAllowedWrite(post({ origin: "null" }), origin)).toBe(false);
    expect(isAllowedWrite(post({ "sec-fetch-site": "same-site" }), origin)).toBe(false);
    expect(isAllowedWrite(post({}), origin)).toBe(false);
  });
});

describe("the client's address", () => {
  const request = (headers: Record<string, string>) => new Request("http://localhost/", { headers });
  it("ignores X-Forwarded-For unless a proxy is configured", () => {
    const r = request({ [PEER_ADDRESS_HEADER]: "10.0.0.5", "x-forwarded-for": "203.0.113.9" });
    expect(clientAddress(r, false)).toBe("10.0.0.5");
  });

  it("behind the proxy takes the entry that proxy added (the last), not one the client wrote", () => {
    const r = request({ [PEER_ADDRESS_HEADER]: "10.0.0.5", "x-forwarded-for": "198.51.100.1, 203.0.113.9" });
    expect(clientAddress(r, true)).toBe("203.0.113.9");
  });
});

describe("cookie flags", () => {
  it("uses Secure and the __Host- prefix in production on https and on localhost", () => {
    expect(cookieIsSecure({ NODE_ENV: "production", APP_ORIGIN: "https://torqueleaf.example" })).toBe(true);
    expect(cookieIsSecure({ NODE_ENV: "production", APP_ORIGIN: "http://localhost:3000" })).toBe(true);
    expect(cookieName("tl_session", true)).toBe("__Host-tl_session");
  });

  it("drops both where a browser would refuse a Secure cookie, and in development", () => {
    expect(cookieIsSecure({ NODE_ENV: "production", APP_ORIGIN: "http://garage-pc.lan:3000" })).toBe(false);
    expect(cookieIsSecure({ NODE_ENV: "development", APP_ORIGIN: "https://torqueleaf.example" })).toBe(false);
    expect(cookieName("tl_session", false)).toBe("tl_session");
  });
});

describe("SESSION_SECRET rotation", () => {
  const settings = (secret: string) => ({
    NODE_ENV: "test" as const,
    APP_ORIGIN: "http://localhost:3000",
    SESSION_SECRET: secret,
  });

  it("signs with the first secret and still accepts cookies signed with the others", async () => {
    const { sessionCookie } = await import("./cookie.server");
    const old = await sessionCookie(settings("old-secret-0123456789")).serialize("token-1");
    const rotated = sessionCookie(settings("new-secret-0123456789,old-secret-0123456789"));
    expect(await rotated.parse(old)).toBe("token-1");
    const fresh = await rotated.serialize("token-2");
    expect(await sessionCookie(settings("new-secret-0123456789")).parse(fresh)).toBe("token-2");
  });

  it("ignores a cookie once its secret is dropped, and any tampered value", async () => {
    const { sessionCookie } = await import("./cookie.server");
    const old = await sessionCookie(settings("old-secret-0123456789")).serialize("token-1");
    expect(await sessionCookie(settings("new-secret-0123456789")).parse(old)).toBeNull();
    const tampered = old.replace(/=([^.;]+)\./, (_m, v: string) => `=${v.slice(0, -2)}AA.`);
    expect(await sessionCookie(settings("old-secret-0123456789")).parse(tampered)).toBeNull();
  });
});
