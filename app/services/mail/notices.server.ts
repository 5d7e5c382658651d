import type { OutboxMail } from "~/models/outbox.server";
import { env } from "~/utils/env.server";
import { MAIL_KIND_INFO, type OptionalMailKind } from "~/utils/mail-kinds";
import type { FitmentStatus } from "~/utils/vocab";
import { type MailBlock, mailLayout } from "./layout.server";
import { optOutUrl } from "./opt-out-token.server";

/**
 * The notices of the review desk, one function per kind of mail in MAIL_KINDS other than account
 * mail. Each takes plain data (names, titles, absolute links) and returns the rendered mail for
 * `outboxInsert`, with the recipient's one-click opt-out link in the footer; the worker adds the
 * matching List-Unsubscribe headers when it sends. Everything is escaped by the layout.
 */

/** Who gets the mail: their account (for the opt-out) and address. */
export type Recipient = { userId: number; email: string; name: string };

const settingsUrl = () => `${env().APP_ORIGIN}/me/account#mail`;

function notice(
  kind: OptionalMailKind,
  to: Recipient,
  content: { subject: string; paragraphs: MailBlock[]; action: { label: string; url: string }; why: string },
): OutboxMail {
  const mail = mailLayout({
    to: to.email,
    subject: content.subject,
    greeting: `Hello ${to.name},`,
    paragraphs: content.paragraphs,
    action: content.action,
    footer: content.why,
    optOut: {
      url: optOutUrl(to.userId, kind),
      settingsUrl: settingsUrl(),
      what: `mails like this (“${MAIL_KIND_INFO[kind].label}”)`,
    },
  });
  return { ...mail, kind, userId: to.userId };
}

const revisionLabel = (n: number) => `revision ${n}`;

/** To each editor: a revision waits in the review queue. */
export function revisionSubmittedNotice(input: {
  to: Recipient;
  guideTitle: string;
  authorName: string;
  revisionNumber: number;
  changeSummary?: string | null;
  reviewUrl: string;
}): OutboxMail {
  const paragraphs: MailBlock[] = [
    `${input.authorName} submitted ${revisionLabel(input.revisionNumber)} of “${input.guideTitle}” for review.`,
  ];
  if (input.changeSummary?.trim())
    paragraphs.push({ by: "What changed, in the author's words", quote: input.changeSummary.trim() });
  paragraphs.push("Nothing reaches readers until an editor has reviewed its findings and signed off its cautions.");
  return notice("revision-submitted", input.to, {
    subject: `For review: ${input.guideTitle}`,
    paragraphs,
    action: { label: "Open the review", url: input.reviewUrl },
    why: "You get this mail because you review guides on Torqueleaf.",
  });
}

/** To the author: an editor sent the revision back, with the note and the comments on steps. */
export function changesRequestedNotice(input: {
  to: Recipient;
  guideTitle: string;
  editorName: string;
  revisionNumber: number;
  note: string;
  comments?: { step?: string | null; text: string }[];
  workbenchUrl: string;
}): OutboxMail {
  const paragraphs: MailBlock[] = [
    `${input.editorName} reviewed ${revisionLabel(input.revisionNumber)} of “${input.guideTitle}” and asks for changes before it can be published.`,
    { by: input.editorName, quote: input.note },
  ];
  const comments = input.comments ?? [];
  if (comments.length) {
    paragraphs.push(`Comments on the guide (${comments.length}):`);
    paragraphs.push({ list: comments.map((c) => (c.step ? `${c.step}: ${c.text}` : c.text)) });
  }
  paragraphs.push("Your draft is open again with the comments beside the steps; submit it when it is ready.");
  return notice("changes-requested", input.to, {
    subject: `Changes requested: ${input.guideTitle}`,
    paragraphs,
    action: { label: "Open the draft", url: input.workbenchUrl },
    why: "You get this mail because you wrote this guide.",
  });
}

/** To the author: the revision passed review and is what readers see now. */
export function guidePublishedNotice(input: {
  to: Recipient;
  guideTitle: string;
  editorName: string;
  revisionNumber: number;
  guideUrl: string;
}): OutboxMail {
  return notice("guide-published", input.to, {
    subject: `Published: ${input.guideTitle}`,
    paragraphs: [
      `${input.editorName} reviewed and approved ${revisionLabel(input.revisionNumber)} of “${input.guideTitle}”. It is in the Library now.`,
    ],
    action: { label: "See the guide", url: input.guideUrl },
    why: "You get this mail because you wrote this guide.",
  });
}

/** To the author: an editor took the guide out of the Library, and why. */
export function guideUnpublishedNotice(input: {
  to: Recipient;
  guideTitle: string;
  editorName: string;
  reason: string;
  workbenchUrl: string;
}): OutboxMail {
  return notice("guide-unpublished", input.to, {
    subject: `Taken down: ${input.guideTitle}`,
    paragraphs: [
      `${input.editorName} unpublished “${input.guideTitle}”. Readers no longer find it in the Library; its page says it was withdrawn.`,
      { by: "The reason given", quote: input.reason },
      "You can revise the guide and submit it for review again.",
    ],
    action: { label: "Open the guide", url: input.workbenchUrl },
    why: "You get this mail because you wrote this guide.",
  });
}

const FITMENT_WORDS: Record<FitmentStatus, string> = {
  fits: "fits",
  "fits-with-changes": "fits with changes",
  "does-not-fit": "does not fit",
};

/** To the author: a reader says how the guide fits their vehicle. */
export function fitmentReportNotice(input: {
  to: Recipient;
  guideTitle: string;
  reporterName: string;
  vehicle: string;
  status: FitmentStatus;
  note?: string | null;
  guideUrl: string;
}): OutboxMail {
  const paragraphs: MailBlock[] = [
    `${input.reporterName} reports that “${input.guideTitle}” ${FITMENT_WORDS[input.status]} on a ${input.vehicle}.`,
  ];
  if (input.note?.trim()) paragraphs.push({ by: input.reporterName, quote: input.note.trim() });
  return notice("fitment-report", input.to, {
    subject: `Fitment report: ${input.guideTitle}`,
    paragraphs,
    action: { label: "See the guide", url: input.guideUrl },
    why: "You get this mail because you wrote this guide.",
  });
}
