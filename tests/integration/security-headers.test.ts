import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { startAppServer } from "../support/app-server";
import { useTestDatabase } from "../support/base-db";
import { TestClient } from "../support/http-client";
import {
  dataUrl,
  moduleShape,
  parseCsp,
  photoPath,
  ROUTE_PATHS,
  type RouteInfo,
  routeList,
  securityProblems,
} from "../support/route-walk";

/**
 * Every route of app/routes.ts, called over HTTP on the development server (`npm run dev`): the
 * security headers are on every answer, pages and their `.data`, the API, resource routes and
 * photos. The built app, static files included, is walked the same way in
 * tests/e2e/security-headers.e2e.ts.
 */

let app: Awaited<ReturnType<typeof startAppServer>>;
let photo = "";
const routes = routeList();

beforeAll(async () => {
  useTestDatabase("security-headers");
  app = await startAppServer();
  photo = await photoPath(app.origin);
});
afterAll(async () => app?.stop());

/** GET (and `.data` for a page) and, where the route has an action, a POST of an empty form. */
async function walk(client: TestClient, route: RouteInfo, signedIn: boolean): Promise<string[]> {
  const problems: string[] = [];
  const shape = await moduleShape(route.file);
  for (const path of ROUTE_PATHS[route.pattern](photo)) {
    const requests: [string, string][] = [["GET", path]];
    if (shape.isPage) requests.push(["GET", dataUrl(path)]);
    if (shape.hasAction) requests.push(["POST", path]);
    if (shape.hasAction && shape.isPage) requests.push(["POST", dataUrl(path)]);
    for (const [method, url] of requests) {
      const response = method === "GET" ? await client.get(url) : await client.post(url, {});
      const body = await response.text();
      problems.push(...securityProblems(`${method} ${url}`, response, body, { signedIn }));
    }
  }
  return problems;
}

describe("security headers", () => {
  it("has a way to reach every route in app/routes.ts", () => {
    const patterns = routes.map((r) => r.pattern);
    expect(
      patterns.filter((p) => !ROUTE_PATHS[p]),
      "routes without a path in tests/support/route-walk.ts",
    ).toEqual([]);
    expect(
      Object.keys(ROUTE_PATHS).filter((p) => !patterns.includes(p)),
      "paths for routes that no longer exist",
    ).toEqual([]);
  });

  it("puts them on every answer of every route for a visitor", async () => {
    const client = new TestClient(app.origin);
    const problems: string[] = [];
    for (const route of routes) problems.push(...(await walk(client, route, false)));
    expect(problems).toEqual([]);
    // The development server compiles each route on its first request.
  }, 180_000);

  it("puts them on every answer for a signed-in member, whose pages are never stored", async () => {
    const client = new TestClient(app.origin);
    expect((await client.signIn("admin@torqueleaf.test", "torqueleaf-demo")).status).toBe(302);
    const problems: string[] = [];
    // Not /logout's POST, which would end the session half-way.
    for (const route of routes.filter((r) => r.pattern !== "/logout")) problems.push(...(await walk(client, route, true)));
    expect(problems).toEqual([]);
    // The check above can fail: the same page for a visitor carries no such instruction.
    const anonymous = await new TestClient(app.origin).get("/");
    expect(anonymous.headers.get("cache-control") ?? "").not.toMatch(/no-store/);
  }, 180_000);

  it("gives every document a fresh nonce, the one on all of its scripts", async () => {
    const nonces = new Set<string>();
    for (let i = 0; i < 3; i++) {
      const response = await fetch(`${app.origin}/`);
      const nonce = (parseCsp(response.headers.get("content-security-policy")).get("script-src") ?? []).find((s) =>
        s.startsWith("'nonce-"),
      );
      const html = await response.text();
      expect(nonce).toBeDefined();
      expect(html).toContain(`nonce="${nonce?.slice(7, -1)}"`);
      nonces.add(nonce ?? "");
    }
    expect(nonces.size).toBe(3);
  });

  it("answers a photo and a file of the development server with them too", async () => {
    for (const path of [photo, "/favicon.svg"]) {
      const response = await fetch(`${app.origin}${path}`);
      expect(response.status, path).toBe(200);
      expect(securityProblems(`GET ${path}`, response, "")).toEqual([]);
    }
  });
});

describe("the policy itself", () => {
  it("lets photos come from the configured bucket or CDN, and asks for HTTPS only on an https origin", async () => {
    const { contentSecurityPolicy, securityHeaders } = await import("~/services/http/security-headers.server");
    const local = { APP_ORIGIN: "http://localhost:3000", S3_PUBLIC_URL: "", GITHUB_BASE_URL: "" };
    const hosted = {
      APP_ORIGIN: "https://torqueleaf.example.test",
      S3_PUBLIC_URL: "https://cdn.example.test/torqueleaf-media/",
      GITHUB_BASE_URL: "",
    };
    expect(parseCsp(contentSecurityPolicy(local, "n")).get("img-src")).toEqual(["'self'", "data:"]);
    expect(parseCsp(contentSecurityPolicy(hosted, "n")).get("img-src")).toEqual(["'self'", "data:", "https://cdn.example.test"]);
    // With no GitHub address of its own configured, sign-in goes to github.com (remix-auth-github's default).
    expect(parseCsp(contentSecurityPolicy(hosted, "n")).get("form-action")).toEqual(["'self'", "https://github.com"]);
    // RFC 6797 §7.2: a host sends HSTS over secure transport only.
    expect(securityHeaders(local, "n")["Strict-Transport-Security"]).toBeUndefined();
    expect(securityHeaders(hosted, "n")["Strict-Transport-Security"]).toMatch(/^max-age=31536000/);
  });
});
