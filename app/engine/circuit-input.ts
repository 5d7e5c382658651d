import { z } from "zod";
import { fieldErrors } from "~/utils/validation";
import { AWG_SIZES, INSULATION_RATINGS_C, MM2_SIZES } from "./wire";

/**
 * The words a person sees for each field, in the planner and the editor. Messages use these, not
 * the field names: the API still keys each message by its field name, so a client knows where it belongs.
 */
export const CIRCUIT_FIELD_LABELS = {
  systemVoltage: "System voltage",
  loadWatts: "Load power",
  loadAmps: "Load current",
  continuous: "Continuous",
  oneWayLengthM: "One-way run",
  returnPath: "Return path",
  location: "Where the wire runs",
  insulationC: "Insulation rating",
  bundled: "Wires in the bundle",
  dropLimitPct: "Drop limit",
  conductorTempC: "Conductor temperature",
  wire: "Wire size",
  fuseA: "Fuse",
  fuseDistanceMm: "Fuse to battery",
  switchRatingA: "Switch rating",
  relay: "Relay",
  switchFeed: "Switch feed",
  feed: "Fed from",
  label: "Circuit name",
} as const;

type Labelled = keyof typeof CIRCUIT_FIELD_LABELS;

function numberField(field: Labelled | string, limits: { gt?: number; min?: number; max: number; unit: string }) {
  const label = CIRCUIT_FIELD_LABELS[field as Labelled] ?? field;
  const unit = limits.unit ? ` ${limits.unit}` : "";
  let schema = z.number({
    error: (issue) => (issue.input === undefined ? `${label} is required` : `${label} must be a number`),
  });
  if (limits.gt !== undefined) {
    schema = schema.gt(limits.gt, { error: `${label} must be more than ${limits.gt}${unit}` });
  }
  if (limits.min !== undefined) {
    schema = schema.min(limits.min, { error: `${label} must be at least ${limits.min}${unit}` });
  }
  return schema.max(limits.max, { error: `${label} must be at most ${limits.max}${unit}` });
}

const WIRE_CHOICES = `${AWG_SIZES.join(", ")} AWG or ${MM2_SIZES.join(", ")} mm²`;

function wireSize(label: string) {
  return z.union([z.strictObject({ awg: z.literal(AWG_SIZES) }), z.strictObject({ mm2: z.literal(MM2_SIZES) })], {
    error: `${label} must be one of ${WIRE_CHOICES}`,
  });
}

export const wireSizeSchema = wireSize(CIRCUIT_FIELD_LABELS.wire);

/**
 * Where the switch (and, with a relay, the coil behind it) takes its feed: from the main fused
 * line (on its own, usually thinner, wire) or from a separate low-current fused tap.
 */
export const switchFeedSchema = z.discriminatedUnion(
  "from",
  [
    z.strictObject({
      from: z.literal("main"),
      /** Absent: the switch feed is the main wire size. */
      wire: wireSize("Switch feed wire").optional(),
    }),
    z.strictObject({
      from: z.literal("tap"),
      fuseA: numberField("Switch feed fuse", { gt: 0, max: 100, unit: "A" }),
      wire: wireSize("Switch feed wire"),
    }),
  ],
  { error: 'Switch feed must say where it comes from: "main" (the main fused line) or "tap" (its own fuse and wire)' },
);
export type SwitchFeed = z.output<typeof switchFeedSchema>;

const choice = (field: Labelled, words: string) => ({ error: `${CIRCUIT_FIELD_LABELS[field]} must be ${words}` });

/** Field names and defaults follow the engine design, §1. */
export const circuitInputShape = {
  systemVoltage: z.literal([12, 24], choice("systemVoltage", "12 or 24 V")).default(12),
  loadWatts: numberField("loadWatts", { gt: 0, max: 5000, unit: "W" }).optional(),
  loadAmps: numberField("loadAmps", { gt: 0, max: 400, unit: "A" }).optional(),
  continuous: z.boolean(choice("continuous", "yes or no")).default(true),
  oneWayLengthM: numberField("oneWayLengthM", { gt: 0, max: 100, unit: "m" }),
  returnPath: z.enum(["wire", "chassis"], choice("returnPath", "its own wire or the chassis")).default("wire"),
  location: z.enum(["engine-bay", "cabin"], choice("location", "the engine bay or the cabin")).default("engine-bay"),
  insulationC: z
    .literal(INSULATION_RATINGS_C, choice("insulationC", `one of ${INSULATION_RATINGS_C.join(", ")} °C`))
    .default(105),
  bundled: numberField("bundled", { min: 1, max: 100, unit: "" })
    .int({ error: "Wires in the bundle must be a whole number" })
    .default(1),
  dropLimitPct: numberField("dropLimitPct", { gt: 0, max: 20, unit: "%" }).default(3),
  conductorTempC: numberField("conductorTempC", { min: -40, max: 200, unit: "°C" }).default(20),
  wire: wireSizeSchema.optional(),
  fuseA: numberField("fuseA", { gt: 0, max: 400, unit: "A" }).nullable().optional(),
  fuseDistanceMm: numberField("fuseDistanceMm", { min: 0, max: 10000, unit: "mm" }).optional(),
  switchRatingA: numberField("switchRatingA", { gt: 0, max: 400, unit: "A" }).default(10),
  /** Absent means the author has not said: relay-recommended then notes a relay; `false` with too much current is switch-overloaded. */
  relay: z.boolean(choice("relay", "used or not used")).optional(),
  /** Absent: the switch is drawn fed from the main fused line on the main wire. */
  switchFeed: switchFeedSchema.optional(),
};

/** What a guide's circuit callout adds to the bare calculator input. */
export const circuitCalloutExtraShape = {
  /** Where the positive feed is taken from; decides battery-disconnect-missing. */
  feed: z.enum(["battery", "fuse-box"], choice("feed", "the battery or the fuse box")).default("battery"),
  label: z.string(choice("label", "text")).trim().max(120, { error: "Circuit name must be at most 120 characters" }).optional(),
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
          ctx.addIssue({ code: "custom", path: [field], message: "Give the load as power (W) or as current (A), not both" });
        }
      } else if (!hasWatts && !hasAmps) {
        ctx.addIssue({ code: "custom", path: ["loadWatts"], message: "Load power or load current is required" });
      }
      if (value.relay === false && value.switchFeed !== undefined) {
        ctx.addIssue({
          code: "custom",
          path: ["switchFeed"],
          message: "A separate switch feed needs a relay: without one the switch sits in the main line and carries the load",
        });
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
