import { request as httpRequest } from "node:http";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { startAppServer } from "../support/app-server";
import { useTestDatabase } from "../support/base-db";
import { TestClient } from "../support/http-client";
import { dataUrl, leaksInternals, moduleShape, photoPath, ROUTE_PATHS, type RouteInfo, routeList } from "../support/route-walk";

/**
 * Malformed requests to every route of app/routes.ts, over HTTP on the development server: each is
 * answered with a 4xx that says what was wrong, never a 5xx, never with a stack trace. Forms are
 * application/x-www-form-urlencoded or multipart/form-data (HTML Living Standard §4.10.21.7);
 * multipart framing per RFC 7578 and RFC 2046 §5.1.1.
 */

let app: Awaited<ReturnType<typeof startAppServer>>;
let photo = "";
const routes = routeList();

beforeAll(async () => {
  useTestDatabase("malformed-requests");
  app = await startAppServer();
  photo = await photoPath(app.origin);
});
afterAll(async () => app?.stop());

const bytes = (text: string) => new Blob([text]);

/** Bodies no form or API route can read as sent. A Blob without a type goes without a Content-Type of its own. */
const MALFORMED: { name: string; type: string | null; body: Blob }[] = [
  { name: "JSON", type: "application/json", body: bytes('{"email":"a@example.test","password":"x"}') },
  { name: "broken JSON", type: "application/json", body: bytes('{"email": "a@exa') },
  { name: "text/plain", type: "text/plain", body: bytes("email=a@example.test") },
  { name: "XML", type: "application/xml", body: bytes("<form><email>a@example.test</email></form>") },
  { name: "no content type", type: null, body: bytes("email=a%40example.test") },
  { name: "no content type, no body", type: null, body: bytes("") },
  {
    name: "broken multipart",
    type: "multipart/form-data; boundary=tl-boundary",
    body: bytes('--tl-boundary\r\nContent-Disposition: form-data; name="email"\r\n\r\na@example.test'),
  },
  {
    name: "multipart with the wrong boundary",
    type: "multipart/form-data; boundary=tl-announced",
    body: bytes('--tl-other\r\nContent-Disposition: form-data; name="email"\r\n\r\na@example.test\r\n--tl-other--\r\n'),
  },
  {
    name: "multipart without a boundary",
    type: "multipart/form-data",
    body: bytes('--x\r\nContent-Disposition: form-data; name="email"\r\n\r\na@example.test\r\n--x--\r\n'),
  },
];

/** A raw request, for methods fetch() refuses to send (TRACE). */
function raw(method: string, path: string, headers: Record<string, string>) {
  return new Promise<{ status: number; headers: Record<string, string | string[] | undefined>; body: string }>(
    (resolve, reject) => {
      const req = httpRequest(`${app.origin}${path}`, { method, headers }, (res) => {
        let body = "";
        res.setEncoding("utf8");
        res.on("data", (chunk) => {
          body += chunk;
        });
        res.on("end", () => resolve({ status: res.statusCode ?? 0, headers: res.headers, body }));
      });
      req.on("error", reject);
      req.end();
    },
  );
}

async function targets(route: RouteInfo) {
  const shape = await moduleShape(route.file);
  const paths = ROUTE_PATHS[route.pattern](photo);
  return shape.isPage ? paths.flatMap((p) => [p, dataUrl(p)]) : paths;
}

const isApi = (path: string) => path.startsWith("/api/");

async function postMalformedEverywhere(client: TestClient): Promise<{ wrong: string[]; count: number }> {
  const wrong: string[] = [];
  let count = 0;
  for (const route of routes) {
    for (const path of await targets(route)) {
      for (const sample of MALFORMED) {
        const headers: Record<string, string> = sample.type ? { "content-type": sample.type } : {};
        const response = await client.request(path, { method: "POST", headers, body: sample.body });
        const body = await response.text();
        count++;
        const label = `POST ${path} with ${sample.name} → ${response.status}`;
        if (response.status < 400 || response.status >= 500) wrong.push(label);
        if (leaksInternals(body)) wrong.push(`${label}: the body shows a stack trace or server paths`);
        if (isApi(path)) {
          const error = (JSON.parse(body) as { error?: { code?: string; message?: string } }).error;
          if (!error?.code || !error.message) wrong.push(`${label}: not the API's error shape: ${body.slice(0, 120)}`);
        } else if (response.status !== 405 && !/x-www-form-urlencoded|could not be read/.test(body)) {
          wrong.push(`${label}: the answer does not say what was wrong`);
        }
      }
    }
  }
  return { wrong, count };
}

describe("malformed requests", () => {
  it("refuses every malformed body on every route with a 4xx that says why, for a visitor", async () => {
    const { wrong, count } = await postMalformedEverywhere(new TestClient(app.origin));
    expect(wrong).toEqual([]);
    expect(count).toBeGreaterThan(routes.length * MALFORMED.length);
  }, 180_000);

  it("refuses them the same way for a signed-in admin, whose actions read more", async () => {
    const client = new TestClient(app.origin);
    expect((await client.signIn("admin@torqueleaf.test", "torqueleaf-demo")).status).toBe(302);
    const { wrong } = await postMalformedEverywhere(client);
    expect(wrong).toEqual([]);
    // Nothing was acted on: the session survived posts to /logout.
    expect((await client.me())?.email).toBe("admin@torqueleaf.test");
  }, 180_000);

  it("answers methods pages do not take with 405 and Allow, TRACE included", async () => {
    const wrong: string[] = [];
    for (const route of routes) {
      for (const path of ROUTE_PATHS[route.pattern](photo)) {
        for (const method of ["TRACE", "PUT", "DELETE", "PATCH", "OPTIONS"]) {
          const response = await raw(method, path, { origin: app.origin, "content-type": "application/x-www-form-urlencoded" });
          const label = `${method} ${path} → ${response.status}`;
          if (response.status >= 500 || response.status < 400) wrong.push(label);
          if (leaksInternals(response.body)) wrong.push(`${label}: the body shows a stack trace or server paths`);
          // RFC 9110 §15.5.6: a 405 names the methods the resource does serve.
          if (response.status === 405 && !response.headers.allow) wrong.push(`${label}: no Allow header`);
          if (!isApi(path) && response.status !== 405) wrong.push(`${label}: expected 405 on a page`);
        }
      }
    }
    expect(wrong).toEqual([]);
  }, 180_000);

  it("answers an unknown /api address with 404 in the API's error shape, for any method", async () => {
    const client = new TestClient(app.origin);
    for (const method of ["GET", "POST", "PUT", "DELETE"]) {
      const response = await client.request("/api/no-such-endpoint", {
        method,
        ...(method === "GET" ? {} : { headers: { "content-type": "application/json" }, body: "{}" }),
      });
      expect(response.status, method).toBe(404);
      expect(await response.json()).toEqual({ error: { code: "not-found", message: "No API route at /api/no-such-endpoint." } });
    }
  });

  it("still lets a well-formed form through to the action, urlencoded and multipart alike", async () => {
    const client = new TestClient(app.origin);
    // Wrong credentials: the action ran and answered (401), rather than the shape check.
    const urlencoded = await client.post("/login", { email: "nobody@example.test", password: "not the password" });
    const multipart = new FormData();
    multipart.set("email", "nobody@example.test");
    multipart.set("password", "not the password");
    const parts = await client.request("/login", { method: "POST", body: multipart });
    expect([urlencoded.status, parts.status]).toEqual([401, 401]);
  });
});
