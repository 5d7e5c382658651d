import { eq } from "drizzle-orm";
import type { Db } from "~/db/client.server";
import { guides } from "~/db/schema";
import { type DraftInput, draftInputSchema } from "~/models/guide-input";
import { type LoadedRevision, loadRevision, partsAndTools } from "~/models/guides.server";
import { findUserByEmail } from "~/models/users.server";

/** The draft input that would save `loaded` again as it is (what the editor sends back). */
export function draftFrom(loaded: LoadedRevision): DraftInput {
  const { revision } = loaded;
  return draftInputSchema.parse({
    version: revision.version,
    title: revision.title,
    summary: revision.summary,
    category: revision.category,
    difficulty: revision.difficulty,
    minutes: revision.minutes,
    steps: loaded.steps.map((s) => ({
      title: s.title,
      body: s.body,
      liftsVehicle: s.liftsVehicle,
      disconnectsBattery: s.disconnectsBattery,
      photos: s.photos.map((p) => ({ mediaId: p.mediaId, alt: p.alt, caption: p.caption })),
      callouts: s.callouts.map((c) => ({ kind: c.kind, ...c.data })),
    })),
    fitment: loaded.fitment.map((f) => ({ variantId: f.variantId, status: f.status, note: f.note })),
    ...partsAndTools(loaded),
  });
}

export async function guideBySlug(db: Db, slug: string) {
  const guide = await db.query.guides.findFirst({ where: eq(guides.slug, slug) });
  if (!guide) throw new Error(`demo guide ${slug} is missing`);
  return guide;
}

/** The guide's working revision, or its published one when it has no draft. */
export async function currentRevision(db: Db, slug: string) {
  const guide = await guideBySlug(db, slug);
  const id = guide.workingRevisionId ?? guide.publishedRevisionId;
  const loaded = id ? await loadRevision(db, id) : null;
  if (!loaded) throw new Error(`demo guide ${slug} has no revision`);
  return loaded;
}

export async function demoUser(db: Db, email: string) {
  const user = await findUserByEmail(db, email);
  if (!user) throw new Error(`demo account ${email} is missing`);
  return user;
}

/** The AppError (or other error) a call rejects with, for asserting status, code, fields and extra. */
export async function rejection(promise: Promise<unknown>) {
  try {
    await promise;
  } catch (error) {
    return error as { status?: number; code?: string; fields?: Record<string, string>; extra?: Record<string, unknown> };
  }
  throw new Error("expected the call to be refused, but it succeeded");
}
