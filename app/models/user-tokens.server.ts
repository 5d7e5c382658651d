import { randomBytes } from "node:crypto";
import { and, eq, gt, inArray, isNull } from "drizzle-orm";
import { batch } from "~/db/batch.server";
import type { Db } from "~/db/client.server";
import { type TOKEN_KINDS, userTokens } from "~/db/schema";
import { hashToken } from "./sessions.server";

export type TokenKind = (typeof TOKEN_KINDS)[number];

const MINUTE = 60_000;

/**
 * How long a mailed or pending link stays valid. Reset links are short because whoever holds one
 * can take the account; a confirmation link only proves the mail arrived, so it may wait a day.
 */
export const TOKEN_TTL: Record<TokenKind, number> = {
  "verify-email": 24 * 60 * MINUTE,
  "reset-password": 30 * MINUTE,
  "link-github": 10 * MINUTE,
};

/**
 * A random single-use token and the queries that store it (only its hash) for a batch, so a mail
 * carrying the link can be written in the same transaction. Older unused tokens of the same kind
 * for the same user stop working, so only the newest mail's link is valid.
 */
export function tokenQueries(db: Db, userId: number, kind: TokenKind, data?: Record<string, unknown>) {
  const token = randomBytes(32).toString("base64url");
  const now = new Date();
  const queries = [
    db
      .update(userTokens)
      .set({ usedAt: now })
      .where(and(eq(userTokens.userId, userId), eq(userTokens.kind, kind), isNull(userTokens.usedAt))),
    db.insert(userTokens).values({
      userId,
      kind,
      tokenHash: hashToken(token),
      data: data ?? null,
      expiresAt: new Date(now.getTime() + TOKEN_TTL[kind]),
    }),
  ];
  return { token, queries };
}

/** Issues a token on its own (see `tokenQueries`). */
export async function issueToken(db: Db, userId: number, kind: TokenKind, data?: Record<string, unknown>) {
  const { token, queries } = tokenQueries(db, userId, kind, data);
  await batch(db, queries);
  return token;
}

const live = (token: string, kind: TokenKind) =>
  and(
    eq(userTokens.tokenHash, hashToken(token)),
    eq(userTokens.kind, kind),
    isNull(userTokens.usedAt),
    gt(userTokens.expiresAt, new Date()),
  );

/** Looks at a token without using it up (to show the form that will use it). */
export async function peekToken(db: Db, token: string, kind: TokenKind) {
  const [row] = await db.select().from(userTokens).where(live(token, kind)).limit(1);
  return row ?? null;
}

/** Uses a token up in one statement, so two requests with the same link cannot both succeed. */
export async function consumeToken(db: Db, token: string, kind: TokenKind) {
  const [row] = await db.update(userTokens).set({ usedAt: new Date() }).where(live(token, kind)).returning();
  return row ?? null;
}

/** Uses up every open token of these kinds for a user, as a query for a batch (links mailed before a change stop working). */
export function voidTokensQuery(db: Db, userId: number, kinds: TokenKind[]) {
  return db
    .update(userTokens)
    .set({ usedAt: new Date() })
    .where(and(eq(userTokens.userId, userId), inArray(userTokens.kind, kinds), isNull(userTokens.usedAt)));
}
