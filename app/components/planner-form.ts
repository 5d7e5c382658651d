import { type CircuitInput, checkCircuit, parseCircuitInput } from "~/engine/circuit";
import { AWG_SIZES, MM2_SIZES, STANDARD_FUSES_A } from "~/engine/wire";

/** The planner's form, as strings: what a browser sends, what the address keeps and what the page keeps while you type. */
export type PlannerValues = Record<string, string>;

export const PLANNER_DEFAULTS: PlannerValues = {
  variant: "",
  place: "front",
  systemVoltage: "12",
  loadKind: "watts",
  load: "120",
  continuous: "on",
  oneWayLengthM: "3",
  returnPath: "wire",
  location: "engine-bay",
  insulationC: "105",
  bundled: "1",
  dropLimitPct: "3",
  conductorTempC: "20",
  wire: "",
  fuse: "",
  fuseDistanceMm: "",
  switchRatingA: "10",
  relay: "",
  /** "typed" once the person types a run length: a vehicle's typical run then never replaces it. */
  runSource: "",
  /** The unit the load was shown in; when "Load given in" changes, the load is converted from it. */
  loadUnit: "",
};

/** What the engine uses when a text field is left blank (engine.md §1 defaults): the placeholder and the words shown. */
export const BLANK_MEANS: Record<string, { placeholder: string; words: string }> = {
  bundled: { placeholder: "1", words: "1 wire used" },
  dropLimitPct: { placeholder: "3", words: "3 % used" },
  switchRatingA: { placeholder: "10", words: "10 A used" },
  conductorTempC: { placeholder: "20", words: "20 °C used" },
  fuseDistanceMm: { placeholder: "not checked", words: "the distance is not checked" },
};

export const WIRE_OPTIONS = [
  ...AWG_SIZES.map((awg) => ({ value: `awg:${awg}`, label: `${awg} AWG` })),
  ...MM2_SIZES.map((mm2) => ({ value: `mm2:${mm2}`, label: `${mm2} mm²` })),
];
export const FUSE_OPTIONS = STANDARD_FUSES_A.map((a) => ({ value: String(a), label: `${a} A` }));

const PLANNER_FIELDS = Object.keys(PLANNER_DEFAULTS);
/** A typed value is kept up to this length, the same on the server and in the address. */
export const MAX_VALUE_LENGTH = 40;

export function valuesFromForm(data: FormData | URLSearchParams, base: PlannerValues = PLANNER_DEFAULTS): PlannerValues {
  const values: PlannerValues = { ...base };
  for (const name of PLANNER_FIELDS) {
    const value = data.get(name);
    if (typeof value === "string") values[name] = value.slice(0, MAX_VALUE_LENGTH);
  }
  // An unticked checkbox sends nothing: a whole form (it always carries loadKind) without it means "off".
  if (data instanceof FormData || data.has("loadKind")) values.continuous = data.get("continuous") === "on" ? "on" : "";
  return values;
}

/**
 * The planner's state as a query string: only what differs from the defaults, plus loadKind and
 * continuous so an unticked box survives. The same names the plain GET form sends.
 */
export function plannerQuery(values: PlannerValues): string {
  const params = new URLSearchParams();
  for (const name of PLANNER_FIELDS) {
    if (name === "continuous" || name === "loadUnit") continue;
    if (name === "loadKind" || values[name] !== PLANNER_DEFAULTS[name]) params.set(name, values[name] ?? "");
  }
  if (values.continuous === "on") params.set("continuous", "on");
  return params.toString();
}

/** Plain decimal numbers only ("2.6", "2,6", ".5"); "0x10", "1e3" and "Infinity" are left as text for the schema to refuse. */
const DECIMAL = /^[+-]?(\d+([.,]\d*)?|[.,]\d+)$/;

export function parseDecimal(text: string): number | string | undefined {
  const trimmed = text.trim();
  if (trimmed === "") return undefined;
  return DECIMAL.test(trimmed) ? Number(trimmed.replace(",", ".")) : trimmed;
}

/** Form strings → the engine's input (engine §1 names); the engine's schema does the checking. */
export function toCircuitRaw(values: PlannerValues): Record<string, unknown> {
  const [unit, size] = values.wire.split(":");
  const raw: Record<string, unknown> = {
    systemVoltage: parseDecimal(values.systemVoltage),
    [values.loadKind === "amps" ? "loadAmps" : "loadWatts"]: parseDecimal(values.load),
    continuous: values.continuous === "on",
    oneWayLengthM: parseDecimal(values.oneWayLengthM),
    returnPath: values.returnPath,
    location: values.location,
    insulationC: parseDecimal(values.insulationC),
    bundled: parseDecimal(values.bundled),
    dropLimitPct: parseDecimal(values.dropLimitPct),
    conductorTempC: parseDecimal(values.conductorTempC),
    wire: unit && size ? { [unit]: Number(size) } : undefined,
    fuseA: values.fuse === "none" ? null : parseDecimal(values.fuse),
    fuseDistanceMm: parseDecimal(values.fuseDistanceMm),
    switchRatingA: parseDecimal(values.switchRatingA),
    relay: values.relay === "" ? undefined : values.relay === "yes",
  };
  return Object.fromEntries(Object.entries(raw).filter(([, v]) => v !== undefined));
}

const roundTo = (value: number, digits: number) => String(Number(value.toFixed(digits)));

/**
 * When "Load given in" changes, the load keeps its meaning: watts ↔ amps at the system voltage
 * (P = V × I, the same nominal voltage the engine uses), or, when the old value is not a number,
 * it is cleared with a message saying so.
 */
export function reconcileLoad(values: PlannerValues): { values: PlannerValues; notice: string | null } {
  const from = values.loadUnit;
  const to = values.loadKind;
  if (from === "" || from === to || (to !== "watts" && to !== "amps"))
    return { values: { ...values, loadUnit: to }, notice: null };
  const load = parseDecimal(values.load);
  const volts = Number(values.systemVoltage) === 24 ? 24 : 12;
  if (typeof load !== "number" || !(load > 0)) {
    return {
      values: { ...values, load: "", loadUnit: to },
      notice: `The load was cleared: "${values.load}" could not be converted. Enter it in ${to === "amps" ? "amps" : "watts"}.`,
    };
  }
  const converted = to === "amps" ? roundTo(load / volts, 2) : roundTo(load * volts, 1);
  const [a, b] = to === "amps" ? [`${values.load} W`, `${converted} A`] : [`${values.load} A`, `${converted} W`];
  return { values: { ...values, load: converted, loadUnit: to }, notice: `Converted the load: ${a} is ${b} at ${volts} V.` };
}

/** Engine field names → the form's field names, so each message lands beside its input. */
const FORM_FIELD: Record<string, string> = { loadWatts: "load", loadAmps: "load", fuseA: "fuse", _: "load" };

export function planCircuit(values: PlannerValues) {
  const parsed = parseCircuitInput(toCircuitRaw(values));
  if (!parsed.ok) {
    const errors: Record<string, string> = {};
    for (const [field, message] of Object.entries(parsed.fields)) {
      const name = FORM_FIELD[field.split(".")[0]] ?? field.split(".")[0];
      errors[name] ??= message;
    }
    return { ok: false as const, errors };
  }
  const input: CircuitInput = parsed.value;
  return { ok: true as const, input, result: checkCircuit(input) };
}
