import { ROLE_LABELS, type Role } from "./vocab";

/** What an audit row says happened, for the site log, a guide's history and the action filter. */
export const AUDIT_ACTION_LABELS: Record<string, string> = {
  "guide.create": "Started the guide",
  "revision.start": "Started a new revision from the published one",
  "revision.submit": "Sent a revision for safety review",
  "finding.acknowledge": "Acknowledged a safety finding",
  "caution.sign-off": "Signed off a caution",
  "revision.request-changes": "Asked the author for changes",
  "revision.approve-publish": "Approved and published a revision",
  "guide.unpublish": "Took the guide out of the Library",
  "user.role-changed": "Changed a role",
  "user.disabled": "Disabled an account",
  "user.enabled": "Enabled an account",
  "user.accepted-contributor-terms": "Accepted the contributor terms",
  "user.password-reset": "Reset a password",
  "user.linked-provider": "Linked a sign-in provider",
  "user.unconfirmed-password-cleared": "Cleared an unconfirmed password",
  "catalogue.make-add": "Added a make",
  "catalogue.make-edit": "Edited a make",
  "catalogue.make-delete": "Deleted a make",
  "catalogue.model-add": "Added a model",
  "catalogue.model-edit": "Edited a model",
  "catalogue.model-delete": "Deleted a model",
  "catalogue.generation-add": "Added a generation",
  "catalogue.generation-edit": "Edited a generation",
  "catalogue.generation-delete": "Deleted a generation",
  "catalogue.variant-add": "Added a variant",
  "catalogue.variant-edit": "Edited a variant",
  "catalogue.variant-retire": "Retired a variant",
  "catalogue.variant-restore": "Offered a retired variant again",
  "catalogue.variant-delete": "Deleted a variant",
  "fitment-report.hide": "Hid a reader's fitment report",
};

type Describable = {
  action: string;
  subjectType: string;
  subjectName: string | null;
  revisionNumber: number | null;
  data: Record<string, unknown> | null;
};

const roleLabel = (value: unknown) =>
  typeof value === "string" && value in ROLE_LABELS ? ROLE_LABELS[value as Role] : String(value);

/** One row of the log in plain words: "Changed Mina Solberg's role from Reader to Editor". */
export function describeAudit(row: Describable): string {
  const data = row.data ?? {};
  const who = row.subjectName;
  const revision = row.revisionNumber ? ` ${row.revisionNumber}` : "";
  switch (row.action) {
    case "user.role-changed":
      return `Changed ${who ? `${who}'s` : "an account's"} role from ${roleLabel(data.from)} to ${roleLabel(data.to)}`;
    case "user.disabled":
      return `Disabled ${who ?? "an account"}`;
    case "user.enabled":
      return `Enabled ${who ?? "an account"} again`;
    case "revision.submit": {
      const findings = typeof data.findings === "number" ? data.findings : null;
      const found =
        findings === null
          ? ""
          : `; the safety check found ${findings === 0 ? "nothing" : `${findings} ${findings === 1 ? "item" : "items"}`}`;
      return `Sent revision${revision} for safety review${found}`;
    }
    case "revision.request-changes":
      return `Asked the author for changes to revision${revision}`;
    case "revision.approve-publish":
      return `Approved and published revision${revision}`;
    case "revision.start":
      return `Started revision${revision} from the published one`;
  }
  if (row.action.startsWith("catalogue.") && typeof data.label === "string") {
    const base = AUDIT_ACTION_LABELS[row.action] ?? row.action;
    return `${base}: ${data.label}`;
  }
  const label = AUDIT_ACTION_LABELS[row.action];
  if (label) return label;
  // An action this list does not know yet still reads as words.
  const words = row.action.replace(/[.-]/g, " ");
  return words.charAt(0).toUpperCase() + words.slice(1);
}

/** A catalogue edit's changed values, "name: Fjell → Fjell Sport", for the details line. */
export function auditChanges(data: Record<string, unknown> | null): string[] {
  const changes = data?.changes;
  if (!changes || typeof changes !== "object") return [];
  return Object.entries(changes as Record<string, { from: unknown; to: unknown }>).map(
    ([field, c]) => `${field}: ${c?.from ?? "none"} → ${c?.to ?? "none"}`,
  );
}
