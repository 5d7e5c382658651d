import { z } from "zod";

/** Shared by the review desk page and the API: one editor decision on a submitted revision. */

export const REVIEW_NOTE_MAX = 2000;

const id = (what: string) =>
  z.coerce
    .number({ error: `Pick the ${what}` })
    .int(`Pick the ${what}`)
    .positive(`Pick the ${what}`);

const note = (min: number, message: string) =>
  z.string({ error: message }).trim().min(min, message).max(REVIEW_NOTE_MAX, `Keep the note under ${REVIEW_NOTE_MAX} characters`);

export const acknowledgeInputSchema = z.object({
  intent: z.literal("acknowledge"),
  findingId: id("finding"),
  note: note(3, "Say why this finding is acceptable"),
});

export const signOffInputSchema = z.object({
  intent: z.literal("sign-off"),
  cautionId: id("caution"),
});

export const requestChangesInputSchema = z.object({
  intent: z.literal("request-changes"),
  note: note(10, "Tell the author what to change (at least 10 characters)"),
});

export const approveInputSchema = z.object({ intent: z.literal("approve") });

/** A step number as the form sends it ("" or absent: the whole guide), 0-based as stored. */
const stepIndex = z.preprocess(
  (value) => (value === "" || value === undefined || value === null ? null : value),
  z.coerce
    .number({ error: "Pick a step, or the whole guide" })
    .int("Pick a step, or the whole guide")
    .min(0, "Pick a step, or the whole guide")
    .max(500, "Pick a step, or the whole guide")
    .nullable(),
);

export const commentInputSchema = z.object({
  intent: z.literal("comment"),
  stepIndex,
  body: note(2, "Write the comment"),
});

export const unpublishInputSchema = z.object({
  intent: z.literal("unpublish"),
  reason: note(10, "Say why the guide leaves the Library (at least 10 characters)"),
});

export const reviewDecisionSchema = z.discriminatedUnion(
  "intent",
  [
    acknowledgeInputSchema,
    signOffInputSchema,
    commentInputSchema,
    requestChangesInputSchema,
    approveInputSchema,
    unpublishInputSchema,
  ],
  { error: "Pick a decision: acknowledge, sign-off, comment, request-changes, approve or unpublish" },
);

export type AcknowledgeInput = z.infer<typeof acknowledgeInputSchema>;
export type SignOffInput = z.infer<typeof signOffInputSchema>;
export type RequestChangesInput = z.infer<typeof requestChangesInputSchema>;
export type CommentInput = z.infer<typeof commentInputSchema>;
export type UnpublishInput = z.infer<typeof unpublishInputSchema>;
export type ReviewDecision = z.infer<typeof reviewDecisionSchema>;

/** The queue's filters, from the address: a vehicle model ("make.model" slugs) and blocking findings only. */
export const reviewQueueQuerySchema = z.object({
  vehicle: z
    .string()
    .max(120)
    .regex(/^[a-z0-9-]+\.[a-z0-9-]+$/, "Pick a vehicle from the list")
    .optional()
    .catch(undefined),
  blocking: z
    .enum(["1", "true", "yes"])
    .transform(() => true)
    .optional()
    .catch(undefined),
});
export type ReviewQueueQuery = z.infer<typeof reviewQueueQuerySchema>;

/** Submitting a draft for review: what changed, in the author's words (optional for a first revision). */
export const submitInputSchema = z.object({
  changeSummary: z.string().trim().max(500, "Keep the change summary under 500 characters").default(""),
});
export type SubmitInput = z.infer<typeof submitInputSchema>;
