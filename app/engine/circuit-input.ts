import { z } from "zod";
import { fieldErrors } from "~/utils/validation";
import { AWG_SIZES, INSULATION_RATINGS_C, MM2_SIZES } from "./wire";

/**
 * Every message names its field: the same text reaches API clients, which
 * see no form around it.
 */
function numberField(field: string, limits: { gt?: number; min?: number; max: number; unit: string }) {
  let schema = z.number({
    error: (issue) => (issue.input === undefined ? `${field} is required` : `${field} must be a number`),
  });
  if (limits.gt !== undefined) {
    schema = schema.gt(limits.gt, { error: `${field} must be more than ${limits.gt} ${limits.unit}` });
  }
  if (limits.min !== undefined) {
    schema = schema.min(limits.min, { error: `${field} must be at least ${limits.min} ${limits.unit}` });
  }
  return schema.max(limits.max, { error: `${field} must be at most ${limits.max} ${limits.unit}` });
}

export const wireSizeSchema = z.union(
  [z.strictObject({ awg: z.literal(AWG_SIZES) }), z.strictObject({ mm2: z.literal(MM2_SIZES) })],
  { error: `wire must be { awg: ${AWG_SIZES.join(", ")} } or { mm2: ${MM2_SIZES.join(", ")} }` },
);

/** Field names and defaults follow the engine design, §1. */
export const circuitInputShape = {
  systemVoltage: z.literal([12, 24], { error: "systemVoltage must be 12 or 24 (V)" }).default(12),
  loadWatts: numberField("loadWatts", { gt: 0, max: 5000, unit: "W" }).optional(),
  loadAmps: numberField("loadAmps", { gt: 0, max: 400, unit: "A" }).optional(),
  continuous: z.boolean({ error: "continuous must be true or false" }).default(true),
  oneWayLengthM: numberField("oneWayLengthM", { gt: 0, max: 100, unit: "m" }),
  returnPath: z.enum(["wire", "chassis"], { error: 'returnPath must be "wire" or "chassis"' }).default("wire"),
  location: z.enum(["engine-bay", "cabin"], { error: 'location must be "engine-bay" or "cabin"' }).default("engine-bay"),
  insulationC: z
    .literal(INSULATION_RATINGS_C, { error: `insulationC must be one of ${INSULATION_RATINGS_C.join(", ")} (°C)` })
    .default(105),
  bundled: numberField("bundled", { min: 1, max: 100, unit: "conductors" })
    .int({ error: "bundled must be a whole number of conductors" })
    .default(1),
  dropLimitPct: numberField("dropLimitPct", { gt: 0, max: 20, unit: "%" }).default(3),
  conductorTempC: numberField("conductorTempC", { min: -40, max: 200, unit: "°C" }).default(20),
  wire: wireSizeSchema.optional(),
  fuseA: numberField("fuseA", { gt: 0, max: 400, unit: "A" }).nullable().optional(),
  fuseDistanceMm: numberField("fuseDistanceMm", { min: 0, max: 10000, unit: "mm" }).optional(),
  switchRatingA: numberField("switchRatingA", { gt: 0, max: 400, unit: "A" }).default(10),
  /** Absent means the author has not said; only an explicit `false` triggers relay-recommended. */
  relay: z.boolean({ error: "relay must be true or false" }).optional(),
};

/** What a guide's circuit callout adds to the bare calculator input. */
export const circuitCalloutExtraShape = {
  /** Where the positive feed is taken from; decides battery-disconnect-missing. */
  feed: z.enum(["battery", "fuse-box"], { error: 'feed must be "battery" or "fuse-box"' }).default("battery"),
  label: z.string().trim().max(120, { error: "label must be at most 120 characters" }).optional(),
};

function isRecord(value: unknown): value is Record<string, unknown> {
  return typeof value === "object" && value !== null;
}

/**
 * Runs even when other fields are wrong, so a form shows every problem at
 * once; hence it reads the raw value defensively.
 */
export function loadExclusivity<T extends z.ZodObject>(schema: T): T {
  const exclusive = z.superRefine(
    (value: unknown, ctx) => {
      if (!isRecord(value)) return;
      const hasWatts = value.loadWatts !== undefined;
      const hasAmps = value.loadAmps !== undefined;
      if (hasWatts && hasAmps) {
        for (const field of ["loadWatts", "loadAmps"]) {
          ctx.addIssue({ code: "custom", path: [field], message: "Give either loadWatts or loadAmps, not both" });
        }
      } else if (!hasWatts && !hasAmps) {
        ctx.addIssue({ code: "custom", path: ["loadWatts"], message: "Give loadWatts or loadAmps (the load)" });
      }
    },
    { when: (payload) => isRecord(payload.value) },
  );
  return schema.check(exclusive) as T;
}

export const circuitInputSchema = loadExclusivity(
  z.object(circuitInputShape, { error: "the circuit must be an object of named fields" }),
);

export type CircuitInput = z.output<typeof circuitInputSchema>;
export type CircuitInputRaw = z.input<typeof circuitInputSchema>;

export type FieldErrors = Record<string, string>;

export function parseCircuitInput(raw: unknown): { ok: true; value: CircuitInput } | { ok: false; fields: FieldErrors } {
  const parsed = circuitInputSchema.safeParse(raw);
  return parsed.success ? { ok: true, value: parsed.data } : { ok: false, fields: fieldErrors(parsed.error) };
}
