import { z } from "zod";
import { calloutSchema } from "~/engine/callouts";
import { CATEGORIES, FITMENT_STATUSES } from "~/utils/vocab";

/** Shared by the editor (client) and the server: the shape of a guide's working revision. */

const optionalText = (max: number) =>
  z
    .string()
    .trim()
    .max(max, `Keep it under ${max} characters`)
    .nullish()
    .transform((v) => (v ? v : null));

export const guideMetaSchema = z.object({
  title: z.string().trim().min(4, "Give the guide a title of at least 4 characters").max(140),
  summary: z.string().trim().max(600, "Keep the summary under 600 characters").default(""),
  category: z.enum(CATEGORIES, { error: "Pick a category" }),
  difficulty: z.coerce.number().int().min(1, "Difficulty runs from 1 to 5").max(5, "Difficulty runs from 1 to 5"),
  minutes: z.coerce
    .number()
    .int("Give whole minutes")
    .min(5, "An install takes at least 5 minutes")
    .max(4320, "Split installs longer than three days into several guides"),
});

export const stepPhotoSchema = z.object({
  mediaId: z.number().int().positive(),
  // A draft may hold a photo whose description is still to come; submitting needs one (guides.server.ts).
  alt: z.string().trim().max(300, "Keep the description under 300 characters").default(""),
  caption: optionalText(300),
});

export const stepInputSchema = z.object({
  title: z.string().trim().min(2, "Give the step a title").max(160),
  body: z.record(z.string(), z.unknown()).refine((b) => b.type === "doc", "The step text must be a rich-text document"),
  liftsVehicle: z.boolean().default(false),
  disconnectsBattery: z.boolean().default(false),
  photos: z.array(stepPhotoSchema).max(12, "At most 12 photos per step").default([]),
  callouts: z.array(calloutSchema).max(20, "At most 20 callouts per step").default([]),
});

export const fitmentInputSchema = z.object({
  variantId: z.number().int().positive(),
  status: z.enum(FITMENT_STATUSES),
  note: optionalText(500),
});

export const partInputSchema = z.object({
  name: z.string().trim().min(2, "Name the part").max(160),
  quantity: z.coerce.number().int().min(1, "Quantity is at least 1").max(999),
  partNumber: optionalText(80),
  notes: optionalText(500),
  stepIndex: z
    .number()
    .int()
    .min(0)
    .nullish()
    .transform((v) => v ?? null),
});

export const toolInputSchema = z.object({ name: z.string().trim().min(2, "Name the tool").max(160) });

export const draftInputSchema = guideMetaSchema
  .extend({
    version: z.number().int().positive(),
    steps: z.array(stepInputSchema).max(60, "At most 60 steps"),
    fitment: z.array(fitmentInputSchema).max(200),
    parts: z.array(partInputSchema).max(200),
    tools: z.array(toolInputSchema).max(100),
  })
  .superRefine((draft, ctx) => {
    const seen = new Set<number>();
    draft.fitment.forEach((row, i) => {
      if (seen.has(row.variantId)) {
        ctx.addIssue({ code: "custom", path: ["fitment", i, "variantId"], message: "This variant is listed twice" });
      }
      seen.add(row.variantId);
    });
    draft.parts.forEach((part, i) => {
      if (part.stepIndex !== null && part.stepIndex >= draft.steps.length) {
        ctx.addIssue({
          code: "custom",
          path: ["parts", i, "stepIndex"],
          message: "This part points at a step that does not exist",
        });
      }
    });
  });

export type GuideMetaInput = z.infer<typeof guideMetaSchema>;
export type DraftInput = z.infer<typeof draftInputSchema>;
export type StepInput = z.infer<typeof stepInputSchema>;

export const submitInputSchema = z.object({
  changeSummary: z.string().trim().max(1000, "Keep the change summary under 1000 characters").default(""),
});

/** The marker and version of an exported draft (`GET /api/guides/:id/export?format=json`). */
export const DRAFT_EXPORT_FORMAT = "torqueleaf-draft";
export const DRAFT_EXPORT_VERSION = 1;

const exportMarker = z.object({
  format: z.literal(DRAFT_EXPORT_FORMAT, { error: `This is not a Torqueleaf draft export (format "${DRAFT_EXPORT_FORMAT}")` }),
  formatVersion: z.literal(DRAFT_EXPORT_VERSION, {
    error: `Only version ${DRAFT_EXPORT_VERSION} of the draft export can be imported`,
  }),
});

/** An exported draft as `POST /api/guides/import` takes it: the draft's fields beside the marker; no version of its own. */
export const draftImportSchema = z.preprocess(
  (value) => (typeof value === "object" && value !== null && !Array.isArray(value) ? { ...value, version: 1 } : value),
  z.intersection(exportMarker, draftInputSchema),
);
export type DraftImport = z.infer<typeof draftImportSchema>;
