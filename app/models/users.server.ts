import { and, asc, count, eq, isNull, or, sql } from "drizzle-orm";
import { batch } from "~/db/batch.server";
import type { Db } from "~/db/client.server";
import { auditLog, oauthAccounts, users } from "~/db/schema";
import { hashPassword } from "~/services/password.server";
import { AppError } from "~/utils/errors";
import type { Role } from "~/utils/vocab";
import { auditInsert } from "./audit.server";
import { revokeUserSessionsQuery } from "./sessions.server";

export const normalizeEmail = (email: string) => email.trim().toLowerCase();

export async function findUserByEmail(db: Db, email: string) {
  return db.query.users.findFirst({ where: eq(users.email, normalizeEmail(email)) });
}

export async function getUserById(db: Db, id: number) {
  return db.query.users.findFirst({ where: eq(users.id, id) });
}

export async function createUser(
  db: Db,
  input: { email: string; name: string; password: string | null; role?: Role; verified?: boolean; bio?: string | null },
) {
  const [user] = await db
    .insert(users)
    .values({
      email: normalizeEmail(input.email),
      name: input.name.trim(),
      passwordHash: input.password ? await hashPassword(input.password) : null,
      role: input.role ?? "reader",
      bio: input.bio ?? null,
      emailVerifiedAt: input.verified ? new Date() : null,
      termsAcceptedAt: input.role && input.role !== "reader" ? new Date() : null,
    })
    .returning();
  return user;
}

export async function updateUserName(db: Db, userId: number, name: string) {
  await db.update(users).set({ name: name.trim() }).where(eq(users.id, userId));
}

/** Sets a password already hashed (hashing is slow, so it happens before the batch this joins). */
export function setPasswordHashQuery(db: Db, userId: number, passwordHash: string) {
  return db.update(users).set({ passwordHash }).where(eq(users.id, userId));
}

/**
 * Drops the password of an account whose address was never confirmed: whoever chose it may not
 * own the address. The condition is part of the statement, so a confirmed account keeps its password.
 */
export function clearUnconfirmedPasswordQuery(db: Db, userId: number) {
  return db
    .update(users)
    .set({ passwordHash: null })
    .where(and(eq(users.id, userId), isNull(users.emailVerifiedAt)));
}

export function markEmailVerifiedQuery(db: Db, userId: number) {
  return db
    .update(users)
    .set({ emailVerifiedAt: sql`coalesce(${users.emailVerifiedAt}, ${Date.now()})` })
    .where(eq(users.id, userId));
}

export async function markEmailVerified(db: Db, userId: number) {
  await markEmailVerifiedQuery(db, userId);
}

// ── Sign-in with another provider ─────────────────────────────────

export async function findUserByOAuth(db: Db, provider: string, providerUserId: string) {
  const [row] = await db
    .select({ user: users })
    .from(oauthAccounts)
    .innerJoin(users, eq(users.id, oauthAccounts.userId))
    .where(and(eq(oauthAccounts.provider, provider), eq(oauthAccounts.providerUserId, providerUserId)))
    .limit(1);
  return row?.user ?? null;
}

type OAuthLink = { provider: string; providerUserId: string; email: string | null; login?: string };

const linkedAudit = (link: OAuthLink) => ({
  action: "user.linked-provider",
  subjectType: "user",
  data: { provider: link.provider, providerUserId: link.providerUserId, login: link.login ?? null },
});

/** The link of a provider identity to an account and its audit entry, as queries for a batch. */
export function linkOAuthAccountQueries(db: Db, link: OAuthLink & { userId: number }) {
  return [
    db
      .insert(oauthAccounts)
      .values({ userId: link.userId, provider: link.provider, providerUserId: link.providerUserId, email: link.email }),
    auditInsert(db, { actorId: link.userId, subjectId: link.userId, ...linkedAudit(link) }),
  ] as const;
}

/**
 * A new account that signs in with a provider, created with its link and audit entry in one
 * batch: the later statements find the new row by its address, so no half-made account is left
 * behind if one of them fails.
 */
export async function createUserWithOAuth(db: Db, input: OAuthLink & { email: string; name: string }) {
  const email = normalizeEmail(input.email);
  const newId = sql`(select ${users.id} from ${users} where ${users.email} = ${email})`;
  await batch(db, [
    db.insert(users).values({ email, name: input.name.trim(), passwordHash: null, role: "reader", emailVerifiedAt: new Date() }),
    db.insert(oauthAccounts).values({ userId: newId, provider: input.provider, providerUserId: input.providerUserId, email }),
    db.insert(auditLog).values({ actorId: newId, subjectId: sql`cast(${newId} as text)`, ...linkedAudit(input) }),
  ]);
  const user = await findUserByEmail(db, email);
  if (!user) throw new Error("the account created with its provider link was not found");
  return user;
}

export async function listOAuthAccounts(db: Db, userId: number) {
  return db
    .select({ provider: oauthAccounts.provider, email: oauthAccounts.email, createdAt: oauthAccounts.createdAt })
    .from(oauthAccounts)
    .where(eq(oauthAccounts.userId, userId));
}

// ── Roles and administration ──────────────────────────────────────

/** A reader becomes an author by accepting the contributor terms; other roles are appointed by an admin. */
export async function acceptContributorTerms(db: Db, userId: number) {
  const user = await getUserById(db, userId);
  if (!user) throw new AppError(404, "not-found", "This account does not exist.");
  if (user.role !== "reader") return user;
  await batch(db, [
    db.update(users).set({ role: "author", termsAcceptedAt: new Date() }).where(eq(users.id, userId)),
    auditInsert(db, {
      actorId: userId,
      action: "user.accepted-contributor-terms",
      subjectType: "user",
      subjectId: userId,
      data: { from: "reader", to: "author" },
    }),
  ]);
  return getUserById(db, userId);
}

export const USERS_PAGE_SIZE = 20;

const likePattern = (q: string) => `%${q.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;

export async function listUsers(db: Db, query: { q?: string; role?: Role; page: number }) {
  const conditions = [];
  if (query.q) {
    const pattern = likePattern(query.q);
    conditions.push(or(sql`${users.email} LIKE ${pattern} ESCAPE '\\'`, sql`${users.name} LIKE ${pattern} ESCAPE '\\'`));
  }
  if (query.role) conditions.push(eq(users.role, query.role));
  const where = conditions.length ? and(...conditions) : undefined;
  const [rows, [{ n }]] = await Promise.all([
    db
      .select({
        id: users.id,
        email: users.email,
        name: users.name,
        role: users.role,
        emailVerifiedAt: users.emailVerifiedAt,
        disabledAt: users.disabledAt,
        createdAt: users.createdAt,
      })
      .from(users)
      .where(where)
      .orderBy(asc(users.name), asc(users.id))
      .limit(USERS_PAGE_SIZE)
      .offset((query.page - 1) * USERS_PAGE_SIZE),
    db.select({ n: count() }).from(users).where(where),
  ]);
  return { users: rows, total: n, page: query.page, pageSize: USERS_PAGE_SIZE };
}

async function targetOf(db: Db, actorId: number, userId: number) {
  if (actorId === userId) {
    throw new AppError(409, "own-account", "You cannot change your own role or status; ask another admin.");
  }
  const user = await getUserById(db, userId);
  if (!user) throw new AppError(404, "not-found", "This account does not exist.");
  return user;
}

export async function changeRole(db: Db, actorId: number, userId: number, role: Role, reason: string) {
  const user = await targetOf(db, actorId, userId);
  if (user.role === role) return user;
  await batch(db, [
    db
      .update(users)
      .set({ role, termsAcceptedAt: role !== "reader" ? (user.termsAcceptedAt ?? new Date()) : user.termsAcceptedAt })
      .where(eq(users.id, userId)),
    auditInsert(db, {
      actorId,
      action: "user.role-changed",
      subjectType: "user",
      subjectId: userId,
      reason,
      data: { from: user.role, to: role },
    }),
  ]);
  return { ...user, role };
}

/** Disabling also ends the account's sessions; the session check refuses it on the next request anyway. */
export async function setDisabled(db: Db, actorId: number, userId: number, disabled: boolean, reason: string) {
  const user = await targetOf(db, actorId, userId);
  if (!!user.disabledAt === disabled) return user;
  await batch(db, [
    db
      .update(users)
      .set({ disabledAt: disabled ? new Date() : null })
      .where(eq(users.id, userId)),
    disabled && revokeUserSessionsQuery(db, userId),
    auditInsert(db, {
      actorId,
      action: disabled ? "user.disabled" : "user.enabled",
      subjectType: "user",
      subjectId: userId,
      reason,
    }),
  ]);
  return user;
}
