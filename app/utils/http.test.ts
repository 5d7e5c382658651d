import { describe, expect, it } from "vitest";
import { z } from "zod";
import { AppError } from "./errors";
import { refusal } from "./refusal.test-support";
import { apiHandler, readJson } from "./http.server";

const schema = z.object({ name: z.string().min(2, "Name it"), items: z.array(z.object({ qty: z.number().int() })) });

const post = (body: BodyInit | null, type?: string, headers: Record<string, string> = {}) =>
  new Request("http://localhost/api/x", {
    method: "POST",
    body,
    headers: { ...(type ? { "content-type": type } : {}), ...headers },
  });

describe("readJson", () => {
  it("returns the parsed body", async () => {
    const value = await readJson(post(JSON.stringify({ name: "Lamp", items: [{ qty: 2 }] }), "application/json"), schema, {
      maxBytes: 1024,
    });
    expect(value).toEqual({ name: "Lamp", items: [{ qty: 2 }] });
  });

  it("answers 415 for another content type, and for none", async () => {
    expect((await refusal(readJson(post("{}", "text/plain"), schema, { maxBytes: 1024 }))).status).toBe(415);
    expect((await refusal(readJson(post("{}"), schema, { maxBytes: 1024 }))).status).toBe(415);
  });

  it("answers 413 past the limit, by the declared length and by the bytes actually sent", async () => {
    const big = JSON.stringify({ name: "x".repeat(5000), items: [] });
    expect((await refusal(readJson(post(big, "application/json"), schema, { maxBytes: 1024 }))).status).toBe(413);
    const stream = new ReadableStream({
      start(controller) {
        for (let i = 0; i < 10; i++) controller.enqueue(new TextEncoder().encode("x".repeat(500)));
        controller.close();
      },
    });
    const streamed = new Request("http://localhost/api/x", {
      method: "POST",
      body: stream,
      headers: { "content-type": "application/json" },
      duplex: "half",
    } as RequestInit);
    expect((await refusal(readJson(streamed, schema, { maxBytes: 1024 }))).status).toBe(413);
  });

  it("answers 400 for broken JSON, and 400 with a message per nested field for the wrong shape", async () => {
    expect((await refusal(readJson(post("{nope", "application/json"), schema, { maxBytes: 1024 }))).code).toBe("invalid-json");
    const wrong = await refusal(
      readJson(post(JSON.stringify({ name: "x", items: [{ qty: 1 }, { qty: 1.5 }] }), "application/json"), schema, {
        maxBytes: 1024,
      }),
    );
    expect(wrong.status).toBe(400);
    expect(wrong.fields).toMatchObject({ name: "Name it" });
    expect(Object.keys(wrong.fields ?? {})).toContain("items.1.qty");
  });
});

describe("apiHandler", () => {
  it("turns an AppError into the API's error shape with its status", async () => {
    const handler = apiHandler(async () => {
      throw new AppError(409, "stale-version", "Someone saved first.", { version: "stale" });
    });
    const response = await handler({});
    expect(response.status).toBe(409);
    expect(await response.json()).toEqual({
      error: { code: "stale-version", message: "Someone saved first.", fields: { version: "stale" } },
    });
  });

  it("says when to retry a rate-limited call", async () => {
    const handler = apiHandler(async () => {
      throw new AppError(429, "rate-limited", "Too many tries.", undefined, { retryAfter: 30 });
    });
    const response = await handler({});
    expect(response.status).toBe(429);
    expect(response.headers.get("retry-after")).toBe("30");
  });

  it("leaves a programming error to fail as one", async () => {
    const handler = apiHandler(async () => {
      throw new TypeError("bug");
    });
    await expect(handler({})).rejects.toThrow(TypeError);
  });
});
