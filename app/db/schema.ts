import { relations, sql } from "drizzle-orm";
import { index, integer, real, sqliteTable, text, uniqueIndex } from "drizzle-orm/sqlite-core";
import type { CalloutData } from "../engine/callouts";
import type { SwitchFeed } from "../engine/circuit-input";
import { TORQUE_SOURCES } from "../engine/torque-sources";
import type { Finding } from "../engine/rules";
import {
  BATTERY_LOCATIONS,
  CALLOUT_KINDS,
  CATEGORIES,
  DRIVETRAINS,
  FINDING_SEVERITIES,
  FINDING_STATUSES,
  FITMENT_STATUSES,
  GUIDE_STATES,
  MAIL_KINDS,
  OUTBOX_STATES,
  POWERTRAINS,
  REVIEW_DECISIONS,
  REVISION_STATES,
  ROLES,
  TOKEN_KINDS,
} from "../utils/vocab";

// The token kinds' own home is the vocabulary module; named here too for the token queries.
export { TOKEN_KINDS };

// Column names are snake_case in SQL (see `casing` in client.server.ts and drizzle.config.ts).
const id = () => integer().primaryKey({ autoIncrement: true });
const createdAt = () => integer({ mode: "timestamp_ms" }).notNull().default(sql`(unixepoch('subsec') * 1000)`);
const updatedAt = () =>
  integer({ mode: "timestamp_ms" })
    .notNull()
    .default(sql`(unixepoch('subsec') * 1000)`)
    .$onUpdateFn(() => new Date());
/** Set by the app on insert and update: a column added to an existing table cannot default to an expression. */
const touchedAt = () =>
  integer({ mode: "timestamp_ms" })
    .$defaultFn(() => new Date())
    .$onUpdateFn(() => new Date());

// ── People and access ──────────────────────────────────────────────

export const users = sqliteTable("users", {
  id: id(),
  email: text().notNull().unique(),
  name: text().notNull(),
  passwordHash: text(),
  role: text({ enum: ROLES }).notNull().default("reader"),
  bio: text(),
  emailVerifiedAt: integer({ mode: "timestamp_ms" }),
  termsAcceptedAt: integer({ mode: "timestamp_ms" }),
  disabledAt: integer({ mode: "timestamp_ms" }),
  createdAt: createdAt(),
  updatedAt: updatedAt(),
});

export const oauthAccounts = sqliteTable(
  "oauth_accounts",
  {
    id: id(),
    userId: integer()
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    provider: text().notNull(),
    providerUserId: text().notNull(),
    email: text(),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex("oauth_provider_user").on(t.provider, t.providerUserId)],
);

/** Server-side sessions: the cookie carries an opaque token, the table keeps only its hash. */
export const sessions = sqliteTable(
  "sessions",
  {
    id: text().primaryKey(),
    userId: integer()
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    userAgent: text(),
    ipAddress: text(),
    createdAt: createdAt(),
    lastSeenAt: integer({ mode: "timestamp_ms" }).notNull(),
    expiresAt: integer({ mode: "timestamp_ms" }).notNull(),
    revokedAt: integer({ mode: "timestamp_ms" }),
  },
  (t) => [index("sessions_user").on(t.userId)],
);

/** Single-use mail tokens, stored hashed. */
export const userTokens = sqliteTable(
  "user_tokens",
  {
    id: id(),
    userId: integer()
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    kind: text({ enum: TOKEN_KINDS }).notNull(),
    tokenHash: text().notNull().unique(),
    data: text({ mode: "json" }).$type<Record<string, unknown>>(),
    expiresAt: integer({ mode: "timestamp_ms" }).notNull(),
    usedAt: integer({ mode: "timestamp_ms" }),
    createdAt: createdAt(),
  },
  (t) => [index("user_tokens_user").on(t.userId)],
);

export const rateLimits = sqliteTable("rate_limits", {
  key: text().primaryKey(),
  windowStart: integer({ mode: "timestamp_ms" }).notNull(),
  count: integer().notNull(),
});

export const SIGN_IN_ATTEMPT_KINDS = ["sign-in", "current-password"] as const;

/** Wrong passwords tried on an account (at sign-in, or on the account page), shown to its owner. */
export const signInAttempts = sqliteTable(
  "sign_in_attempts",
  {
    id: id(),
    userId: integer()
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    kind: text({ enum: SIGN_IN_ATTEMPT_KINDS }).notNull(),
    ipAddress: text().notNull(),
    /** A short summary such as "Firefox on Linux", never the whole User-Agent string. */
    browser: text().notNull(),
    createdAt: createdAt(),
  },
  (t) => [index("sign_in_attempts_user_created").on(t.userId, t.createdAt)],
);

// ── Vehicle catalogue ──────────────────────────────────────────────

export const makes = sqliteTable("makes", {
  id: id(),
  slug: text().notNull().unique(),
  name: text().notNull(),
});

export const models = sqliteTable(
  "models",
  {
    id: id(),
    makeId: integer()
      .notNull()
      .references(() => makes.id),
    slug: text().notNull(),
    name: text().notNull(),
    bodyStyle: text(),
  },
  (t) => [uniqueIndex("models_make_slug").on(t.makeId, t.slug)],
);

export const generations = sqliteTable(
  "generations",
  {
    id: id(),
    modelId: integer()
      .notNull()
      .references(() => models.id),
    slug: text().notNull(),
    name: text().notNull(),
    firstYear: integer().notNull(),
    lastYear: integer(),
  },
  (t) => [uniqueIndex("generations_model_slug").on(t.modelId, t.slug)],
);

export const variants = sqliteTable(
  "variants",
  {
    id: id(),
    generationId: integer()
      .notNull()
      .references(() => generations.id),
    key: text().notNull().unique(),
    name: text().notNull(),
    powertrain: text({ enum: POWERTRAINS }).notNull(),
    drivetrain: text({ enum: DRIVETRAINS }).notNull(),
    batteryLocation: text({ enum: BATTERY_LOCATIONS }).notNull(),
    batteryRunM: real().notNull(),
    /** A retired variant stays for the guides whose fitment names it, but is offered for no new fitment. */
    retiredAt: integer({ mode: "timestamp_ms" }),
  },
  (t) => [index("variants_generation").on(t.generationId)],
);

/**
 * A counter per kind of content that readers' pages are built from, raised by triggers on every
 * change to it (migrations 0008 and 0011): "catalogue" (makes, models, generations, variants),
 * "guides" (guides, and authors' names and bios) and "reports" (readers' fitment reports). Caches
 * of those pages compare these rows instead of the content.
 */
export const contentStamps = sqliteTable("content_stamps", {
  name: text().primaryKey(),
  stamp: integer().notNull().default(0),
});

// ── Guides and their revisions ─────────────────────────────────────

/** The guide's own columns mirror its published revision so the Library lists without joins. */
export const guides = sqliteTable(
  "guides",
  {
    id: id(),
    slug: text().notNull().unique(),
    authorId: integer()
      .notNull()
      .references(() => users.id),
    state: text({ enum: GUIDE_STATES }).notNull().default("draft"),
    title: text().notNull(),
    summary: text().notNull().default(""),
    category: text({ enum: CATEGORIES }).notNull(),
    difficulty: integer().notNull(),
    minutes: integer().notNull(),
    publishedRevisionId: integer(),
    workingRevisionId: integer(),
    publishedAt: integer({ mode: "timestamp_ms" }),
    /** Set when an editor takes the guide out of the Library; its page answers 410 with this reason. */
    unpublishedReason: text(),
    unpublishedAt: integer({ mode: "timestamp_ms" }),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [
    // The Library lists published guides newest first, and finds a guide by its published revision.
    index("guides_state_published").on(t.state, t.publishedAt),
    index("guides_published_revision").on(t.publishedRevisionId),
    index("guides_author").on(t.authorId),
  ],
);

export const revisions = sqliteTable(
  "revisions",
  {
    id: id(),
    guideId: integer()
      .notNull()
      .references(() => guides.id, { onDelete: "cascade" }),
    number: integer().notNull(),
    state: text({ enum: REVISION_STATES }).notNull().default("draft"),
    /** Optimistic concurrency: every save must name the version it edited. */
    version: integer().notNull().default(1),
    title: text().notNull(),
    summary: text().notNull().default(""),
    category: text({ enum: CATEGORIES }).notNull(),
    difficulty: integer().notNull(),
    minutes: integer().notNull(),
    changeSummary: text(),
    createdById: integer()
      .notNull()
      .references(() => users.id),
    submittedAt: integer({ mode: "timestamp_ms" }),
    reviewedAt: integer({ mode: "timestamp_ms" }),
    reviewedById: integer().references(() => users.id),
    publishedAt: integer({ mode: "timestamp_ms" }),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [uniqueIndex("revisions_guide_number").on(t.guideId, t.number), index("revisions_state").on(t.state)],
);

export const steps = sqliteTable(
  "steps",
  {
    id: id(),
    revisionId: integer()
      .notNull()
      .references(() => revisions.id, { onDelete: "cascade" }),
    position: integer().notNull(),
    title: text().notNull(),
    body: text({ mode: "json" }).notNull().$type<unknown>(),
    /** Rendered once when the revision is saved, so readers never pay for the rich-text render. */
    bodyHtml: text().notNull().default(""),
    bodyText: text().notNull().default(""),
    liftsVehicle: integer({ mode: "boolean" }).notNull().default(false),
    disconnectsBattery: integer({ mode: "boolean" }).notNull().default(false),
  },
  (t) => [uniqueIndex("steps_revision_position").on(t.revisionId, t.position)],
);

export const callouts = sqliteTable(
  "callouts",
  {
    id: id(),
    stepId: integer()
      .notNull()
      .references(() => steps.id, { onDelete: "cascade" }),
    position: integer().notNull(),
    kind: text({ enum: CALLOUT_KINDS }).notNull(),
    /** Validated by the engine's callout schema for its kind before it is stored. */
    data: text({ mode: "json" }).notNull().$type<CalloutData>(),
    /** Torque callouts: where the value comes from; null on other kinds and on torque callouts stored before it was recorded. */
    torqueSource: text({ enum: TORQUE_SOURCES }),
    /** Circuit callouts: the switch (relay coil) feed branch, its own fuse and wire or from the main line; null when not given. */
    switchFeed: text({ mode: "json" }).$type<SwitchFeed>(),
  },
  (t) => [index("callouts_step").on(t.stepId)],
);

export type MediaVariant = { width: number; height: number; format: "webp" | "jpeg"; key: string; bytes: number };

export const media = sqliteTable("media", {
  id: id(),
  ownerId: integer()
    .notNull()
    .references(() => users.id),
  keyPrefix: text().notNull().unique(),
  originalName: text(),
  width: integer().notNull(),
  height: integer().notNull(),
  bytes: integer().notNull(),
  sha256: text().notNull(),
  variants: text({ mode: "json" }).notNull().$type<MediaVariant[]>(),
  createdAt: createdAt(),
});

export const stepPhotos = sqliteTable(
  "step_photos",
  {
    id: id(),
    stepId: integer()
      .notNull()
      .references(() => steps.id, { onDelete: "cascade" }),
    mediaId: integer()
      .notNull()
      .references(() => media.id),
    position: integer().notNull(),
    alt: text().notNull(),
    caption: text(),
  },
  (t) => [index("step_photos_step").on(t.stepId)],
);

export const fitment = sqliteTable(
  "fitment",
  {
    id: id(),
    revisionId: integer()
      .notNull()
      .references(() => revisions.id, { onDelete: "cascade" }),
    variantId: integer()
      .notNull()
      .references(() => variants.id),
    status: text({ enum: FITMENT_STATUSES }).notNull(),
    note: text(),
  },
  (t) => [
    uniqueIndex("fitment_revision_variant").on(t.revisionId, t.variantId),
    // The Library's filters and facets read fitment from both sides, each from its index alone.
    index("fitment_revision_status_variant").on(t.revisionId, t.status, t.variantId),
    index("fitment_variant_status_revision").on(t.variantId, t.status, t.revisionId),
  ],
);

export const parts = sqliteTable(
  "parts",
  {
    id: id(),
    revisionId: integer()
      .notNull()
      .references(() => revisions.id, { onDelete: "cascade" }),
    position: integer().notNull(),
    name: text().notNull(),
    quantity: integer().notNull().default(1),
    partNumber: text(),
    notes: text(),
    stepIndex: integer(),
  },
  (t) => [index("parts_revision").on(t.revisionId)],
);

export const tools = sqliteTable(
  "tools",
  {
    id: id(),
    revisionId: integer()
      .notNull()
      .references(() => revisions.id, { onDelete: "cascade" }),
    position: integer().notNull(),
    name: text().notNull(),
  },
  (t) => [index("tools_revision").on(t.revisionId)],
);

// ── Review ─────────────────────────────────────────────────────────

export const reviews = sqliteTable(
  "reviews",
  {
    id: id(),
    revisionId: integer()
      .notNull()
      .references(() => revisions.id, { onDelete: "cascade" }),
    editorId: integer()
      .notNull()
      .references(() => users.id),
    decision: text({ enum: REVIEW_DECISIONS }).notNull(),
    note: text(),
    createdAt: createdAt(),
  },
  (t) => [index("reviews_revision").on(t.revisionId)],
);

/** Safety findings computed by the engine when a revision is submitted. */
export const findings = sqliteTable(
  "findings",
  {
    id: id(),
    revisionId: integer()
      .notNull()
      .references(() => revisions.id, { onDelete: "cascade" }),
    rule: text().notNull().$type<Finding["rule"]>(),
    severity: text({ enum: FINDING_SEVERITIES }).notNull(),
    stepIndex: integer(),
    message: text().notNull(),
    numbers: text({ mode: "json" }).$type<Record<string, number>>(),
    status: text({ enum: FINDING_STATUSES }).notNull().default("open"),
    resolvedById: integer().references(() => users.id),
    resolvedAt: integer({ mode: "timestamp_ms" }),
    note: text(),
    createdAt: createdAt(),
  },
  (t) => [index("findings_revision").on(t.revisionId)],
);

export const cautionSignoffs = sqliteTable("caution_signoffs", {
  id: id(),
  calloutId: integer()
    .notNull()
    .unique()
    .references(() => callouts.id, { onDelete: "cascade" }),
  editorId: integer()
    .notNull()
    .references(() => users.id),
  /** The signal word and text the editor accepted ("DANGER: …"): a sign-off is for that exact wording. */
  wording: text(),
  createdAt: createdAt(),
});

/** An editor's comment on a revision under review, pinned to a step (or to the whole guide when null). */
export const reviewComments = sqliteTable(
  "review_comments",
  {
    id: id(),
    revisionId: integer()
      .notNull()
      .references(() => revisions.id, { onDelete: "cascade" }),
    stepIndex: integer(),
    editorId: integer()
      .notNull()
      .references(() => users.id),
    body: text().notNull(),
    createdAt: createdAt(),
  },
  (t) => [index("review_comments_revision").on(t.revisionId)],
);

// ── Mail ───────────────────────────────────────────────────────────

/**
 * Durable outbox: a mail is written in the same transaction as the change it reports and sent later
 * by the worker, with retries and backoff. `to`, `subject`, `text` and `html` are rendered when the
 * row is written; the worker adds nothing but the transport.
 */
export const outbox = sqliteTable(
  "outbox",
  {
    id: id(),
    kind: text({ enum: MAIL_KINDS }).notNull(),
    /** The recipient's account, when the mail is for one (their opt-outs apply at send time). */
    userId: integer().references(() => users.id, { onDelete: "set null" }),
    to: text().notNull(),
    subject: text().notNull(),
    text: text().notNull(),
    html: text().notNull(),
    state: text({ enum: OUTBOX_STATES }).notNull().default("pending"),
    attempts: integer().notNull().default(0),
    nextAttemptAt: integer({ mode: "timestamp_ms" }).notNull().default(sql`(unixepoch('subsec') * 1000)`),
    /** A worker that claims a row holds it until then; a crashed worker's claim simply runs out. */
    claimedUntil: integer({ mode: "timestamp_ms" }),
    lastError: text(),
    sentAt: integer({ mode: "timestamp_ms" }),
    createdAt: createdAt(),
  },
  (t) => [index("outbox_due").on(t.state, t.nextAttemptAt)],
);

/** A kind of mail a user has turned off (account mail cannot be). */
export const mailOptOuts = sqliteTable(
  "mail_opt_outs",
  {
    userId: integer()
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    kind: text({ enum: MAIL_KINDS }).notNull(),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex("mail_opt_outs_user_kind").on(t.userId, t.kind)],
);

// ── Readers ────────────────────────────────────────────────────────

export const savedVehicles = sqliteTable(
  "saved_vehicles",
  {
    id: id(),
    userId: integer()
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    variantId: integer()
      .notNull()
      .references(() => variants.id),
    year: integer(),
    nickname: text(),
    /** The one vehicle the Library and guide pages judge fitment against; at most one per reader. */
    current: integer({ mode: "boolean" }).notNull().default(false),
    createdAt: createdAt(),
  },
  (t) => [index("saved_vehicles_user").on(t.userId)],
);

export const checklists = sqliteTable(
  "checklists",
  {
    id: id(),
    userId: integer()
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    guideId: integer()
      .notNull()
      .references(() => guides.id, { onDelete: "cascade" }),
    revisionId: integer()
      .notNull()
      .references(() => revisions.id),
    title: text().notNull(),
    createdAt: createdAt(),
    updatedAt: touchedAt(),
  },
  (t) => [index("checklists_user").on(t.userId)],
);

export const checklistItems = sqliteTable(
  "checklist_items",
  {
    id: id(),
    checklistId: integer()
      .notNull()
      .references(() => checklists.id, { onDelete: "cascade" }),
    position: integer().notNull(),
    name: text().notNull(),
    partNumber: text(),
    quantity: integer().notNull().default(1),
    checked: integer({ mode: "boolean" }).notNull().default(false),
    note: text(),
    /** "part" or "tool" when copied from the guide; null for the reader's own item. */
    source: text({ enum: ["part", "tool"] }),
    /** The step that uses the part (from the guide's parts list), if any. */
    stepIndex: integer(),
    /** Identity of the guide's part or tool the item was copied from, to merge a newer revision. */
    sourceKey: text(),
    /** Set when a newer revision of the guide no longer lists the part; the item is kept, marked. */
    removedAt: integer({ mode: "timestamp_ms" }),
    updatedAt: touchedAt(),
  },
  (t) => [index("checklist_items_checklist").on(t.checklistId)],
);

export const fitmentReports = sqliteTable(
  "fitment_reports",
  {
    id: id(),
    guideId: integer()
      .notNull()
      .references(() => guides.id, { onDelete: "cascade" }),
    variantId: integer()
      .notNull()
      .references(() => variants.id),
    userId: integer()
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    /** The saved vehicle reported on, if the reader chose one (the variant is kept either way). */
    vehicleId: integer().references(() => savedVehicles.id, { onDelete: "set null" }),
    year: integer(),
    status: text({ enum: FITMENT_STATUSES }).notNull(),
    note: text(),
    createdAt: createdAt(),
    updatedAt: touchedAt(),
    /** An editor hid the report (abusive or off-topic); the reason is in the audit log too. */
    hiddenAt: integer({ mode: "timestamp_ms" }),
    hiddenBy: integer().references(() => users.id),
    hiddenReason: text(),
  },
  (t) => [
    index("fitment_reports_guide").on(t.guideId),
    // One report per reader, vehicle (variant) and guide: a second replaces the first.
    uniqueIndex("fitment_reports_reader_variant").on(t.guideId, t.userId, t.variantId),
  ],
);

/** Work-through mode: the steps a signed-in reader has ticked done, per published revision. */
export const stepTicks = sqliteTable(
  "step_ticks",
  {
    id: id(),
    userId: integer()
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    revisionId: integer()
      .notNull()
      .references(() => revisions.id, { onDelete: "cascade" }),
    position: integer().notNull(),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex("step_ticks_reader_step").on(t.userId, t.revisionId, t.position)],
);

export const comments = sqliteTable(
  "comments",
  {
    id: id(),
    guideId: integer()
      .notNull()
      .references(() => guides.id, { onDelete: "cascade" }),
    userId: integer()
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    body: text().notNull(),
    createdAt: createdAt(),
  },
  (t) => [index("comments_guide").on(t.guideId)],
);

// ── Audit ──────────────────────────────────────────────────────────

export const auditLog = sqliteTable(
  "audit_log",
  {
    id: id(),
    actorId: integer().references(() => users.id),
    action: text().notNull(),
    subjectType: text().notNull(),
    subjectId: text().notNull(),
    reason: text(),
    data: text({ mode: "json" }).$type<Record<string, unknown>>(),
    /** The guide the entry concerns, when it concerns one: the guide's own history and the site filter use it. */
    guideId: integer().references(() => guides.id, { onDelete: "set null" }),
    createdAt: createdAt(),
  },
  (t) => [
    index("audit_subject").on(t.subjectType, t.subjectId),
    index("audit_created").on(t.createdAt),
    index("audit_guide").on(t.guideId, t.createdAt),
    index("audit_actor").on(t.actorId, t.createdAt),
  ],
);

// ── Relations (for the query builder) ──────────────────────────────

export const usersRelations = relations(users, ({ many }) => ({ guides: many(guides) }));
export const modelsRelations = relations(models, ({ one, many }) => ({
  make: one(makes, { fields: [models.makeId], references: [makes.id] }),
  generations: many(generations),
}));
export const makesRelations = relations(makes, ({ many }) => ({ models: many(models) }));
export const generationsRelations = relations(generations, ({ one, many }) => ({
  model: one(models, { fields: [generations.modelId], references: [models.id] }),
  variants: many(variants),
}));
export const variantsRelations = relations(variants, ({ one }) => ({
  generation: one(generations, { fields: [variants.generationId], references: [generations.id] }),
}));
export const guidesRelations = relations(guides, ({ one, many }) => ({
  author: one(users, { fields: [guides.authorId], references: [users.id] }),
  workingRevision: one(revisions, { fields: [guides.workingRevisionId], references: [revisions.id] }),
  publishedRevision: one(revisions, { fields: [guides.publishedRevisionId], references: [revisions.id] }),
  revisions: many(revisions),
}));
export const revisionsRelations = relations(revisions, ({ one, many }) => ({
  guide: one(guides, { fields: [revisions.guideId], references: [guides.id] }),
  steps: many(steps),
  findings: many(findings),
}));
export const stepsRelations = relations(steps, ({ one, many }) => ({
  revision: one(revisions, { fields: [steps.revisionId], references: [revisions.id] }),
  callouts: many(callouts),
  photos: many(stepPhotos),
}));
export const calloutsRelations = relations(callouts, ({ one }) => ({
  step: one(steps, { fields: [callouts.stepId], references: [steps.id] }),
  signoff: one(cautionSignoffs, { fields: [callouts.id], references: [cautionSignoffs.calloutId] }),
}));
export const cautionSignoffsRelations = relations(cautionSignoffs, ({ one }) => ({
  callout: one(callouts, { fields: [cautionSignoffs.calloutId], references: [callouts.id] }),
  editor: one(users, { fields: [cautionSignoffs.editorId], references: [users.id] }),
}));
export const stepPhotosRelations = relations(stepPhotos, ({ one }) => ({
  step: one(steps, { fields: [stepPhotos.stepId], references: [steps.id] }),
  media: one(media, { fields: [stepPhotos.mediaId], references: [media.id] }),
}));
export const fitmentRelations = relations(fitment, ({ one }) => ({
  variant: one(variants, { fields: [fitment.variantId], references: [variants.id] }),
}));
export const findingsRelations = relations(findings, ({ one }) => ({
  revision: one(revisions, { fields: [findings.revisionId], references: [revisions.id] }),
}));
export const checklistsRelations = relations(checklists, ({ one, many }) => ({
  guide: one(guides, { fields: [checklists.guideId], references: [guides.id] }),
  items: many(checklistItems),
}));
export const checklistItemsRelations = relations(checklistItems, ({ one }) => ({
  checklist: one(checklists, { fields: [checklistItems.checklistId], references: [checklists.id] }),
}));

export type User = typeof users.$inferSelect;
export type Guide = typeof guides.$inferSelect;
export type Revision = typeof revisions.$inferSelect;
export type Step = typeof steps.$inferSelect;
export type Variant = typeof variants.$inferSelect;
export type Media = typeof media.$inferSelect;
