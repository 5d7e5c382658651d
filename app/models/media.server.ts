import type { Db } from "~/db/client.server";
import { type MediaVariant, media } from "~/db/schema";
import { processImage } from "~/services/images.server";
import type { Storage } from "~/services/storage.server";
import { type Actor, assertCan } from "~/utils/permissions";

/** The one upload pipeline: resize, strip metadata, store in S3, record. Used by the API and the demo seed. */
export async function uploadPhoto(db: Db, storage: Storage, actor: Actor, file: Buffer, originalName: string | null) {
  assertCan(actor, "upload:media");
  const ownerId = actor.id;
  const image = await processImage(storage, file);
  const [row] = await db
    .insert(media)
    .values({ ownerId, originalName, ...image })
    .returning();
  return { id: row.id, width: row.width, height: row.height, variants: publicVariants(storage, row.variants) };
}

export function publicVariants(storage: Pick<Storage, "publicUrl">, variants: MediaVariant[]) {
  return variants.map((v) => ({ width: v.width, format: v.format, url: storage.publicUrl(v.key) }));
}
