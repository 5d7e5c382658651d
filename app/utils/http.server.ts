import { createHash } from "node:crypto";
import { data } from "react-router";
import type { z } from "zod";
import { AppError, tooLarge, unsupportedType } from "./errors";
import { fieldErrors } from "./validation";

/** The JSON API's error shape: `{ error: { code, message, fields } }` with the matching status. */
export function apiError(
  status: number,
  code: string,
  message: string,
  fields?: Record<string, string>,
  extra?: Record<string, unknown>,
) {
  return Response.json(
    { error: { code, message, ...(fields ? { fields } : {}), ...extra } },
    { status, headers: retryHeaders(extra) },
  );
}

/** A rate-limit refusal (`extra.retryAfter` in seconds) says when to come back; other refusals send no header. */
export function retryHeaders(extra: Record<string, unknown> | undefined): HeadersInit | undefined {
  return typeof extra?.retryAfter === "number" ? { "Retry-After": String(extra.retryAfter) } : undefined;
}

/** An AppError as the API answers it. */
export function errorResponse(error: AppError) {
  return apiError(error.status, error.code, error.message, error.fields, error.extra);
}

/**
 * Wraps an `/api` loader or action: an AppError (or a Response thrown by a guard) becomes the
 * API's error answer; anything else is left to fail as a 500, since it is our fault.
 */
export function apiHandler<A>(handler: (args: A) => Promise<Response>): (args: A) => Promise<Response> {
  return async (args) => {
    try {
      return await handler(args);
    } catch (error) {
      if (error instanceof AppError) return errorResponse(error);
      if (error instanceof Response) return error;
      throw error;
    }
  };
}

/**
 * How long a browser or a shared cache may keep an answer that is the same for every reader (a
 * published guide, the Library's list, the catalogue), and use it a while longer as it checks again
 * (RFC 5861). Short: a guide withdrawn or corrected for its safety content must not linger.
 */
export const PUBLIC_CACHE_CONTROL = "public, max-age=30, stale-while-revalidate=60";

/** Whether the request's If-None-Match names this ETag (RFC 9110 §13.1.2, weak comparison). */
export function matchesEtag(request: Request, etag: string): boolean {
  return etagListed(request.headers.get("if-none-match"), etag);
}

/** Whether an If-None-Match header's value names `etag` (weak comparison, RFC 9110 §13.1.2). */
export function etagListed(header: string | null | undefined, etag: string): boolean {
  if (!header) return false;
  if (header.trim() === "*") return true;
  const opaque = (tag: string) => tag.trim().replace(/^W\//, "");
  return header.split(",").some((tag) => opaque(tag) === opaque(etag));
}

// A body kept in a reader cache is the same object on every request (callers never change what a
// cache gives them): its text and ETag are made once and live as long as the object does.
const serializedBodies = new WeakMap<object, { text: string; etag: string }>();
/** A public JSON answer's text and its weak ETag, made once per body object. */
export function serializedJson(body: object): { text: string; etag: string } {
  let done = serializedBodies.get(body);
  if (!done) {
    const text = JSON.stringify(body);
    done = { text, etag: `W/"${createHash("sha256").update(text).digest("base64url").slice(0, 32)}"` };
    serializedBodies.set(body, done);
  }
  return done;
}

/**
 * A JSON answer the same for every reader, with an ETag of its bytes (weak: compression may change
 * them on the way) and PUBLIC_CACHE_CONTROL; a request that names the ETag gets 304 and no body.
 */
export function publicJson(request: Request, body: object): Response {
  const { text, etag } = serializedJson(body);
  const headers = { ETag: etag, "Cache-Control": PUBLIC_CACHE_CONTROL };
  if (matchesEtag(request, etag)) return new Response(null, { status: 304, headers });
  return new Response(text, { headers: { ...headers, "Content-Type": "application/json" } });
}

/** An AppError as a thrown page response: the route's ErrorBoundary shows its message in plain words. */
export function pageErrorResponse(error: AppError) {
  return data(error.message, { status: error.status, headers: retryHeaders(error.extra) });
}

/** Runs a page loader's work; an AppError (404, 403 …) is thrown on as the page response for it. */
export async function forPage<T>(work: () => Promise<T>): Promise<T> {
  try {
    return await work();
  } catch (error) {
    if (error instanceof AppError) throw pageErrorResponse(error);
    throw error;
  }
}

/** Reads a body as text, refusing it once it passes `maxBytes` without reading the rest. */
export async function readBodyText(request: Request, maxBytes: number): Promise<string> {
  const declared = Number(request.headers.get("content-length") ?? "");
  const limit = `The body is larger than ${formatBytes(maxBytes)}.`;
  if (Number.isFinite(declared) && declared > maxBytes) throw tooLarge(limit);
  if (!request.body) return "";
  const reader = request.body.getReader();
  const chunks: Uint8Array[] = [];
  let total = 0;
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    total += value.byteLength;
    if (total > maxBytes) {
      // The rest is read and dropped rather than the stream cancelled: the development server's
      // request adapter would still write the rest into a cancelled stream and fail. The body-limit
      // middleware has bounded what can follow.
      while (!(await reader.read()).done) {}
      throw tooLarge(limit);
    }
    chunks.push(value);
  }
  return Buffer.concat(chunks).toString("utf8");
}

/**
 * Reads a JSON body against a schema: 415 for another content type, 413 past `maxBytes`,
 * 400 for JSON that does not parse, and 400 with `fields` for JSON that does not fit the schema.
 */
export async function readJson<S extends z.ZodType>(
  request: Request,
  schema: S,
  options: { maxBytes: number },
): Promise<z.output<S>> {
  const type = request.headers.get("content-type") ?? "";
  if (!/^application\/json\s*(;|$)/i.test(type)) {
    throw unsupportedType("Send the body as JSON (Content-Type: application/json).");
  }
  const text = await readBodyText(request, options.maxBytes);
  let body: unknown;
  try {
    body = JSON.parse(text);
  } catch {
    throw new AppError(400, "invalid-json", "The body is not valid JSON.");
  }
  const parsed = schema.safeParse(body);
  if (!parsed.success) throw new AppError(400, "invalid", "Some fields need attention.", fieldErrors(parsed.error));
  return parsed.data;
}

function formatBytes(bytes: number) {
  return bytes >= 1024 * 1024 ? `${Math.round(bytes / 1024 / 1024)} MB` : `${Math.round(bytes / 1024)} KB`;
}
