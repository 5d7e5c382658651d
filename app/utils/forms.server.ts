import { data, redirect } from "react-router";
import type { z } from "zod";
import { flashCookie } from "~/services/auth/cookie.server";
import { env } from "./env.server";
import { AppError, invalid, tooLarge, unsupportedType } from "./errors";
import { type Flash, type FormFailure, type FormValues, isSecretField } from "./forms";
import { retryHeaders } from "./http.server";
import { fieldErrors, schemaKeys } from "./validation";

/** More fields than any of our forms has (the guide editor's included): past it the post is refused. */
export const MAX_FORM_FIELDS = 2_000;

const FORM_TYPES = /^(application\/x-www-form-urlencoded|multipart\/form-data)\s*(;|$)/i;

/**
 * Reads a posted form into plain strings (files are not read here; repeated names keep the last
 * value). A body that is not a form answers 415, one that does not parse 400, one with too many
 * fields 413, so a malformed request never reaches an action as a server error.
 */
export async function readForm(request: Request, options: { maxFields?: number } = {}): Promise<FormValues> {
  const values: FormValues = {};
  for (const [key, value] of await readFormData(request, options)) if (typeof value === "string") values[key] = value;
  return values;
}

/** The same checks as `readForm`, for an action that needs the FormData itself (repeated names, files). */
export async function readFormData(request: Request, options: { maxFields?: number } = {}): Promise<FormData> {
  const type = request.headers.get("content-type") ?? "";
  if (!FORM_TYPES.test(type)) throw unsupportedType("Send the form as a form post (urlencoded or multipart).");
  let form: FormData;
  try {
    form = await request.formData();
  } catch {
    throw new AppError(400, "malformed-form", "The form could not be read. Reload the page and send it again.");
  }
  let count = 0;
  for (const _ of form.keys()) {
    if (++count > (options.maxFields ?? MAX_FORM_FIELDS)) throw tooLarge("The form has more fields than any of ours.");
  }
  return form;
}

/** Parses form values with a schema: the input, or a 400 AppError with a message per field. */
export function parseValues<S extends z.ZodType>(schema: S, values: Record<string, unknown>): z.output<S> {
  const parsed = schema.safeParse(values);
  if (!parsed.success) throw invalid(fieldErrors(parsed.error));
  return parsed.data;
}

/**
 * The form's answer to a refusal: its status, the message, the field errors, and the values to type
 * back into the form — only the form's own fields (`keep`), never a secret. A 429 says when to retry.
 */
export function formFailure(error: AppError, values: FormValues, keep: readonly string[]) {
  const kept: FormValues = {};
  for (const name of keep) if (name in values && !isSecretField(name)) kept[name] = values[name];
  const body: FormFailure = { ok: false, code: error.code, message: error.message, fields: error.fields, values: kept };
  return data(body, { status: error.status, headers: retryHeaders(error.extra) });
}

/**
 * The one shape of a form action: read the form, parse it with the schema, run the work; any
 * AppError along the way (bad field, not allowed, conflict, rate limit) becomes the form's answer
 * with what was typed, anything else stays a server error.
 */
export async function handleForm<S extends z.ZodType, R>(
  request: Request,
  schema: S,
  work: (input: z.output<S>, values: FormValues) => Promise<R>,
) {
  let values: FormValues = {};
  try {
    values = await readForm(request);
    return await work(parseValues(schema, values), values);
  } catch (error) {
    if (error instanceof AppError) return formFailure(error, values, schemaKeys(schema));
    throw error;
  }
}

/**
 * Route `headers` export for forms: React Router drops an action's headers from the page response
 * unless the route passes them on, and a 429 must say when to come back.
 */
export function formHeaders({ actionHeaders }: { actionHeaders: Headers }) {
  const retryAfter = actionHeaders.get("Retry-After");
  return retryAfter ? { "Retry-After": retryAfter } : new Headers();
}

/** Redirect-after-post with a one-time message for the next page (read and cleared by the root loader). */
export async function redirectWithFlash(to: string, flash: Flash, init: { headers?: HeadersInit } = {}) {
  const headers = new Headers(init.headers);
  headers.append("Set-Cookie", await flashCookie(env()).serialize(flash));
  return redirect(to, { headers });
}

/** The pending flash message, with the header that clears it, so it shows exactly once. */
export async function takeFlash(request: Request): Promise<{ flash: Flash | null; headers?: Headers }> {
  const cookie = flashCookie(env());
  const header = request.headers.get("cookie");
  if (!header?.includes(`${cookie.name}=`)) return { flash: null };
  const value = (await cookie.parse(header)) as Partial<Flash> | null;
  const headers = new Headers({ "Set-Cookie": await cookie.serialize("", { maxAge: 0 }) });
  const valid =
    value &&
    typeof value.text === "string" &&
    value.text.length <= 500 &&
    ["success", "info", "error"].includes(String(value.tone));
  return { flash: valid ? (value as Flash) : null, headers };
}
