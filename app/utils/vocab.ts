/** The product's fixed vocabularies, shared by the schema, validation and the screens. */

export const ROLES = ["reader", "author", "editor", "admin"] as const;
export type Role = (typeof ROLES)[number];
export const ROLE_LABELS: Record<Role, string> = { reader: "Reader", author: "Author", editor: "Editor", admin: "Admin" };

export const POWERTRAINS = ["gas", "diesel", "hybrid", "plug-in-hybrid", "electric"] as const;
export type Powertrain = (typeof POWERTRAINS)[number];
export const DRIVETRAINS = ["FWD", "RWD", "AWD", "4WD"] as const;
export type Drivetrain = (typeof DRIVETRAINS)[number];
export const BATTERY_LOCATIONS = ["engine-bay", "cargo-area", "under-seat"] as const;
export type BatteryLocation = (typeof BATTERY_LOCATIONS)[number];

export const CATEGORIES = ["lighting", "power", "racks", "protection", "recovery", "electronics"] as const;
export type Category = (typeof CATEGORIES)[number];

/** A guide's public state; its working revision carries its own state beside it. */
export const GUIDE_STATES = ["draft", "in-review", "changes-requested", "published", "unpublished"] as const;
export type GuideState = (typeof GUIDE_STATES)[number];
/**
 * A revision is editable only while it is a draft; once submitted it is a frozen snapshot (database
 * triggers refuse changes). Sent back, it stays frozen and the author continues on a fresh copy.
 */
export const REVISION_STATES = ["draft", "in-review", "changes-requested", "published", "superseded"] as const;
export type RevisionState = (typeof REVISION_STATES)[number];

export const FITMENT_STATUSES = ["fits", "fits-with-changes", "does-not-fit"] as const;
export type FitmentStatus = (typeof FITMENT_STATUSES)[number];

/** What a single-use mailed token is for. */
export const TOKEN_KINDS = ["verify-email", "reset-password", "link-github"] as const;
export type TokenKind = (typeof TOKEN_KINDS)[number];

export const REVIEW_DECISIONS = ["request-changes", "approve", "unpublish"] as const;
export type ReviewDecision = (typeof REVIEW_DECISIONS)[number];
/** The engine's finding severities, as stored with a submitted revision. */
/**
 * Mail that goes through the outbox. `account` mail (confirm address, reset password …) cannot be
 * turned off; each of the others can, per user, in account settings and through its one-click link.
 */
export const MAIL_KINDS = [
  "account",
  "revision-submitted",
  "changes-requested",
  "guide-published",
  "guide-unpublished",
  "fitment-report",
] as const;
export type MailKind = (typeof MAIL_KINDS)[number];
export const OUTBOX_STATES = ["pending", "sent", "skipped", "failed"] as const;
export type OutboxState = (typeof OUTBOX_STATES)[number];

export const FINDING_SEVERITIES = ["blocking", "warning", "info"] as const;
export const FINDING_STATUSES = ["open", "acknowledged"] as const;
export type FindingStatus = (typeof FINDING_STATUSES)[number];

export const CALLOUT_KINDS = ["torque", "circuit", "caution", "tip"] as const;
export type CalloutKind = (typeof CALLOUT_KINDS)[number];

export const POWERTRAIN_LABELS: Record<Powertrain, string> = {
  gas: "Gasoline",
  diesel: "Diesel",
  hybrid: "Hybrid",
  "plug-in-hybrid": "Plug-in hybrid",
  electric: "Electric",
};
export const BATTERY_LOCATION_LABELS: Record<BatteryLocation, string> = {
  "engine-bay": "engine bay",
  "cargo-area": "cargo area",
  "under-seat": "under a seat",
};
export const CATEGORY_LABELS: Record<Category, string> = {
  lighting: "Lighting",
  power: "Power outlets",
  racks: "Racks and carriers",
  protection: "Underbody protection",
  recovery: "Recovery points",
  electronics: "Electronics",
};
export const FITMENT_LABELS: Record<FitmentStatus, string> = {
  fits: "Fits",
  "fits-with-changes": "Fits with changes",
  "does-not-fit": "Does not fit",
};
export const DIFFICULTY_LABELS = ["", "Easy", "Moderate", "Involved", "Advanced", "Expert"] as const;
