import { createHash, randomBytes } from "node:crypto";
import type { Cookie } from "react-router";
import { env, type Env } from "~/utils/env.server";
import { signedCookie } from "./cookie.server";

/** How long a browser is remembered as one its owner signed in from. */
export const DEVICE_DAYS = 365;
/** Accounts remembered per browser (a shared computer); the oldest is dropped first. */
const MAX_ACCOUNTS = 5;

/**
 * One entry per account that signed in on this browser: a random device id and a hash binding it
 * to the account, so the cookie names no account, and an entry copied onto another account is worthless.
 */
type Entry = { d: string; a: string };

const bind = (deviceId: string, userId: number) =>
  createHash("sha256").update(`device:${deviceId}:${userId}`).digest("base64url").slice(0, 22);

type Settings = Pick<Env, "NODE_ENV" | "APP_ORIGIN" | "SESSION_SECRET">;

/**
 * The signed "this browser signed in before" cookie: HttpOnly (no script reads it), SameSite=Lax,
 * and Secure with the `__Host-` prefix wherever the session cookie has them. Its signature, with
 * SESSION_SECRET, is what makes it unforgeable; it opens nothing by itself, it only lets the
 * owner's own browser past the sign-in limits that a guesser on the same address has used up.
 */
export function deviceCookie(settings: Settings = env()): Cookie {
  return signedCookie("tl_device", DEVICE_DAYS * 24 * 60 * 60, settings);
}

async function entries(request: Request, settings: Settings): Promise<Entry[]> {
  // A bad signature parses to null, a foreign shape is ignored.
  const value = await deviceCookie(settings).parse(request.headers.get("cookie"));
  if (!Array.isArray(value)) return [];
  return value
    .filter((e): e is Entry => !!e && typeof e.d === "string" && typeof e.a === "string" && e.d.length <= 64)
    .slice(0, MAX_ACCOUNTS);
}

/** The device id this browser holds for the account, when it signed in to it before; otherwise null. */
export async function knownDevice(request: Request, userId: number, settings: Settings = env()): Promise<string | null> {
  return (await entries(request, settings)).find((e) => e.a === bind(e.d, userId))?.d ?? null;
}

/** The Set-Cookie value that remembers this browser for the account (keeping its other accounts). */
export async function rememberDevice(request: Request, userId: number, settings: Settings = env()): Promise<string> {
  const existing = await entries(request, settings);
  const mine = existing.find((e) => e.a === bind(e.d, userId));
  const deviceId = mine?.d ?? randomBytes(16).toString("base64url");
  const others = existing.filter((e) => e !== mine);
  const next = [{ d: deviceId, a: bind(deviceId, userId) }, ...others].slice(0, MAX_ACCOUNTS);
  return deviceCookie(settings).serialize(next);
}
