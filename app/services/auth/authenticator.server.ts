import { randomBytes } from "node:crypto";
import { Authenticator } from "remix-auth";
import { FormStrategy } from "remix-auth-form";
import { z } from "zod";
import { getDb } from "~/db/client.server";
import type { User } from "~/db/schema";
import { enforceSignInLimits, forgive, recordFailedAttempt } from "~/models/rate-limit.server";
import { findUserByEmail } from "~/models/users.server";
import { hashPassword, verifyPassword } from "~/services/password.server";
import { AppError } from "~/utils/errors";
import { parseValues } from "~/utils/forms.server";
import { env } from "~/utils/env.server";
import { summarizeBrowser } from "./browser-summary";
import { clientAddress } from "./client-address.server";
import { knownDevice } from "./device.server";
import { currentPasswordField, emailField } from "./fields.server";
import { createGitHubStrategy, type GitHubProfile } from "./github.server";

export type Signed = { kind: "password"; user: User } | { kind: "github"; profile: GitHubProfile };

export const signInSchema = z.object({ email: emailField, password: currentPasswordField });

/** One answer for an unknown address and a wrong password, so the form never confirms who has an account. */
export const WRONG_CREDENTIALS = "That e-mail address and password do not match an account. Check both and try again.";

let dummyHash: Promise<string> | undefined;

/** Checks a password even when there is no account, so both cases take the same scrypt time. */
async function passwordMatches(user: User | undefined, password: string) {
  if (user?.passwordHash) return verifyPassword(password, user.passwordHash);
  dummyHash ??= hashPassword(randomBytes(16).toString("hex"));
  await verifyPassword(password, await dummyHash);
  return false;
}

/**
 * E-mail and password: field checks, then the abuse limits (a browser that signed in to this
 * account before has its own allowance), then the password, then the account's state.
 */
async function verifyPasswordSignIn({ form, request }: { form: FormData; request: Request }): Promise<Signed> {
  const { email, password } = parseValues(signInSchema, Object.fromEntries(form));
  const db = await getDb();
  const address = clientAddress(request, env().TRUST_PROXY);
  const user = await findUserByEmail(db, email);
  const device = user ? await knownDevice(request, user.id) : null;
  const counted = await enforceSignInLimits(db, { address, account: email, device });
  if (!(await passwordMatches(user, password)) || !user) {
    // Kept for the owner to see on their account page; an address without an account has nobody to tell.
    if (user) {
      await recordFailedAttempt(db, {
        userId: user.id,
        kind: "sign-in",
        ipAddress: address,
        browser: summarizeBrowser(request.headers.get("user-agent")),
      });
    }
    throw new AppError(401, "invalid-credentials", WRONG_CREDENTIALS);
  }
  // The owner's own sign-ins do not use up the allowance of their address or device.
  await forgive(db, counted);
  // Past this point the password was right, so saying why the account cannot sign in reveals nothing new.
  if (user.disabledAt) {
    throw new AppError(403, "disabled", "This account has been disabled by an administrator. Write to the editors to ask why.");
  }
  if (!user.emailVerifiedAt) {
    throw new AppError(
      403,
      "unverified",
      "Confirm your e-mail address first: open the link in the mail we sent when you joined.",
      {
        email: "This address is not confirmed yet.",
      },
    );
  }
  return { kind: "password", user };
}

let cached: { key: string; authenticator: Authenticator<Signed> } | undefined;

/** The strategies, built from the settings (which the tests and the stand-ins may change at start-up). */
export function authenticator(): Authenticator<Signed> {
  const settings = env();
  const key = [
    settings.APP_ORIGIN,
    settings.NODE_ENV,
    settings.GITHUB_BASE_URL,
    settings.GITHUB_API_URL,
    settings.GITHUB_CLIENT_ID,
    settings.GITHUB_CLIENT_SECRET,
  ].join("|");
  if (cached?.key !== key) {
    const instance = new Authenticator<Signed>();
    instance.use(new FormStrategy<Signed>(verifyPasswordSignIn), "password");
    instance.use(
      createGitHubStrategy<Signed>(settings, async (profile) => ({ kind: "github", profile })),
      "github",
    );
    cached = { key, authenticator: instance };
  }
  return cached.authenticator;
}
