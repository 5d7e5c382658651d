import { batch } from "~/db/batch.server";
import type { Db } from "~/db/client.server";
import type { User } from "~/db/schema";
import { auditInsert } from "~/models/audit.server";
import { outboxInsert } from "~/models/outbox.server";
import { revokeUserSessionsQuery } from "~/models/sessions.server";
import { consumeToken, issueToken, peekToken, voidTokensQuery } from "~/models/user-tokens.server";
import {
  clearUnconfirmedPasswordQuery,
  createUserWithOAuth,
  findUserByEmail,
  findUserByOAuth,
  getUserById,
  linkOAuthAccountQueries,
  markEmailVerifiedQuery,
  normalizeEmail,
} from "~/models/users.server";
import { env } from "~/utils/env.server";
import { GITHUB, type GitHubProfile } from "./github.server";
import { unconfirmedPasswordClearedMail } from "./mails.server";

export type GitHubOutcome =
  | { kind: "signed-in"; user: User }
  | { kind: "confirm-link"; token: string }
  | { kind: "refused"; reason: "disabled" | "no-verified-email" };

/**
 * Decides what a GitHub identity means here. Accounts are keyed by GitHub's numeric id, never by
 * login or e-mail (both can change hands). An identity whose e-mail matches an existing account is
 * linked only when GitHub reports that address as verified, and only after the member confirms.
 *
 * An address GitHub does not report as verified is passed over as if it matched nothing: a
 * distinct answer for it would tell anyone who adds an address to a GitHub profile (which needs
 * no proof of owning it) whether that address has an account here.
 */
export async function resolveGitHubIdentity(db: Db, profile: GitHubProfile): Promise<GitHubOutcome> {
  const providerUserId = String(profile.id);
  const known = await findUserByOAuth(db, GITHUB, providerUserId);
  if (known) return known.disabledAt ? { kind: "refused", reason: "disabled" } : { kind: "signed-in", user: known };

  // The primary address first: it is the one GitHub itself mails.
  const verified = [...profile.emails].sort((a, b) => Number(b.primary) - Number(a.primary)).filter((e) => e.verified);
  for (const entry of verified) {
    const match = await findUserByEmail(db, entry.email);
    if (!match) continue;
    const token = await issueToken(db, match.id, "link-github", {
      providerUserId,
      login: profile.login,
      email: normalizeEmail(entry.email),
    });
    return { kind: "confirm-link", token };
  }

  const [first] = verified;
  if (!first) return { kind: "refused", reason: "no-verified-email" };
  const user = await createUserWithOAuth(db, {
    email: normalizeEmail(first.email),
    name: profile.name || profile.login,
    provider: GITHUB,
    providerUserId,
    login: profile.login,
  });
  return { kind: "signed-in", user };
}

type PendingLink = { providerUserId: string; login: string; email: string };

/**
 * An account nobody has confirmed yet may have been opened by someone who does not own the
 * address, with a password of their choosing, waiting for the real owner to make it trusted.
 */
export const isUnclaimed = (user: Pick<User, "emailVerifiedAt">) => !user.emailVerifiedAt;

/** The link waiting for the member's yes, with the account it would join; null when expired or used. */
export async function pendingLink(db: Db, token: string) {
  const row = await peekToken(db, token, "link-github");
  if (!row) return null;
  const user = await getUserById(db, row.userId);
  return user ? { user, link: row.data as PendingLink, unclaimed: isUnclaimed(user) } : null;
}

export type ConfirmedLink = { user: User; link: PendingLink; passwordCleared: boolean };

/**
 * The member said yes: the GitHub identity joins the account, whose address GitHub has now vouched for.
 *
 * When the account was never confirmed, GitHub's word is the first proof of who owns the address,
 * so whatever was set up before that proof is dropped: the password (whoever created the account
 * may have been someone else, waiting for the owner to confirm it for them), every session and
 * every link mailed earlier. We chose this over refusing the link until the address is confirmed
 * by mail, because GitHub's verified address is the same proof the mail would give, and the owner
 * gets in at once; they are told on screen and by mail, and can set a new password on the account
 * page. Everything is one batch, so an account is never left confirmed with the old password, and
 * the mail that says so is queued exactly when it happens.
 */
export async function confirmLink(db: Db, token: string): Promise<ConfirmedLink | null> {
  const row = await consumeToken(db, token, "link-github");
  if (!row) return null;
  const user = await getUserById(db, row.userId);
  if (!user || user.disabledAt) return null;
  const link = row.data as PendingLink;
  const alreadyLinked = !!(await findUserByOAuth(db, GITHUB, link.providerUserId));
  const unclaimed = isUnclaimed(user);
  const passwordCleared = unclaimed && !!user.passwordHash;
  const origin = env().APP_ORIGIN;
  await batch(db, [
    ...(alreadyLinked ? [] : linkOAuthAccountQueries(db, { userId: user.id, provider: GITHUB, ...link })),
    // Before the address is marked confirmed: the clearing statement only touches unconfirmed accounts.
    unclaimed && clearUnconfirmedPasswordQuery(db, user.id),
    unclaimed && revokeUserSessionsQuery(db, user.id),
    unclaimed && voidTokensQuery(db, user.id, ["verify-email", "reset-password"]),
    unclaimed &&
      auditInsert(db, {
        actorId: user.id,
        action: "user.unconfirmed-password-cleared",
        subjectType: "user",
        subjectId: user.id,
        data: { provider: GITHUB, login: link.login, hadPassword: !!user.passwordHash },
      }),
    markEmailVerifiedQuery(db, user.id),
    passwordCleared &&
      outboxInsert(db, {
        ...unconfirmedPasswordClearedMail(user.email, user.name, link.login, `${origin}/me/account`, `${origin}/reset`),
        kind: "account",
        userId: user.id,
      }),
  ]);
  const fresh = (await getUserById(db, user.id)) ?? user;
  return { user: fresh, link, passwordCleared };
}

export async function cancelLink(db: Db, token: string) {
  await consumeToken(db, token, "link-github");
}
