import { MAIL_KINDS, type MailKind, type Role } from "./vocab";

/** Account mail (confirm address, reset password, password changed) always goes out; the rest can be turned off. */
export const OPTIONAL_MAIL_KINDS = MAIL_KINDS.filter((k) => k !== "account") as Exclude<MailKind, "account">[];
export type OptionalMailKind = (typeof OPTIONAL_MAIL_KINDS)[number];

export const isOptionalMailKind = (kind: string): kind is OptionalMailKind => (OPTIONAL_MAIL_KINDS as string[]).includes(kind);

/** How each kind reads on the account page and the opt-out page, and who receives it. */
export const MAIL_KIND_INFO: Record<OptionalMailKind, { label: string; hint: string; for: "authors" | "editors" }> = {
  "revision-submitted": {
    label: "A revision waits for review",
    hint: "Sent to editors when an author submits a guide or a new revision.",
    for: "editors",
  },
  "changes-requested": {
    label: "An editor asks for changes",
    hint: "Sent to the author, with the editor's comments.",
    for: "authors",
  },
  "guide-published": {
    label: "Your guide is published",
    hint: "Sent to the author when an editor approves a revision.",
    for: "authors",
  },
  "guide-unpublished": {
    label: "Your guide is taken down",
    hint: "Sent to the author when an editor unpublishes a guide, with the reason.",
    for: "authors",
  },
  "fitment-report": {
    label: "A reader reports on fitment",
    hint: "Sent to the author when a reader says whether a guide fits their vehicle.",
    for: "authors",
  },
};

/** The optional kinds that can reach someone of this role: everyone who may write gets the author notices, editors the review ones too. */
export function mailKindsFor(role: Role): OptionalMailKind[] {
  const editor = role === "editor" || role === "admin";
  return OPTIONAL_MAIL_KINDS.filter((k) => editor || MAIL_KIND_INFO[k].for === "authors");
}
