import type { Db } from "~/db/client.server";
import { auditLog } from "~/db/schema";

export type AuditEntry = {
  actorId: number | null;
  action: string;
  subjectType: string;
  subjectId: string | number;
  reason?: string | null;
  data?: Record<string, unknown>;
  /** The guide the entry concerns, so it shows in that guide's history and the site log's guide filter. */
  guideId?: number | null;
};

/** The audit insert as a query, so it can join a batch with the change it records. */
export function auditInsert(db: Db, entry: AuditEntry) {
  return db.insert(auditLog).values({ ...entry, subjectId: String(entry.subjectId) });
}
