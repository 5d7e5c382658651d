import { describe, expect, it } from "vitest";
import { z } from "zod";
import { AppError } from "./errors";
import { refusal } from "./refusal.test-support";
import { formFailure, handleForm, MAX_FORM_FIELDS, readForm } from "./forms.server";
import { fieldErrors, schemaKeys } from "./validation";

const formPost = (body: BodyInit, type?: string) =>
  new Request("http://localhost/x", { method: "POST", body, headers: type ? { "content-type": type } : {} });

describe("fieldErrors", () => {
  it("keys every message by the field's full dotted path, first message only", () => {
    const schema = z.object({
      title: z.string().min(4, "Too short"),
      steps: z.array(z.object({ title: z.string().min(2, "Give the step a title") })),
    });
    const result = schema.safeParse({ title: "ab", steps: [{ title: "ok" }, { title: "" }] });
    expect(result.success).toBe(false);
    if (!result.success)
      expect(fieldErrors(result.error)).toEqual({ title: "Too short", "steps.1.title": "Give the step a title" });
  });
});

describe("schemaKeys", () => {
  it("lists the fields of objects, unions of objects and wrapped schemas", () => {
    const union = z.discriminatedUnion("intent", [
      z.object({ intent: z.literal("a"), name: z.string() }),
      z.object({ intent: z.literal("b"), userId: z.string() }),
    ]);
    expect(schemaKeys(union).sort()).toEqual(["intent", "name", "userId"]);
    expect(schemaKeys(z.object({ email: z.string() }).transform((v) => v.email))).toEqual(["email"]);
  });
});

describe("readForm", () => {
  it("reads an urlencoded form", async () => {
    const values = await readForm(formPost(new URLSearchParams({ a: "1", b: "two" })));
    expect(values).toEqual({ a: "1", b: "two" });
  });

  it("refuses JSON, plain text and a missing type with 415", async () => {
    for (const type of ["application/json", "text/plain", "application/xml", undefined]) {
      expect((await refusal(readForm(formPost("{}", type)))).status).toBe(415);
    }
  });

  it("refuses a broken multipart body with 400", async () => {
    const broken = formPost("--xyz\r\nContent-Disposition: form-da", "multipart/form-data; boundary=xyz");
    expect((await refusal(readForm(broken))).status).toBe(400);
  });

  it("refuses more fields than any form has with 413", async () => {
    const many = new URLSearchParams();
    for (let i = 0; i <= MAX_FORM_FIELDS; i++) many.append(`f${i}`, "x");
    expect((await refusal(readForm(formPost(many)))).status).toBe(413);
  });
});

describe("formFailure and handleForm", () => {
  it("types back only the form's own fields, never a password", async () => {
    const response = formFailure(
      new AppError(400, "invalid", "Check the form."),
      { email: "a@b.test", password: "x", junk: "y" },
      ["email", "password"],
    );
    expect(response.init?.status).toBe(400);
    expect(response.data.values).toEqual({ email: "a@b.test" });
  });

  it("answers a bad field with 400, the field's message and what was typed", async () => {
    const schema = z.object({ name: z.string().min(3, "Enter a name"), note: z.string() });
    const answer = await handleForm(
      formPost(new URLSearchParams({ name: "a", note: "kept", extra: "dropped" })),
      schema,
      async () => ({
        ok: true as const,
      }),
    );
    if (!("init" in answer)) throw new Error("expected a refusal");
    expect(answer.init?.status).toBe(400);
    expect(answer.data).toMatchObject({ ok: false, fields: { name: "Enter a name" }, values: { name: "a", note: "kept" } });
  });

  it("runs the work with the parsed input and passes a refusal from it back to the form", async () => {
    const schema = z.object({ n: z.coerce.number() });
    const ok = await handleForm(formPost(new URLSearchParams({ n: "4" })), schema, async (input) => ({ doubled: input.n * 2 }));
    expect(ok).toEqual({ doubled: 8 });
    const refused = await handleForm(formPost(new URLSearchParams({ n: "4" })), schema, async () => {
      throw new AppError(409, "wrong-state", "Already done.");
    });
    if (!("init" in refused)) throw new Error("expected a refusal");
    expect(refused.init?.status).toBe(409);
  });
});
