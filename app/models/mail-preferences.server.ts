import { and, eq, inArray } from "drizzle-orm";
import { batch } from "~/db/batch.server";
import type { Db } from "~/db/client.server";
import { mailOptOuts } from "~/db/schema";
import { isOptionalMailKind, type OptionalMailKind } from "~/utils/mail-kinds";
import { auditInsert } from "./audit.server";

/** The kinds of mail this member turned off. */
export async function mailOptOutsOf(db: Db, userId: number): Promise<OptionalMailKind[]> {
  const rows = await db.select({ kind: mailOptOuts.kind }).from(mailOptOuts).where(eq(mailOptOuts.userId, userId));
  return rows.map((r) => r.kind).filter(isOptionalMailKind);
}

/**
 * Turns one kind off from a mail's opt-out link (the page's button or a mail client's one-click
 * POST). Repeating it changes nothing and writes no second audit entry. False when the account is gone.
 */
export async function optOutByLink(db: Db, userId: number, kind: OptionalMailKind, via: "page" | "one-click") {
  const already = await db
    .select({ kind: mailOptOuts.kind })
    .from(mailOptOuts)
    .where(and(eq(mailOptOuts.userId, userId), eq(mailOptOuts.kind, kind)));
  if (already.length) return true;
  try {
    await batch(db, [
      db.insert(mailOptOuts).values({ userId, kind }).onConflictDoNothing(),
      auditInsert(db, {
        actorId: userId,
        action: "user.mail-opt-out",
        subjectType: "user",
        subjectId: userId,
        data: { kind, via },
      }),
    ]);
  } catch (error) {
    // The account was deleted after the mail went out.
    if (String((error as Error).message).includes("FOREIGN KEY")) return false;
    throw error;
  }
  return true;
}

/**
 * Saves the account page's Mail section: of the kinds shown (`shown`), those in `wanted` are on and
 * the rest off. Audited with what changed; nothing is written when nothing changed.
 */
export async function saveMailPreferences(db: Db, userId: number, shown: OptionalMailKind[], wanted: OptionalMailKind[]) {
  const before = new Set(await mailOptOutsOf(db, userId));
  const turnOff = shown.filter((k) => !wanted.includes(k) && !before.has(k));
  const turnOn = shown.filter((k) => wanted.includes(k) && before.has(k));
  if (!turnOff.length && !turnOn.length) return { changed: false };
  await batch(db, [
    turnOn.length > 0 && db.delete(mailOptOuts).where(and(eq(mailOptOuts.userId, userId), inArray(mailOptOuts.kind, turnOn))),
    turnOff.length > 0 &&
      db
        .insert(mailOptOuts)
        .values(turnOff.map((kind) => ({ userId, kind })))
        .onConflictDoNothing(),
    auditInsert(db, {
      actorId: userId,
      action: "user.mail-preferences",
      subjectType: "user",
      subjectId: userId,
      data: { off: turnOff, on: turnOn },
    }),
  ]);
  return { changed: true };
}
