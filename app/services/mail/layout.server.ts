import type { Mail } from "~/services/mail.server";

export const escapeHtml = (s: string) =>
  s.replace(/[&<>"']/g, (c) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" })[c] ?? c);

/** Text as HTML with its line breaks kept. */
const lines = (s: string) => escapeHtml(s).replace(/\r?\n/g, "<br>");

/** A paragraph, someone's words quoted (an editor's note or comment), or a short list. */
export type MailBlock = string | { quote: string; by: string } | { list: string[] };

export type MailLayout = {
  to: string;
  subject: string;
  greeting: string;
  paragraphs: MailBlock[];
  action?: { label: string; url: string };
  footer: string;
  /** For mail the recipient may turn off: the one-click link and the settings page. */
  optOut?: { url: string; settingsUrl: string; what: string };
};

function blockText(block: MailBlock): string {
  if (typeof block === "string") return block;
  if ("list" in block) return block.list.map((item) => `- ${item}`).join("\n");
  return `${block.by}:\n${block.quote
    .split(/\r?\n/)
    .map((l) => `> ${l}`)
    .join("\n")}`;
}

function blockHtml(block: MailBlock): string {
  if (typeof block === "string") return `<p>${escapeHtml(block)}</p>`;
  if ("list" in block) return `<ul style="padding-left:20px">${block.list.map((i) => `<li>${lines(i)}</li>`).join("")}</ul>`;
  return `<p style="margin-bottom:4px;font-weight:600">${escapeHtml(block.by)}:</p>
<blockquote style="margin:0 0 16px;padding:8px 14px;border-left:4px solid #b58a3c;background:#f7f4ee">${lines(block.quote)}</blockquote>`;
}

/**
 * One simple layout for every mail: the brand bar, a greeting, the paragraphs, one button, and the
 * link again as text for mail readers that block buttons. Inline styles only, as mail needs. Every
 * value is escaped here, so callers pass plain text.
 */
export function mailLayout(input: MailLayout): Mail {
  const textParts = [input.greeting, "", ...input.paragraphs.flatMap((p) => [blockText(p), ""])];
  if (input.action) textParts.push(`${input.action.label}: ${input.action.url}`, "");
  textParts.push("—", input.footer);
  if (input.optOut) {
    textParts.push(
      `Turn off ${input.optOut.what} with one click: ${input.optOut.url}`,
      `Choose which mails you get: ${input.optOut.settingsUrl}`,
    );
  }
  const button = input.action
    ? `<p style="margin:24px 0"><a href="${escapeHtml(input.action.url)}" style="background:#17413a;color:#f7f4ee;padding:12px 20px;border-radius:6px;text-decoration:none;font-weight:600">${escapeHtml(input.action.label)}</a></p>
       <p style="font-size:13px;color:#4a5358">Or paste this address into your browser:<br><span style="word-break:break-all">${escapeHtml(input.action.url)}</span></p>`
    : "";
  const optOut = input.optOut
    ? `<br><a href="${escapeHtml(input.optOut.url)}" style="color:#17413a">Turn off ${escapeHtml(input.optOut.what)}</a> · <a href="${escapeHtml(input.optOut.settingsUrl)}" style="color:#17413a">Choose which mails you get</a>`
    : "";
  const html = `<!doctype html><html lang="en"><body style="margin:0;background:#f7f4ee;font-family:system-ui,sans-serif;color:#1d2327">
<table role="presentation" width="100%" cellpadding="0" cellspacing="0"><tr><td align="center" style="padding:24px">
<table role="presentation" width="560" cellpadding="0" cellspacing="0" style="max-width:560px;background:#ffffff;border:1px solid #d9d1c3;border-radius:10px">
<tr><td style="background:#17413a;color:#f7f4ee;padding:16px 24px;border-radius:10px 10px 0 0;font-family:Georgia,serif;font-size:22px;font-weight:600">Torqueleaf</td></tr>
<tr><td style="padding:24px;font-size:16px;line-height:1.5">
<p>${escapeHtml(input.greeting)}</p>
${input.paragraphs.map(blockHtml).join("\n")}
${button}
<p style="margin-top:32px;font-size:13px;color:#4a5358;border-top:1px solid #d9d1c3;padding-top:12px">${escapeHtml(input.footer)}${optOut}</p>
</td></tr></table></td></tr></table></body></html>`;
  return { to: input.to, subject: input.subject, text: textParts.join("\n"), html };
}
