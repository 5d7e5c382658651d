import { createHash, randomBytes } from "node:crypto";
import type { IncomingMessage, ServerResponse } from "node:http";
import { createContext, type MiddlewareFunction, type RouterContextProvider } from "react-router";
import { PRINT_STYLE } from "~/components/print-style";
import { DIAGRAM_STYLE } from "~/engine/diagram";
import { authContext } from "~/services/auth/session.server";
import { hasVehicleCookie } from "~/services/vehicle-cookie.server";
import { type Env, env } from "~/utils/env.server";
import { originFormTargets, refuseUnsupportedMethods } from "./request-shape.server";

type Settings = Pick<Env, "APP_ORIGIN" | "S3_PUBLIC_URL" | "GITHUB_BASE_URL">;

/** The nonce of this request's Content-Security-Policy, set first by the root middleware. */
export const nonceContext = createContext<string | null>(null);

/** 128 random bits, fresh for every request (CSP Level 3 §2.3.1 asks for at least 128 bits). */
export const createNonce = () => randomBytes(16).toString("base64");

function originOf(url: string): string | null {
  try {
    return new URL(url).origin;
  } catch {
    return null;
  }
}

/**
 * Browser features the app never uses, switched off for the page and anything it could embed. Only
 * names Chromium recognises: an unknown feature name is reported as an error in the console.
 */
const PERMISSIONS_POLICY = [
  "accelerometer",
  "autoplay",
  "camera",
  "display-capture",
  "encrypted-media",
  "geolocation",
  "gyroscope",
  "hid",
  "magnetometer",
  "microphone",
  "midi",
  "payment",
  "picture-in-picture",
  "publickey-credentials-get",
  "serial",
  "usb",
  "xr-spatial-tracking",
]
  .map((feature) => `${feature}=()`)
  .join(", ");

/**
 * The app's only inline style sheets, allowed by hash (CSP Level 3 §8.4): the wiring diagram's, which
 * the circuit planner also inserts in the browser, where no nonce could reach it, and the print view's.
 */
const STYLE_HASHES = [DIAGRAM_STYLE, PRINT_STYLE].map((css) => `'sha256-${createHash("sha256").update(css).digest("base64")}'`);

/**
 * Scripts run only from our own origin or with this request's nonce (React Router's inline hand-off
 * scripts). Styles come from Tailwind's stylesheet and the hashed sheets above; no screen sets `style=`.
 * Photos come from us or, when S3_PUBLIC_URL is set, from that bucket or CDN. The GitHub sign-in
 * route accepts a form post and answers with a redirect to GitHub, which `form-action` must allow.
 */
export function contentSecurityPolicy(settings: Settings, nonce: string): string {
  return policyTemplate(settings).split(NONCE_SLOT).join(nonce);
}

/** Where the nonce goes in a policy built once per settings (no nonce can contain a space or quote). */
const NONCE_SLOT = "\u0000nonce\u0000";
let templateFor: { key: string; template: string } | undefined;

function policyTemplate(settings: Settings): string {
  const key = `${settings.S3_PUBLIC_URL}\n${settings.GITHUB_BASE_URL}`;
  if (templateFor?.key !== key) templateFor = { key, template: buildPolicy(settings, NONCE_SLOT) };
  return templateFor.template;
}

function buildPolicy(settings: Settings, nonce: string): string {
  const images = ["'self'", "data:", originOf(settings.S3_PUBLIC_URL)];
  const forms = ["'self'", originOf(settings.GITHUB_BASE_URL || "https://github.com")];
  const directives: Record<string, (string | null)[]> = {
    "default-src": ["'self'"],
    "script-src": ["'self'", `'nonce-${nonce}'`],
    // The nonce is for the style sheets of the development server (React Router's and Vite's).
    "style-src": ["'self'", `'nonce-${nonce}'`, ...STYLE_HASHES],
    "img-src": images,
    "font-src": ["'self'"],
    "connect-src": ["'self'"],
    "object-src": ["'none'"],
    "base-uri": ["'self'"],
    "form-action": forms,
    "frame-ancestors": ["'none'"],
  };
  return Object.entries(directives)
    .map(([name, sources]) => [name, ...new Set(sources.filter(Boolean))].join(" "))
    .join("; ");
}

/** The headers every answer carries, pages, data, the API, photos and static files alike. */
export function securityHeaders(settings: Settings, nonce: string): Record<string, string> {
  return { "Content-Security-Policy": contentSecurityPolicy(settings, nonce), ...fixedHeaders(settings) };
}

let fixedFor: { origin: string; headers: Record<string, string> } | undefined;

/** The headers without a nonce, built once per origin (what a 304 carries). */
export function fixedHeaders(settings: Settings): Record<string, string> {
  if (fixedFor?.origin === settings.APP_ORIGIN) return fixedFor.headers;
  const headers = {
    "X-Content-Type-Options": "nosniff",
    "Referrer-Policy": "strict-origin-when-cross-origin",
    "Permissions-Policy": PERMISSIONS_POLICY,
    "X-Frame-Options": "DENY",
    "Cross-Origin-Opener-Policy": "same-origin",
    "Cross-Origin-Resource-Policy": "same-origin",
    // Only over HTTPS: on plain http the header is ignored, and on a local origin it would pin the name to HTTPS.
    ...(new URL(settings.APP_ORIGIN).protocol === "https:"
      ? { "Strict-Transport-Security": "max-age=31536000; includeSubDomains" }
      : {}),
  };
  fixedFor = { origin: settings.APP_ORIGIN, headers };
  return headers;
}

/** A document, its `.data`, or a redirect (which `.data` turns into a 202 only after the middleware). */
const isPage = (response: Response) =>
  /^text\/(html|x-script)\b/.test(response.headers.get("content-type") ?? "") ||
  (response.status >= 300 && response.status < 400);

function isSignedIn(context: Readonly<RouterContextProvider>): boolean {
  try {
    return !!context.get(authContext);
  } catch {
    // The session middleware did not run (a refused request): nobody was signed in for it.
    return false;
  }
}

function withHeaders(response: Response, headers: Record<string, string>): Response {
  try {
    for (const [name, value] of Object.entries(headers)) response.headers.set(name, value);
    return response;
  } catch {
    // Some responses have immutable headers; copy them into one we can change.
    const copy = new Response(response.body, response);
    for (const [name, value] of Object.entries(headers)) copy.headers.set(name, value);
    return copy;
  }
}

/**
 * The first root middleware: gives the request its nonce, then puts the security headers on whatever
 * the routes answer. A page (a document or its `.data`) for a signed-in member, or one that sets a
 * cookie, or one for a visitor with a picked vehicle, is never stored by the browser or a shared cache.
 */
export const securityHeadersMiddleware: MiddlewareFunction<Response> = async ({ context, request }, next) => {
  const nonce = createNonce();
  context.set(nonceContext, nonce);
  const secure = (response: Response) => {
    const headers = securityHeaders(env(), nonce);
    // A route that sets its own, narrower policy keeps it (/media's photos are sandboxed), and a
    // document keeps the policy it was rendered with.
    // A 304 has none: the browser keeps the policy that came with the page it already has, whose
    // scripts carry that policy's nonce (RFC 9111 §4.3.4 updates only the headers a 304 sends).
    if (response.headers.has("content-security-policy") || response.status === 304) delete headers["Content-Security-Policy"];
    // A visitor's picked vehicle (vehicle-cookie.server.ts) makes pages theirs as much as a session does.
    if (isPage(response) && (isSignedIn(context) || hasVehicleCookie(request) || response.headers.has("set-cookie"))) {
      headers["Cache-Control"] = "private, no-store";
    }
    return withHeaders(response, headers);
  };
  try {
    return secure(await next());
  } catch (thrown) {
    if (thrown instanceof Response) throw secure(thrown);
    throw thrown;
  }
};

/**
 * The nonce for a document render (app/entry.server.tsx), with the security headers already on the
 * document's headers, so even a document rendered outside the middleware carries a policy that
 * matches its scripts.
 */
export function documentNonce(loadContext: Readonly<RouterContextProvider> | undefined, headers: Headers): string {
  let nonce: string | null = null;
  try {
    nonce = loadContext?.get(nonceContext) ?? null;
  } catch {
    nonce = null;
  }
  nonce ??= createNonce();
  for (const [name, value] of Object.entries(securityHeaders(env(), nonce))) headers.set(name, value);
  return nonce;
}

type NodeHandler = (req: IncomingMessage, res: ServerResponse, next: (error?: unknown) => void) => void;

/**
 * For the Node servers (Express in production, Vite in development): fills in the security headers
 * on every answer that React Router did not already give them to, such as static files, just
 * before the headers are sent. Headers already set are left alone, so a page's policy keeps its nonce.
 */
export function securityHeadersLayer(): NodeHandler {
  return (_req, res, next) => {
    const writeHead = res.writeHead as (...args: unknown[]) => ServerResponse;
    res.writeHead = function (this: ServerResponse, ...args: unknown[]) {
      if (!this.headersSent) {
        const settings = env();
        for (const [name, value] of Object.entries(fixedHeaders(settings))) {
          if (!this.hasHeader(name)) this.setHeader(name, value);
        }
        // A 304 keeps the policy of the page the browser already has (see the middleware above).
        if (!this.hasHeader("Content-Security-Policy") && this.statusCode !== 304) {
          this.setHeader("Content-Security-Policy", contentSecurityPolicy(settings, createNonce()));
        }
      }
      return writeHead.apply(this, args);
    } as typeof res.writeHead;
    next();
  };
}

/** The same Node layers for the Vite development server (`npm run dev` and the integration tests). */
export function httpHardeningPlugin() {
  return {
    name: "torqueleaf-http-hardening",
    // Vite's own CORS answers OPTIONS for other local origins; the app serves no other origin.
    config: () => ({ server: { cors: false } }),
    configureServer(server: { middlewares: { use: (fn: NodeHandler) => void } }) {
      server.middlewares.use(securityHeadersLayer());
      server.middlewares.use(refuseUnsupportedMethods());
      server.middlewares.use(originFormTargets());
    },
  };
}
