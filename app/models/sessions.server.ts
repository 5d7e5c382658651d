import { createHash, randomBytes } from "node:crypto";
import { and, desc, eq, gt, isNull, ne } from "drizzle-orm";
import type { Db } from "~/db/client.server";
import { sessions, users } from "~/db/schema";
import { summarizeBrowser } from "~/services/auth/browser-summary";

const DAY = 24 * 60 * 60 * 1000;
/** Last-seen is written at most this often, so reading a page does not always cost a write. */
const TOUCH_EVERY = 5 * 60 * 1000;

/** The table keeps only the hash of the cookie's token: a copy of the database cannot sign anyone in. */
export const hashToken = (token: string) => createHash("sha256").update(token).digest("hex");

export async function createSession(
  db: Db,
  userId: number,
  meta: { userAgent: string | null; ipAddress: string | null },
  days: number,
): Promise<{ token: string; id: string }> {
  const token = randomBytes(32).toString("base64url");
  const id = hashToken(token);
  const now = Date.now();
  await db.insert(sessions).values({
    id,
    userId,
    userAgent: meta.userAgent?.slice(0, 300) ?? null,
    ipAddress: meta.ipAddress,
    lastSeenAt: new Date(now),
    expiresAt: new Date(now + days * DAY),
  });
  return { token, id };
}

/** The live session for a cookie token, with its user; null when unknown, revoked or expired. */
export async function findLiveSession(db: Db, token: string) {
  const [row] = await db
    .select({ session: sessions, user: users })
    .from(sessions)
    .innerJoin(users, eq(users.id, sessions.userId))
    .where(and(eq(sessions.id, hashToken(token)), isNull(sessions.revokedAt), gt(sessions.expiresAt, new Date())))
    .limit(1);
  return row ?? null;
}

export async function touchSession(db: Db, session: { id: string; lastSeenAt: Date }) {
  if (Date.now() - session.lastSeenAt.getTime() < TOUCH_EVERY) return;
  await db.update(sessions).set({ lastSeenAt: new Date() }).where(eq(sessions.id, session.id));
}

export async function revokeSession(db: Db, id: string, userId?: number) {
  const where = userId === undefined ? eq(sessions.id, id) : and(eq(sessions.id, id), eq(sessions.userId, userId));
  const rows = await db
    .update(sessions)
    .set({ revokedAt: new Date() })
    .where(and(where, isNull(sessions.revokedAt)))
    .returning({ id: sessions.id });
  return rows.length > 0;
}

/** Ends every session of a user, or every one but `exceptId` (the one making the change), as a query for a batch. */
export function revokeUserSessionsQuery(db: Db, userId: number, exceptId?: string) {
  const conditions = [eq(sessions.userId, userId), isNull(sessions.revokedAt)];
  if (exceptId) conditions.push(ne(sessions.id, exceptId));
  return db
    .update(sessions)
    .set({ revokedAt: new Date() })
    .where(and(...conditions));
}

export async function revokeUserSessions(db: Db, userId: number, exceptId?: string) {
  await revokeUserSessionsQuery(db, userId, exceptId);
}

export async function listLiveSessions(db: Db, userId: number) {
  return db
    .select({
      id: sessions.id,
      userAgent: sessions.userAgent,
      ipAddress: sessions.ipAddress,
      createdAt: sessions.createdAt,
      lastSeenAt: sessions.lastSeenAt,
    })
    .from(sessions)
    .where(and(eq(sessions.userId, userId), isNull(sessions.revokedAt), gt(sessions.expiresAt, new Date())))
    .orderBy(desc(sessions.lastSeenAt));
}

/**
 * An address as a person reads it: an IPv4 client reached over an IPv6 socket shows as
 * "::ffff:192.0.2.7" (an IPv4-mapped address, RFC 4291 §2.5.5.2), which is plain 192.0.2.7.
 */
export function plainAddress(address: string | null | undefined): string | null {
  const ip = address?.trim();
  if (!ip) return null;
  const mapped = ip.match(/^::ffff:(\d{1,3}(?:\.\d{1,3}){3})$/i);
  return mapped ? mapped[1] : ip;
}

/** A session as the account page lists it: "Firefox on Linux" and a plain address, not the raw headers. */
export function describeSession<T extends { userAgent: string | null; ipAddress: string | null }>(session: T) {
  const { userAgent, ipAddress, ...rest } = session;
  return { ...rest, browser: summarizeBrowser(userAgent), ipAddress: plainAddress(ipAddress) };
}
