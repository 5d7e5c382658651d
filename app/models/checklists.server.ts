import { and, asc, desc, eq, inArray, isNotNull, isNull, sql } from "drizzle-orm";
import type { Db } from "~/db/client.server";
import { checklistItems, checklists, guides, parts, revisions, tools } from "~/db/schema";
import { AppError, notFound } from "~/utils/errors";
import { type Actor, assertCan } from "~/utils/permissions";
import {
  CHECKLIST_LIMITS,
  type ChecklistSummary,
  type ChecklistView,
  type ItemPatch,
  type OwnItemInput,
} from "./checklist-input";
import { runBatch } from "./guides.server";

/**
 * A reader's parts checklists: a copy of a published revision's parts and tools, ticked off, with
 * quantities, notes and the reader's own items. Only the owner reads or changes one. A checklist is
 * the reader's private record, so its changes are not written to the site's audit log.
 */

type Item = typeof checklistItems.$inferSelect;
type CopiedRow = {
  key: string;
  source: "part" | "tool";
  name: string;
  quantity: number;
  partNumber: string | null;
  stepIndex: number | null;
};

/**
 * What a guide's parts and tools are called across revisions, so a merge can tell a kept part from
 * an added one: parts by part number (or name), tools by name; repeats numbered in order.
 */
export function copiedRows(
  partRows: { name: string; quantity: number; partNumber: string | null; stepIndex: number | null }[],
  toolRows: { name: string }[],
): CopiedRow[] {
  const seen = new Map<string, number>();
  const keyOf = (base: string) => {
    const n = (seen.get(base) ?? 0) + 1;
    seen.set(base, n);
    return n === 1 ? base : `${base}#${n}`;
  };
  const norm = (text: string) => text.trim().toLowerCase().replace(/\s+/g, " ");
  return [
    ...partRows.map((p) => ({
      key: keyOf(`part:${p.partNumber?.trim() ? `no:${norm(p.partNumber)}` : norm(p.name)}`),
      source: "part" as const,
      name: p.name,
      quantity: Math.min(Math.max(p.quantity, 1), CHECKLIST_LIMITS.quantity),
      partNumber: p.partNumber,
      stepIndex: p.stepIndex,
    })),
    ...toolRows.map((t) => ({
      key: keyOf(`tool:${norm(t.name)}`),
      source: "tool" as const,
      name: t.name,
      quantity: 1,
      partNumber: null,
      stepIndex: null,
    })),
  ];
}

async function revisionRows(db: Db, revisionId: number) {
  const [partRows, toolRows] = await Promise.all([
    db.select().from(parts).where(eq(parts.revisionId, revisionId)).orderBy(asc(parts.position)),
    db.select().from(tools).where(eq(tools.revisionId, revisionId)).orderBy(asc(tools.position)),
  ]);
  return copiedRows(partRows, toolRows);
}

async function publishedGuideBySlug(db: Db, slug: string) {
  const [row] = await db
    .select({
      id: guides.id,
      slug: guides.slug,
      title: guides.title,
      state: guides.state,
      revisionId: guides.publishedRevisionId,
    })
    .from(guides)
    .where(eq(guides.slug, slug));
  return row?.state === "published" && row.revisionId ? { ...row, revisionId: row.revisionId } : null;
}

/** A checklist the actor owns: 404 when there is none, 403 when it is someone else's. */
export async function ownChecklist(db: Db, actor: Actor, checklistId: number) {
  const [row] = await db.select().from(checklists).where(eq(checklists.id, checklistId));
  if (!row) throw notFound("This checklist");
  assertCan(actor, "manage:checklist", row);
  return row;
}

/** The reader's checklist for a guide, if they saved one already. */
export async function checklistForGuide(db: Db, actor: Actor, guideId: number) {
  const [row] = await db
    .select({ id: checklists.id })
    .from(checklists)
    .where(and(eq(checklists.userId, actor.id), eq(checklists.guideId, guideId)))
    .orderBy(desc(checklists.id))
    .limit(1);
  return row ?? null;
}

/**
 * A new checklist copied from the guide's published revision. A reader keeps one per guide: saving
 * again answers the one they have (`created: false`) rather than a second copy of the same parts.
 */
export async function createChecklist(db: Db, actor: Actor, guideSlug: string) {
  assertCan(actor, "manage:checklist", { userId: actor.id });
  const guide = await publishedGuideBySlug(db, guideSlug);
  if (!guide)
    throw new AppError(404, "not-found", `No published guide is called "${guideSlug}".`, {
      guideSlug: "No published guide has this name.",
    });
  const existing = await checklistForGuide(db, actor, guide.id);
  if (existing) return { id: existing.id, created: false };
  const [revision] = await db.select({ title: revisions.title }).from(revisions).where(eq(revisions.id, guide.revisionId));
  const rows = await revisionRows(db, guide.revisionId);
  // The new checklist's id inside the same transaction: the reader's newest (ids only grow).
  const newId = sql`(SELECT max(id) FROM checklists WHERE user_id = ${actor.id})`;
  await runBatch(db, [
    db
      .insert(checklists)
      .values({ userId: actor.id, guideId: guide.id, revisionId: guide.revisionId, title: revision?.title ?? guide.title }),
    ...rows.map((row, position) =>
      db.insert(checklistItems).values({
        checklistId: sql`${newId}`,
        position,
        name: row.name,
        quantity: row.quantity,
        partNumber: row.partNumber,
        stepIndex: row.stepIndex,
        source: row.source,
        sourceKey: row.key,
      }),
    ),
  ]);
  const created = await checklistForGuide(db, actor, guide.id);
  if (!created) throw new Error("checklist was not created");
  return { id: created.id, created: true };
}

function itemView(item: Item) {
  return {
    id: item.id,
    name: item.name,
    quantity: item.quantity,
    checked: item.checked,
    note: item.note,
    own: item.source === null,
    kind: item.source ?? ("own" as const),
    partNumber: item.partNumber,
    step: item.stepIndex === null ? null : item.stepIndex + 1,
    removed: item.removedAt !== null,
  };
}

/** One checklist with its items in order, and whether the guide has published a newer revision since. */
export async function getChecklist(db: Db, actor: Actor, checklistId: number): Promise<ChecklistView> {
  const row = await ownChecklist(db, actor, checklistId);
  const [[guide], [revision], items] = await Promise.all([
    db
      .select({ slug: guides.slug, title: guides.title, state: guides.state, latest: revisions.number })
      .from(guides)
      .leftJoin(revisions, eq(revisions.id, guides.publishedRevisionId))
      .where(eq(guides.id, row.guideId)),
    db.select({ number: revisions.number }).from(revisions).where(eq(revisions.id, row.revisionId)),
    db
      .select()
      .from(checklistItems)
      .where(eq(checklistItems.checklistId, row.id))
      .orderBy(asc(checklistItems.position), asc(checklistItems.id)),
  ]);
  const latest = guide?.state === "published" ? (guide.latest ?? null) : null;
  return {
    id: row.id,
    guide: { slug: guide?.slug ?? "", title: row.title },
    revisionNumber: revision?.number ?? 0,
    latestRevisionNumber: latest,
    newerRevision: latest !== null && latest > (revision?.number ?? 0),
    items: items.map(itemView),
  };
}

/** The reader's checklists, newest change first, each with its progress (items no longer listed left out). */
export async function listChecklists(db: Db, actor: Actor): Promise<ChecklistSummary[]> {
  const rows = await db
    .select({
      id: checklists.id,
      title: checklists.title,
      slug: guides.slug,
      updatedAt: checklists.updatedAt,
      number: revisions.number,
      latest: sql<number | null>`(SELECT number FROM revisions WHERE id = ${guides.publishedRevisionId})`,
      total: sql<number>`(SELECT count(*) FROM checklist_items i WHERE i.checklist_id = ${checklists.id} AND i.removed_at IS NULL)`,
      checked: sql<number>`(SELECT count(*) FROM checklist_items i WHERE i.checklist_id = ${checklists.id} AND i.removed_at IS NULL AND i.checked = 1)`,
    })
    .from(checklists)
    .innerJoin(guides, eq(guides.id, checklists.guideId))
    .innerJoin(revisions, eq(revisions.id, checklists.revisionId))
    .where(eq(checklists.userId, actor.id))
    .orderBy(desc(checklists.updatedAt), desc(checklists.id))
    .limit(200);
  return rows.map((r) => ({
    id: r.id,
    guide: { slug: r.slug, title: r.title },
    revisionNumber: r.number,
    newerRevision: r.latest !== null && r.latest > r.number,
    total: Number(r.total),
    checked: Number(r.checked),
    updatedAt: (r.updatedAt ?? new Date(0)).toISOString(),
  }));
}

export async function deleteChecklist(db: Db, actor: Actor, checklistId: number) {
  await ownChecklist(db, actor, checklistId);
  await db.delete(checklists).where(eq(checklists.id, checklistId));
}

const touch = (db: Db, checklistId: number) =>
  db.update(checklists).set({ updatedAt: new Date() }).where(eq(checklists.id, checklistId));

/**
 * Changes the fields sent and only those, in one UPDATE of one row: two devices ticking different
 * items never undo each other, and the last change to the same field wins.
 */
export async function patchItem(db: Db, actor: Actor, checklistId: number, itemId: number, patch: ItemPatch) {
  await ownChecklist(db, actor, checklistId);
  const set: Partial<typeof checklistItems.$inferInsert> = { updatedAt: new Date() };
  if (patch.checked !== undefined) set.checked = patch.checked;
  if (patch.quantity !== undefined) set.quantity = patch.quantity;
  if (patch.note !== undefined) set.note = patch.note ? patch.note : null;
  const where = and(eq(checklistItems.id, itemId), eq(checklistItems.checklistId, checklistId));
  const [results] = (await runBatch(db, [
    db.update(checklistItems).set(set).where(where).returning(),
    touch(db, checklistId),
  ])) as [Item[]];
  if (!results?.length) throw notFound("This item");
  return itemView(results[0]);
}

export async function addOwnItem(db: Db, actor: Actor, checklistId: number, input: OwnItemInput) {
  await ownChecklist(db, actor, checklistId);
  const [{ n }] = await db
    .select({ n: sql<number>`count(*)` })
    .from(checklistItems)
    .where(eq(checklistItems.checklistId, checklistId));
  if (Number(n) >= CHECKLIST_LIMITS.items) {
    throw new AppError(409, "too-many-items", `A checklist holds at most ${CHECKLIST_LIMITS.items} items.`);
  }
  const position = sql`(SELECT coalesce(max(position), -1) + 1 FROM checklist_items WHERE checklist_id = ${checklistId})`;
  const [results] = (await runBatch(db, [
    db
      .insert(checklistItems)
      .values({ checklistId, position, name: input.name, quantity: input.quantity, source: null })
      .returning(),
    touch(db, checklistId),
  ])) as [Item[]];
  return itemView(results[0]);
}

/** Removes a reader's own item, or a guide item a newer revision dropped; the guide's current items stay. */
export async function deleteItem(db: Db, actor: Actor, checklistId: number, itemId: number) {
  await ownChecklist(db, actor, checklistId);
  const [item] = await db
    .select()
    .from(checklistItems)
    .where(and(eq(checklistItems.id, itemId), eq(checklistItems.checklistId, checklistId)));
  if (!item) throw notFound("This item");
  if (item.source !== null && item.removedAt === null) {
    throw new AppError(409, "guide-item", "Items from the guide stay on the checklist; tick them off instead.");
  }
  await runBatch(db, [db.delete(checklistItems).where(eq(checklistItems.id, itemId)), touch(db, checklistId)]);
}

/**
 * Brings a checklist up to the guide's published revision: parts and tools it adds appear, the
 * ones it no longer lists are marked removed (kept, with their ticks and notes), kept ones take
 * the guide's new name, part number and step. Ticks, quantities, notes and own items are never
 * written here, so a merge that runs while another device ticks items keeps those ticks.
 */
export async function mergeLatestRevision(db: Db, actor: Actor, checklistId: number) {
  const row = await ownChecklist(db, actor, checklistId);
  const [guide] = await db
    .select({ state: guides.state, revisionId: guides.publishedRevisionId, number: revisions.number, title: revisions.title })
    .from(guides)
    .innerJoin(revisions, eq(revisions.id, guides.publishedRevisionId))
    .where(eq(guides.id, row.guideId));
  if (guide?.state !== "published" || !guide.revisionId) {
    throw new AppError(409, "not-published", "The guide is not published now, so there is nothing to merge.");
  }
  if (guide.revisionId === row.revisionId) return { added: 0, removed: 0, revisionNumber: guide.number };
  const latest = await revisionRows(db, guide.revisionId);
  const current = await db
    .select()
    .from(checklistItems)
    .where(and(eq(checklistItems.checklistId, checklistId), isNotNull(checklistItems.sourceKey)));
  const byKey = new Map(current.map((item) => [item.sourceKey, item]));
  const latestKeys = new Set(latest.map((r) => r.key));
  const added = latest.filter((r) => !byKey.has(r.key));
  const kept = latest.filter((r) => byKey.has(r.key));
  const gone = current.filter((item) => !latestKeys.has(item.sourceKey ?? "") && item.removedAt === null);
  const position = sql`(SELECT coalesce(max(position), -1) + 1 FROM checklist_items WHERE checklist_id = ${checklistId})`;
  await runBatch(db, [
    ...kept.map((r) =>
      db
        .update(checklistItems)
        .set({ name: r.name, partNumber: r.partNumber, stepIndex: r.stepIndex, removedAt: null })
        .where(and(eq(checklistItems.checklistId, checklistId), eq(checklistItems.sourceKey, r.key))),
    ),
    gone.length > 0 &&
      db
        .update(checklistItems)
        .set({ removedAt: new Date() })
        .where(
          and(
            inArray(
              checklistItems.id,
              gone.map((g) => g.id),
            ),
            isNull(checklistItems.removedAt),
          ),
        ),
    ...added.map((r) =>
      db.insert(checklistItems).values({
        checklistId,
        position,
        name: r.name,
        quantity: r.quantity,
        partNumber: r.partNumber,
        stepIndex: r.stepIndex,
        source: r.source,
        sourceKey: r.key,
      }),
    ),
    db
      .update(checklists)
      .set({ revisionId: guide.revisionId, title: guide.title, updatedAt: new Date() })
      .where(eq(checklists.id, checklistId)),
  ]);
  return { added: added.length, removed: gone.length, revisionNumber: guide.number };
}
