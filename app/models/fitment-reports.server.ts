import { and, desc, eq, isNull, sql } from "drizzle-orm";
import { z } from "zod";
import { batch } from "~/db/batch.server";
import type { Db } from "~/db/client.server";
import { fitmentReports, guides, mailOptOuts, users } from "~/db/schema";
import { fitmentReportNotice } from "~/services/mail/notices.server";
import { env } from "~/utils/env.server";
import { forbidden, invalid, notFound } from "~/utils/errors";
import { type Actor, can } from "~/utils/permissions";
import { FITMENT_STATUSES, type FitmentStatus } from "~/utils/vocab";
import { auditInsert } from "./audit.server";
import { outboxInsert } from "./outbox.server";
import { BoundedCache } from "~/utils/bounded-cache";
import type { ContentStamps } from "./content-stamps.server";
import { HIDE_REASON_MAX, REPORT_NOTE_MAX } from "./reader-limits";
import { findOwnVehicle, variantFacts, variantIdField, vehicleIdField, vehicleLabel } from "./vehicles.server";

/** Guides whose public reports are kept: every guide a busy Library's readers open. */
const PUBLIC_REPORTS_KEPT = 1024;

/** An optional id: a form's empty choice and JSON's null mean none. */
const optionalId = <T extends z.ZodType>(field: T) =>
  z.preprocess((v) => (v === "" || v === null ? undefined : v), field.optional());

/** A report's fields, from the API's JSON or the guide page's form: one of the reader's vehicles, or a variant. */
export const reportFieldsSchema = z.object({
  vehicleId: optionalId(vehicleIdField),
  variantId: optionalId(variantIdField),
  outcome: z.enum(FITMENT_STATUSES, { error: "Outcome: choose fits, fits with changes or does not fit." }),
  note: z
    .string({ error: "Note: give it as text." })
    .trim()
    .max(REPORT_NOTE_MAX, `Note: at most ${REPORT_NOTE_MAX} characters.`)
    .optional()
    .default(""),
});

/** What a report needs beyond its fields' shapes: a vehicle, and a note when it fit with changes. */
export function reportRules(input: z.output<typeof reportFieldsSchema>, ctx: z.RefinementCtx) {
  if (input.vehicleId === undefined && input.variantId === undefined) {
    ctx.addIssue({ code: "custom", path: ["vehicleId"], message: "Vehicle: pick one of your saved vehicles." });
  }
  if (input.outcome === "fits-with-changes" && !input.note) {
    ctx.addIssue({ code: "custom", path: ["note"], message: "Note: say what you had to change." });
  }
}

export const reportInputSchema = reportFieldsSchema.superRefine(reportRules);
export type ReportInput = z.output<typeof reportInputSchema>;

const reportIdField = z.preprocess(
  (v) => (typeof v === "string" && /^\d{1,10}$/.test(v) ? Number(v) : v),
  z
    .number({ error: "Report: pick a report from the list." })
    .int("Report: pick a report from the list.")
    .positive("Report: pick a report from the list.")
    .max(2 ** 31, "Report: pick a report from the list."),
);

export const hideInputSchema = z.object({
  reportId: reportIdField,
  reason: z
    .string({ error: "Reason: say why the report is hidden." })
    .trim()
    .min(3, "Reason: say why the report is hidden.")
    .max(HIDE_REASON_MAX, `Reason: at most ${HIDE_REASON_MAX} characters.`),
});

async function publishedGuide(db: Db, slug: string) {
  const [guide] = await db
    .select({ id: guides.id, slug: guides.slug, title: guides.title, state: guides.state, authorId: guides.authorId })
    .from(guides)
    .where(eq(guides.slug, slug));
  if (guide?.state !== "published") throw notFound(`A published guide called "${slug}"`);
  return guide;
}

/**
 * Records how the guide fitted the reader's vehicle. One report per reader, variant and guide: a
 * second replaces the first (the unique index decides, in one statement). The author hears of a new
 * report, or of a changed outcome, by mail in the same transaction, unless they turned that mail
 * off or wrote the report themselves. A report an editor hid stays hidden when its reader edits it.
 */
export async function submitFitmentReport(db: Db, actor: Actor & { name: string }, slug: string, input: ReportInput) {
  if (!can(actor, "report:fitment")) throw forbidden();
  const guide = await publishedGuide(db, slug);
  let variantId = input.variantId;
  let year: number | null = null;
  let vehicleId: number | null = null;
  if (input.vehicleId !== undefined) {
    const vehicle = await findOwnVehicle(db, actor, input.vehicleId);
    variantId = vehicle.variantId;
    year = vehicle.year;
    vehicleId = vehicle.id;
  }
  if (variantId === undefined) throw invalid({ vehicleId: "Vehicle: pick one of your saved vehicles." });
  const facts = (await variantFacts(db, [variantId])).get(variantId);
  if (!facts) throw invalid({ variantId: "Variant: pick a variant from the list." });

  const [before] = await db
    .select({ id: fitmentReports.id, status: fitmentReports.status })
    .from(fitmentReports)
    .where(
      and(eq(fitmentReports.guideId, guide.id), eq(fitmentReports.userId, actor.id), eq(fitmentReports.variantId, variantId)),
    );
  const values = { status: input.outcome, note: input.note || null, vehicleId, year, updatedAt: new Date() };
  const upsert = db
    .insert(fitmentReports)
    .values({ guideId: guide.id, userId: actor.id, variantId, ...values })
    .onConflictDoUpdate({ target: [fitmentReports.guideId, fitmentReports.userId, fitmentReports.variantId], set: values })
    .returning({ id: fitmentReports.id });

  const tellAuthor = guide.authorId !== actor.id && (!before || before.status !== input.outcome);
  const mail = tellAuthor ? await authorMail(db, guide, actor.name, vehicleLabel(facts.label, year), input) : null;
  const [rows] = await batch(db, [upsert, mail && outboxInsert(db, mail)]);
  const id = (rows as { id: number }[])[0].id;
  return { id, guideId: guide.id, variantId, year, vehicleId, outcome: input.outcome, note: values.note, replaced: !!before };
}

/** The author's mail about a report, or null when they turned fitment-report mail off. */
async function authorMail(
  db: Db,
  guide: { authorId: number; title: string; slug: string },
  reporterName: string,
  vehicle: string,
  input: ReportInput,
) {
  const [author] = await db.select().from(users).where(eq(users.id, guide.authorId));
  if (!author || author.disabledAt) return null;
  const [off] = await db
    .select({ kind: mailOptOuts.kind })
    .from(mailOptOuts)
    .where(and(eq(mailOptOuts.userId, author.id), eq(mailOptOuts.kind, "fitment-report")));
  if (off) return null;
  return fitmentReportNotice({
    to: { userId: author.id, email: author.email, name: author.name },
    guideTitle: guide.title,
    reporterName,
    vehicle,
    status: input.outcome,
    note: input.note,
    guideUrl: new URL(`/guides/${encodeURIComponent(guide.slug)}#fitment-reports`, env().APP_ORIGIN).href,
  });
}

export type FitmentTally = { variantId: number; fits: number; fitsWithChanges: number; doesNotFit: number };

const visible = isNull(fitmentReports.hiddenAt);

/** Readers' reports counted per variant (hidden reports not counted), in variant order. */
export async function fitmentTallies(db: Db, guideId: number): Promise<FitmentTally[]> {
  const n = (status: FitmentStatus) => sql<number>`sum(case when ${fitmentReports.status} = ${status} then 1 else 0 end)`;
  const rows = await db
    .select({
      variantId: fitmentReports.variantId,
      fits: n("fits"),
      fitsWithChanges: n("fits-with-changes"),
      doesNotFit: n("does-not-fit"),
    })
    .from(fitmentReports)
    .where(and(eq(fitmentReports.guideId, guideId), visible))
    .groupBy(fitmentReports.variantId)
    .orderBy(fitmentReports.variantId);
  return rows.map((r) => ({
    variantId: r.variantId,
    fits: Number(r.fits),
    fitsWithChanges: Number(r.fitsWithChanges),
    doesNotFit: Number(r.doesNotFit),
  }));
}

export type ShownReport = {
  id: number;
  variantId: number;
  vehicle: string;
  outcome: FitmentStatus;
  note: string | null;
  at: string;
};

/** The newest visible reports with a note, for the guide page (no reader is named). */
export async function shownReports(db: Db, guideId: number, limit = 20): Promise<ShownReport[]> {
  const rows = await db
    .select()
    .from(fitmentReports)
    .where(and(eq(fitmentReports.guideId, guideId), visible))
    .orderBy(desc(fitmentReports.updatedAt), desc(fitmentReports.id))
    .limit(limit);
  const facts = await variantFacts(
    db,
    rows.map((r) => r.variantId),
  );
  return rows.map((r) => ({
    id: r.id,
    variantId: r.variantId,
    vehicle: vehicleLabel(facts.get(r.variantId)?.label ?? "A vehicle", r.year),
    outcome: r.status,
    note: r.note,
    at: (r.updatedAt ?? r.createdAt).toISOString(),
  }));
}

/** What every reader sees of a guide's reports: the tally per variant (with its vehicle's name) and the newest notes. */
export type PublicReports = { tallies: (FitmentTally & { vehicle: string })[]; reports: ShownReport[] };

/** Guides' public reports, by guide and the reports and catalogue stamps they were read at. */
const publicReportsKept = new BoundedCache<string, PublicReports>(PUBLIC_REPORTS_KEPT);

/**
 * A guide's public reports, read once per reports stamp (a report written, edited or hidden raises
 * it, migration 0011) and catalogue stamp (the vehicles' names): a guide page then asks nothing of
 * the reports table. `stamps`: read by the caller for this request, before this.
 */
export async function publicReports(db: Db, guideId: number, stamps: ContentStamps): Promise<PublicReports> {
  const key = `${guideId}:${stamps.reports}:${stamps.catalogue}`;
  const kept = publicReportsKept.get(key);
  if (kept) return kept;
  const [tallies, reports] = await Promise.all([fitmentTallies(db, guideId), shownReports(db, guideId)]);
  const names = await variantFacts(
    db,
    tallies.map((t) => t.variantId),
  );
  const found = {
    tallies: tallies.map((t) => ({ ...t, vehicle: names.get(t.variantId)?.label ?? "A vehicle" })),
    reports,
  };
  publicReportsKept.set(key, found);
  return found;
}

/** The reader's own reports on a guide, to fill the form when they edit one. */
export async function ownReports(db: Db, userId: number, guideId: number) {
  return db
    .select({
      id: fitmentReports.id,
      variantId: fitmentReports.variantId,
      vehicleId: fitmentReports.vehicleId,
      outcome: fitmentReports.status,
      note: fitmentReports.note,
      hidden: sql<boolean>`${fitmentReports.hiddenAt} is not null`,
    })
    .from(fitmentReports)
    .where(and(eq(fitmentReports.userId, userId), eq(fitmentReports.guideId, guideId)));
}

/** An editor hides an abusive or off-topic report, with the reason, audited in the same transaction. */
export async function hideFitmentReport(db: Db, editor: Actor, input: z.output<typeof hideInputSchema>) {
  if (!can(editor, "hide:fitment-report:any")) throw forbidden("Only editors can hide fitment reports.");
  const [report] = await db.select().from(fitmentReports).where(eq(fitmentReports.id, input.reportId));
  if (!report) throw notFound("That fitment report");
  if (report.hiddenAt) return { alreadyHidden: true, guideId: report.guideId };
  await batch(db, [
    db
      .update(fitmentReports)
      .set({ hiddenAt: new Date(), hiddenBy: editor.id, hiddenReason: input.reason })
      .where(and(eq(fitmentReports.id, report.id), isNull(fitmentReports.hiddenAt))),
    auditInsert(db, {
      actorId: editor.id,
      action: "fitment-report.hide",
      subjectType: "fitment-report",
      subjectId: report.id,
      reason: input.reason,
      guideId: report.guideId,
      data: { variantId: report.variantId, outcome: report.status },
    }),
  ]);
  return { alreadyHidden: false, guideId: report.guideId };
}

/** The newest visible reports on the author's guides (new or changed), for the Workbench. */
export async function reportsForAuthor(db: Db, authorId: number, limit = 8) {
  const rows = await db
    .select({
      id: fitmentReports.id,
      variantId: fitmentReports.variantId,
      year: fitmentReports.year,
      outcome: fitmentReports.status,
      note: fitmentReports.note,
      at: fitmentReports.createdAt,
      updatedAt: fitmentReports.updatedAt,
      slug: guides.slug,
      title: guides.title,
    })
    .from(fitmentReports)
    .innerJoin(guides, eq(guides.id, fitmentReports.guideId))
    .where(and(eq(guides.authorId, authorId), visible))
    .orderBy(desc(fitmentReports.updatedAt), desc(fitmentReports.id))
    .limit(limit);
  const facts = await variantFacts(
    db,
    rows.map((r) => r.variantId),
  );
  return rows.map((r) => ({ ...r, vehicle: vehicleLabel(facts.get(r.variantId)?.label ?? "A vehicle", r.year) }));
}
