import { z } from "zod";

/** The most steps a guide's tick list can name; far above any guide (the editor allows fewer). */
export const MAX_TICK_POSITION = 499;

/** A reader's tick on one step of a published revision: set (`done: true`) or cleared. Idempotent, so a queued copy can be replayed. */
export const stepTickInputSchema = z.strictObject({
  revision: z.number({ error: "The revision number is required." }).int().positive().max(1_000_000),
  position: z
    .number({ error: "The step's position is required." })
    .int("The step's position is a whole number.")
    .min(0)
    .max(MAX_TICK_POSITION),
  done: z.boolean({ error: "Say whether the step is done (true or false)." }),
});
export type StepTickInput = z.infer<typeof stepTickInputSchema>;

/** What the step-tick route answers: the steps of that revision the reader has done, by position (0 = step 1). */
export type StepTicks = { revision: number; done: number[] };

/** The address of a guide's step ticks for the signed-in reader. */
export const stepTicksPath = (slug: string) => `/api/guides/${encodeURIComponent(slug)}/step-ticks`;

/**
 * The header a page puts on its tick: the id of the reader it was made for. A tick queued without
 * signal may be sent later with whoever's session the browser then holds; the route refuses it when
 * the two differ, so it never lands on another reader's account.
 */
export const TICK_READER_HEADER = "X-Torqueleaf-Reader";
