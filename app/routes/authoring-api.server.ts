import type { z } from "zod";
import type { User } from "~/db/schema";
import { getDb } from "~/db/client.server";
import { getGuideById } from "~/models/guides.server";
import { requireUser } from "~/services/auth/guards.server";
import { BODY_LIMITS } from "~/services/http/body-limit.server";
import { AppError, notFound, unsupportedType } from "~/utils/errors";
import { errorResponse, readBodyText } from "~/utils/http.server";
import { fieldErrors } from "~/utils/validation";

/** Shared by the authoring API routes (drafts, submit, revisions, export, import). */

/** The largest authoring JSON body: the server-wide JSON limit, checked again here as the body is read. */
export const AUTHORING_JSON_MAX_BYTES = BODY_LIMITS.json;

/** Keys that could reach an object's prototype when a parsed body is copied or merged. */
const POISON_KEYS = new Set(["__proto__", "constructor", "prototype"]);

/**
 * Parses JSON with every `__proto__`, `constructor` and `prototype` key dropped at any depth, so
 * no later copy (zod's, the rich-text check's, the store's) can pick one up.
 */
export function parseJsonWithoutPoison(text: string): unknown {
  return JSON.parse(text, (key, value) => (POISON_KEYS.has(key) ? undefined : value));
}

/**
 * A JSON body against a schema: 415 for another content type, 413 past the limit, 400 for JSON
 * that does not parse or does not fit (with `fields`).
 */
export async function readAuthoringJson<S extends z.ZodType>(request: Request, schema: S): Promise<z.output<S>> {
  const type = request.headers.get("content-type") ?? "";
  if (!/^application\/json\s*(;|$)/i.test(type)) {
    throw unsupportedType("Send the body as JSON (Content-Type: application/json).");
  }
  const text = await readBodyText(request, AUTHORING_JSON_MAX_BYTES);
  let body: unknown;
  try {
    body = parseJsonWithoutPoison(text);
  } catch {
    throw new AppError(400, "invalid-json", "The body is not valid JSON.");
  }
  const parsed = schema.safeParse(body);
  if (!parsed.success) throw new AppError(400, "invalid", "Some fields need attention.", fieldErrors(parsed.error));
  return parsed.data;
}

/** A guide id from the path: digits only, else the guide simply does not exist. */
export function guideIdParam(raw: string | undefined): number {
  const id = /^\d{1,12}$/.test(raw ?? "") ? Number(raw) : Number.NaN;
  if (!Number.isSafeInteger(id) || id <= 0) throw notFound("This guide");
  return id;
}

/** 405 naming the methods the address serves (RFC 9110 §15.5.6). */
export function methodNotAllowed(allow: string[], what: string): Response {
  const response = errorResponse(new AppError(405, "method-not-allowed", `${what} answers ${allow.join(" and ")} only.`));
  response.headers.set("Allow", allow.join(", "));
  return response;
}

/** The signed-in user for an API route (401 in the API's shape when nobody is). */
export function apiUser(args: { request: Request; context?: unknown }): Promise<User> {
  return requireUser(args);
}

/** Answers the signed-in author's own data: never kept by a shared cache or the browser. */
export const PRIVATE_JSON = { "Cache-Control": "private, no-store" } as const;

/**
 * The signed-in user, the database and the guide the path names (401, then 404). Each route checks
 * its own permission on the guide before it reads a body, so a stranger learns nothing from field
 * errors.
 */
export async function apiGuide(args: { request: Request; params: { id?: string }; context?: unknown }) {
  const user = await apiUser(args);
  const guideId = guideIdParam(args.params.id);
  const db = await getDb();
  const guide = await getGuideById(db, guideId);
  if (!guide) throw notFound("This guide");
  return { user, db, guide, guideId };
}
