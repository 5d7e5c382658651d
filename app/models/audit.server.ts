import { and, asc, count, desc, eq, gte, isNotNull, lt, type SQL, sql } from "drizzle-orm";
import { alias } from "drizzle-orm/sqlite-core";
import { z } from "zod";
import type { Db } from "~/db/client.server";
import { auditLog, guides, revisions, users } from "~/db/schema";

export type AuditEntry = {
  actorId: number | null;
  action: string;
  subjectType: string;
  /** A subquery when the subject is made in the same batch. */
  subjectId: string | number | SQL;
  reason?: string | null;
  data?: Record<string, unknown>;
  /**
   * The guide the entry concerns, so it shows in that guide's history and the site log's guide
   * filter; a subquery when the guide is made in the same batch.
   */
  guideId?: number | SQL | null;
};

/** The audit insert as a query, so it can join a batch with the change it records. */
export function auditInsert(db: Db, entry: AuditEntry) {
  const subjectId = typeof entry.subjectId === "object" ? sql`cast(${entry.subjectId} as text)` : String(entry.subjectId);
  return db.insert(auditLog).values({ ...entry, subjectId });
}

// ── Reading the log ───────────────────────────────────────────────

export const AUDIT_PAGE_SIZE = 25;

const DAY = /^\d{4}-\d{2}-\d{2}$/;
const day = (label: string) =>
  z
    .string()
    .trim()
    .max(10, `${label}: give a date as YYYY-MM-DD`)
    .regex(DAY, `${label}: give a date as YYYY-MM-DD`)
    .refine((text) => {
      const date = new Date(`${text}T00:00:00Z`);
      return !Number.isNaN(date.getTime()) && date.toISOString().startsWith(text);
    }, `${label}: this date does not exist`);
const id = (message: string) =>
  z.coerce
    .number({ error: message })
    .int(message)
    .positive(message)
    .max(2 ** 31, message);

/**
 * The site log's filters as the address carries them (`actor`, `action`, `guide`, `from`, `to`,
 * `page`; api.md). Dates are whole days in UTC, both ends included.
 */
export const auditQuerySchema = z
  .object({
    actor: id("Who: pick a person from the list").optional(),
    action: z
      .string()
      .trim()
      .max(60, "What: pick an action from the list")
      .regex(/^[a-z]+(\.[a-z-]+)+$/, "What: pick an action from the list")
      .optional(),
    guide: id("Guide: pick a guide from the list").optional(),
    from: day("From").optional(),
    to: day("To").optional(),
    page: z.coerce
      .number({ error: "Page: give a page number" })
      .int("Page: give a whole page number")
      .min(1, "Page: pages start at 1")
      .max(10_000, "Page: there are not that many pages")
      .default(1),
  })
  .refine((q) => !q.from || !q.to || q.from <= q.to, { path: ["to"], message: "To: the end date comes before the start date" });

export type AuditQuery = z.output<typeof auditQuerySchema>;

/** The address's parameters, empty ones left out (a plain GET form sends every field). */
export function auditParams(params: URLSearchParams): Record<string, string> {
  const kept: Record<string, string> = {};
  for (const key of ["actor", "action", "guide", "from", "to", "page"]) {
    const value = params.get(key);
    if (value !== null && value.trim() !== "") kept[key] = value.slice(0, 200);
  }
  return kept;
}

const subjectUser = alias(users, "subject_user");

/**
 * A page of the audit log, newest first, each row with who acted, the guide it concerns, the
 * person it concerns (role changes) and the revision number (review decisions).
 */
export async function listAudit(db: Db, query: Partial<AuditQuery> & { guideId?: number }, pageSize = AUDIT_PAGE_SIZE) {
  const size = Math.min(Math.max(1, Math.trunc(pageSize)), 100);
  const page = Math.min(Math.max(1, Math.trunc(query.page ?? 1)), 10_000);
  const guideId = query.guideId ?? query.guide;
  const conditions: SQL[] = [];
  if (query.actor) conditions.push(eq(auditLog.actorId, query.actor));
  if (query.action) conditions.push(eq(auditLog.action, query.action));
  if (guideId) conditions.push(eq(auditLog.guideId, guideId));
  if (query.from) conditions.push(gte(auditLog.createdAt, new Date(`${query.from}T00:00:00Z`)));
  if (query.to) conditions.push(lt(auditLog.createdAt, new Date(new Date(`${query.to}T00:00:00Z`).getTime() + 86_400_000)));
  const where = conditions.length ? and(...conditions) : undefined;
  const [rows, [{ n }]] = await Promise.all([
    db
      .select({
        id: auditLog.id,
        at: auditLog.createdAt,
        action: auditLog.action,
        subjectType: auditLog.subjectType,
        subjectId: auditLog.subjectId,
        reason: auditLog.reason,
        data: auditLog.data,
        actor: { id: users.id, name: users.name },
        guide: { id: guides.id, title: guides.title, slug: guides.slug },
        subjectName: subjectUser.name,
        revisionNumber: revisions.number,
      })
      .from(auditLog)
      .leftJoin(users, eq(users.id, auditLog.actorId))
      .leftJoin(guides, eq(guides.id, auditLog.guideId))
      .leftJoin(
        subjectUser,
        and(eq(auditLog.subjectType, "user"), eq(sql`cast(${auditLog.subjectId} as integer)`, subjectUser.id)),
      )
      .leftJoin(
        revisions,
        and(eq(auditLog.subjectType, "revision"), eq(sql`cast(${auditLog.subjectId} as integer)`, revisions.id)),
      )
      .where(where)
      .orderBy(desc(auditLog.createdAt), desc(auditLog.id))
      .limit(size)
      .offset((page - 1) * size),
    db.select({ n: count() }).from(auditLog).where(where),
  ]);
  const entries = rows.map((r) => ({
    ...r,
    actor: r.actor?.id ? r.actor : null,
    guide: r.guide?.id ? r.guide : null,
  }));
  return { entries, total: n, page, pageSize: size };
}

export type AuditRow = Awaited<ReturnType<typeof listAudit>>["entries"][number];

/** The filter menus: everyone who has acted, and every guide (each capped, so the page stays small). */
export async function auditFilterChoices(db: Db) {
  const [actors, guideRows] = await Promise.all([
    db
      .selectDistinct({ id: users.id, name: users.name, email: users.email })
      .from(auditLog)
      .innerJoin(users, eq(users.id, auditLog.actorId))
      .where(isNotNull(auditLog.actorId))
      .orderBy(asc(users.name))
      .limit(500),
    db.select({ id: guides.id, title: guides.title }).from(guides).orderBy(asc(guides.title)).limit(500),
  ]);
  return { actors, guides: guideRows };
}
