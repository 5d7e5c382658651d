import { and, asc, count, desc, eq, inArray, sql } from "drizzle-orm";
import { z } from "zod";
import { batch } from "~/db/batch.server";
import type { Db } from "~/db/client.server";
import { generations, makes, models, savedVehicles, variants } from "~/db/schema";
import { getUser } from "~/services/auth/session.server";
import { readVehicleCookie } from "~/services/vehicle-cookie.server";
import { AppError, invalid, notFound } from "~/utils/errors";
import { type Actor, assertCan } from "~/utils/permissions";
import { NICKNAME_MAX } from "./reader-limits";

/** A reader keeps a handful of vehicles, not a fleet register. */
export const MAX_SAVED_VEHICLES = 20;

/** A form's digits become a number; anything else that is not a number (an array, true) is refused, not coerced. */
const digits = (value: unknown) => (typeof value === "string" && /^\s*\d{1,10}\s*$/.test(value) ? Number(value) : value);

const idField = (message: string) =>
  z.preprocess(
    digits,
    z
      .number({ error: message })
      .int(message)
      .positive(message)
      .max(2 ** 31, message),
  );

export const vehicleIdField = idField("Vehicle: pick one of your saved vehicles.");
export const variantIdField = idField("Variant: pick a variant from the list.");

/** A vehicle to save, from the API's JSON or the page's form (numbers may come as strings). */
export const vehicleInputSchema = z.object({
  variantId: variantIdField,
  year: z.preprocess(
    digits,
    z
      .number({ error: "Model year: give the year as four digits." })
      .int("Model year: give the year as four digits.")
      .min(1900, "Model year: give a year from 1900 on.")
      .max(2100, "Model year: give a year before 2100."),
  ),
  nickname: z
    .string({ error: "Nickname: give it as text." })
    .trim()
    .max(NICKNAME_MAX, `Nickname: at most ${NICKNAME_MAX} characters.`)
    .optional()
    .default(""),
  current: z.boolean({ error: "Current: true or false." }).optional(),
});
export type VehicleInput = z.output<typeof vehicleInputSchema>;

/** A variant with what its label and year check need. */
export type VariantFacts = {
  variantId: number;
  label: string;
  firstYear: number;
  lastYear: number | null;
  retired: boolean;
};

/** Make, model, generation and variant names for the given variants, by id. */
export async function variantFacts(db: Db, ids: readonly number[]): Promise<Map<number, VariantFacts>> {
  const wanted = [...new Set(ids)];
  if (wanted.length === 0) return new Map();
  const rows = await db
    .select({
      variantId: variants.id,
      variant: variants.name,
      retiredAt: variants.retiredAt,
      generation: generations.name,
      firstYear: generations.firstYear,
      lastYear: generations.lastYear,
      model: models.name,
      make: makes.name,
    })
    .from(variants)
    .innerJoin(generations, eq(generations.id, variants.generationId))
    .innerJoin(models, eq(models.id, generations.modelId))
    .innerJoin(makes, eq(makes.id, models.makeId))
    .where(inArray(variants.id, wanted));
  return new Map(
    rows.map((r) => [
      r.variantId,
      {
        variantId: r.variantId,
        label: `${r.make} ${r.model} ${r.generation} · ${r.variant}`,
        firstYear: r.firstYear,
        lastYear: r.lastYear,
        retired: r.retiredAt !== null,
      },
    ]),
  );
}

/** The newest model year a generation still in production may name: next year's models are on sale already. */
export const openLastYear = () => new Date().getUTCFullYear() + 1;

/** Checks that the variant exists and the year lies within its generation's years; the facts, or a 400 naming the field. */
async function checkedVariant(db: Db, variantId: number, year: number): Promise<VariantFacts> {
  const facts = (await variantFacts(db, [variantId])).get(variantId);
  if (!facts) throw invalid({ variantId: "Variant: pick a variant from the list." });
  const last = facts.lastYear ?? openLastYear();
  if (year < facts.firstYear || year > last) {
    throw invalid({ year: `Model year: this generation was built ${facts.firstYear}–${facts.lastYear ?? "today"}.` });
  }
  return facts;
}

export type SavedVehicle = {
  id: number;
  variantId: number;
  year: number | null;
  nickname: string;
  current: boolean;
  /** "Norvik Fjell F3 · 2.0 hybrid AWD, 2021" */
  label: string;
};

/** The reader's saved vehicles, the current one first, then newest first. */
export async function listVehicles(db: Db, userId: number): Promise<SavedVehicle[]> {
  const rows = await db
    .select()
    .from(savedVehicles)
    .where(eq(savedVehicles.userId, userId))
    .orderBy(desc(savedVehicles.current), desc(savedVehicles.createdAt), desc(savedVehicles.id));
  const facts = await variantFacts(
    db,
    rows.map((r) => r.variantId),
  );
  return rows.map((r) => ({
    id: r.id,
    variantId: r.variantId,
    year: r.year,
    nickname: r.nickname ?? "",
    current: r.current,
    label: vehicleLabel(facts.get(r.variantId)?.label ?? "A vehicle no longer in the catalogue", r.year),
  }));
}

export const vehicleLabel = (variant: string, year: number | null) => (year ? `${variant}, ${year}` : variant);

/** The API's shape of the list (api.md). */
export const vehiclesJson = (list: SavedVehicle[]) => ({
  vehicles: list.map(({ id, variantId, year, nickname, current }) => ({ id, variantId, year, nickname, current })),
});

/**
 * Saves a vehicle for the reader. The first one saved becomes current, and so does one saved with
 * `current: true`; either way exactly one of the reader's vehicles is current afterwards, because each
 * change is one statement or one transaction.
 */
export async function saveVehicle(db: Db, actor: Actor, input: VehicleInput): Promise<{ id: number }> {
  assertCan(actor, "save:vehicle", { userId: actor.id });
  await checkedVariant(db, input.variantId, input.year);
  const [{ n }] = await db.select({ n: count() }).from(savedVehicles).where(eq(savedVehicles.userId, actor.id));
  if (n >= MAX_SAVED_VEHICLES) {
    throw new AppError(409, "too-many", `You can keep up to ${MAX_SAVED_VEHICLES} vehicles. Delete one to add another.`);
  }
  const values = { userId: actor.id, variantId: input.variantId, year: input.year, nickname: input.nickname || null };
  if (input.current) {
    const [, inserted] = await batch(db, [
      db.update(savedVehicles).set({ current: false }).where(eq(savedVehicles.userId, actor.id)),
      db
        .insert(savedVehicles)
        .values({ ...values, current: true })
        .returning({ id: savedVehicles.id }),
    ]);
    return (inserted as { id: number }[])[0];
  }
  // Current when the reader has none yet, decided in the insert itself.
  const noneCurrent = sql`not exists (select 1 from ${savedVehicles} where ${savedVehicles.userId} = ${actor.id} and ${savedVehicles.current} = 1)`;
  const [row] = await db
    .insert(savedVehicles)
    .values({ ...values, current: noneCurrent as unknown as boolean })
    .returning({ id: savedVehicles.id });
  return row;
}

/** The reader's own vehicle by id: 404 when there is none, 403 when it is another reader's. */
async function ownVehicle(db: Db, actor: Actor, vehicleId: number) {
  const [row] = await db.select().from(savedVehicles).where(eq(savedVehicles.id, vehicleId));
  if (!row) throw notFound("That saved vehicle");
  assertCan(actor, "save:vehicle", { userId: row.userId });
  return row;
}

export async function findOwnVehicle(db: Db, actor: Actor, vehicleId: number) {
  return ownVehicle(db, actor, vehicleId);
}

/** Makes one of the reader's vehicles current and every other one not, in one statement. */
export async function makeCurrent(db: Db, actor: Actor, vehicleId: number) {
  await ownVehicle(db, actor, vehicleId);
  await db
    .update(savedVehicles)
    .set({ current: sql`${savedVehicles.id} = ${vehicleId}` as unknown as boolean })
    .where(eq(savedVehicles.userId, actor.id));
}

/** Deletes a vehicle; if it was current, the newest remaining one becomes current. */
export async function deleteVehicle(db: Db, actor: Actor, vehicleId: number) {
  await ownVehicle(db, actor, vehicleId);
  const newest = db
    .select({ id: savedVehicles.id })
    .from(savedVehicles)
    .where(eq(savedVehicles.userId, actor.id))
    .orderBy(desc(savedVehicles.createdAt), desc(savedVehicles.id))
    .limit(1);
  const noneCurrent = sql`not exists (select 1 from ${savedVehicles} where ${savedVehicles.userId} = ${actor.id} and ${savedVehicles.current} = 1)`;
  await batch(db, [
    db.delete(savedVehicles).where(and(eq(savedVehicles.id, vehicleId), eq(savedVehicles.userId, actor.id))),
    db
      .update(savedVehicles)
      .set({ current: true })
      .where(and(inArray(savedVehicles.id, newest), noneCurrent)),
  ]);
}

/** Whether the reader already keeps this variant and year (so a picked vehicle is not saved twice). */
export async function findSameVehicle(db: Db, userId: number, variantId: number, year: number) {
  const [row] = await db
    .select({ id: savedVehicles.id })
    .from(savedVehicles)
    .where(and(eq(savedVehicles.userId, userId), eq(savedVehicles.variantId, variantId), eq(savedVehicles.year, year)))
    .orderBy(asc(savedVehicles.id))
    .limit(1);
  return row ?? null;
}

/** The vehicle the Library and guide pages judge fitment against. */
export type CurrentVehicle = {
  variantId: number;
  year: number | null;
  /** "Norvik Fjell F3 · 2.0 hybrid AWD, 2021", with the nickname in front when there is one. */
  label: string;
  /** Set for a signed-in reader's saved vehicle; absent for a visitor's picked (cookie) vehicle. */
  vehicleId?: number;
};

/**
 * The current vehicle for this request: a signed-in reader's current saved vehicle (null when they
 * have saved none), or for a visitor who is not signed in the vehicle kept in the signed
 * `tl_vehicle` cookie (null without one). Pass the loader's args: `currentVehicle(args, db)`.
 * A page that shows it is per-reader: it is answered `private, no-store` (security-headers.server.ts).
 */
export async function currentVehicle(args: { request: Request; context?: unknown }, db: Db): Promise<CurrentVehicle | null> {
  const user = await getUser(args);
  if (user) {
    const [row] = await db
      .select()
      .from(savedVehicles)
      .where(and(eq(savedVehicles.userId, user.id), eq(savedVehicles.current, true)))
      .limit(1);
    if (!row) return null;
    const facts = (await variantFacts(db, [row.variantId])).get(row.variantId);
    const label = vehicleLabel(facts?.label ?? "A vehicle no longer in the catalogue", row.year);
    return {
      variantId: row.variantId,
      year: row.year,
      label: row.nickname ? `${row.nickname} (${label})` : label,
      vehicleId: row.id,
    };
  }
  return pickedVehicle(args.request, db);
}

/** A visitor's picked vehicle from the cookie, with its label; null when it names no variant we have. */
export async function pickedVehicle(request: Request, db: Db): Promise<CurrentVehicle | null> {
  const picked = await readVehicleCookie(request);
  if (!picked) return null;
  const facts = (await variantFacts(db, [picked.variantId])).get(picked.variantId);
  if (!facts) return null;
  return { variantId: picked.variantId, year: picked.year, label: vehicleLabel(facts.label, picked.year) };
}

/** Checks a visitor's pick the same way a saved vehicle is checked (a 400 naming the field). */
export async function checkPick(db: Db, variantId: number, year: number) {
  await checkedVariant(db, variantId, year);
}
