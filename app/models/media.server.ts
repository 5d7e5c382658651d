import { and, inArray, lt, notExists, sql } from "drizzle-orm";
import type { Db } from "~/db/client.server";
import { type MediaVariant, media, stepPhotos } from "~/db/schema";
import { processImage } from "~/services/images.server";
import type { Storage } from "~/services/storage.server";
import { type Actor, assertCan } from "~/utils/permissions";

/** Media no step uses is removed once it is this old (issue: "no draft references it for 24 h"). */
export const UNUSED_MEDIA_MAX_AGE_MS = 24 * 60 * 60 * 1000;

/**
 * The one upload pipeline: resize, strip metadata, store in S3, record. Used by the API and the demo
 * seed. If recording fails, the stored objects are deleted: no object without a row, no row without objects.
 */
export async function uploadPhoto(db: Db, storage: Storage, actor: Actor, file: Buffer, originalName: string | null) {
  assertCan(actor, "upload:media");
  const ownerId = actor.id;
  const image = await processImage(storage, file);
  let row: typeof media.$inferSelect;
  try {
    [row] = await db
      .insert(media)
      .values({ ownerId, originalName: originalName?.slice(0, 255) ?? null, ...image })
      .returning();
  } catch (error) {
    await storage.delete(image.variants.map((v) => v.key)).catch(() => undefined);
    throw error;
  }
  return { id: row.id, width: row.width, height: row.height, variants: publicVariants(storage, row.variants) };
}

export function publicVariants(storage: Pick<Storage, "publicUrl">, variants: MediaVariant[]) {
  return variants.map((v) => ({ width: v.width, format: v.format, url: storage.publicUrl(v.key) }));
}

/**
 * Removes media that no step uses (no step_photos row, in any revision) and that is older than
 * `olderThanMs`: the row first, on the condition that still no step uses it (a draft saved since
 * the select may have attached it), then its objects. Returns the ids removed.
 */
export async function sweepUnusedMedia(
  db: Db,
  storage: Pick<Storage, "delete">,
  options: { olderThanMs?: number; now?: number } = {},
): Promise<number[]> {
  const cutoff = new Date((options.now ?? Date.now()) - (options.olderThanMs ?? UNUSED_MEDIA_MAX_AGE_MS));
  const unused = await db
    .select({ id: media.id, variants: media.variants })
    .from(media)
    .where(
      and(
        lt(media.createdAt, cutoff),
        notExists(db.select({ one: sql`1` }).from(stepPhotos).where(sql`${stepPhotos.mediaId} = ${media.id}`)),
      ),
    )
    .limit(500);
  const removed: number[] = [];
  for (const item of unused) {
    const gone = await db
      .delete(media)
      .where(
        and(
          inArray(media.id, [item.id]),
          notExists(db.select({ one: sql`1` }).from(stepPhotos).where(sql`${stepPhotos.mediaId} = ${media.id}`)),
        ),
      )
      .returning({ id: media.id });
    if (!gone.length) continue;
    await storage.delete(item.variants.map((v) => v.key));
    removed.push(item.id);
  }
  return removed;
}
