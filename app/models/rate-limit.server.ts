import { lt, sql } from "drizzle-orm";
import type { Db } from "~/db/client.server";
import { rateLimits } from "~/db/schema";
import { AppError } from "~/utils/errors";

const MINUTE = 60_000;
const HOUR = 60 * MINUTE;

/**
 * Attempts allowed per fixed window, per account and per client address. The account limits stop
 * password guessing against one person from many addresses; the address limits stop one client
 * spraying many accounts. Sizes are common practice for interactive sign-in: a person who mistypes
 * never meets them, a script meets them within seconds.
 */
export const LIMITS = {
  "sign-in": { account: [10, 15 * MINUTE], address: [50, 15 * MINUTE], what: "sign-in attempts" },
  "sign-up": { account: [3, HOUR], address: [10, HOUR], what: "sign-ups" },
  reset: { account: [3, HOUR], address: [10, HOUR], what: "password reset requests" },
  verify: { account: [5, HOUR], address: [30, HOUR], what: "confirmation requests" },
} as const satisfies Record<string, { account: readonly [number, number]; address: readonly [number, number]; what: string }>;

export type LimitedAction = keyof typeof LIMITS;

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
    await db.delete(rateLimits).where(lt(rateLimits.windowStart, new Date(now - 24 * HOUR)));
  }
  const retryAfter = Math.max(1, Math.ceil((row.windowStart.getTime() + windowMs - now) / 1000));
  return { allowed: row.count <= limit, retryAfter };
}

export function rateLimited(action: LimitedAction, retryAfter: number) {
  const minutes = Math.ceil(retryAfter / 60);
  return new AppError(
    429,
    "rate-limited",
    `Too many ${LIMITS[action].what} in a short time. Wait ${minutes} minute${minutes === 1 ? "" : "s"} and try again.`,
    undefined,
    { retryAfter },
  );
}

/** Counts the attempt against the client address and, when known, the account; throws 429 past either limit. */
export async function enforceLimits(db: Db, action: LimitedAction, who: { address: string; account?: string | null }) {
  const limits = LIMITS[action];
  const byAddress = await hit(db, `${action}:address:${who.address}`, limits.address[0], limits.address[1]);
  if (!byAddress.allowed) throw rateLimited(action, byAddress.retryAfter);
  if (who.account) {
    const byAccount = await hit(db, `${action}:account:${who.account.toLowerCase()}`, limits.account[0], limits.account[1]);
    if (!byAccount.allowed) throw rateLimited(action, byAccount.retryAfter);
  }
}
