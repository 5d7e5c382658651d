import { createHmac, timingSafeEqual } from "node:crypto";
import { z } from "zod";
import { env } from "~/utils/env.server";
import { isOptionalMailKind, type OptionalMailKind } from "~/utils/mail-kinds";

/**
 * The token in a mail's one-click opt-out link: `userId.kind.signature`, the signature an HMAC-SHA256
 * over both with SESSION_SECRET. Like the cookies, SESSION_SECRET is comma-separated: the first
 * secret signs, every one verifies, so rotating it does not break links already in inboxes.
 * It is the same for every mail of that kind to that person, so the List-Unsubscribe header (added at
 * send time) and the footer link (rendered when the row is written) agree. It holds no address and
 * opens nothing but that one opt-out.
 */
const PURPOSE = "torqueleaf mail opt-out v1";
const TOKEN = /^([1-9]\d{0,9})\.([a-z-]{1,40})\.([A-Za-z0-9_-]{43})$/;
export const MAX_OPT_OUT_TOKEN_LENGTH = 100;
const tokenSchema = z.string().max(MAX_OPT_OUT_TOKEN_LENGTH).regex(TOKEN);

const secrets = () =>
  env()
    .SESSION_SECRET.split(",")
    .map((s) => s.trim())
    .filter(Boolean);

const sign = (secret: string, userId: number, kind: string) =>
  createHmac("sha256", secret).update(`${PURPOSE}\n${userId}\n${kind}`).digest("base64url");

export function optOutToken(userId: number, kind: OptionalMailKind): string {
  return `${userId}.${kind}.${sign(secrets()[0], userId, kind)}`;
}

/** The link itself, on APP_ORIGIN. */
export function optOutUrl(userId: number, kind: OptionalMailKind): string {
  return `${env().APP_ORIGIN}/mail/opt-out/${optOutToken(userId, kind)}`;
}

/** Who and what a token is for, or null when it is malformed or its signature does not match any secret. */
export function readOptOutToken(token: string): { userId: number; kind: OptionalMailKind } | null {
  const parsed = tokenSchema.safeParse(token);
  const match = parsed.success ? TOKEN.exec(parsed.data) : null;
  if (!match) return null;
  const [, id, kind, signature] = match;
  if (!isOptionalMailKind(kind)) return null;
  const userId = Number(id);
  // Compared as text: two spellings of the same bytes (the last character's spare bits) are not both valid.
  const given = Buffer.from(signature);
  for (const secret of secrets()) {
    const expected = Buffer.from(sign(secret, userId, kind));
    if (expected.length === given.length && timingSafeEqual(expected, given)) return { userId, kind };
  }
  return null;
}
