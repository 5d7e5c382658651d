import { readFile } from "node:fs/promises";
import { eq } from "drizzle-orm";
import sharp from "sharp";
import { catalogue } from "../../content-samples/catalogue";
import { guides as guideSamples } from "../../content-samples/guides/index";
import { people } from "../../content-samples/people";
import type { Db } from "~/db/client.server";
import { guides, outbox } from "~/db/schema";
import { upsertCatalogue, variantByKey } from "~/models/catalogue.server";
import { draftInputSchema } from "~/models/guide-input";
import { fieldErrors } from "~/utils/validation";
import { createGuide, saveDraft } from "~/models/guides.server";
import { uploadPhoto } from "~/models/media.server";
import { approveRevision, revisionCautions, signOffCaution, submitRevision } from "~/models/review.server";
import { createUser, findUserByEmail } from "~/models/users.server";
import type { Storage } from "~/services/storage.server";

/** Every demo account signs in with this password (development and demo data only). */
export const DEMO_PASSWORD = "torqueleaf-demo";

const photosDir = new URL("../../content-samples/photos/", import.meta.url);

/**
 * Loads the invented demo scenario through the same model functions the app uses: accounts,
 * catalogue, photos through the upload pipeline, guides written, submitted, reviewed and published.
 * Running it again changes nothing that is already there.
 */
export async function loadDemoData(db: Db, storage: Storage, log: (line: string) => void = () => {}) {
  for (const person of people) {
    if (!(await findUserByEmail(db, person.email))) {
      await createUser(db, { ...person, password: DEMO_PASSWORD, verified: true });
    }
  }
  await upsertCatalogue(db, catalogue);

  const editor = await findUserByEmail(db, "editor@torqueleaf.test");
  if (!editor) throw new Error("the demo editor account is missing");
  // Keyed by author and file: a draft may show only its own author's uploads.
  const uploaded = new Map<string, number>();

  for (const sample of guideSamples) {
    if (await db.query.guides.findFirst({ where: eq(guides.slug, sample.slug) })) continue;
    const author = await findUserByEmail(db, sample.author);
    if (!author) throw new Error(`demo guide ${sample.slug}: unknown author ${sample.author}`);

    const steps = [];
    for (const step of sample.steps) {
      const photos = [];
      for (const photo of step.photos) {
        const key = `${author.id}:${photo.file}`;
        let mediaId = uploaded.get(key);
        if (!mediaId) {
          const jpeg = await sharp(await readFile(new URL(photo.file, photosDir)))
            .jpeg({ quality: 90 })
            .toBuffer();
          mediaId = (await uploadPhoto(db, storage, author, jpeg, photo.file.replace(/\.svg$/, ".jpg"))).id;
          uploaded.set(key, mediaId);
        }
        photos.push({ mediaId, alt: photo.alt, caption: photo.caption });
      }
      steps.push({ ...step, photos });
    }
    const fitment = [];
    for (const row of sample.fitment) {
      const variant = await variantByKey(db, row.variant);
      if (!variant) throw new Error(`demo guide ${sample.slug}: unknown variant ${row.variant}`);
      fitment.push({ variantId: variant.id, status: row.status, note: row.note ?? null });
    }
    const created = await createGuide(db, author, sample, { slug: sample.slug });
    const parsed = draftInputSchema.safeParse({
      ...sample,
      version: created.draft.version,
      steps,
      fitment,
      parts: sample.parts.map(({ step, ...part }) => ({ ...part, stepIndex: step ?? null })),
    });
    if (!parsed.success) {
      throw new Error(`demo guide ${sample.slug} is invalid: ${JSON.stringify(fieldErrors(parsed.error))}`);
    }
    await saveDraft(db, created.id, author, parsed.data);
    if (sample.state !== "draft") {
      const { revisionId } = await submitRevision(db, created.id, author, sample.changeSummary);
      if (sample.state === "published") {
        for (const caution of await revisionCautions(db, revisionId)) {
          await signOffCaution(db, revisionId, editor, { cautionId: caution.id });
        }
        await approveRevision(db, revisionId, editor);
      }
    }
    log(`demo guide ${sample.slug} (${sample.state})`);
  }
  // The scenario's submissions and approvals are its history, written through the same model
  // functions as real ones: their notifications are not news to anyone, so none is sent.
  await db.delete(outbox);
}
