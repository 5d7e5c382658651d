import { request as httpRequest } from "node:http";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { startAppServer } from "../support/app-server";
import { useTestDatabase } from "../support/base-db";
import { TestClient } from "../support/http-client";

// The limits are the app's own choice (common practice: a few hundred KB for forms, 1 MB for JSON).
let app: Awaited<ReturnType<typeof startAppServer>>;

beforeAll(async () => {
  useTestDatabase("body-limit");
  app = await startAppServer();
  // The development server compiles modules on first use; the timings below are about the limit, not that.
  for (const path of ["/api/guides", "/login"]) await fetch(`${app.origin}${path}`);
});
afterAll(async () => app?.stop());

const form = { "content-type": "application/x-www-form-urlencoded" };

/** Sends a body in pieces without Content-Length (chunked), as a client that hides its size would. */
function streamed(path: string, headers: Record<string, string>, pieces: Iterable<string>) {
  return new Promise<{ status: number; body: string }>((resolve, reject) => {
    const url = new URL(path, app.origin);
    const req = httpRequest(url, { method: "POST", headers: { ...headers, origin: app.origin } }, (res) => {
      let body = "";
      res.setEncoding("utf8");
      res.on("data", (c) => {
        body += c;
      });
      res.on("end", () => resolve({ status: res.statusCode ?? 0, body }));
    });
    // The server may end the connection once it has answered.
    req.on("error", (error) =>
      error.message.includes("EPIPE") || error.message.includes("ECONNRESET") ? undefined : reject(error),
    );
    (async () => {
      for (const piece of pieces) {
        if (req.destroyed) return;
        if (!req.write(piece)) await new Promise((r) => req.once("drain", r));
      }
      req.end();
    })().catch(reject);
  });
}

describe("request bodies are limited before the app parses them", () => {
  // That the refusal does not wait for the body is shown without a clock by the production-start
  // test, whose body never ends.
  it("answers a 30 MB form with 413 while another request is served", async () => {
    const body = "a=&".repeat(10_000_000);
    const big = fetch(`${app.origin}/login`, { method: "POST", headers: { ...form, origin: app.origin }, body }).then(
      async (r) => ({ status: r.status, text: await r.text() }),
    );
    await new Promise((r) => setTimeout(r, 50));
    const other = await fetch(`${app.origin}/api/guides`);
    const answer = await big;
    expect(answer.status).toBe(413);
    expect(answer.text).toMatch(/larger than 256 KB/);
    expect(other.status).toBe(200);
  });

  it("cuts off a form streamed without Content-Length at the limit", async () => {
    function* pieces() {
      for (let i = 0; i < 2_000; i++) yield "x".repeat(16_384);
    }
    const answer = await streamed("/login", { ...form, "transfer-encoding": "chunked" }, pieces());
    expect(answer.status).toBe(413);
    expect(answer.body).toMatch(/larger than 256 KB/);
  });

  it("refuses a small form with more than 1,000 fields", async () => {
    const body = Array.from({ length: 1_500 }, (_, i) => `f${i}=x`).join("&");
    expect(body.length).toBeLessThan(256 * 1024);
    const response = await fetch(`${app.origin}/login`, { method: "POST", headers: { ...form, origin: app.origin }, body });
    expect(response.status).toBe(413);
    expect(await response.text()).toMatch(/more than 1000 fields/);
  });

  it("counts multipart parts too, even when a boundary is split between chunks", async () => {
    const boundary = "torqueleaf-test-boundary";
    const part = (i: number) => `--${boundary}\r\nContent-Disposition: form-data; name="f${i}"\r\n\r\nx\r\n`;
    const text = `${Array.from({ length: 1_200 }, (_, i) => part(i)).join("")}--${boundary}--\r\n`;
    // Pieces of 7 characters cut almost every boundary line in two.
    const pieces = text.match(/[\s\S]{1,7}/g) ?? [];
    const answer = await streamed(
      "/login",
      { "content-type": `multipart/form-data; boundary=${boundary}`, "transfer-encoding": "chunked" },
      pieces,
    );
    expect(answer.status).toBe(413);
    expect(answer.body).toMatch(/more than 1000 fields/);
  });

  it("answers an oversized JSON body under /api in the API's error shape", async () => {
    const response = await fetch(`${app.origin}/api/circuit`, {
      method: "POST",
      headers: { "content-type": "application/json", origin: app.origin },
      body: JSON.stringify({ note: "x".repeat(1_100_000) }),
    });
    expect(response.status).toBe(413);
    expect(response.headers.get("content-type")).toMatch(/application\/json/);
    expect(await response.json()).toEqual({
      error: { code: "too-large", message: "The request body is larger than 1 MB, the most this address accepts." },
    });
  });

  it("hands a form within the limits to the app intact, with or without Content-Length", async () => {
    const client = new TestClient(app.origin);
    expect((await client.signIn("reader@torqueleaf.test", "torqueleaf-demo")).status).toBe(302);
    expect((await client.me())?.email).toBe("reader@torqueleaf.test");

    const body = new URLSearchParams({ email: "editor@torqueleaf.test", password: "torqueleaf-demo" }).toString();
    // Split inside a field so that the pieces must be joined again in order.
    const answer = await streamed("/login", { ...form, "transfer-encoding": "chunked" }, [body.slice(0, 9), body.slice(9)]);
    expect(answer.status).toBe(302);
  });

  it("passes a photo upload to the app as it streams: the answer comes before the body ends", async () => {
    const boundary = "torqueleaf-test-boundary";
    const head = `--${boundary}\r\nContent-Disposition: form-data; name="file"; filename="a.jpg"\r\nContent-Type: image/jpeg\r\n\r\n`;
    const url = new URL("/api/media", app.origin);
    const status = await new Promise<number>((resolve, reject) => {
      const req = httpRequest(url, {
        method: "POST",
        headers: {
          "content-type": `multipart/form-data; boundary=${boundary}`,
          "transfer-encoding": "chunked",
          origin: app.origin,
        },
      });
      req.on("response", (res) => {
        resolve(res.statusCode ?? 0);
        req.destroy();
      });
      req.on("error", (error) => (req.destroyed ? undefined : reject(error)));
      // The first 64 KB of a larger photo, and then nothing: a middleware that held the whole body
      // would never let the app answer.
      req.write(head + "x".repeat(64 * 1024));
      setTimeout(() => reject(new Error("no answer while the body was still open")), 5_000).unref();
    });
    // Not signed in: the app refuses at once (401), without waiting for the rest of the upload.
    expect(status).toBe(401);
  });
});
