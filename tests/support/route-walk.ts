import { createHash } from "node:crypto";
import routes from "../../app/routes";

/**
 * Walks every route in app/routes.ts over HTTP, for the security-header and malformed-request
 * tests, on the development server (integration) and the built app (e2e) alike. A route without
 * an entry in ROUTE_PATHS fails those tests, so a new route must say here how it is reached.
 */

type RouteEntry = { path?: string; index?: boolean; file: string; children?: RouteEntry[] };
export type RouteInfo = { pattern: string; file: string };

/** Every route as its URL pattern ("/guides/:slug") and module file ("routes/guide.tsx"). */
export function routeList(entries: RouteEntry[] = routes as RouteEntry[], prefix = ""): RouteInfo[] {
  return entries.flatMap((entry) => {
    const here = entry.index ? prefix || "/" : `${prefix}/${entry.path ?? ""}`.replace(/\/+/g, "/");
    const own = entry.index || entry.path !== undefined ? [{ pattern: here === "" ? "/" : here, file: entry.file }] : [];
    return [...own, ...routeList(entry.children ?? [], entry.path !== undefined ? here.replace(/\/$/, "") : prefix)];
  });
}

export type RouteModuleShape = { hasAction: boolean; isPage: boolean };

/** Whether the route's module has an action, and whether it renders a page (a default export). */
export async function moduleShape(file: string): Promise<RouteModuleShape> {
  const mod = (await import(/* @vite-ignore */ `../../app/${file}`)) as Record<string, unknown>;
  return { hasAction: typeof mod.action === "function", isPage: typeof mod.default === "function" };
}

/** Demo data values for the routes' parameters (content-samples: the published guide, its first photo). */
export const fixtures = {
  publishedSlug: "kestrel-hood-auxiliary-lamps",
  badToken: "not-a-real-token-0123456789abcdefghijklmnop",
  /** The demo author's draft: the seventh guide the seed writes (content-samples/guides/index.ts). */
  draftGuideId: 7,
  /** The demo revision in review (the seed's sixth guide's first revision). */
  inReviewRevisionId: 6,
};

/** One URL per route pattern, with its parameters filled in; `photo` is looked up from the running app. */
export const ROUTE_PATHS: Record<string, (photo: string) => string[]> = {
  "/": () => ["/"],
  "/guides/:slug": () => [`/guides/${fixtures.publishedSlug}`, `/guides/${fixtures.publishedSlug}?print=1`],
  "/tools/circuit": () => ["/tools/circuit"],
  "/media/*": (photo) => [photo],
  "/dev/inbox": () => ["/dev/inbox"],
  "/api/catalogue": () => ["/api/catalogue"],
  "/api/guides": () => ["/api/guides"],
  "/api/guides/:slug": () => [`/api/guides/${fixtures.publishedSlug}`],
  "/api/guides/:slug/step-ticks": () => [`/api/guides/${fixtures.publishedSlug}/step-ticks`],
  "/api/circuit": () => ["/api/circuit"],
  "/api/media": () => ["/api/media"],
  "/api/guides/import": () => ["/api/guides/import"],
  "/api/guides/:id/draft": () => [`/api/guides/${fixtures.draftGuideId}/draft`, "/api/guides/not-a-number/draft"],
  "/api/guides/:id/submit": () => [`/api/guides/${fixtures.draftGuideId}/submit`],
  "/api/guides/:id/revision": () => [`/api/guides/${fixtures.draftGuideId}/revision`],
  "/api/guides/:id/export": () => [
    `/api/guides/${fixtures.draftGuideId}/export?format=json`,
    `/api/guides/${fixtures.draftGuideId}/export?format=markdown`,
  ],
  "/signup": () => ["/signup"],
  "/login": () => ["/login"],
  "/logout": () => ["/logout"],
  "/verify/:token": () => [`/verify/${fixtures.badToken}`],
  "/reset": () => ["/reset"],
  "/reset/:token": () => [`/reset/${fixtures.badToken}`],
  "/auth/github": () => ["/auth/github"],
  "/auth/github/callback": () => ["/auth/github/callback?code=x&state=y"],
  "/auth/github/link": () => ["/auth/github/link"],
  "/me/account": () => ["/me/account"],
  "/mail/opt-out/:token": () => [`/mail/opt-out/${fixtures.badToken}`],
  "/contributor-terms": () => ["/contributor-terms"],
  "/admin/users": () => ["/admin/users"],
  "/admin/audit": () => ["/admin/audit", "/admin/audit?actor=someone&from=2024-02-30&page=0"],
  "/admin/catalogue": () => ["/admin/catalogue"],
  "/workbench": () => ["/workbench"],
  "/workbench/guides/new": () => ["/workbench/guides/new"],
  "/workbench/guides/:id": () => ["/workbench/guides/1", "/workbench/guides/not-a-number"],
  "/workbench/guides/:id/preview": () => ["/workbench/guides/1/preview"],
  "/api/me": () => ["/api/me"],
  "/me/vehicles": () => ["/me/vehicles", "/me/vehicles?vmake=1&vmodel=not-a-number&vgen=99999"],
  "/pick-vehicle": () => ["/pick-vehicle"],
  "/guides/:slug/fitment-reports": () => [
    `/guides/${fixtures.publishedSlug}/fitment-reports`,
    "/guides/no-such-guide/fitment-reports",
  ],
  "/api/me/vehicles": () => ["/api/me/vehicles"],
  "/api/me/vehicles/:id": () => ["/api/me/vehicles/999999999", "/api/me/vehicles/not-a-number"],
  "/api/guides/:slug/fitment-reports": () => [`/api/guides/${fixtures.publishedSlug}/fitment-reports`],
  "/review": () => ["/review", "/review?vehicle=norvik.fjell&blocking=1"],
  "/review/:revisionId": () => [`/review/${fixtures.inReviewRevisionId}`, "/review/not-a-number"],
  "/api/review/queue": () => ["/api/review/queue"],
  "/api/review/:revisionId": () => [`/api/review/${fixtures.inReviewRevisionId}`, "/api/review/not-a-number"],
  // Checklists: the demo data has none, so these answer 401, 403 or 404 to the walkers (the
  // checklist tests and the matrix cover the owner's answers).
  "/me/checklists": () => ["/me/checklists"],
  "/me/checklists/:id": () => ["/me/checklists/1", "/me/checklists/1?print=1", "/me/checklists/not-a-number"],
  "/me/checklists/:id/csv": () => ["/me/checklists/1/csv"],
  "/api/checklists": () => ["/api/checklists"],
  "/api/checklists/:id": () => ["/api/checklists/1", "/api/checklists/1.csv", "/api/checklists/not-a-number"],
  "/api/checklists/:id/merge": () => ["/api/checklists/1/merge"],
  "/api/checklists/:id/items": () => ["/api/checklists/1/items"],
  "/api/checklists/:id/items/:itemId": () => ["/api/checklists/1/items/1", "/api/checklists/1/items/x"],
  "/api/openapi.json": () => ["/api/openapi.json"],
  "/api/docs": () => ["/api/docs"],
  "/api/*": () => ["/api/no-such-endpoint"],
  "/*": () => ["/no-such-page"],
};

/** The path of the published guide's first stored photo, as the API gives it. */
export async function photoPath(origin: string): Promise<string> {
  const guide = (await (await fetch(`${origin}/api/guides/${fixtures.publishedSlug}`)).json()) as {
    steps: { photos: { variants: { url: string }[] }[] }[];
  };
  return new URL(guide.steps.flatMap((s) => s.photos)[0].variants[0].url, origin).pathname;
}

/** The `.data` URL React Router's client fetches for a page (single fetch): `/_root.data` for the index. */
export function dataUrl(path: string): string {
  const url = new URL(path, "http://x");
  url.pathname = url.pathname === "/" ? "/_root.data" : `${url.pathname.replace(/\/$/, "")}.data`;
  return url.pathname + url.search;
}

export function parseCsp(header: string | null): Map<string, string[]> {
  const directives = new Map<string, string[]>();
  for (const part of (header ?? "").split(";")) {
    const [name, ...sources] = part.trim().split(/\s+/);
    if (name) directives.set(name.toLowerCase(), sources);
  }
  return directives;
}

const sha256 = (text: string) => `'sha256-${createHash("sha256").update(text).digest("base64")}'`;

/**
 * What is wrong with one answer's security headers, as readable lines (empty when nothing is).
 * Sources: CSP Level 3 (W3C) for the policy, the Fetch standard for nosniff, Referrer Policy (W3C),
 * Permissions Policy (W3C), RFC 6797 for HSTS.
 */
export function securityProblems(
  label: string,
  response: Response,
  body: string,
  options: { signedIn?: boolean; extraImgOrigin?: string } = {},
): string[] {
  const problems: string[] = [];
  const fail = (why: string) => problems.push(`${label} → ${response.status}: ${why}`);
  const headers = response.headers;
  const csp = parseCsp(headers.get("content-security-policy"));
  const has = (directive: string, ...sources: string[]) => {
    const listed = csp.get(directive);
    for (const source of sources) if (!listed?.includes(source)) fail(`${directive} lacks ${source}`);
  };
  if (!headers.has("content-security-policy")) fail("no Content-Security-Policy");
  // A stored file (a /media photo) gets a narrower policy than a page: nothing may load, it runs
  // sandboxed, and no other site may frame it.
  const sandboxed = csp.has("sandbox") && !!csp.get("default-src")?.includes("'none'");
  if (sandboxed) {
    has("frame-ancestors", "'none'");
    if (csp.get("script-src")?.length) fail("a sandboxed file may run no scripts");
  } else {
    has("default-src", "'self'");
    has("object-src", "'none'");
    has("frame-ancestors", "'none'");
    has("base-uri", "'self'");
    has("form-action", "'self'");
    has("img-src", "'self'", "data:", ...(options.extraImgOrigin ? [options.extraImgOrigin] : []));
    has("font-src", "'self'");
    has("connect-src", "'self'");
    const scripts = csp.get("script-src") ?? [];
    const nonces = scripts.filter((s) => /^'nonce-[A-Za-z0-9+/]{22}==?'$/.test(s));
    if (nonces.length !== 1) fail(`script-src needs exactly one nonce: ${scripts.join(" ")}`);
    for (const directive of ["script-src", "style-src"]) {
      const sources = csp.get(directive) ?? [];
      if (sources.includes("'unsafe-inline'") || sources.includes("'unsafe-eval'")) fail(`${directive} allows unsafe code`);
    }
  }
  if (headers.get("x-content-type-options") !== "nosniff") fail("no X-Content-Type-Options: nosniff");
  if (headers.get("referrer-policy") !== "strict-origin-when-cross-origin") fail("wrong Referrer-Policy");
  const permissions = headers.get("permissions-policy") ?? "";
  for (const feature of ["camera", "microphone", "geolocation", "payment", "usb"]) {
    if (!permissions.split(/,\s*/).includes(`${feature}=()`)) fail(`Permissions-Policy leaves ${feature} on`);
  }
  // The test servers are plain http: HSTS there would be ignored at best (RFC 6797 §7.2).
  if (headers.has("strict-transport-security")) fail("HSTS over plain http");

  const isHtml = /^text\/html/.test(headers.get("content-type") ?? "");
  if (isHtml) {
    const scriptSources = csp.get("script-src") ?? [];
    const nonce = scriptSources.find((s) => s.startsWith("'nonce-"))?.slice("'nonce-".length, -1);
    for (const tag of body.match(/<script\b[^>]*>/g) ?? []) {
      if (!tag.includes(`nonce="${nonce}"`)) fail(`a script without the request's nonce: ${tag.slice(0, 80)}`);
    }
    const styles = csp.get("style-src") ?? [];
    for (const [, attributes, css] of body.matchAll(/<style\b([^>]*)>([\s\S]*?)<\/style>/g)) {
      if (!styles.includes(sha256(css)) && !attributes.includes(`nonce="${nonce}"`)) {
        fail(`an inline style sheet the policy refuses: ${css.slice(0, 60)}`);
      }
    }
    if (/<[a-z][^>]*\sstyle="/i.test(body)) fail("an inline style= attribute, which style-src refuses");
  }
  const isPage = isHtml || /^text\/x-script/.test(headers.get("content-type") ?? "");
  if (isPage && options.signedIn) {
    const cache = headers.get("cache-control") ?? "";
    if (!/\bno-store\b/.test(cache) || !/\bprivate\b/.test(cache)) fail(`a signed-in page may be stored: "${cache}"`);
  }
  return problems;
}

/** Signs of a stack trace (V8's "at file:line:column" frames, raw or JSON-escaped) or of the server's own folder. */
export function leaksInternals(body: string): boolean {
  return /(?:\n|\\n)\s*at [^\n]*?:\d+:\d+/.test(body) || body.includes(process.cwd());
}
