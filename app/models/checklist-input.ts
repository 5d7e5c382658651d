import { z } from "zod";

/**
 * The checklist API's bodies and answers (design/api.md): the routes parse with these, the pages'
 * forms share the field limits, and the OpenAPI document is generated from the same schemas.
 */

export const CHECKLIST_LIMITS = { name: 120, note: 500, quantity: 999, items: 300, slug: 200 } as const;

const quantity = z
  .number({ error: "quantity: give a whole number" })
  .int("quantity: give a whole number")
  .min(1, "quantity: at least 1")
  .max(CHECKLIST_LIMITS.quantity, `quantity: at most ${CHECKLIST_LIMITS.quantity}`);

const note = z
  .string({ error: "note: give text" })
  .trim()
  .max(CHECKLIST_LIMITS.note, `note: at most ${CHECKLIST_LIMITS.note} characters`)
  .nullable();

export const createChecklistSchema = z
  .object({
    guideSlug: z
      .string({ error: "guideSlug: name a published guide" })
      .trim()
      .min(1, "guideSlug: name a published guide")
      .max(CHECKLIST_LIMITS.slug, "guideSlug: name a published guide"),
  })
  .meta({ id: "ChecklistCreate" });

/** A change to one item: only the fields sent change, so ticks of different items never overwrite each other. */
export const itemPatchSchema = z
  .object({
    checked: z.boolean({ error: "checked: true or false" }).optional(),
    quantity: quantity.optional(),
    note: note.optional(),
  })
  .refine((p) => p.checked !== undefined || p.quantity !== undefined || p.note !== undefined, {
    message: "Send checked, quantity or note.",
  })
  .meta({ id: "ChecklistItemPatch" });

export const ownItemSchema = z
  .object({
    name: z
      .string({ error: "name: give the item a name" })
      .trim()
      .min(1, "name: give the item a name")
      .max(CHECKLIST_LIMITS.name, `name: at most ${CHECKLIST_LIMITS.name} characters`),
    quantity: quantity.default(1),
  })
  .meta({ id: "ChecklistOwnItem" });

export type ItemPatch = z.output<typeof itemPatchSchema>;
export type OwnItemInput = z.output<typeof ownItemSchema>;

// ── Answers ────────────────────────────────────────────────────────

export const checklistItemSchema = z
  .object({
    id: z.number().int(),
    name: z.string(),
    quantity: z.number().int(),
    checked: z.boolean(),
    note: z.string().nullable(),
    own: z.boolean().meta({ description: "Added by the reader, not copied from the guide." }),
    kind: z.enum(["part", "tool", "own"]),
    partNumber: z.string().nullable(),
    step: z.number().int().nullable().meta({ description: "The guide step (1-based) that uses the part." }),
    removed: z.boolean().meta({ description: "A newer merged revision no longer lists it; kept with its tick and note." }),
  })
  .meta({ id: "ChecklistItem" });

const guideRef = z.object({ slug: z.string(), title: z.string() });

export const checklistSchema = z
  .object({
    id: z.number().int(),
    guide: guideRef,
    revisionNumber: z.number().int(),
    latestRevisionNumber: z.number().int().nullable().meta({ description: "The guide's published revision now." }),
    newerRevision: z.boolean(),
    items: z.array(checklistItemSchema),
  })
  .meta({ id: "Checklist" });

export const checklistSummarySchema = z
  .object({
    id: z.number().int(),
    guide: guideRef,
    revisionNumber: z.number().int(),
    newerRevision: z.boolean(),
    total: z.number().int(),
    checked: z.number().int(),
    updatedAt: z.string(),
  })
  .meta({ id: "ChecklistSummary" });

export const checklistListSchema = z.object({ checklists: z.array(checklistSummarySchema) });

export type ChecklistView = z.output<typeof checklistSchema>;
export type ChecklistSummary = z.output<typeof checklistSummarySchema>;

/** Ids from the path: digits only, else the checklist or item does not exist. */
export function idParam(raw: string | undefined): number | null {
  if (!/^\d{1,12}$/.test(raw ?? "")) return null;
  const id = Number(raw);
  return Number.isSafeInteger(id) && id > 0 ? id : null;
}
