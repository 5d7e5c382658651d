import type { Mail } from "~/services/mail.server";
import { TOKEN_TTL } from "~/models/user-tokens.server";

const escapeHtml = (s: string) =>
  s.replace(/[&<>"']/g, (c) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" })[c] ?? c);

const minutes = (ms: number) => Math.round(ms / 60_000);

/**
 * One simple layout for every account mail: the brand bar, a greeting, the paragraphs, one button,
 * and the link again as text for mail readers that block buttons. Inline styles only, as mail needs.
 */
function layout(input: {
  to: string;
  subject: string;
  greeting: string;
  paragraphs: string[];
  action?: { label: string; url: string };
  footer: string;
}): Mail {
  const textParts = [input.greeting, "", ...input.paragraphs.flatMap((p) => [p, ""])];
  if (input.action) textParts.push(`${input.action.label}: ${input.action.url}`, "");
  textParts.push("—", input.footer);
  const button = input.action
    ? `<p style="margin:24px 0"><a href="${escapeHtml(input.action.url)}" style="background:#17413a;color:#f7f4ee;padding:12px 20px;border-radius:6px;text-decoration:none;font-weight:600">${escapeHtml(input.action.label)}</a></p>
       <p style="font-size:13px;color:#4a5358">Or paste this address into your browser:<br><span style="word-break:break-all">${escapeHtml(input.action.url)}</span></p>`
    : "";
  const html = `<!doctype html><html lang="en"><body style="margin:0;background:#f7f4ee;font-family:system-ui,sans-serif;color:#1d2327">
<table role="presentation" width="100%" cellpadding="0" cellspacing="0"><tr><td align="center" style="padding:24px">
<table role="presentation" width="560" cellpadding="0" cellspacing="0" style="max-width:560px;background:#ffffff;border:1px solid #d9d1c3;border-radius:10px">
<tr><td style="background:#17413a;color:#f7f4ee;padding:16px 24px;border-radius:10px 10px 0 0;font-family:Georgia,serif;font-size:22px;font-weight:600">Torqueleaf</td></tr>
<tr><td style="padding:24px;font-size:16px;line-height:1.5">
<p>${escapeHtml(input.greeting)}</p>
${input.paragraphs.map((p) => `<p>${escapeHtml(p)}</p>`).join("\n")}
${button}
<p style="margin-top:32px;font-size:13px;color:#4a5358;border-top:1px solid #d9d1c3;padding-top:12px">${escapeHtml(input.footer)}</p>
</td></tr></table></td></tr></table></body></html>`;
  return { to: input.to, subject: input.subject, text: textParts.join("\n"), html };
}

const NOT_YOU = "If you did not ask for this, ignore this message; nothing changes on your account.";

export function confirmAddressMail(to: string, name: string, url: string): Mail {
  return layout({
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
  return layout({
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
  return layout({
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
  return layout({
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
  return layout({
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
