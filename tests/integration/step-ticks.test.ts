import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { StepTicks } from "~/utils/step-ticks";
import { startAppServer } from "../support/app-server";
import { useTestDatabase } from "../support/base-db";
import { TestClient } from "../support/http-client";
import { type ApiError, sendJson, signedIn } from "./authoring-support";

// Work-through mode's step ticks over real HTTP on the development server with a copy of the demo
// database. Status codes follow the error table of design/api.md.

const SLUG = "kestrel-hood-auxiliary-lamps";
const PATH = `/api/guides/${SLUG}/step-ticks`;
let app: Awaited<ReturnType<typeof startAppServer>>;
let reader: TestClient;
let author: TestClient;
let revision = 0;
let stepCount = 0;

beforeAll(async () => {
  useTestDatabase("step-ticks");
  app = await startAppServer();
  [reader, author] = await Promise.all(["reader", "author"].map((n) => signedIn(app.origin, `${n}@torqueleaf.test`)));
  const guide = (await (await fetch(`${app.origin}/api/guides/${SLUG}`)).json()) as {
    revision: { number: number };
    steps: unknown[];
  };
  revision = guide.revision.number;
  stepCount = guide.steps.length;
});
afterAll(async () => app?.stop());

const put = (client: TestClient, body: unknown, path = PATH) => sendJson<StepTicks & ApiError>(client, "PUT", path, body);

describe("a reader's step ticks", () => {
  it("start empty, are set and cleared one step at a time, and setting twice changes nothing", async () => {
    const first = await sendJson<StepTicks>(reader, "GET", PATH);
    expect(first).toEqual({ status: 200, body: { revision, done: [] } });
    await put(reader, { revision, position: 2, done: true });
    await put(reader, { revision, position: 0, done: true });
    const twice = await put(reader, { revision, position: 2, done: true });
    expect(twice).toEqual({ status: 200, body: { revision, done: [0, 2] } });
    const cleared = await put(reader, { revision, position: 0, done: false });
    expect(cleared.body.done).toEqual([2]);
    expect((await sendJson<StepTicks>(reader, "GET", PATH)).body.done).toEqual([2]);
  });

  it("are private: never kept by a cache, and another reader sees only their own", async () => {
    const response = await reader.request(PATH);
    expect(response.headers.get("cache-control")).toBe("private, no-store");
    await put(author, { revision, position: stepCount - 1, done: true });
    expect((await sendJson<StepTicks>(author, "GET", PATH)).body.done).toEqual([stepCount - 1]);
    expect((await sendJson<StepTicks>(reader, "GET", PATH)).body.done).not.toContain(stepCount - 1);
  });

  it("refuse with 409 a tick whose X-Torqueleaf-Reader names another reader (a queued tick sent under the next session)", async () => {
    const me = (await (await reader.request("/api/me")).json()) as { user: { id: number } };
    const send = (who: string) =>
      reader.request(PATH, {
        method: "PUT",
        headers: { "content-type": "application/json", "X-Torqueleaf-Reader": who },
        body: JSON.stringify({ revision, position: 1, done: true }),
      });
    const other = await send(String(me.user.id + 1));
    expect(other.status).toBe(409);
    expect((await sendJson<StepTicks>(reader, "GET", PATH)).body.done).not.toContain(1);
    expect((await send(String(me.user.id))).status).toBe(200);
    await put(reader, { revision, position: 1, done: false });
  });

  it("need a signed-in reader: 401 for anonymous callers, reading or writing", async () => {
    const anonymous = new TestClient(app.origin);
    expect((await sendJson<ApiError>(anonymous, "GET", PATH)).status).toBe(401);
    const write = await put(anonymous, { revision, position: 0, done: true });
    expect(write.status).toBe(401);
    expect(write.body.error.code).toBe("unauthorized");
  });

  it("answer 404 for a guide that is not published", async () => {
    const path = "/api/guides/fjell-phev-rear-usb-charger/step-ticks";
    expect((await sendJson(reader, "GET", path)).status).toBe(404);
    expect((await put(reader, { revision: 1, position: 0, done: true }, path)).status).toBe(404);
  });

  it("refuse a revision that is not the published one with 409, so a stale queued tick is dropped", async () => {
    const stale = await put(reader, { revision: revision + 1, position: 0, done: true });
    expect(stale.status).toBe(409);
    expect(stale.body.error.fields).toHaveProperty("revision");
  });
});

describe("malformed ticks", () => {
  const cases: [string, unknown, string][] = [
    ["no position", { revision: 1, done: true }, "position"],
    ["a position past the last step", { revision: 1, position: 10_000, done: true }, "position"],
    ["a negative position", { revision: 1, position: -1, done: true }, "position"],
    ["a fractional position", { revision: 1, position: 1.5, done: true }, "position"],
    ["done as text", { revision: 1, position: 0, done: "yes" }, "done"],
    ["a revision as text", { revision: "1", position: 0, done: true }, "revision"],
    ["an extra field", { revision: 1, position: 0, done: true, userId: 1 }, ""],
  ];
  for (const [name, body, field] of cases) {
    it(`refuses ${name} with 400 naming the field`, async () => {
      const answer = await put(reader, body);
      expect(answer.status).toBe(400);
      expect(answer.body.error.code).toBe("invalid");
      if (field) expect(Object.keys(answer.body.error.fields ?? {})).toContain(field);
    });
  }

  it("refuses a position beyond this guide's steps with 400 naming the position", async () => {
    const answer = await put(reader, { revision, position: stepCount, done: true });
    expect(answer.status).toBe(400);
    expect(answer.body.error.fields?.position).toMatch(new RegExp(`${stepCount} steps`));
  });

  it("refuses broken JSON (400), another content type (415), an oversized body (413) and POST (405)", async () => {
    const broken = await reader.request(PATH, {
      method: "PUT",
      headers: { "content-type": "application/json" },
      body: '{"revision":',
    });
    expect(broken.status).toBe(400);
    const text = await reader.request(PATH, { method: "PUT", headers: { "content-type": "text/plain" }, body: "done" });
    expect(text.status).toBe(415);
    const big = await put(reader, { revision, position: 0, done: true, pad: "x".repeat(5000) });
    expect(big.status).toBe(413);
    const post = await reader.request(PATH, { method: "POST", headers: { "content-type": "application/json" }, body: "{}" });
    expect(post.status).toBe(405);
  });
});
