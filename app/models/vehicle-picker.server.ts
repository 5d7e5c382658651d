import type { Db } from "~/db/client.server";
import type { PickerOptions } from "~/components/vehicle-picker";
import { openLastYear } from "./vehicles.server";
import type { ContentStamps } from "./content-stamps.server";
import { readCatalogue } from "./reader-cache.server";

/** The picker's steps as the address carries them: `vmake`, `vmodel`, `vgen` (catalogue ids). */
export const PICKER_PARAMS = ["vmake", "vmodel", "vgen"] as const;

const idParam = (params: URLSearchParams, name: string) => {
  const value = params.get(name) ?? "";
  return /^\d{1,9}$/.test(value) ? Number(value) : null;
};

/**
 * What the vehicle picker offers for the steps chosen so far: every make, the chosen make's models,
 * the chosen model's generations, and the chosen generation's variants and model years. A step that
 * does not belong to the one before it (the make was changed) is dropped, and so are those after it.
 * Retired variants are not offered.
 */
export async function pickerOptions(db: Db, params: URLSearchParams, stamps?: ContentStamps): Promise<PickerOptions> {
  const tree = await readCatalogue(db, stamps);
  const make = tree.find((m) => m.id === idParam(params, "vmake"));
  const model = make?.models.find((m) => m.id === idParam(params, "vmodel"));
  const generation = model?.generations.find((g) => g.id === idParam(params, "vgen"));
  const last = generation ? (generation.lastYear ?? openLastYear()) : 0;
  return {
    makes: tree.map((m) => ({ id: m.id, name: m.name })),
    models: make ? make.models.map((m) => ({ id: m.id, name: m.name })) : [],
    generations: model
      ? model.generations.map((g) => ({
          id: g.id,
          name: `${g.name} (${g.firstYear}–${g.lastYear ?? ""})`,
        }))
      : [],
    variants: generation ? generation.variants.filter((v) => !v.retiredAt).map((v) => ({ id: v.id, name: v.name })) : [],
    years: generation ? Array.from({ length: last - generation.firstYear + 1 }, (_, i) => last - i) : [],
    chosen: { make: make?.id ?? null, model: model?.id ?? null, generation: generation?.id ?? null },
  };
}
