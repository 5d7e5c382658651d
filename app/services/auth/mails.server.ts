import { TOKEN_TTL } from "~/models/user-tokens.server";
import type { Mail } from "~/services/mail.server";
import { mailLayout } from "~/services/mail/layout.server";

const minutes = (ms: number) => Math.round(ms / 60_000);

const NOT_YOU = "If you did not ask for this, ignore this message; nothing changes on your account.";

export function confirmAddressMail(to: string, name: string, url: string): Mail {
  return mailLayout({
    to,
    subject: "Confirm your e-mail address for Torqueleaf",
    greeting: `Hello ${name},`,
    paragraphs: [
      "Thanks for joining Torqueleaf. Confirm that this address is yours, then sign in.",
      `The link works once, for ${minutes(TOKEN_TTL["verify-email"]) / 60} hours.`,
    ],
    action: { label: "Confirm my address", url },
    footer: NOT_YOU,
  });
}

export function resetPasswordMail(to: string, name: string, url: string): Mail {
  return mailLayout({
    to,
    subject: "Choose a new Torqueleaf password",
    greeting: `Hello ${name},`,
    paragraphs: [
      "Someone asked to reset the password of the Torqueleaf account that uses this address.",
      `The link works once, for ${minutes(TOKEN_TTL["reset-password"])} minutes. Choosing a new password signs out every device.`,
    ],
    action: { label: "Choose a new password", url },
    footer: NOT_YOU,
  });
}

/** Sent instead of a second account, so the sign-up form never tells a stranger which addresses are taken. */
export function alreadyRegisteredMail(to: string, name: string, signInUrl: string, resetUrl: string): Mail {
  return mailLayout({
    to,
    subject: "You already have a Torqueleaf account",
    greeting: `Hello ${name},`,
    paragraphs: [
      "Someone tried to create a Torqueleaf account with this address, which already has one.",
      `If that was you, sign in instead. Forgot the password? Ask for a new one at ${resetUrl}`,
    ],
    action: { label: "Sign in", url: signInUrl },
    footer: NOT_YOU,
  });
}

export function passwordChangedMail(to: string, name: string, resetUrl: string): Mail {
  return mailLayout({
    to,
    subject: "Your Torqueleaf password was changed",
    greeting: `Hello ${name},`,
    paragraphs: [
      "The password of your Torqueleaf account was just changed, and your other devices were signed out.",
      `If you did not do this, choose a new password now at ${resetUrl} and tell an editor.`,
    ],
    footer: "This notice is sent on every password change.",
  });
}

/**
 * Sent when a GitHub identity claimed an account whose address nobody had confirmed: the password
 * it was created with is gone, so whoever chose it (perhaps not the address's owner) is shut out.
 */
export function unconfirmedPasswordClearedMail(
  to: string,
  name: string,
  login: string,
  accountUrl: string,
  resetUrl: string,
): Mail {
  return mailLayout({
    to,
    subject: "Your Torqueleaf account is linked to GitHub and its old password was removed",
    greeting: `Hello ${name},`,
    paragraphs: [
      `Your Torqueleaf account was just linked to the GitHub identity @${login}, which confirmed this address.`,
      "The address had never been confirmed before, so the password the account was created with was removed and every device was signed out: if someone else opened the account with your address, they can no longer sign in.",
      "You sign in with GitHub now. To sign in with your e-mail address too, set a new password on your account page.",
      `If you did not link GitHub yourself, choose a new password at ${resetUrl} and tell an editor.`,
    ],
    action: { label: "Open my account page", url: accountUrl },
    footer: "This notice is sent whenever linking removes a password.",
  });
}
