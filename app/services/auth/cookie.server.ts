import { type Cookie, createCookie } from "react-router";
import type { Env } from "~/utils/env.server";

export const SESSION_DAYS = 30;

/**
 * Secure cookies only travel over HTTPS, which browsers also grant to http://localhost. On any
 * other plain-http origin a Secure cookie would be dropped and nobody could sign in, so there the
 * cookie goes without Secure and without the `__Host-` prefix (which requires Secure).
 */
export function cookieIsSecure(settings: Pick<Env, "NODE_ENV" | "APP_ORIGIN">): boolean {
  if (settings.NODE_ENV !== "production") return false;
  const url = new URL(settings.APP_ORIGIN);
  return url.protocol === "https:" || ["localhost", "127.0.0.1", "[::1]"].includes(url.hostname);
}

/** `__Host-` binds the cookie to this exact host and path `/`: no subdomain can set or read it. */
export function cookieName(base: string, secure: boolean) {
  return secure ? `__Host-${base}` : base;
}

type CookieSettings = Pick<Env, "NODE_ENV" | "APP_ORIGIN" | "SESSION_SECRET">;

const built = new Map<string, Cookie>();

/**
 * A cookie signed with SESSION_SECRET, HttpOnly, SameSite=Lax, path `/`, and Secure with the
 * `__Host-` prefix wherever that works (see `cookieIsSecure`). SESSION_SECRET is comma-separated:
 * the first secret signs, every one is accepted, so a new secret can be put in front and the old
 * one dropped a cookie-lifetime later. Built once per name, lifetime and settings.
 */
export function signedCookie(base: string, maxAgeSeconds: number, settings: CookieSettings): Cookie {
  const key = `${base}|${maxAgeSeconds}|${settings.NODE_ENV}|${settings.APP_ORIGIN}|${settings.SESSION_SECRET}`;
  let cookie = built.get(key);
  if (!cookie) {
    const secure = cookieIsSecure(settings);
    cookie = createCookie(cookieName(base, secure), {
      httpOnly: true,
      sameSite: "lax",
      secure,
      path: "/",
      maxAge: maxAgeSeconds,
      secrets: settings.SESSION_SECRET.split(",")
        .map((s) => s.trim())
        .filter(Boolean),
    });
    built.set(key, cookie);
  }
  return cookie;
}

/** The session cookie holds only an opaque random id, signed so that a tampered value is ignored without a database look-up. */
export function sessionCookie(settings: CookieSettings): Cookie {
  return signedCookie("tl_session", SESSION_DAYS * 24 * 60 * 60, settings);
}

/** A short-lived signed cookie for one step of a flow (where to return after GitHub, which link is waiting for confirmation). */
export function flowCookie(base: string, maxAgeSeconds: number, settings: CookieSettings) {
  return signedCookie(base, maxAgeSeconds, settings);
}

/** The one-time message after a redirect-after-post (signed, so a page shows only our own words). */
export function flashCookie(settings: CookieSettings) {
  return signedCookie("tl_flash", 60, settings);
}
