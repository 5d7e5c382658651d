import { and, count, desc, eq, gt, inArray, lt, sql } from "drizzle-orm";
import type { Db } from "~/db/client.server";
import { rateLimits, type SIGN_IN_ATTEMPT_KINDS, signInAttempts } from "~/db/schema";
import { AppError } from "~/utils/errors";

const MINUTE = 60_000;
const HOUR = 60 * MINUTE;
const DAY = 24 * HOUR;

/**
 * Attempts allowed per fixed window, per account and per client address. Sizes are common
 * practice for interactive forms: a person who mistypes never meets them, a script meets them
 * within seconds.
 */
export const LIMITS = {
  "sign-up": { account: [3, HOUR], address: [10, HOUR], what: "sign-ups" },
  reset: { account: [3, HOUR], address: [10, HOUR], what: "password reset requests" },
  verify: { account: [5, HOUR], address: [30, HOUR], what: "confirmation requests" },
  /**
   * The current password asked on the account page, per account: whoever holds an open session
   * (a shared or stolen computer) must not be able to guess it to take the account over.
   */
  "current-password": { account: [5, 15 * MINUTE], address: [20, 15 * MINUTE], what: "password checks" },
} as const satisfies Record<string, { account: readonly [number, number]; address: readonly [number, number]; what: string }>;

/**
 * Password sign-in has no limit per account alone: one that counted every address together would
 * let anyone lock the owner out with a few wrong guesses. Instead a guesser is slowed per address
 * (spraying many accounts) and per account-and-address (guessing one), and a device the owner
 * signed in from before has its own allowance, so a guesser sharing its address cannot shut it out.
 */
export const SIGN_IN_LIMITS = {
  address: [50, 15 * MINUTE],
  accountAddress: [10, 15 * MINUTE],
  device: [10, 15 * MINUTE],
} as const;

export type LimitedAction = keyof typeof LIMITS | "sign-in";

const WHAT: Record<LimitedAction, string> = {
  ...Object.fromEntries(Object.entries(LIMITS).map(([action, limits]) => [action, limits.what])),
  "sign-in": "sign-in attempts",
} as Record<LimitedAction, string>;

/** Counts one attempt under `key` and says whether it is still within `limit` for the window. */
export async function hit(db: Db, key: string, limit: number, windowMs: number) {
  const now = Date.now();
  const expired = sql`${rateLimits.windowStart} <= ${now - windowMs}`;
  const [row] = await db
    .insert(rateLimits)
    .values({ key, windowStart: new Date(now), count: 1 })
    .onConflictDoUpdate({
      target: rateLimits.key,
      set: {
        // SQLite evaluates every SET expression against the old row, so both CASEs see the same window.
        count: sql`CASE WHEN ${expired} THEN 1 ELSE ${rateLimits.count} + 1 END`,
        windowStart: sql`CASE WHEN ${expired} THEN ${now} ELSE ${rateLimits.windowStart} END`,
      },
    })
    .returning();
  if (Math.random() < 0.01) {
    await db.delete(rateLimits).where(lt(rateLimits.windowStart, new Date(now - DAY)));
    await db.delete(signInAttempts).where(lt(signInAttempts.createdAt, new Date(now - ATTEMPTS_KEPT_DAYS * DAY)));
  }
  const retryAfter = Math.max(1, Math.ceil((row.windowStart.getTime() + windowMs - now) / 1000));
  return { allowed: row.count <= limit, retryAfter };
}

/** Takes back the attempt just counted under each key (it turned out right), so only failures add up. */
export async function forgive(db: Db, keys: string[]) {
  if (keys.length === 0) return;
  await db
    .update(rateLimits)
    .set({ count: sql`max(${rateLimits.count} - 1, 0)` })
    .where(inArray(rateLimits.key, keys));
}

export function rateLimited(action: LimitedAction, retryAfter: number) {
  const minutes = Math.ceil(retryAfter / 60);
  return new AppError(
    429,
    "rate-limited",
    `Too many ${WHAT[action]} in a short time. Wait ${minutes} minute${minutes === 1 ? "" : "s"} and try again.`,
    undefined,
    { retryAfter },
  );
}

/**
 * The bucket for an address: an IPv4 address as it is, an IPv6 address by its /64 prefix (one
 * home or one server usually holds a whole /64, so counting single IPv6 addresses limits nothing).
 */
export function addressBucket(address: string): string {
  const ip = address.trim().toLowerCase();
  const mapped = ip.match(/^::ffff:(\d+\.\d+\.\d+\.\d+)$/);
  if (mapped) return mapped[1];
  if (!ip.includes(":")) return ip;
  const [head, tail = ""] = ip.split("::");
  const left = head ? head.split(":") : [];
  const right = ip.includes("::") && tail ? tail.split(":") : [];
  const groups = ip.includes("::") ? [...left, ...Array(Math.max(0, 8 - left.length - right.length)).fill("0"), ...right] : left;
  return `${groups
    .slice(0, 4)
    .map((g) => g.replace(/^0+(?=.)/, ""))
    .join(":")}::/64`;
}

/**
 * Counts the attempt against the client address and, when known, the account; throws 429 past
 * either limit. Returns the keys it counted, for `forgive` when only failures should add up.
 */
export async function enforceLimits(
  db: Db,
  action: keyof typeof LIMITS,
  who: { address: string; account?: string | null },
): Promise<string[]> {
  const limits = LIMITS[action];
  const keys = [`${action}:address:${addressBucket(who.address)}`];
  const byAddress = await hit(db, keys[0], limits.address[0], limits.address[1]);
  if (!byAddress.allowed) throw rateLimited(action, byAddress.retryAfter);
  if (who.account) {
    keys.push(`${action}:account:${who.account.toLowerCase()}`);
    const byAccount = await hit(db, keys[1], limits.account[0], limits.account[1]);
    if (!byAccount.allowed) throw rateLimited(action, byAccount.retryAfter);
  }
  return keys;
}

/**
 * Counts a password sign-in (see SIGN_IN_LIMITS). With `device`, the id from a valid device
 * cookie of this very account, only that device's allowance applies. Returns the keys counted,
 * so a right password can be forgiven and only wrong ones add up.
 */
export async function enforceSignInLimits(
  db: Db,
  who: { address: string; account: string; device?: string | null },
): Promise<string[]> {
  const checks: [string, readonly [number, number]][] = who.device
    ? [[`sign-in:device:${who.device}`, SIGN_IN_LIMITS.device]]
    : [
        [`sign-in:address:${addressBucket(who.address)}`, SIGN_IN_LIMITS.address],
        [`sign-in:account-address:${who.account.toLowerCase()}|${addressBucket(who.address)}`, SIGN_IN_LIMITS.accountAddress],
      ];
  for (const [key, [limit, windowMs]] of checks) {
    const result = await hit(db, key, limit, windowMs);
    if (!result.allowed) throw rateLimited("sign-in", result.retryAfter);
  }
  return checks.map(([key]) => key);
}

// ── Failed attempts, for the owner to see ─────────────────────────

export const ATTEMPTS_KEPT_DAYS = 30;
export type AttemptKind = (typeof SIGN_IN_ATTEMPT_KINDS)[number];

export async function recordFailedAttempt(
  db: Db,
  attempt: { userId: number; kind: AttemptKind; ipAddress: string; browser: string },
) {
  await db.insert(signInAttempts).values({
    userId: attempt.userId,
    kind: attempt.kind,
    ipAddress: attempt.ipAddress.slice(0, 64),
    browser: attempt.browser.slice(0, 80),
  });
}

/**
 * The newest failed attempts on an account within the kept period, how many there were in all,
 * and the addresses that tried most (a guesser that moves between addresses shows as several).
 */
export async function recentFailedAttempts(db: Db, userId: number, limit = 10) {
  const since = new Date(Date.now() - ATTEMPTS_KEPT_DAYS * DAY);
  const where = and(eq(signInAttempts.userId, userId), gt(signInAttempts.createdAt, since));
  const tries = count();
  const [rows, [{ n }], addresses] = await Promise.all([
    db
      .select({
        kind: signInAttempts.kind,
        ipAddress: signInAttempts.ipAddress,
        browser: signInAttempts.browser,
        createdAt: signInAttempts.createdAt,
      })
      .from(signInAttempts)
      .where(where)
      .orderBy(desc(signInAttempts.createdAt), desc(signInAttempts.id))
      .limit(limit),
    db.select({ n: count() }).from(signInAttempts).where(where),
    db
      .select({ ipAddress: signInAttempts.ipAddress, tries })
      .from(signInAttempts)
      .where(where)
      .groupBy(signInAttempts.ipAddress)
      .orderBy(desc(tries), signInAttempts.ipAddress)
      .limit(limit),
  ]);
  return { attempts: rows, total: n, addresses };
}
