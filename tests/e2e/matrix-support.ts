import routes from "../../app/routes";

/** The six kinds of caller the matrix asks about; "author (own)" and "(other's)" differ only in the path they call. */
export const WHO = ["anonymous", "reader", "authorOwn", "authorOther", "editor", "admin"] as const;
export type Who = (typeof WHO)[number];
export type Expected = Record<Who, number>;

export type Probe = {
  method?: "GET" | "POST" | "PUT" | "PATCH" | "DELETE";
  /** A path, or one per caller (an author's own object for authorOwn, another author's for authorOther). */
  path: string | ((who: Who) => string);
  form?: Record<string, string>;
  json?: unknown;
  /** Run with a session of its own, for probes that end or change the session (sign-out). */
  freshSession?: boolean;
  expect: Expected;
};

/** Everyone gets `status`, except the callers named in `except`. */
export function all(status: number, except: Partial<Expected> = {}): Expected {
  return { ...Object.fromEntries(WHO.map((w) => [w, status])), ...except } as Expected;
}

/** Anonymous callers get `anonymous` (a redirect to sign in, or 401 on the API); everyone signed in gets `status`. */
export const signedIn = (status: number, anonymous: number) => all(status, { anonymous });

/** Only the listed roles get `allowed`; other signed-in callers get `denied`; anonymous callers get `anonymous`. */
export function only(
  roles: ("reader" | "author" | "editor" | "admin")[],
  allowed: number,
  denied: number,
  anonymous: number,
): Expected {
  const has = (who: Who) => roles.some((r) => (r === "author" ? who === "authorOwn" || who === "authorOther" : r === who));
  return Object.fromEntries(WHO.map((w) => [w, w === "anonymous" ? anonymous : has(w) ? allowed : denied])) as Expected;
}

type RouteEntry = { path?: string; index?: boolean; children?: RouteEntry[] };

/** Every URL pattern in app/routes.ts, as "/guides/:slug"; layout routes without a path add none of their own. */
export function routePatterns(entries: RouteEntry[] = routes as RouteEntry[], prefix = ""): string[] {
  return entries.flatMap((entry) => {
    const here = entry.index ? prefix || "/" : `${prefix}/${entry.path ?? ""}`.replace(/\/+/g, "/");
    const own = entry.index || entry.path !== undefined ? [here === "" ? "/" : here] : [];
    return [...own, ...routePatterns(entry.children ?? [], entry.path !== undefined ? here.replace(/\/$/, "") : prefix)];
  });
}

/** The demo accounts behind each caller (api.md); both author columns use the same author. */
export const ACCOUNTS: Record<Exclude<Who, "anonymous">, string> = {
  reader: "reader@torqueleaf.test",
  authorOwn: "author@torqueleaf.test",
  authorOther: "author@torqueleaf.test",
  editor: "editor@torqueleaf.test",
  admin: "admin@torqueleaf.test",
};

export async function signInOverHttp(origin: string, email: string): Promise<string> {
  const response = await fetch(`${origin}/login`, {
    method: "POST",
    headers: { origin, "content-type": "application/x-www-form-urlencoded" },
    body: new URLSearchParams({ email, password: "torqueleaf-demo" }),
    redirect: "manual",
  });
  const cookie = response.headers.getSetCookie().find((c) => c.includes("tl_session="));
  if (response.status !== 302 || !cookie) throw new Error(`could not sign in ${email}: ${response.status}`);
  return cookie.split(";")[0];
}

/** Calls one probe as one caller over real HTTP, the way a same-site browser form or script would. */
export async function call(origin: string, probe: Probe, who: Who, cookie: string | null): Promise<number> {
  const method = probe.method ?? "GET";
  const headers: Record<string, string> = {};
  if (cookie) headers.cookie = cookie;
  if (method !== "GET") headers.origin = origin;
  let body: string | undefined;
  if (probe.form) {
    headers["content-type"] = "application/x-www-form-urlencoded";
    body = new URLSearchParams(probe.form).toString();
  } else if (probe.json !== undefined) {
    headers["content-type"] = "application/json";
    body = JSON.stringify(probe.json);
  }
  const path = typeof probe.path === "function" ? probe.path(who) : probe.path;
  const response = await fetch(`${origin}${path}`, { method, headers, body, redirect: "manual" });
  await response.arrayBuffer();
  return response.status;
}
