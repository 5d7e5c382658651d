import type { Db } from "~/db/client.server";
import type { User } from "~/db/schema";
import { consumeToken, issueToken, peekToken } from "~/models/user-tokens.server";
import {
  createUser,
  findUserByEmail,
  findUserByOAuth,
  getUserById,
  linkOAuthAccount,
  markEmailVerified,
  normalizeEmail,
} from "~/models/users.server";
import { GITHUB, type GitHubProfile } from "./github.server";

export type GitHubOutcome =
  | { kind: "signed-in"; user: User }
  | { kind: "confirm-link"; token: string }
  | { kind: "refused"; reason: "disabled" | "no-verified-email" | "unverified-match" };

/**
 * Decides what a GitHub identity means here. Accounts are keyed by GitHub's numeric id, never by
 * login or e-mail (both can change hands). An identity whose e-mail matches an existing account is
 * linked only when GitHub reports that address as verified, and only after the member confirms.
 */
export async function resolveGitHubIdentity(db: Db, profile: GitHubProfile): Promise<GitHubOutcome> {
  const providerUserId = String(profile.id);
  const known = await findUserByOAuth(db, GITHUB, providerUserId);
  if (known) return known.disabledAt ? { kind: "refused", reason: "disabled" } : { kind: "signed-in", user: known };

  // The primary address first: it is the one GitHub itself mails.
  const emails = [...profile.emails].sort((a, b) => Number(b.primary) - Number(a.primary));
  for (const entry of emails) {
    const match = await findUserByEmail(db, entry.email);
    if (!match) continue;
    if (!entry.verified) return { kind: "refused", reason: "unverified-match" };
    const token = await issueToken(db, match.id, "link-github", {
      providerUserId,
      login: profile.login,
      email: normalizeEmail(entry.email),
    });
    return { kind: "confirm-link", token };
  }

  const verified = emails.find((e) => e.verified);
  if (!verified) return { kind: "refused", reason: "no-verified-email" };
  const user = await createUser(db, {
    email: verified.email,
    name: profile.name || profile.login,
    password: null,
    verified: true,
  });
  await linkOAuthAccount(db, {
    userId: user.id,
    provider: GITHUB,
    providerUserId,
    email: normalizeEmail(verified.email),
    login: profile.login,
  });
  return { kind: "signed-in", user };
}

type PendingLink = { providerUserId: string; login: string; email: string };

/** The link waiting for the member's yes, with the account it would join; null when expired or used. */
export async function pendingLink(db: Db, token: string) {
  const row = await peekToken(db, token, "link-github");
  if (!row) return null;
  const user = await getUserById(db, row.userId);
  return user ? { user, link: row.data as PendingLink } : null;
}

/** The member said yes: the GitHub identity joins the account, whose address GitHub has now vouched for. */
export async function confirmLink(db: Db, token: string): Promise<User | null> {
  const row = await consumeToken(db, token, "link-github");
  if (!row) return null;
  const user = await getUserById(db, row.userId);
  if (!user || user.disabledAt) return null;
  const link = row.data as PendingLink;
  if (!(await findUserByOAuth(db, GITHUB, link.providerUserId))) {
    await linkOAuthAccount(db, { userId: user.id, provider: GITHUB, ...link });
  }
  await markEmailVerified(db, user.id);
  return user;
}

export async function cancelLink(db: Db, token: string) {
  await consumeToken(db, token, "link-github");
}
