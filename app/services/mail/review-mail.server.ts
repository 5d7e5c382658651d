import type { OutboxMail } from "~/models/outbox.server";
import { env } from "~/utils/env.server";

/**
 * The review desk's notifications, rendered in full when the outbox row is written: a plain-text
 * part and an escaped HTML part, every link absolute from APP_ORIGIN. Deliberately plain; the
 * account settings and opt-out link are added where the outbox is sent.
 */

export type Recipient = { id: number; email: string; name: string };
export type ReviewComment = { stepIndex: number | null; body: string };

const escapeHtml = (s: string) =>
  s.replace(/[&<>"']/g, (c) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" })[c] ?? c);

const link = (path: string) => new URL(path, env().APP_ORIGIN).href;

function render(
  kind: OutboxMail["kind"],
  to: Recipient,
  subject: string,
  paragraphs: string[],
  action: { label: string; path: string },
  list: string[] = [],
): OutboxMail {
  const url = link(action.path);
  const text = [
    `Hello ${to.name},`,
    "",
    ...paragraphs.flatMap((p) => [p, ""]),
    ...(list.length ? [...list.map((item) => `- ${item}`), ""] : []),
    `${action.label}: ${url}`,
  ].join("\n");
  const html = `<!doctype html><html lang="en"><body style="font-family:system-ui,sans-serif;color:#1d2327;line-height:1.5">
<p>Hello ${escapeHtml(to.name)},</p>
${paragraphs.map((p) => `<p>${escapeHtml(p)}</p>`).join("\n")}
${list.length ? `<ul>${list.map((item) => `<li style="white-space:pre-wrap">${escapeHtml(item)}</li>`).join("")}</ul>` : ""}
<p><a href="${escapeHtml(url)}">${escapeHtml(action.label)}</a></p>
<p style="font-size:13px;color:#4a5358">${escapeHtml(url)}</p>
</body></html>`;
  return { kind, userId: to.id, to: to.email, subject, text, html };
}

const where = (c: ReviewComment) => (c.stepIndex === null ? "Whole guide" : `Step ${c.stepIndex + 1}`);

export function revisionSubmittedMail(
  to: Recipient,
  input: { title: string; authorName: string; number: number; revisionId: number; changeSummary: string | null },
): OutboxMail {
  return render(
    "revision-submitted",
    to,
    `For review: ${input.title}`,
    [
      `${input.authorName} submitted revision ${input.number} of "${input.title}" for review.`,
      ...(input.changeSummary ? [`What changed, in the author's words: ${input.changeSummary}`] : []),
    ],
    { label: "Open it on the review desk", path: `/review/${input.revisionId}` },
  );
}

export function changesRequestedMail(
  to: Recipient,
  input: { title: string; number: number; guideId: number; note: string; editorName: string; comments: ReviewComment[] },
): OutboxMail {
  return render(
    "changes-requested",
    to,
    `Changes requested: ${input.title}`,
    [
      `${input.editorName} reviewed revision ${input.number} of "${input.title}" and asked for changes before it can be published.`,
      `Their note: ${input.note}`,
      ...(input.comments.length ? ["Their comments on the guide:"] : []),
    ],
    { label: "Continue in the Workbench", path: `/workbench/guides/${input.guideId}` },
    input.comments.map((c) => `${where(c)}: ${c.body}`),
  );
}

export function guidePublishedMail(to: Recipient, input: { title: string; number: number; slug: string }): OutboxMail {
  return render(
    "guide-published",
    to,
    `Published: ${input.title}`,
    [`An editor reviewed revision ${input.number} of "${input.title}" and published it. Readers see it in the Library now.`],
    { label: "See the guide", path: `/guides/${encodeURIComponent(input.slug)}` },
  );
}

export function guideUnpublishedMail(
  to: Recipient,
  input: { title: string; guideId: number; reason: string; editorName: string },
): OutboxMail {
  return render(
    "guide-unpublished",
    to,
    `Unpublished: ${input.title}`,
    [
      `${input.editorName} took "${input.title}" out of the Library. Readers who open it see the reason below.`,
      `Reason: ${input.reason}`,
    ],
    { label: "Open it in the Workbench", path: `/workbench/guides/${input.guideId}` },
  );
}
