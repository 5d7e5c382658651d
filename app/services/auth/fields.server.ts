import { z } from "zod";
import { isCommonPassword } from "./common-passwords";

// Password rules from NIST SP 800-63B rev. 3 §5.1.1.2: at least 8 characters, at least 64 allowed,
// no composition rules, and refuse values from a list of common passwords. The upper bound only
// keeps a single scrypt call cheap; it is far above what anyone types.
export const PASSWORD_MIN = 8;
export const PASSWORD_MAX = 256;

export const emailField = z
  .string({ error: "Enter your e-mail address." })
  .trim()
  .min(1, "Enter your e-mail address.")
  .max(254, "An e-mail address is at most 254 characters.")
  .pipe(z.email("Enter an e-mail address like name@example.com."));

export const nameField = z
  .string({ error: "Enter your name." })
  .trim()
  .min(1, "Enter the name other members will see.")
  .max(80, "Keep the name under 80 characters.");

/** A password as typed at sign-in: anything non-empty; the rules apply only when one is chosen. */
export const currentPasswordField = z
  .string({ error: "Enter your password." })
  .min(1, "Enter your password.")
  .max(PASSWORD_MAX, "That password is longer than any we accept.");

export const newPasswordField = z
  .string({ error: "Choose a password." })
  .min(PASSWORD_MIN, `Use at least ${PASSWORD_MIN} characters; a few unrelated words work well.`)
  .max(PASSWORD_MAX, `Use at most ${PASSWORD_MAX} characters.`)
  .refine((value) => !isCommonPassword(value), "That password is one of the most common ones. Pick something less guessable.");

/** Forms that ask for nothing but an address (resend a confirmation, ask for a reset link). */
export const emailOnlySchema = z.object({ email: emailField });
export const newPasswordSchema = z.object({ password: newPasswordField });

/** A new password must also differ from the account's own e-mail address and name (same NIST section). */
export function passwordMatchesIdentity(password: string, identity: { email: string; name?: string }): boolean {
  const p = password.trim().toLowerCase();
  const local = identity.email.split("@")[0]?.toLowerCase();
  return p === identity.email.toLowerCase() || p === local || (!!identity.name && p === identity.name.trim().toLowerCase());
}
