import { z } from "zod";
import { type Db, getDb } from "~/db/client.server";
import type { User } from "~/db/schema";
import { batch } from "~/db/batch.server";
import { auditInsert } from "~/models/audit.server";
import { enforceLimits, forgive, recordFailedAttempt } from "~/models/rate-limit.server";
import { revokeUserSessionsQuery } from "~/models/sessions.server";
import { outboxInsert, queueMail } from "~/models/outbox.server";
import { consumeToken, peekToken, type TokenKind, tokenQueries } from "~/models/user-tokens.server";
import {
  createUser,
  findUserByEmail,
  getUserById,
  markEmailVerified,
  markEmailVerifiedQuery,
  setPasswordHashQuery,
} from "~/models/users.server";
import type { Mail } from "~/services/mail.server";
import { hashPassword, verifyPassword } from "~/services/password.server";
import { AppError } from "~/utils/errors";
import { parseValues } from "~/utils/forms.server";
import { env } from "~/utils/env.server";
import { summarizeBrowser } from "./browser-summary";
import { clientAddress } from "./client-address.server";
import { currentPasswordField, emailField, nameField, newPasswordField, passwordMatchesIdentity } from "./fields.server";
import { alreadyRegisteredMail, confirmAddressMail, passwordChangedMail, resetPasswordMail } from "./mails.server";

const address = (request: Request) => clientAddress(request, env().TRUST_PROXY);
const link = (path: string) => `${env().APP_ORIGIN}${path}`;

const parse = parseValues;

/** Account mail for the outbox: always sent, opt-outs do not apply. */
const accountMail = (userId: number, mail: Mail) => ({ ...mail, kind: "account" as const, userId });

/**
 * A fresh link of `kind` and the mail that carries it, in one transaction: the link exists exactly
 * when its mail is queued. The request never waits for SMTP (the worker sends it), so the answer's
 * timing does not tell whether an account exists.
 */
async function issueLinkByMail(db: Db, user: User, kind: TokenKind, mail: (token: string) => Mail) {
  const { token, queries } = tokenQueries(db, user.id, kind);
  await batch(db, [...queries, outboxInsert(db, accountMail(user.id, mail(token)))]);
}

const identityProblem = "Choose a password that is not your e-mail address or your name.";

export const signUpSchema = z.object({ name: nameField, email: emailField, password: newPasswordField });

/**
 * Creates an unconfirmed reader and mails the confirmation link. For an address that already has
 * an account the visible answer is the same; that account's owner gets a notice instead, so the
 * form cannot be used to find out who is a member.
 */
export async function signUp(request: Request, values: Record<string, string>) {
  const input = parse(signUpSchema, values);
  if (passwordMatchesIdentity(input.password, input)) {
    throw new AppError(400, "invalid", "Some fields need attention.", { password: identityProblem });
  }
  const db = await getDb();
  await enforceLimits(db, "sign-up", { address: address(request), account: input.email });
  const existing = await findUserByEmail(db, input.email);
  if (existing) {
    // The same scrypt cost as creating an account, so the answer takes as long either way.
    await hashPassword(input.password);
    await queueMail(
      db,
      accountMail(existing.id, alreadyRegisteredMail(existing.email, existing.name, link("/login"), link("/reset"))),
    );
    return;
  }
  const user = await createUser(db, { name: input.name, email: input.email, password: input.password });
  await issueLinkByMail(db, user, "verify-email", (token) => confirmAddressMail(user.email, user.name, link(`/verify/${token}`)));
}

/** Sends a fresh confirmation link to an unconfirmed account; the same answer whether or not there is one. */
export async function resendConfirmation(request: Request, values: Record<string, string>) {
  const { email } = parse(z.object({ email: emailField }), values);
  const db = await getDb();
  await enforceLimits(db, "verify", { address: address(request), account: email });
  const user = await findUserByEmail(db, email);
  if (!user || user.emailVerifiedAt || user.disabledAt) return;
  await issueLinkByMail(db, user, "verify-email", (token) => confirmAddressMail(user.email, user.name, link(`/verify/${token}`)));
}

/** Uses up a confirmation link; false when it is unknown, used or expired. */
export async function confirmAddress(request: Request, token: string): Promise<boolean> {
  const db = await getDb();
  await enforceLimits(db, "verify", { address: address(request) });
  const row = await consumeToken(db, token, "verify-email");
  if (!row) return false;
  await markEmailVerified(db, row.userId);
  return true;
}

/** Mails a reset link when the address has an active account; the caller shows the same answer either way. */
export async function requestPasswordReset(request: Request, values: Record<string, string>) {
  const { email } = parse(z.object({ email: emailField }), values);
  const db = await getDb();
  await enforceLimits(db, "reset", { address: address(request), account: email });
  const user = await findUserByEmail(db, email);
  if (!user || user.disabledAt) return;
  await issueLinkByMail(db, user, "reset-password", (token) => resetPasswordMail(user.email, user.name, link(`/reset/${token}`)));
}

/**
 * Sets the new password from a reset link and ends every session of the account: whoever had
 * the old password is signed out. Reading the link also proves the address, so it counts as confirmed.
 */
export async function completePasswordReset(request: Request, token: string, values: Record<string, string>) {
  const { password } = parse(z.object({ password: newPasswordField }), values);
  const db = await getDb();
  await enforceLimits(db, "reset", { address: address(request) });
  const expired = () => new AppError(400, "expired", "This reset link has expired or was used already. Ask for a new one.");
  // Checked before the link is used up, so a refused password does not cost the member their link.
  const pending = await peekToken(db, token, "reset-password");
  const owner = pending ? await getUserById(db, pending.userId) : null;
  if (!owner || owner.disabledAt) throw expired();
  if (passwordMatchesIdentity(password, owner)) {
    throw new AppError(400, "invalid", "Some fields need attention.", { password: identityProblem });
  }
  // Hashed before the link is used up, so the slow step cannot leave a used link and no password.
  const passwordHash = await hashPassword(password);
  const row = await consumeToken(db, token, "reset-password");
  if (!row) throw expired();
  await batch(db, [
    setPasswordHashQuery(db, row.userId, passwordHash),
    markEmailVerifiedQuery(db, row.userId),
    revokeUserSessionsQuery(db, row.userId),
    auditInsert(db, { actorId: row.userId, action: "user.password-reset", subjectType: "user", subjectId: row.userId }),
    outboxInsert(db, accountMail(owner.id, passwordChangedMail(owner.email, owner.name, link("/reset")))),
  ]);
}

/**
 * A signed-in member changes their password; every other session of the account ends. The
 * current password is limited like sign-in (only wrong ones count), so an open session on a
 * shared computer cannot be used to guess it, and each wrong one is shown to the owner.
 */
export async function changePassword(request: Request, user: User, sessionId: string, values: Record<string, string>) {
  const schema = z.object({
    currentPassword: user.passwordHash ? currentPasswordField : z.string().optional(),
    newPassword: newPasswordField,
  });
  const input = parse(schema, values);
  const db = await getDb();
  if (user.passwordHash) {
    const counted = await enforceLimits(db, "current-password", { address: address(request), account: String(user.id) });
    if (!(await verifyPassword(input.currentPassword ?? "", user.passwordHash))) {
      await recordFailedAttempt(db, {
        userId: user.id,
        kind: "current-password",
        ipAddress: address(request),
        browser: summarizeBrowser(request.headers.get("user-agent")),
      });
      throw new AppError(400, "invalid", "Some fields need attention.", {
        currentPassword: "That is not your current password.",
      });
    }
    await forgive(db, counted);
  }
  if (passwordMatchesIdentity(input.newPassword, user)) {
    throw new AppError(400, "invalid", "Some fields need attention.", { newPassword: identityProblem });
  }
  await batch(db, [
    setPasswordHashQuery(db, user.id, await hashPassword(input.newPassword)),
    revokeUserSessionsQuery(db, user.id, sessionId),
    outboxInsert(db, accountMail(user.id, passwordChangedMail(user.email, user.name, link("/reset")))),
  ]);
}
