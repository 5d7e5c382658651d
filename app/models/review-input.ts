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

export const reviewDecisionSchema = z.discriminatedUnion(
  "intent",
  [acknowledgeInputSchema, signOffInputSchema, requestChangesInputSchema, approveInputSchema],
  { error: "Pick a decision: acknowledge, sign-off, request-changes or approve" },
);

export type AcknowledgeInput = z.infer<typeof acknowledgeInputSchema>;
export type SignOffInput = z.infer<typeof signOffInputSchema>;
export type RequestChangesInput = z.infer<typeof requestChangesInputSchema>;
export type ReviewDecision = z.infer<typeof reviewDecisionSchema>;

/** Submitting a draft for review: what changed, in the author's words (optional for a first revision). */
export const submitInputSchema = z.object({
  changeSummary: z.string().trim().max(500, "Keep the change summary under 500 characters").default(""),
});
export type SubmitInput = z.infer<typeof submitInputSchema>;
