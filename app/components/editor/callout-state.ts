import { circuitCalloutSchema, SIGNAL_WORDS, type SignalWord } from "~/engine/callouts";
import { type CircuitInput, type CircuitResult, checkCircuit } from "~/engine/circuit";
import {
  convertTorque,
  estimateTorque,
  METRIC_SIZES,
  type MetricSize,
  PROPERTY_CLASSES,
  type PropertyClass,
  TORQUE_UNITS,
  type TorqueEstimate,
  type TorqueUnit,
  type TorqueValues,
} from "~/engine/torque";
import { TORQUE_SOURCES, type TorqueSource } from "~/engine/torque-sources";
import type { CalloutKind } from "~/utils/vocab";

/**
 * The callout editor's state is the API's callout objects themselves (what `calloutSchema`
 * parses): a field not filled in yet is absent (or, for a required text, an empty string). These
 * helpers make each change and work out the live previews without ever throwing on a half-typed
 * callout.
 */
export type DraftCallout = { kind?: unknown; [field: string]: unknown };

export function asDraft(value: unknown): DraftCallout {
  return typeof value === "object" && value !== null && !Array.isArray(value) ? (value as DraftCallout) : {};
}

/** What a new callout of each kind starts as: the required texts empty, torque in N·m. */
export function newCallout(kind: CalloutKind): DraftCallout {
  switch (kind) {
    case "torque":
      return { kind, fastener: "", unit: "N·m" };
    case "circuit":
      return { kind, feed: "battery" };
    case "caution":
      return { kind, text: "" };
    case "tip":
      return { kind, text: "" };
  }
}

/** Sets a field, or takes it out when the value is undefined (absent is how "not filled in" is kept). */
export function setField(callout: DraftCallout, field: string, value: unknown): DraftCallout {
  const next = { ...callout };
  if (value === undefined) delete next[field];
  else next[field] = value;
  return next;
}

/** An optional text: blank means absent, since the schemas refuse an empty optional text. */
export function setOptionalText(callout: DraftCallout, field: string, text: string): DraftCallout {
  return setField(callout, field, text.trim() === "" ? undefined : text);
}

const isOneOf = <T extends string>(list: readonly T[], value: unknown): value is T =>
  typeof value === "string" && (list as readonly string[]).includes(value);

// ——— torque ———

/** The torque form's "where the value comes from": a source, or the estimate in place of a value. */
export type TorqueOrigin = TorqueSource | "";

export function torqueOrigin(callout: DraftCallout): TorqueOrigin {
  if (callout.estimate === true) return "estimate";
  return isOneOf(TORQUE_SOURCES, callout.valueSource) ? callout.valueSource : "";
}

/**
 * Choosing an estimate takes the maker's value and unit out (the schema allows one or the other)
 * and hands them back in `set`; choosing a source again puts back what `stashed` kept.
 */
export function setTorqueOrigin(
  callout: DraftCallout,
  origin: TorqueSource,
  stashed: { value?: unknown; unit?: unknown } = {},
): { callout: DraftCallout; set: { value?: unknown; unit?: unknown } } {
  if (origin === "estimate") {
    const { value, unit, ...rest } = callout;
    return { callout: { ...rest, estimate: true, valueSource: "estimate" }, set: { value, unit } };
  }
  const { estimate: _estimate, ...rest } = callout;
  const next: DraftCallout = { ...rest, valueSource: origin };
  if (next.value === undefined && stashed.value !== undefined) next.value = stashed.value;
  if (next.unit === undefined) next.unit = stashed.unit ?? "N·m";
  return { callout: next, set: {} };
}

export type TorquePreview =
  | { kind: "value"; values: TorqueValues }
  | { kind: "estimate"; estimate: TorqueEstimate }
  | { kind: "missing"; words: string };

/** The live conversion or the labelled estimate, from whatever the torque form holds so far. */
export function torquePreview(callout: DraftCallout): TorquePreview {
  if (callout.estimate === true) {
    const size = isOneOf<MetricSize>(METRIC_SIZES, callout.size) ? callout.size : null;
    const propertyClass = isOneOf<PropertyClass>(PROPERTY_CLASSES, callout.propertyClass) ? callout.propertyClass : null;
    if (size && propertyClass) {
      return { kind: "estimate", estimate: estimateTorque({ size, propertyClass, lubricated: callout.lubricated === true }) };
    }
    const wanted = [size ? null : `the bolt size (${METRIC_SIZES.join(", ")})`, propertyClass ? null : "the property class"];
    return { kind: "missing", words: `Choose ${wanted.filter(Boolean).join(" and ")} to see the estimate.` };
  }
  const value = callout.value;
  const unit = isOneOf<TorqueUnit>(TORQUE_UNITS, callout.unit) ? callout.unit : null;
  if (typeof value === "number" && Number.isFinite(value) && value > 0 && unit) {
    return { kind: "value", values: convertTorque(value, unit) };
  }
  const wanted = [typeof value === "number" && value > 0 ? null : "the torque value", unit ? null : "its unit"];
  return { kind: "missing", words: `Fill in ${wanted.filter(Boolean).join(" and ")} to see it in every unit.` };
}

// ——— circuit ———

export type LoadKind = "watts" | "amps";

/** Which load field the form shows: the one the callout holds, else the form's own choice. */
export function loadKindOf(callout: DraftCallout, fallback: LoadKind): LoadKind {
  if (callout.loadAmps !== undefined && callout.loadWatts === undefined) return "amps";
  if (callout.loadWatts !== undefined) return "watts";
  return fallback;
}

const roundTo = (value: number, digits: number) => Number(value.toFixed(digits));

/**
 * Watts ↔ amps at the callout's system voltage (P = V × I at the nominal voltage, as the engine
 * computes current), so the load keeps its meaning when the author switches how it is given.
 */
export function switchLoadKind(callout: DraftCallout, to: LoadKind): { callout: DraftCallout; notice: string | null } {
  const volts = callout.systemVoltage === 24 ? 24 : 12;
  const [fromField, toField] = to === "amps" ? ["loadWatts", "loadAmps"] : ["loadAmps", "loadWatts"];
  const old = callout[fromField];
  const { [fromField]: _dropped, ...rest } = callout;
  if (typeof old !== "number" || !(old > 0)) return { callout: old === undefined ? callout : rest, notice: null };
  const converted = to === "amps" ? roundTo(old / volts, 2) : roundTo(old * volts, 1);
  const [a, b] = to === "amps" ? [`${old} W`, `${converted} A`] : [`${old} A`, `${converted} W`];
  return { callout: { ...rest, [toField]: converted }, notice: `Converted the load: ${a} is ${b} at ${volts} V.` };
}

/** "Not used" takes out a switch feed of its own (the schema refuses one without a relay) and hands it back. */
export function setRelay(callout: DraftCallout, relay: boolean | undefined): { callout: DraftCallout; removed: unknown } {
  const next = setField(callout, "relay", relay);
  if (relay !== false || next.switchFeed === undefined) return { callout: next, removed: undefined };
  const { switchFeed, ...rest } = next;
  return { callout: rest, removed: switchFeed };
}

export type CircuitPreview =
  | { ok: true; input: CircuitInput & { relay?: boolean; label?: string; feed: "battery" | "fuse-box" }; result: CircuitResult }
  | { ok: false; missing: string[]; problems: string[] };

/**
 * The engine's check while the author types: the same schema and `checkCircuit` the planner and
 * the API use. Until the callout parses it says what is still to fill in, never throws.
 */
export function circuitPreview(callout: DraftCallout): CircuitPreview {
  const missing: string[] = [];
  if (callout.loadWatts === undefined && callout.loadAmps === undefined) missing.push("the load (W or A)");
  if (callout.oneWayLengthM === undefined) missing.push("the one-way run");
  const parsed = circuitCalloutSchema.safeParse({ ...callout, kind: "circuit" });
  if (!parsed.success) {
    const skip = new Set(["loadWatts", "oneWayLengthM"]);
    const problems = parsed.error.issues
      .filter((issue) => !(missing.length && skip.has(String(issue.path[0])) && /required/.test(issue.message)))
      .map((issue) => issue.message);
    return { ok: false, missing, problems: [...new Set(problems)] };
  }
  try {
    return { ok: true, input: parsed.data, result: checkCircuit(parsed.data) };
  } catch {
    // The engine is property-tested never to throw on a parsed input; this keeps the editor standing if it ever did.
    return { ok: false, missing: [], problems: ["The circuit could not be checked with these values."] };
  }
}

/** "Fill in the load (W or A) and the one-way run to see …" */
export function missingWords(missing: string[]): string {
  const list = missing.length > 1 ? `${missing.slice(0, -1).join(", ")} and ${missing[missing.length - 1]}` : missing[0];
  return `Fill in ${list} to see the results, the findings and the wiring diagram.`;
}

// ——— caution ———

export function signalWordOf(callout: DraftCallout): SignalWord | undefined {
  return isOneOf(SIGNAL_WORDS, callout.signalWord) ? callout.signalWord : undefined;
}
