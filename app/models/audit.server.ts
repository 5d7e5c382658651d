import type { Db } from "~/db/client.server";
import { auditLog } from "~/db/schema";

export type AuditEntry = {
  actorId: number | null;
  action: string;
  subjectType: string;
  subjectId: string | number;
  reason?: string | null;
  data?: Record<string, unknown>;
};

/** The audit insert as a query, so it can join a batch with the change it records. */
export function auditInsert(db: Db, entry: AuditEntry) {
  return db.insert(auditLog).values({ ...entry, subjectId: String(entry.subjectId) });
}
