import { z } from "zod";
import { BATTERY_LOCATIONS, DRIVETRAINS, POWERTRAINS } from "~/utils/vocab";

/**
 * The catalogue admin's forms, one intent each. Every message names its field, so the page can
 * show it beside the field and a script can read it from `fields`.
 */

/** Model years the catalogue takes: from early production cars to a couple of years ahead of today. */
export const FIRST_MODEL_YEAR = 1900;
export const lastModelYear = () => new Date().getUTCFullYear() + 2;

/** A typical battery-to-firewall run is 0.5–3 m (common practice); 15 m leaves room for long-wheelbase vans and buses. */
export const MAX_BATTERY_RUN_M = 15;

const emptyToUndefined = (value: unknown) => (typeof value === "string" && value.trim() === "" ? undefined : value);

const name = (field: string, max: number) =>
  z
    .string({ error: `${field}: give a name` })
    .trim()
    .min(1, `${field}: give a name`)
    .max(max, `${field}: keep it under ${max} characters`);

const rowId = (what: string) =>
  z.coerce
    .number({ error: `Pick the ${what} from the list` })
    .int(`Pick the ${what} from the list`)
    .positive(`Pick the ${what} from the list`)
    .max(2 ** 31, `Pick the ${what} from the list`);

const year = (field: string) =>
  z.coerce
    .number({ error: `${field}: give a year in digits, such as 2021` })
    .int(`${field}: give a whole year, such as 2021`)
    .min(FIRST_MODEL_YEAR, `${field}: give a year from ${FIRST_MODEL_YEAR} on`)
    .refine((y) => y <= lastModelYear(), `${field}: give a year no later than ${lastModelYear()}`);

/** Which form on the page sent the post, so the page opens that one again with what was typed. */
const formKey = z.string().max(60).optional();

export const makeFields = z.object({ name: name("Make name", 60) });
export const modelFields = z.object({
  name: name("Model name", 60),
  bodyStyle: z.preprocess(emptyToUndefined, z.string().trim().max(40, "Body style: keep it under 40 characters").optional()),
});
export const generationFields = z.object({
  name: name("Generation name", 40),
  firstYear: year("First model year"),
  lastYear: z.preprocess(emptyToUndefined, year("Last model year").optional()),
});
const YEARS_IN_ORDER =
  "Last model year: give a year no earlier than the first model year (or leave it empty while it is still made)";
export const variantFields = z.object({
  name: name("Variant name", 60),
  powertrain: z.enum(POWERTRAINS, { error: "Powertrain: pick one from the list" }),
  drivetrain: z.enum(DRIVETRAINS, { error: "Drivetrain: pick one from the list" }),
  batteryLocation: z.enum(BATTERY_LOCATIONS, { error: "12 V battery location: pick one from the list" }),
  batteryRunM: z.coerce
    .number({ error: "Battery-to-firewall run: give metres in digits, such as 1.4" })
    .min(0.1, "Battery-to-firewall run: give at least 0.1 m")
    .max(MAX_BATTERY_RUN_M, `Battery-to-firewall run: give at most ${MAX_BATTERY_RUN_M} m`),
});

export type MakeFields = z.output<typeof makeFields>;
export type ModelFields = z.output<typeof modelFields>;
export type GenerationFields = z.output<typeof generationFields>;
export type VariantFields = z.output<typeof variantFields>;

const intent = <T extends string>(value: T) => z.literal(value);

/** Every change the catalogue page posts, told apart by `intent`. */
export const catalogueIntentSchema = z
  .discriminatedUnion(
    "intent",
    [
      makeFields.extend({ intent: intent("add-make"), formKey }),
      makeFields.extend({ intent: intent("edit-make"), formKey, id: rowId("make") }),
      z.object({ intent: intent("delete-make"), formKey, id: rowId("make") }),
      modelFields.extend({ intent: intent("add-model"), formKey, makeId: rowId("make") }),
      modelFields.extend({ intent: intent("edit-model"), formKey, id: rowId("model") }),
      z.object({ intent: intent("delete-model"), formKey, id: rowId("model") }),
      generationFields.extend({ intent: intent("add-generation"), formKey, modelId: rowId("model") }),
      generationFields.extend({ intent: intent("edit-generation"), formKey, id: rowId("generation") }),
      z.object({ intent: intent("delete-generation"), formKey, id: rowId("generation") }),
      variantFields.extend({ intent: intent("add-variant"), formKey, generationId: rowId("generation") }),
      variantFields.extend({ intent: intent("edit-variant"), formKey, id: rowId("variant") }),
      z.object({ intent: intent("retire-variant"), formKey, id: rowId("variant") }),
      z.object({ intent: intent("restore-variant"), formKey, id: rowId("variant") }),
      z.object({ intent: intent("delete-variant"), formKey, id: rowId("variant") }),
    ],
    { error: "Choose one of the actions on this page." },
  )
  .superRefine((input, ctx) => {
    if ("firstYear" in input && input.lastYear !== undefined && input.lastYear < input.firstYear) {
      ctx.addIssue({ code: "custom", path: ["lastYear"], message: YEARS_IN_ORDER });
    }
  });

export type CatalogueIntent = z.output<typeof catalogueIntentSchema>;
