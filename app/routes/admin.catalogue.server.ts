import { getDb } from "~/db/client.server";
import { type CatalogueIntent, catalogueIntentSchema } from "~/models/catalogue-input";
import {
  addGeneration,
  addMake,
  addModel,
  addVariant,
  deleteGeneration,
  deleteMake,
  deleteModel,
  deleteVariant,
  editGeneration,
  editMake,
  editModel,
  editVariant,
  getCatalogue,
  guidesPerVariant,
  setVariantRetired,
} from "~/models/catalogue.server";
import { requirePermission } from "~/services/auth/guards.server";
import { AppError } from "~/utils/errors";
import { formFailure, parseValues, readForm, redirectWithFlash } from "~/utils/forms.server";
import type { FormValues } from "~/utils/forms";
import type { Actor } from "~/utils/permissions";
import { schemaKeys } from "~/utils/validation";

type Args = { request: Request; context?: unknown };

export async function catalogueLoader(args: Args) {
  await requirePermission(args, "manage:catalogue");
  const db = await getDb();
  const [makes, used] = await Promise.all([getCatalogue(db), guidesPerVariant(db)]);
  return { makes, used: Object.fromEntries(used) as Record<number, number> };
}

/** The change one intent asks for (from the page or `POST /api/catalogue`), and the words of the message after it. */
export async function applyCatalogueChange(actor: Actor, input: CatalogueIntent): Promise<string> {
  const db = await getDb();
  const edited = (r: { changed: boolean; label?: string }, what: string) =>
    r.changed ? `${r.label}: ${what} saved.` : "Nothing changed.";
  switch (input.intent) {
    case "add-make":
      return `${(await addMake(db, actor, { name: input.name })).label} added.`;
    case "edit-make":
      return edited(await editMake(db, actor, input.id, { name: input.name }), "make");
    case "delete-make":
      return `${(await deleteMake(db, actor, input.id)).label} deleted.`;
    case "add-model":
      return `${(await addModel(db, actor, input.makeId, { name: input.name, bodyStyle: input.bodyStyle })).label} added.`;
    case "edit-model":
      return edited(await editModel(db, actor, input.id, input), "model");
    case "delete-model":
      return `${(await deleteModel(db, actor, input.id)).label} deleted.`;
    case "add-generation":
      return `${(await addGeneration(db, actor, input.modelId, generationOf(input))).label} added.`;
    case "edit-generation":
      return edited(await editGeneration(db, actor, input.id, generationOf(input)), "generation");
    case "delete-generation":
      return `${(await deleteGeneration(db, actor, input.id)).label} deleted.`;
    case "add-variant":
      return `${(await addVariant(db, actor, input.generationId, input)).label} added.`;
    case "edit-variant":
      return edited(await editVariant(db, actor, input.id, input), "variant");
    case "retire-variant": {
      const r = await setVariantRetired(db, actor, input.id, true);
      return r.changed
        ? `${r.label} retired: it stays on existing guides and is offered for no new fitment.`
        : `${r.label} was already retired.`;
    }
    case "restore-variant": {
      const r = await setVariantRetired(db, actor, input.id, false);
      return r.changed ? `${r.label} is offered for fitment again.` : `${r.label} was not retired.`;
    }
    case "delete-variant":
      return `${(await deleteVariant(db, actor, input.id)).label} deleted.`;
  }
}

const generationOf = (input: { name: string; firstYear: number; lastYear?: number }) => ({
  name: input.name,
  firstYear: input.firstYear,
  lastYear: input.lastYear,
});

/**
 * Every catalogue change, one intent per form. A refusal comes back to the page with its message
 * and what was typed: 400 by field, 409 for a name taken, a level not empty, or a used variant
 * (the guides named). `POST /api/catalogue` takes the same intents as JSON.
 */
export async function catalogueAction(args: Args) {
  const admin = await requirePermission(args, "manage:catalogue");
  let values: FormValues = {};
  try {
    values = await readForm(args.request);
    const input = parseValues(catalogueIntentSchema, values);
    const text = await applyCatalogueChange(admin, input);
    return redirectWithFlash("/admin/catalogue", { tone: "success", text });
  } catch (error) {
    if (!(error instanceof AppError)) throw error;
    return formFailure(error, values, schemaKeys(catalogueIntentSchema));
  }
}
