import { asc, eq } from "drizzle-orm";
import type { Db } from "~/db/client.server";
import { generations, makes, models, variants } from "~/db/schema";
import type { BatteryLocation, Drivetrain, Powertrain } from "~/utils/vocab";

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
        })),
      })),
    })),
  }));
}
