import { and, asc, count, eq, ne, type SQL, sql } from "drizzle-orm";
import { batch } from "~/db/batch.server";
import type { Db } from "~/db/client.server";
import { fitment, fitmentReports, generations, guides, makes, models, revisions, savedVehicles, variants } from "~/db/schema";
import { AppError, forbidden, notFound } from "~/utils/errors";
import { type Actor, can } from "~/utils/permissions";
import type { BatteryLocation, Drivetrain, Powertrain } from "~/utils/vocab";
import { auditInsert } from "./audit.server";
import type { GenerationFields, MakeFields, ModelFields, VariantFields } from "./catalogue-input";
import { slugify } from "./guides.server";

export type CatalogueInput = {
  makes: {
    name: string;
    slug: string;
    models: {
      name: string;
      slug: string;
      bodyStyle?: string | null;
      generations: {
        name: string;
        slug: string;
        firstYear: number;
        lastYear: number | null;
        variants: {
          key: string;
          name: string;
          powertrain: Powertrain;
          drivetrain: Drivetrain;
          batteryLocation: BatteryLocation;
          batteryRunM: number;
        }[];
      }[];
    }[];
  }[];
};

/** Adds or updates makes, models, generations and variants by their slugs and keys. */
export async function upsertCatalogue(db: Db, input: CatalogueInput) {
  for (const make of input.makes) {
    const [m] = await db
      .insert(makes)
      .values({ slug: make.slug, name: make.name })
      .onConflictDoUpdate({ target: makes.slug, set: { name: make.name } })
      .returning({ id: makes.id });
    for (const model of make.models) {
      const [mo] = await db
        .insert(models)
        .values({ makeId: m.id, slug: model.slug, name: model.name, bodyStyle: model.bodyStyle ?? null })
        .onConflictDoUpdate({
          target: [models.makeId, models.slug],
          set: { name: model.name, bodyStyle: model.bodyStyle ?? null },
        })
        .returning({ id: models.id });
      for (const gen of model.generations) {
        const values = { name: gen.name, firstYear: gen.firstYear, lastYear: gen.lastYear };
        const [g] = await db
          .insert(generations)
          .values({ modelId: mo.id, slug: gen.slug, ...values })
          .onConflictDoUpdate({ target: [generations.modelId, generations.slug], set: values })
          .returning({ id: generations.id });
        for (const v of gen.variants) {
          const { key, ...rest } = v;
          await db
            .insert(variants)
            .values({ generationId: g.id, key, ...rest })
            .onConflictDoUpdate({ target: variants.key, set: { generationId: g.id, ...rest } });
        }
      }
    }
  }
}

/** The whole catalogue as a tree: makes → models → generations → variants. */
export async function getCatalogue(db: Db) {
  return db.query.makes.findMany({
    orderBy: asc(makes.name),
    with: {
      models: {
        orderBy: asc(models.name),
        with: {
          generations: {
            orderBy: asc(generations.firstYear),
            with: { variants: { orderBy: [asc(variants.powertrain), asc(variants.drivetrain)] } },
          },
        },
      },
    },
  });
}

export type CatalogueTree = Awaited<ReturnType<typeof getCatalogue>>;

export async function variantByKey(db: Db, key: string) {
  return db.query.variants.findFirst({ where: eq(variants.key, key) });
}

/** A variant with its generation, model and make, for labels such as "Norvik Fjell F3 (2019–2025) · 2.0 hybrid AWD". */
export async function variantsWithNames(db: Db) {
  const rows = await db.query.variants.findMany({
    with: { generation: { with: { model: { with: { make: true } } } } },
  });
  return rows.map((v) => ({
    id: v.id,
    key: v.key,
    name: v.name,
    powertrain: v.powertrain,
    drivetrain: v.drivetrain,
    batteryLocation: v.batteryLocation,
    batteryRunM: v.batteryRunM,
    make: v.generation.model.make.name,
    model: v.generation.model.name,
    generation: v.generation.name,
    years: yearsLabel(v.generation.firstYear, v.generation.lastYear),
    label: `${v.generation.model.make.name} ${v.generation.model.name} ${v.generation.name} · ${v.name}`,
  }));
}

export function yearsLabel(first: number, last: number | null) {
  return last ? `${first}–${last}` : `${first}–`;
}

/** The catalogue as `GET /api/catalogue` and the guide editor's fitment matrix show it. */
export function publicCatalogue(makes: CatalogueTree) {
  return makes.map((make) => ({
    slug: make.slug,
    name: make.name,
    models: make.models.map((model) => ({
      slug: model.slug,
      name: model.name,
      bodyStyle: model.bodyStyle,
      generations: model.generations.map((g) => ({
        slug: g.slug,
        name: g.name,
        firstYear: g.firstYear,
        lastYear: g.lastYear,
        variants: g.variants.map((v) => ({
          id: v.id,
          key: v.key,
          name: v.name,
          powertrain: v.powertrain,
          drivetrain: v.drivetrain,
          batteryLocation: v.batteryLocation,
          batteryRunM: v.batteryRunM,
          /** Retired: kept for the guides that name it, offered for no new fitment. */
          retired: v.retiredAt !== null,
        })),
      })),
    })),
  }));
}

// ── Administration ────────────────────────────────────────────────

/**
 * The editor's fitment matrix offers no retired variant, except those the draft already lists:
 * existing rows keep showing and can be changed or removed.
 */
export function offeredForFitment<C extends ReturnType<typeof publicCatalogue>>(
  catalogue: C,
  listed: { variantId: number }[],
): C {
  const keep = new Set(listed.map((row) => row.variantId));
  return catalogue.map((make) => ({
    ...make,
    models: make.models.map((model) => ({
      ...model,
      generations: model.generations.map((g) => ({ ...g, variants: g.variants.filter((v) => !v.retired || keep.has(v.id)) })),
    })),
  })) as C;
}

/** What a variant is used by: guides whose fitment (in any revision) names it, and readers' vehicles and reports. */
export async function variantUse(db: Db, variantId: number) {
  const [guideRows, [saved], [reports]] = await Promise.all([
    db
      .selectDistinct({ id: guides.id, slug: guides.slug, title: guides.title })
      .from(fitment)
      .innerJoin(revisions, eq(revisions.id, fitment.revisionId))
      .innerJoin(guides, eq(guides.id, revisions.guideId))
      .where(eq(fitment.variantId, variantId))
      .orderBy(asc(guides.title)),
    db.select({ n: count() }).from(savedVehicles).where(eq(savedVehicles.variantId, variantId)),
    db.select({ n: count() }).from(fitmentReports).where(eq(fitmentReports.variantId, variantId)),
  ]);
  return { guides: guideRows, savedVehicles: saved?.n ?? 0, fitmentReports: reports?.n ?? 0 };
}

/** For the admin page: how many guides name each variant in their fitment. */
export async function guidesPerVariant(db: Db): Promise<Map<number, number>> {
  const rows = await db
    .select({ variantId: fitment.variantId, n: sql<number>`count(distinct ${revisions.guideId})` })
    .from(fitment)
    .innerJoin(revisions, eq(revisions.id, fitment.revisionId))
    .groupBy(fitment.variantId);
  return new Map(rows.map((r) => [r.variantId, r.n]));
}

function assertManages(actor: Actor) {
  if (!can(actor, "manage:catalogue")) throw forbidden("Only admins keep the vehicle catalogue.");
}

/** Runs a catalogue change with its audit row; a row that another admin just put to use is refused as in use, not a crash. */
async function catalogueBatch(db: Db, queries: Parameters<typeof batch>[1]) {
  try {
    await batch(db, queries);
  } catch (error) {
    const text = String((error as { message?: string })?.message ?? error);
    if (text.includes("FOREIGN KEY constraint failed")) {
      throw new AppError(409, "in-use", "Something now uses this entry, so it cannot be deleted: reload the page to see it.");
    }
    if (text.includes("UNIQUE constraint failed")) {
      throw new AppError(409, "exists", "Another admin has just added an entry with the same name: reload the page.");
    }
    throw error;
  }
}

async function freeSlug(base: string, taken: (slug: string) => Promise<boolean>) {
  const root = slugify(base).slice(0, 60) || "entry";
  if (!(await taken(root))) return root;
  for (let n = 2; n < 1000; n++) if (!(await taken(`${root}-${n}`))) return `${root}-${n}`;
  throw new AppError(409, "exists", "Too many entries share this name: choose another.");
}

/** Before → after for the fields that changed, for the audit row's details. */
function changesOf<T extends Record<string, unknown>>(before: T, after: Partial<T>) {
  const changes: Record<string, { from: unknown; to: unknown }> = {};
  for (const [key, value] of Object.entries(after)) {
    const old = before[key] ?? null;
    if ((value ?? null) !== old) changes[key] = { from: old, to: value ?? null };
  }
  return changes;
}

const audit = (
  db: Db,
  actor: Actor,
  action: string,
  subjectType: string,
  subjectId: number | SQL,
  data: Record<string, unknown>,
) => auditInsert(db, { actorId: actor.id, action: `catalogue.${action}`, subjectType, subjectId, data });

const nothingChanged = { changed: false as const };

async function makeRow(db: Db, id: number) {
  const row = await db.query.makes.findFirst({ where: eq(makes.id, id) });
  if (!row) throw notFound("This make");
  return row;
}
async function modelRow(db: Db, id: number) {
  const row = await db.query.models.findFirst({ where: eq(models.id, id), with: { make: true } });
  if (!row) throw notFound("This model");
  return row;
}
async function generationRow(db: Db, id: number) {
  const row = await db.query.generations.findFirst({
    where: eq(generations.id, id),
    with: { model: { with: { make: true } } },
  });
  if (!row) throw notFound("This generation");
  return row;
}
async function variantRow(db: Db, id: number) {
  const row = await db.query.variants.findFirst({
    where: eq(variants.id, id),
    with: { generation: { with: { model: { with: { make: true } } } } },
  });
  if (!row) throw notFound("This variant");
  return row;
}

const generationLabel = (g: {
  name: string;
  firstYear: number;
  lastYear: number | null;
  model: { name: string; make: { name: string } };
}) => `${g.model.make.name} ${g.model.name} ${g.name} (${yearsLabel(g.firstYear, g.lastYear)})`;

async function assertNameFree(
  db: Db,
  table: typeof makes | typeof models | typeof generations | typeof variants,
  where: SQL | undefined,
  field: string,
  message: string,
) {
  const [row] = await db.select({ n: count() }).from(table).where(where);
  if ((row?.n ?? 0) > 0) throw new AppError(409, "exists", message, { [field]: message });
}

export async function addMake(db: Db, actor: Actor, input: MakeFields) {
  assertManages(actor);
  await assertNameFree(
    db,
    makes,
    sql`lower(${makes.name}) = lower(${input.name})`,
    "name",
    `Make name: there is a make called ${input.name} already`,
  );
  const slug = await freeSlug(input.name, async (s) => !!(await db.query.makes.findFirst({ where: eq(makes.slug, s) })));
  await catalogueBatch(db, [
    db.insert(makes).values({ slug, name: input.name }),
    audit(db, actor, "make-add", "make", sql`(SELECT id FROM makes WHERE slug = ${slug})`, {
      label: input.name,
      values: { name: input.name },
    }),
  ]);
  return { label: input.name };
}

export async function editMake(db: Db, actor: Actor, id: number, input: MakeFields) {
  assertManages(actor);
  const before = await makeRow(db, id);
  const changes = changesOf(before, { name: input.name });
  if (!Object.keys(changes).length) return nothingChanged;
  await assertNameFree(
    db,
    makes,
    and(sql`lower(${makes.name}) = lower(${input.name})`, ne(makes.id, id)),
    "name",
    `Make name: there is a make called ${input.name} already`,
  );
  await catalogueBatch(db, [
    db.update(makes).set({ name: input.name }).where(eq(makes.id, id)),
    audit(db, actor, "make-edit", "make", id, { label: input.name, changes }),
  ]);
  return { changed: true as const, label: input.name };
}

export async function deleteMake(db: Db, actor: Actor, id: number) {
  assertManages(actor);
  const before = await makeRow(db, id);
  const [inside] = await db.select({ n: count() }).from(models).where(eq(models.makeId, id));
  if ((inside?.n ?? 0) > 0) {
    throw new AppError(409, "not-empty", `${before.name} still has ${plural(inside.n, "model")}: delete them first.`);
  }
  await catalogueBatch(db, [
    db.delete(makes).where(eq(makes.id, id)),
    audit(db, actor, "make-delete", "make", id, { label: before.name }),
  ]);
  return { label: before.name };
}

export async function addModel(db: Db, actor: Actor, makeId: number, input: ModelFields) {
  assertManages(actor);
  const make = await makeRow(db, makeId);
  const label = `${make.name} ${input.name}`;
  await assertNameFree(
    db,
    models,
    and(eq(models.makeId, makeId), sql`lower(${models.name}) = lower(${input.name})`),
    "name",
    `Model name: ${make.name} has a model called ${input.name} already`,
  );
  const slug = await freeSlug(
    input.name,
    async (s) => !!(await db.query.models.findFirst({ where: and(eq(models.makeId, makeId), eq(models.slug, s)) })),
  );
  await catalogueBatch(db, [
    db.insert(models).values({ makeId, slug, name: input.name, bodyStyle: input.bodyStyle ?? null }),
    audit(db, actor, "model-add", "model", sql`(SELECT id FROM models WHERE make_id = ${makeId} AND slug = ${slug})`, {
      label,
      values: { name: input.name, bodyStyle: input.bodyStyle ?? null },
    }),
  ]);
  return { label };
}

export async function editModel(db: Db, actor: Actor, id: number, input: ModelFields) {
  assertManages(actor);
  const before = await modelRow(db, id);
  const after = { name: input.name, bodyStyle: input.bodyStyle ?? null };
  const changes = changesOf(before, after);
  if (!Object.keys(changes).length) return nothingChanged;
  await assertNameFree(
    db,
    models,
    and(eq(models.makeId, before.makeId), sql`lower(${models.name}) = lower(${input.name})`, ne(models.id, id)),
    "name",
    `Model name: ${before.make.name} has a model called ${input.name} already`,
  );
  const label = `${before.make.name} ${input.name}`;
  await catalogueBatch(db, [
    db.update(models).set(after).where(eq(models.id, id)),
    audit(db, actor, "model-edit", "model", id, { label, changes }),
  ]);
  return { changed: true as const, label };
}

export async function deleteModel(db: Db, actor: Actor, id: number) {
  assertManages(actor);
  const before = await modelRow(db, id);
  const label = `${before.make.name} ${before.name}`;
  const [inside] = await db.select({ n: count() }).from(generations).where(eq(generations.modelId, id));
  if ((inside?.n ?? 0) > 0) {
    throw new AppError(409, "not-empty", `${label} still has ${plural(inside.n, "generation")}: delete them first.`);
  }
  await catalogueBatch(db, [
    db.delete(models).where(eq(models.id, id)),
    audit(db, actor, "model-delete", "model", id, { label }),
  ]);
  return { label };
}

export async function addGeneration(db: Db, actor: Actor, modelId: number, input: GenerationFields) {
  assertManages(actor);
  const model = await modelRow(db, modelId);
  const values = { name: input.name, firstYear: input.firstYear, lastYear: input.lastYear ?? null };
  const label = generationLabel({ ...values, model });
  await assertNameFree(
    db,
    generations,
    and(eq(generations.modelId, modelId), sql`lower(${generations.name}) = lower(${input.name})`),
    "name",
    `Generation name: ${model.make.name} ${model.name} has a generation called ${input.name} already`,
  );
  const slug = await freeSlug(
    input.name,
    async (s) =>
      !!(await db.query.generations.findFirst({ where: and(eq(generations.modelId, modelId), eq(generations.slug, s)) })),
  );
  await catalogueBatch(db, [
    db.insert(generations).values({ modelId, slug, ...values }),
    audit(
      db,
      actor,
      "generation-add",
      "generation",
      sql`(SELECT id FROM generations WHERE model_id = ${modelId} AND slug = ${slug})`,
      { label, values },
    ),
  ]);
  return { label };
}

export async function editGeneration(db: Db, actor: Actor, id: number, input: GenerationFields) {
  assertManages(actor);
  const before = await generationRow(db, id);
  const after = { name: input.name, firstYear: input.firstYear, lastYear: input.lastYear ?? null };
  const changes = changesOf(before, after);
  if (!Object.keys(changes).length) return nothingChanged;
  await assertNameFree(
    db,
    generations,
    and(eq(generations.modelId, before.modelId), sql`lower(${generations.name}) = lower(${input.name})`, ne(generations.id, id)),
    "name",
    `Generation name: ${before.model.make.name} ${before.model.name} has a generation called ${input.name} already`,
  );
  const label = generationLabel({ ...after, model: before.model });
  await catalogueBatch(db, [
    db.update(generations).set(after).where(eq(generations.id, id)),
    audit(db, actor, "generation-edit", "generation", id, { label, changes }),
  ]);
  return { changed: true as const, label };
}

export async function deleteGeneration(db: Db, actor: Actor, id: number) {
  assertManages(actor);
  const before = await generationRow(db, id);
  const label = generationLabel(before);
  const [inside] = await db.select({ n: count() }).from(variants).where(eq(variants.generationId, id));
  if ((inside?.n ?? 0) > 0) {
    throw new AppError(409, "not-empty", `${label} still has ${plural(inside.n, "variant")}: delete them first.`);
  }
  await catalogueBatch(db, [
    db.delete(generations).where(eq(generations.id, id)),
    audit(db, actor, "generation-delete", "generation", id, { label }),
  ]);
  return { label };
}

const variantValues = (input: VariantFields) => ({
  name: input.name,
  powertrain: input.powertrain,
  drivetrain: input.drivetrain,
  batteryLocation: input.batteryLocation,
  batteryRunM: input.batteryRunM,
});

export async function addVariant(db: Db, actor: Actor, generationId: number, input: VariantFields) {
  assertManages(actor);
  const generation = await generationRow(db, generationId);
  const values = variantValues(input);
  const label = `${generation.model.make.name} ${generation.model.name} ${generation.name} · ${input.name}`;
  await assertNameFree(
    db,
    variants,
    and(eq(variants.generationId, generationId), sql`lower(${variants.name}) = lower(${input.name})`),
    "name",
    `Variant name: ${generation.name} has a variant called ${input.name} already`,
  );
  const key = await freeSlug(
    `${generation.model.make.slug} ${generation.model.slug} ${generation.slug} ${input.name}`,
    async (k) => !!(await db.query.variants.findFirst({ where: eq(variants.key, k) })),
  );
  await catalogueBatch(db, [
    db.insert(variants).values({ generationId, key, ...values }),
    audit(db, actor, "variant-add", "variant", sql`(SELECT id FROM variants WHERE key = ${key})`, { label, values }),
  ]);
  return { label };
}

export async function editVariant(db: Db, actor: Actor, id: number, input: VariantFields) {
  assertManages(actor);
  const before = await variantRow(db, id);
  const after = variantValues(input);
  const changes = changesOf(before, after);
  if (!Object.keys(changes).length) return nothingChanged;
  await assertNameFree(
    db,
    variants,
    and(eq(variants.generationId, before.generationId), sql`lower(${variants.name}) = lower(${input.name})`, ne(variants.id, id)),
    "name",
    `Variant name: ${before.generation.name} has a variant called ${input.name} already`,
  );
  const label = `${before.generation.model.make.name} ${before.generation.model.name} ${before.generation.name} · ${input.name}`;
  await catalogueBatch(db, [
    db.update(variants).set(after).where(eq(variants.id, id)),
    audit(db, actor, "variant-edit", "variant", id, { label, changes }),
  ]);
  return { changed: true as const, label };
}

const variantLabel = (v: Awaited<ReturnType<typeof variantRow>>) =>
  `${v.generation.model.make.name} ${v.generation.model.name} ${v.generation.name} · ${v.name}`;

/** A retired variant stays on the guides that name it but is offered for no new fitment; restoring offers it again. */
export async function setVariantRetired(db: Db, actor: Actor, id: number, retired: boolean) {
  assertManages(actor);
  const before = await variantRow(db, id);
  const label = variantLabel(before);
  if (!!before.retiredAt === retired) return { changed: false as const, label };
  await catalogueBatch(db, [
    db
      .update(variants)
      .set({ retiredAt: retired ? new Date() : null })
      .where(eq(variants.id, id)),
    audit(db, actor, retired ? "variant-retire" : "variant-restore", "variant", id, { label }),
  ]);
  return { changed: true as const, label };
}

/** Deletes a variant nothing uses; one that a guide's fitment names is refused (409, the guides named): retire it instead. */
export async function deleteVariant(db: Db, actor: Actor, id: number) {
  assertManages(actor);
  const before = await variantRow(db, id);
  const label = variantLabel(before);
  const use = await variantUse(db, id);
  if (use.guides.length) {
    const names = use.guides.map((g) => `“${g.title}”`).join(", ");
    throw new AppError(
      409,
      "in-use",
      `${label} cannot be deleted: the fitment of ${plural(use.guides.length, "guide")} names it (${names}). Retire it instead: it stays on those guides and is offered for no new fitment.`,
      undefined,
      { guides: use.guides },
    );
  }
  if (use.savedVehicles || use.fitmentReports) {
    throw new AppError(
      409,
      "in-use",
      `${label} cannot be deleted: readers use it (${plural(use.savedVehicles, "saved vehicle")}, ${plural(use.fitmentReports, "fitment report")}). Retire it instead.`,
      undefined,
      { guides: [] },
    );
  }
  await catalogueBatch(db, [
    db.delete(variants).where(eq(variants.id, id)),
    audit(db, actor, "variant-delete", "variant", id, {
      label,
      values: variantValues({ ...before, batteryRunM: before.batteryRunM }),
    }),
  ]);
  return { label };
}

const plural = (n: number, word: string) => `${n} ${word}${n === 1 ? "" : "s"}`;
