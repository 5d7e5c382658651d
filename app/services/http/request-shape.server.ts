import type { IncomingMessage, ServerResponse } from "node:http";
import { data, type MiddlewareFunction } from "react-router";
import { apiError } from "~/utils/http.server";
import { streamsBody } from "./body-limit.server";

/**
 * What a request must look like before any action reads it, checked once for every route so that
 * a new action cannot forget it: a malformed request gets a 4xx that says what was wrong, never a
 * 5xx from `request.formData()` deep inside an action.
 */

/** Methods the app serves at all; anything else (TRACE, OPTIONS, WebDAV …) is refused before routing. */
const SERVED_METHODS = new Set(["GET", "HEAD", "POST", "PUT", "PATCH", "DELETE"]);
/** Pages read forms only, by POST. */
export const PAGE_METHODS = "GET, HEAD, POST";
const PAGE_TYPES = new Set(["application/x-www-form-urlencoded", "multipart/form-data"]);
/** The JSON API reads JSON, and multipart for file uploads (design/api.md). */
const API_TYPES = new Set(["application/json", "multipart/form-data"]);

const isApiPath = (pathname: string) => pathname === "/api" || pathname.startsWith("/api/");

/** The media type of the body, without parameters, lower case; null when there is none. */
export function mediaType(request: Request): string | null {
  const value = request.headers.get("content-type");
  const type = value?.split(";")[0].trim().toLowerCase();
  return type ? type : null;
}

/** HTTP/1.1 framing (RFC 9112 §6.3): a body comes with Content-Length above 0 or Transfer-Encoding. */
function hasBody(request: Request): boolean {
  if (request.headers.has("transfer-encoding")) return true;
  const length = Number(request.headers.get("content-length") ?? "0");
  return Number.isNaN(length) || length > 0;
}

type Problem = { status: 400 | 405 | 415; code: string; message: string };

const FORM_TYPES_TEXT = "application/x-www-form-urlencoded or multipart/form-data";

async function readsAsForm(request: Request): Promise<boolean> {
  try {
    await request.clone().formData();
    return true;
  } catch {
    return false;
  }
}

async function pageProblem(request: Request): Promise<Problem | null> {
  if (request.method.toUpperCase() !== "POST") {
    return {
      status: 405,
      code: "method-not-allowed",
      message: `Pages accept ${PAGE_METHODS} only; forms are sent with POST.`,
    };
  }
  const type = mediaType(request);
  if (!type || !PAGE_TYPES.has(type)) {
    return {
      status: 415,
      code: "unsupported-media-type",
      message: `${type ? "This body type is not accepted here" : "The request has no Content-Type"}: send the form as ${FORM_TYPES_TEXT}.`,
    };
  }
  if (!(await readsAsForm(request))) {
    return {
      status: 400,
      code: "malformed-form",
      message: "The form data could not be read: the body does not match its Content-Type.",
    };
  }
  return null;
}

async function apiProblem(request: Request): Promise<Problem | null> {
  if (!hasBody(request)) return null;
  const type = mediaType(request);
  if (!type || !API_TYPES.has(type)) {
    return {
      status: 415,
      code: "unsupported-media-type",
      message: `${type ? "This body type is not accepted" : "The request has a body but no Content-Type"}: send JSON (application/json), or multipart/form-data for a file.`,
    };
  }
  if (type === "multipart/form-data") {
    // An upload route parses its own stream (4xx for a bad one); reading it here would hold it all.
    if (streamsBody(request.method.toUpperCase(), new URL(request.url).pathname)) return null;
    if (await readsAsForm(request)) return null;
    return { status: 400, code: "malformed-form", message: "The multipart body could not be read: check its boundary." };
  }
  try {
    JSON.parse(await request.clone().text());
    return null;
  } catch {
    return { status: 400, code: "invalid-json", message: "The body is not valid JSON." };
  }
}

/**
 * Gives an error from the API the API's JSON shape. React Router answers a write to a resource route
 * without an action with its own 405 (`{ "message": "Unexpected Server Error" }`); such a route
 * takes GET and HEAD only.
 */
async function asApiError(response: Response, method: string): Promise<Response> {
  if (response.status < 400) return response;
  if (response.status === 405 && !response.headers.has("allow")) {
    await response.body?.cancel();
    const refused = apiError(405, "method-not-allowed", `${method} is not accepted at this address.`);
    refused.headers.set("Allow", "GET, HEAD");
    return refused;
  }
  if (/json/.test(response.headers.get("content-type") ?? "")) return response;
  await response.body?.cancel();
  return apiError(response.status, response.status === 404 ? "not-found" : "error", response.statusText || "Request refused.");
}

const STATUS_TEXT = { 400: "Bad Request", 405: "Method Not Allowed", 415: "Unsupported Media Type" } as const;

/**
 * Root middleware, after the cross-site check: refuses with 405/415/400 before any action runs; on
 * the API in its JSON error shape, on pages through the error page (or the `.data` error).
 */
export const requestShapeMiddleware: MiddlewareFunction<Response> = async ({ request }, next) => {
  const method = request.method.toUpperCase();
  const api = isApiPath(new URL(request.url).pathname);
  if (!SERVED_METHODS.has(method)) {
    if (api) return refusedMethod(apiError(405, "method-not-allowed", `${method} is not accepted at this address.`));
    throw data(`${method} is not accepted here: pages accept ${PAGE_METHODS}.`, { status: 405, statusText: STATUS_TEXT[405] });
  }
  if (method === "GET" || method === "HEAD") return next();
  const problem = api ? await apiProblem(request) : await pageProblem(request);
  if (!problem) return next();
  if (api) return apiError(problem.status, problem.code, problem.message);
  throw data(problem.message, { status: problem.status, statusText: STATUS_TEXT[problem.status] });
};

/**
 * Root middleware, before the cross-site check, so it sees every refusal rendered below it: a 405
 * names the methods that are served (Allow, RFC 9110 §15.5.6), and an error from the API, such as
 * React Router's own 405 for a route without an action, comes in the API's JSON shape.
 */
export const refusalShapeMiddleware: MiddlewareFunction<Response> = async ({ request }, next) => {
  const method = request.method.toUpperCase();
  const response = await next();
  if (isApiPath(new URL(request.url).pathname)) return asApiError(response, method);
  if (response.status === 405 && !response.headers.has("allow")) {
    // A form posted to a page without an action is React Router's own 405: such a page takes GET only.
    return withAllow(response, method === "POST" ? "GET, HEAD" : PAGE_METHODS);
  }
  return response;
};

function refusedMethod(response: Response) {
  response.headers.set("Allow", "GET, HEAD, POST, PUT, PATCH, DELETE");
  return response;
}

function withAllow(response: Response, allow: string): Response {
  try {
    response.headers.set("Allow", allow);
    return response;
  } catch {
    const copy = new Response(response.body, response);
    copy.headers.set("Allow", allow);
    return copy;
  }
}

type NodeHandler = (req: IncomingMessage, res: ServerResponse, next: (error?: unknown) => void) => void;

/**
 * For the Node servers: a request target in absolute form ("http://host/path", RFC 9112 §3.2.2,
 * which a server must accept) is read as its path and query; any other target that is not a path
 * (the asterisk form, an authority) is refused with 400. React Router's adapter builds the request's
 * URL by putting the target after our origin, which fails for those: a 500 otherwise.
 */
export function originFormTargets(): NodeHandler {
  return (req, res, next) => {
    const target = req.url ?? "";
    if (target.startsWith("/")) return next();
    if (/^https?:\/\//i.test(target) && URL.canParse(target)) {
      const url = new URL(target);
      // Express keeps the target it got as `originalUrl`, which React Router's adapter reads.
      const path = `${url.pathname}${url.search}`;
      Object.assign(req, { url: path, originalUrl: path });
      return next();
    }
    res.statusCode = 400;
    res.setHeader("Cache-Control", "no-store");
    res.setHeader("Content-Type", "text/plain; charset=utf-8");
    res.end("The request target must be a path, such as /api/guides.");
  };
}

/**
 * For the Node servers: answers a method the app never serves with 405 before the request reaches
 * React Router, whose Fetch request cannot even be built for TRACE (the Fetch standard forbids it),
 * which would otherwise surface as a 500.
 */
export function refuseUnsupportedMethods(): NodeHandler {
  return (req, res, next) => {
    const method = (req.method ?? "").toUpperCase();
    if (SERVED_METHODS.has(method)) return next();
    const api = isApiPath((req.url ?? "/").split("?")[0]);
    res.statusCode = 405;
    res.setHeader("Allow", api ? "GET, HEAD, POST, PUT, PATCH, DELETE" : PAGE_METHODS);
    res.setHeader("Cache-Control", "no-store");
    if (api) {
      res.setHeader("Content-Type", "application/json; charset=utf-8");
      res.end(JSON.stringify({ error: { code: "method-not-allowed", message: `${method} is not accepted at this address.` } }));
    } else {
      res.setHeader("Content-Type", "text/plain; charset=utf-8");
      res.end(`${method} is not accepted here: pages accept ${PAGE_METHODS}.`);
    }
  };
}
