import { ACCESSORY_PLACES, type AccessoryPlace, typicalRunLengthM } from "~/engine/runs";
import type { BatteryLocation, Drivetrain, FitmentStatus, Powertrain } from "~/utils/vocab";

/** The catalogue as `GET /api/catalogue` answers it (`makes`). */
export type CatalogueVariant = {
  id: number;
  key: string;
  name: string;
  powertrain: Powertrain;
  drivetrain: Drivetrain;
  batteryLocation: BatteryLocation;
  batteryRunM: number;
};
export type CatalogueGeneration = {
  slug: string;
  name: string;
  firstYear: number;
  lastYear: number | null;
  variants: CatalogueVariant[];
};
export type CatalogueModel = { slug: string; name: string; bodyStyle?: string | null; generations: CatalogueGeneration[] };
export type CatalogueMake = { slug: string; name: string; models: CatalogueModel[] };

/** A fitment row of the draft (`PUT /api/guides/:id/draft`); a variant with no row is "not listed". */
export type FitmentValue = { variantId: number; status: FitmentStatus; note?: string | null };
export type FitmentChoice = FitmentStatus | "not-listed";

export type GenerationPick = { make: string; model: string; generation: string };
export const NO_PICK: GenerationPick = { make: "", model: "", generation: "" };

export type PlacedVariant = {
  make: CatalogueMake;
  model: CatalogueModel;
  generation: CatalogueGeneration;
  variant: CatalogueVariant;
};

export function yearsWords(generation: Pick<CatalogueGeneration, "firstYear" | "lastYear">): string {
  return generation.lastYear ? `${generation.firstYear}–${generation.lastYear}` : `${generation.firstYear} on`;
}

/** Every variant with the make, model and generation it belongs to, by id. */
export function variantIndex(catalogue: readonly CatalogueMake[]): Map<number, PlacedVariant> {
  const index = new Map<number, PlacedVariant>();
  for (const make of catalogue)
    for (const model of make.models)
      for (const generation of model.generations)
        for (const variant of generation.variants) index.set(variant.id, { make, model, generation, variant });
  return index;
}

export function pickOf(placed: PlacedVariant): GenerationPick {
  return { make: placed.make.slug, model: placed.model.slug, generation: placed.generation.slug };
}

/** The generation the matrix opens on: that of the first row the draft lists, else nothing picked. */
export function initialPick(catalogue: readonly CatalogueMake[], value: readonly FitmentValue[]): GenerationPick {
  const index = variantIndex(catalogue);
  for (const row of value) {
    const placed = index.get(row.variantId);
    if (placed) return pickOf(placed);
  }
  return NO_PICK;
}

/**
 * A change of one level clears the levels under it; a level with a single choice is taken at once,
 * so a make with one model goes straight to its generations.
 */
export function changePick(catalogue: readonly CatalogueMake[], pick: GenerationPick, level: keyof GenerationPick, slug: string) {
  const next: GenerationPick =
    level === "make"
      ? { make: slug, model: "", generation: "" }
      : level === "model"
        ? { ...pick, model: slug, generation: "" }
        : { ...pick, generation: slug };
  const make = catalogue.find((m) => m.slug === next.make);
  if (make && next.model === "" && make.models.length === 1) next.model = make.models[0].slug;
  const model = make?.models.find((m) => m.slug === next.model);
  if (model && next.generation === "" && model.generations.length === 1) next.generation = model.generations[0].slug;
  return next;
}

export function pickedGeneration(catalogue: readonly CatalogueMake[], pick: GenerationPick): CatalogueGeneration | null {
  const make = catalogue.find((m) => m.slug === pick.make);
  const model = make?.models.find((m) => m.slug === pick.model);
  return model?.generations.find((g) => g.slug === pick.generation) ?? null;
}

export function choiceOf(value: readonly FitmentValue[], variantId: number): FitmentChoice {
  return value.find((row) => row.variantId === variantId)?.status ?? "not-listed";
}

/**
 * Sets one variant's status. A listed row keeps its note through every change of status; "not
 * listed" takes the row out and hands its note back (`removedNote`), and listing it again may
 * restore that note.
 */
export function setFitmentStatus(
  value: readonly FitmentValue[],
  variantId: number,
  choice: FitmentChoice,
  restoreNote?: string | null,
): { value: FitmentValue[]; removedNote?: string | null } {
  const index = value.findIndex((row) => row.variantId === variantId);
  if (choice === "not-listed") {
    if (index < 0) return { value: [...value] };
    return { value: value.filter((row) => row.variantId !== variantId), removedNote: value[index].note ?? null };
  }
  if (index >= 0) return { value: value.map((row, i) => (i === index ? { ...row, status: choice } : row)) };
  return { value: [...value, { variantId, status: choice, note: restoreNote ?? "" }] };
}

export function setFitmentNote(value: readonly FitmentValue[], variantId: number, note: string): FitmentValue[] {
  return value.map((row) => (row.variantId === variantId ? { ...row, note } : row));
}

export const NOTE_REQUIRED = "Say what has to change: a note is required for “fits with changes”.";

/** The one rule the draft's schema leaves to the editor: "fits with changes" says which changes. */
export function fitmentNoteProblems(value: readonly FitmentValue[], path = "fitment"): Record<string, string> {
  const problems: Record<string, string> = {};
  value.forEach((row, i) => {
    if (row.status === "fits-with-changes" && !(row.note ?? "").trim()) problems[`${path}.${i}.note`] = NOTE_REQUIRED;
  });
  return problems;
}

const PLACE_WORDS: Record<AccessoryPlace, string> = { front: "front", dash: "dash", rear: "rear" };

/** The typical one-way run from this variant's battery to each place an accessory goes (app/engine/runs.ts). */
export function typicalRuns(variant: CatalogueVariant): { place: AccessoryPlace; words: string; metres: number }[] {
  return ACCESSORY_PLACES.map((place) => ({ place, words: PLACE_WORDS[place], metres: typicalRunLengthM(variant, place) }));
}
