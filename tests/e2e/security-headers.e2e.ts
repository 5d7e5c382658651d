import { request as httpRequest } from "node:http";
import { beforeAll, describe, expect, inject, it } from "vitest";
import { TestClient } from "../support/http-client";
import { dataUrl, leaksInternals, moduleShape, photoPath, ROUTE_PATHS, routeList, securityProblems } from "../support/route-walk";

/**
 * The security headers on the built app as `npm start` serves it (Express): every route of
 * app/routes.ts, and what only this server answers, the static files of build/client.
 */

const origin = inject("origin");
let photo = "";
const routes = routeList();

beforeAll(async () => {
  photo = await photoPath(origin);
});

async function walkAll(client: TestClient, signedIn: boolean) {
  const problems: string[] = [];
  for (const route of routes) {
    if (signedIn && route.pattern === "/logout") continue;
    const shape = await moduleShape(route.file);
    for (const path of ROUTE_PATHS[route.pattern](photo)) {
      const urls = shape.isPage ? [path, dataUrl(path)] : [path];
      for (const url of urls) {
        const response = await client.get(url);
        problems.push(...securityProblems(`GET ${url}`, response, await response.text(), { signedIn }));
        if (shape.hasAction) {
          const posted = await client.post(url, {});
          problems.push(...securityProblems(`POST ${url}`, posted, await posted.text(), { signedIn }));
        }
      }
    }
  }
  return problems;
}

describe("security headers on the built app", () => {
  it("are on every answer of every route, for a visitor and for a signed-in admin", async () => {
    expect(await walkAll(new TestClient(origin), false)).toEqual([]);
    const admin = new TestClient(origin);
    expect((await admin.signIn("admin@torqueleaf.test", "torqueleaf-demo")).status).toBe(302);
    expect(await walkAll(admin, true)).toEqual([]);
  });

  it("are on static files, the built scripts and a stored photo", async () => {
    const html = await (await fetch(`${origin}/`)).text();
    const script = html.match(/\/assets\/[\w.-]+\.js/)?.[0];
    const stylesheet = html.match(/\/assets\/[\w.-]+\.css/)?.[0];
    expect(script).toBeDefined();
    expect(stylesheet).toBeDefined();
    for (const path of ["/favicon.svg", script ?? "", stylesheet ?? "", photo]) {
      const response = await fetch(`${origin}${path}`);
      expect(response.status, path).toBe(200);
      expect(securityProblems(`GET ${path}`, response, "")).toEqual([]);
    }
    // A file that is not there falls through to the app's 404 page, with the headers all the same.
    const missing = await fetch(`${origin}/assets/no-such-file.js`);
    expect(missing.status).toBe(404);
    expect(securityProblems("GET /assets/no-such-file.js", missing, await missing.text())).toEqual([]);
  });

  it("are on the 405 for TRACE, which never reaches the app", async () => {
    const answer = await new Promise<{ status: number; headers: Headers; body: string }>((resolve, reject) => {
      const req = httpRequest(`${origin}/login`, { method: "TRACE" }, (res) => {
        let body = "";
        res.on("data", (chunk) => {
          body += chunk;
        });
        res.on("end", () => {
          const headers = new Headers();
          for (const [name, value] of Object.entries(res.headers)) if (typeof value === "string") headers.set(name, value);
          resolve({ status: res.statusCode ?? 0, headers, body });
        });
      });
      req.on("error", reject);
      req.end();
    });
    expect(answer.status).toBe(405);
    expect(answer.headers.get("allow")).toBe("GET, HEAD, POST");
    expect(leaksInternals(answer.body)).toBe(false);
    expect(securityProblems("TRACE /login", new Response(null, { headers: answer.headers }), "")).toEqual([]);
  });
});
