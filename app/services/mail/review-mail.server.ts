import type { OutboxMail } from "~/models/outbox.server";
import { env } from "~/utils/env.server";
import { changesRequestedNotice, guidePublishedNotice, guideUnpublishedNotice, revisionSubmittedNotice } from "./notices.server";

/**
 * The review desk's mail in the shapes its model functions hold (accounts, revisions, comments by
 * step index), rendered through the shared notices (notices.server.ts: one escaped layout, the
 * recipient's one-click opt-out link) with every link absolute from APP_ORIGIN.
 */

export type Recipient = { id: number; email: string; name: string };
export type ReviewComment = { stepIndex: number | null; body: string };

const link = (path: string) => new URL(path, env().APP_ORIGIN).href;
const recipient = (to: Recipient) => ({ userId: to.id, email: to.email, name: to.name });
const where = (c: ReviewComment) => (c.stepIndex === null ? "Whole guide" : `Step ${c.stepIndex + 1}`);

export function revisionSubmittedMail(
  to: Recipient,
  input: { title: string; authorName: string; number: number; revisionId: number; changeSummary: string | null },
): OutboxMail {
  return revisionSubmittedNotice({
    to: recipient(to),
    guideTitle: input.title,
    authorName: input.authorName,
    revisionNumber: input.number,
    changeSummary: input.changeSummary,
    reviewUrl: link(`/review/${input.revisionId}`),
  });
}

export function changesRequestedMail(
  to: Recipient,
  input: { title: string; number: number; guideId: number; note: string; editorName: string; comments: ReviewComment[] },
): OutboxMail {
  return changesRequestedNotice({
    to: recipient(to),
    guideTitle: input.title,
    editorName: input.editorName,
    revisionNumber: input.number,
    note: input.note,
    comments: input.comments.map((c) => ({ step: where(c), text: c.body })),
    workbenchUrl: link(`/workbench/guides/${input.guideId}`),
  });
}

export function guidePublishedMail(to: Recipient, input: { title: string; number: number; slug: string }): OutboxMail {
  return guidePublishedNotice({
    to: recipient(to),
    guideTitle: input.title,
    editorName: "An editor",
    revisionNumber: input.number,
    guideUrl: link(`/guides/${encodeURIComponent(input.slug)}`),
  });
}

export function guideUnpublishedMail(
  to: Recipient,
  input: { title: string; guideId: number; reason: string; editorName: string },
): OutboxMail {
  return guideUnpublishedNotice({
    to: recipient(to),
    guideTitle: input.title,
    editorName: input.editorName,
    reason: input.reason,
    workbenchUrl: link(`/workbench/guides/${input.guideId}`),
  });
}
