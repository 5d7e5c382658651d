import { type CircuitInput, checkCircuit, parseCircuitInput } from "~/engine/circuit";
import { AWG_SIZES, MM2_SIZES, STANDARD_FUSES_A } from "~/engine/wire";

/** The planner's form, as strings: what a browser posts and what the page keeps while you type. */
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
};

export const WIRE_OPTIONS = [
  ...AWG_SIZES.map((awg) => ({ value: `awg:${awg}`, label: `${awg} AWG` })),
  ...MM2_SIZES.map((mm2) => ({ value: `mm2:${mm2}`, label: `${mm2} mm²` })),
];
export const FUSE_OPTIONS = STANDARD_FUSES_A.map((a) => ({ value: String(a), label: `${a} A` }));

const PLANNER_FIELDS = Object.keys(PLANNER_DEFAULTS);

export function valuesFromForm(data: FormData | URLSearchParams, base: PlannerValues = PLANNER_DEFAULTS): PlannerValues {
  const values: PlannerValues = { ...base };
  for (const name of PLANNER_FIELDS) {
    const value = data.get(name);
    if (typeof value === "string") values[name] = value.slice(0, 40);
  }
  // An unticked checkbox sends nothing.
  if (data instanceof FormData || data.has("loadKind")) values.continuous = data.get("continuous") === "on" ? "on" : "";
  return values;
}

const numberOrText = (text: string) => {
  const trimmed = text.trim().replace(",", ".");
  if (trimmed === "") return undefined;
  const n = Number(trimmed);
  return Number.isFinite(n) ? n : trimmed;
};

/** Form strings → the engine's input (engine §1 names); the engine's schema does the checking. */
export function toCircuitRaw(values: PlannerValues): Record<string, unknown> {
  const [unit, size] = values.wire.split(":");
  const raw: Record<string, unknown> = {
    systemVoltage: numberOrText(values.systemVoltage),
    [values.loadKind === "amps" ? "loadAmps" : "loadWatts"]: numberOrText(values.load) ?? undefined,
    continuous: values.continuous === "on",
    oneWayLengthM: numberOrText(values.oneWayLengthM),
    returnPath: values.returnPath,
    location: values.location,
    insulationC: numberOrText(values.insulationC),
    bundled: numberOrText(values.bundled),
    dropLimitPct: numberOrText(values.dropLimitPct),
    conductorTempC: numberOrText(values.conductorTempC),
    wire: unit && size ? { [unit]: Number(size) } : undefined,
    fuseA: values.fuse === "none" ? null : numberOrText(values.fuse),
    fuseDistanceMm: numberOrText(values.fuseDistanceMm),
    switchRatingA: numberOrText(values.switchRatingA),
    relay: values.relay === "" ? undefined : values.relay === "yes",
  };
  return Object.fromEntries(Object.entries(raw).filter(([, v]) => v !== undefined));
}

/** Engine field names → the form's field names, so each message lands beside its input. */
const FORM_FIELD: Record<string, string> = { loadWatts: "load", loadAmps: "load", fuseA: "fuse", input: "load" };

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
