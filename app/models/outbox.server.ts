import type { Db } from "~/db/client.server";
import { outbox } from "~/db/schema";
import type { Mail } from "~/services/mail.server";
import type { MailKind } from "~/utils/vocab";

/** One mail for the outbox: rendered in full, for one recipient, of one kind. */
export type OutboxMail = Mail & { kind: MailKind; userId?: number | null };

/**
 * The outbox insert as a query, so it joins the batch (transaction) of the change it reports: the
 * mail exists exactly when the change does. The worker sends it later.
 */
export function outboxInsert(db: Db, mail: OutboxMail) {
  return db.insert(outbox).values(mail);
}
