import { z } from "zod";
import { checkCircuit, type CircuitResult } from "./circuit";
import { fieldErrors } from "~/utils/validation";
import { circuitCalloutExtraShape, circuitInputShape, loadExclusivity, type FieldErrors, type SwitchFeed } from "./circuit-input";
import {
  METRIC_SIZES,
  PROPERTY_CLASSES,
  TORQUE_UNITS,
  convertTorque,
  estimateTorque,
  type MetricSize,
  type PropertyClass,
  type TorqueEstimate,
  type TorqueValues,
} from "./torque";
import { TORQUE_SOURCES, type TorqueSource } from "./torque-sources";

export const SIGNAL_WORDS = ["DANGER", "WARNING", "CAUTION", "NOTICE"] as const;
export type SignalWord = (typeof SIGNAL_WORDS)[number];

function text(label: string, max: number) {
  return z
    .string({ error: `${label} must be text` })
    .trim()
    .min(1, { error: `${label} must not be empty` })
    .max(max, { error: `${label} must be at most ${max} characters` });
}

export { TORQUE_SOURCE_LABELS, TORQUE_SOURCES, type TorqueSource } from "./torque-sources";

const torqueCalloutObject = z.object({
  kind: z.literal("torque"),
  fastener: text("Fastener", 200),
  value: z
    .number({ error: "Torque value must be a number" })
    .gt(0, { error: "Torque value must be more than 0" })
    .max(100_000, { error: "Torque value must be at most 100000" })
    .optional(),
  unit: z.enum(TORQUE_UNITS, { error: `Torque unit must be one of ${TORQUE_UNITS.join(", ")}` }).optional(),
  /** Free text ("M8", "5/16-18") for display; only the metric sizes can be estimated. */
  size: text("Bolt size", 40).optional(),
  propertyClass: text("Property class", 20).optional(),
  threadlocker: text("Threadlocker", 200).optional(),
  /** True only when the maker publishes no value: the engine then estimates one. */
  estimate: z.boolean({ error: "Estimate must be yes or no" }).optional(),
  lubricated: z.boolean({ error: "Lubricated must be yes or no" }).optional(),
  /** Absent only on callouts stored before sources were recorded; the page then says so. */
  valueSource: z
    .enum(TORQUE_SOURCES, {
      error: "Torque source must be the vehicle maker, the accessory maker, measured by the author, or an estimate",
    })
    .optional(),
});

function isMetricSize(size: string | undefined): size is MetricSize {
  return (METRIC_SIZES as readonly string[]).includes(size ?? "");
}

function isPropertyClass(value: string | undefined): value is PropertyClass {
  return (PROPERTY_CLASSES as readonly string[]).includes(value ?? "");
}

/** A maker's value and an estimate side by side would invite picking the wrong one, so it is one or the other. */
export const torqueCalloutSchema = torqueCalloutObject.superRefine((callout, ctx) => {
  if (callout.estimate === true) {
    if (callout.value !== undefined) {
      ctx.addIssue({
        code: "custom",
        path: ["estimate"],
        message: "An estimate is only for fasteners without a maker's value: remove the torque value or the estimate",
      });
    }
    if (callout.valueSource !== undefined && callout.valueSource !== "estimate") {
      ctx.addIssue({
        code: "custom",
        path: ["valueSource"],
        message: "An estimated torque has no maker's or measured source: leave the torque source as the estimate",
      });
    }
    if (!isMetricSize(callout.size)) {
      ctx.addIssue({
        code: "custom",
        path: ["size"],
        message: `Bolt size must be one of ${METRIC_SIZES.join(", ")} for an estimate`,
      });
    }
    if (!isPropertyClass(callout.propertyClass)) {
      ctx.addIssue({
        code: "custom",
        path: ["propertyClass"],
        message: `Property class must be ${PROPERTY_CLASSES.join(" or ")} for an estimate`,
      });
    }
    return;
  }
  if (callout.valueSource === "estimate") {
    ctx.addIssue({
      code: "custom",
      path: ["valueSource"],
      message: "A torque value given by hand is not an estimate: say whose value it is, or ask for an estimate instead",
    });
  }
  if (callout.value === undefined) {
    ctx.addIssue({
      code: "custom",
      path: ["value"],
      message: "Torque value is required (or ask for an estimate with the bolt size and class)",
    });
  }
  if (callout.unit === undefined) {
    ctx.addIssue({ code: "custom", path: ["unit"], message: `Torque unit is required: one of ${TORQUE_UNITS.join(", ")}` });
  }
});

export const circuitCalloutSchema = loadExclusivity(
  z.object({ kind: z.literal("circuit"), ...circuitInputShape, ...circuitCalloutExtraShape }),
);

export const cautionCalloutSchema = z.object({
  kind: z.literal("caution"),
  signalWord: z.enum(SIGNAL_WORDS, { error: `Signal word must be one of ${SIGNAL_WORDS.join(", ")}` }),
  text: text("Caution text", 2000),
});

export const tipCalloutSchema = z.object({ kind: z.literal("tip"), text: text("Tip text", 2000) });

export const calloutSchema = z.discriminatedUnion(
  "kind",
  [torqueCalloutSchema, circuitCalloutSchema, cautionCalloutSchema, tipCalloutSchema],
  { error: "Callout type must be torque, circuit, caution or tip" },
);

export type TorqueCallout = z.output<typeof torqueCalloutSchema>;
export type CircuitCallout = z.output<typeof circuitCalloutSchema>;
export type CautionCallout = z.output<typeof cautionCalloutSchema>;
export type TipCallout = z.output<typeof tipCalloutSchema>;
export type Callout = z.output<typeof calloutSchema>;
export type CalloutInput = z.input<typeof calloutSchema>;

type WithoutKind<T> = T extends unknown ? Omit<T, "kind"> : never;
/** A callout as stored: its kind, a torque value's source and a circuit's switch feed in their own columns, everything else in a JSON column. */
export type CalloutData = WithoutKind<Callout>;
export type CalloutRow = {
  kind: Callout["kind"];
  data: CalloutData;
  torqueSource?: TorqueSource | null;
  switchFeed?: SwitchFeed | null;
};

/** Splits a checked callout into its columns. */
export function calloutRow(callout: Callout): CalloutRow {
  if (callout.kind === "torque") {
    const { kind, valueSource, ...data } = callout;
    return { kind, data, torqueSource: valueSource ?? null, switchFeed: null };
  }
  if (callout.kind === "circuit") {
    const { kind, switchFeed, ...data } = callout;
    return { kind, data, torqueSource: null, switchFeed: switchFeed ?? null };
  }
  const { kind, ...data } = callout;
  return { kind, data, torqueSource: null, switchFeed: null };
}

/** Joins a stored callout's columns again (it was checked by `calloutSchema` before it was stored). */
export function storedCallout(row: CalloutRow): Callout {
  const extra: Record<string, unknown> = {};
  if (row.kind === "torque" && row.torqueSource) extra.valueSource = row.torqueSource;
  if (row.kind === "circuit" && row.switchFeed) extra.switchFeed = row.switchFeed;
  return { kind: row.kind, ...row.data, ...extra } as Callout;
}

export type TorqueEvaluation = {
  kind: "torque";
  /** The maker's value in every unit; null when the callout is an estimate. */
  values: TorqueValues | null;
  estimate: TorqueEstimate | null;
};
export type CircuitEvaluation = { kind: "circuit"; result: CircuitResult };
export type CalloutEvaluation = TorqueEvaluation | CircuitEvaluation | { kind: "caution" | "tip"; result: null };

export function evaluateTorqueCallout(callout: TorqueCallout): TorqueEvaluation {
  if (callout.value !== undefined && callout.unit !== undefined) {
    return { kind: "torque", values: convertTorque(callout.value, callout.unit), estimate: null };
  }
  if (callout.estimate === true && isMetricSize(callout.size) && isPropertyClass(callout.propertyClass)) {
    return {
      kind: "torque",
      values: null,
      estimate: estimateTorque({
        size: callout.size,
        propertyClass: callout.propertyClass,
        lubricated: callout.lubricated ?? false,
      }),
    };
  }
  // Only reachable with a callout that skipped the schema.
  return { kind: "torque", values: null, estimate: null };
}

export function evaluateCallout(callout: TorqueCallout): TorqueEvaluation;
export function evaluateCallout(callout: CircuitCallout): CircuitEvaluation;
export function evaluateCallout(callout: Callout): CalloutEvaluation;
export function evaluateCallout(callout: Callout): CalloutEvaluation {
  switch (callout.kind) {
    case "torque":
      return evaluateTorqueCallout(callout);
    case "circuit":
      return { kind: "circuit", result: checkCircuit(callout) };
    default:
      return { kind: callout.kind, result: null };
  }
}

export function parseCallout(raw: unknown): { ok: true; value: Callout } | { ok: false; fields: FieldErrors } {
  const parsed = calloutSchema.safeParse(raw);
  return parsed.success ? { ok: true, value: parsed.data } : { ok: false, fields: fieldErrors(parsed.error) };
}
