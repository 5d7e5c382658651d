import { useEffect, useState } from "react";
import { Form } from "react-router";
import { SafetyNotice } from "~/components/chrome";
import { CircuitFigure, CircuitResults, EngineSvg, FullSizeView } from "~/components/circuit-results";
import {
  BLANK_MEANS,
  FUSE_OPTIONS,
  type PlannerValues,
  planCircuit,
  plannerQuery,
  reconcileLoad,
  valuesFromForm,
  WIRE_OPTIONS,
} from "~/components/planner-form";
import { getDb } from "~/db/client.server";
import { dropChartSvg } from "~/engine/chart";
import { ACCESSORY_PLACE_LABELS, ACCESSORY_PLACES, type AccessoryPlace, typicalRunLengthM } from "~/engine/runs";
import { INSULATION_RATINGS_C } from "~/engine/wire";
import { variantsWithNames } from "~/models/catalogue.server";
import { BATTERY_LOCATION_LABELS, POWERTRAIN_LABELS } from "~/utils/vocab";
import { readFormData } from "~/utils/forms.server";
import { forPage } from "~/utils/http.server";
import type { Route } from "./+types/tools.circuit";

export const meta: Route.MetaFunction = () => [
  { title: "Circuit planner · Torqueleaf" },
  {
    name: "description",
    content:
      "Size the fuse, wire and relay for a 12 V or 24 V accessory circuit, with the voltage drop, a wiring diagram and the sources behind every number.",
  },
];

type VariantOption = Awaited<ReturnType<typeof variantsWithNames>>[number];

function placeOf(values: PlannerValues): AccessoryPlace {
  return (ACCESSORY_PLACES as readonly string[]).includes(values.place) ? (values.place as AccessoryPlace) : "front";
}

/** The chosen vehicle's typical run to where the accessory goes, as the form shows it; null without a vehicle. */
function suggestedRun(values: PlannerValues, variants: VariantOption[]): string | null {
  const variant = variants.find((v) => v.key === values.variant);
  return variant ? String(typicalRunLengthM(variant, placeOf(values))) : null;
}

/**
 * Fills the run length from the vehicle, unless the person typed one: a typed value is never
 * replaced, only offered the vehicle's run beside it. `force` is the "use this vehicle's run" button.
 */
function prefill(values: PlannerValues, variants: VariantOption[], force = false): PlannerValues {
  const run = suggestedRun(values, variants);
  if (run === null || (values.runSource === "typed" && !force)) return values;
  return { ...values, oneWayLengthM: run, runSource: "vehicle" };
}

/** The address holds the whole plan, so a reload or a shared link shows the same circuit. */
function fromRequest(params: URLSearchParams | FormData, variants: VariantOption[]) {
  const { values, notice } = reconcileLoad(valuesFromForm(params));
  return { values: params.get("intent") === "prefill" ? prefill(values, variants, true) : values, notice };
}

export async function loader({ request }: Route.LoaderArgs) {
  const variants = await variantsWithNames(await getDb());
  return { variants, ...fromRequest(new URL(request.url).searchParams, variants) };
}

/** The form sends GET; a POST (an older bookmark or client) is answered the same way. */
export async function action({ request }: Route.ActionArgs) {
  return forPage(async () => {
    const form = await readFormData(request);
    return fromRequest(form, await variantsWithNames(await getDb()));
  });
}

const inputClass =
  "mt-1 block min-h-11 w-full min-w-0 rounded-md border border-rule bg-paper px-3 py-2 text-base sm:text-sm aria-[invalid=true]:border-z-danger";

type FieldProps = {
  label: string;
  name: string;
  values: PlannerValues;
  errors: Record<string, string>;
  hint?: string;
  options?: readonly { value: string; label: string }[];
  inputMode?: "decimal" | "numeric";
};

/**
 * One labelled planner input or menu. Controlled by the page's state, which the form's own
 * onChange keeps current; without JavaScript the browser sends the same names.
 */
function PlannerField({ label, name, values, errors, hint, options, inputMode }: FieldProps) {
  const error = errors[name];
  const blank = BLANK_MEANS[name];
  const usesDefault = !options && blank !== undefined && (values[name] ?? "").trim() === "";
  const note = usesDefault ? `Left blank: ${blank.words}.` : hint;
  const described = error ? `${name}-error` : note ? `${name}-hint` : undefined;
  const common = {
    id: name,
    name,
    value: values[name],
    onChange: () => {},
    className: inputClass,
    "aria-invalid": error ? true : undefined,
    "aria-describedby": described,
  };
  return (
    <div className="min-w-0">
      <label htmlFor={name} className="block text-sm font-medium">
        {label}
      </label>
      {options ? (
        <select {...common}>
          {options.map((o) => (
            <option key={o.value} value={o.value}>
              {o.label}
            </option>
          ))}
        </select>
      ) : (
        <input {...common} inputMode={inputMode} maxLength={40} placeholder={blank?.placeholder} autoComplete="off" />
      )}
      {error ? (
        <p id={`${name}-error`} className="mt-1 text-sm font-medium text-z-danger">
          {error}
        </p>
      ) : note ? (
        <p id={`${name}-hint`} className="mt-1 text-xs text-ink-soft" data-testid={usesDefault ? `${name}-default` : undefined}>
          {note}
        </p>
      ) : null}
    </div>
  );
}

const opts = (pairs: [string, string][]) => pairs.map(([value, label]) => ({ value, label }));
const NOT_CHOSEN = { value: "", label: "Not chosen" };
const buttonClass = "inline-flex min-h-11 items-center justify-center rounded-md px-4 text-sm font-semibold";

export default function CircuitPlanner({ loaderData, actionData }: Route.ComponentProps) {
  const { variants } = loaderData;
  const submitted = actionData ?? loaderData;
  const [values, setValues] = useState<PlannerValues>(submitted.values);
  const [notice, setNotice] = useState<string | null>(submitted.notice);
  const [seen, setSeen] = useState(submitted);
  if (seen !== submitted) {
    // A server round trip (the plain form, or the vehicle's run asked for) replaces what is on screen.
    setSeen(submitted);
    setValues(submitted.values);
    setNotice(submitted.notice);
  }
  // The address follows the form (replaced, not pushed: typing is not a page to go back to).
  useEffect(() => {
    const query = plannerQuery(values);
    const next = `${window.location.pathname}?${query}${window.location.hash}`;
    if (next !== `${window.location.pathname}${window.location.search}${window.location.hash}`) {
      window.history.replaceState(window.history.state, "", next);
    }
  }, [values]);

  const plan = planCircuit(values);
  const errors = plan.ok ? {} : plan.errors;
  const variant = variants.find((v) => v.key === values.variant);
  const suggestion = suggestedRun(values, variants);
  const onChange = (event: React.FormEvent<HTMLFormElement>) => {
    const target = event.target as HTMLInputElement;
    let next = valuesFromForm(new FormData(event.currentTarget));
    if (target.name === "oneWayLengthM") next.runSource = "typed";
    if (target.name === "variant" || target.name === "place") next = prefill(next, variants);
    const reconciled = reconcileLoad(next);
    if (target.name === "loadKind") setNotice(reconciled.notice);
    else if (target.name === "load") setNotice(null);
    setValues(reconciled.values);
  };
  const takeSuggestion = (event: React.MouseEvent<HTMLButtonElement>) => {
    event.preventDefault();
    setValues(prefill(values, variants, true));
  };
  const field = { values, errors };
  const typedRunKept = suggestion !== null && values.runSource === "typed" && values.oneWayLengthM.trim() !== suggestion;

  return (
    <div className="mx-auto max-w-6xl px-4 py-10 sm:px-6">
      <header className="max-w-3xl">
        <h1 className="font-serif text-4xl font-semibold tracking-tight text-spruce-900">Circuit planner</h1>
        <p className="mt-3 text-lg text-ink-soft">
          Enter the load and the run. The planner sizes the fuse and the wire, checks the voltage drop, tells you whether the
          switch needs a relay, and draws the circuit. Every number shows where it comes from.
        </p>
      </header>
      <div className="mt-6 max-w-3xl">
        <SafetyNotice compact />
      </div>

      <div className="mt-8 grid min-w-0 gap-8 lg:grid-cols-[22rem_minmax(0,1fr)]">
        <Form
          method="get"
          preventScrollReset
          onChange={onChange}
          className="h-fit min-w-0 space-y-5 rounded-xl border border-rule bg-white p-4 shadow-sm sm:p-5"
          aria-label="Circuit"
        >
          <fieldset className="min-w-0 space-y-3 rounded-lg bg-paper p-3">
            <legend className="text-xs font-semibold uppercase tracking-wider text-ink-soft">
              Start from a vehicle (optional)
            </legend>
            <PlannerField
              label="Vehicle"
              name="variant"
              {...field}
              options={[
                NOT_CHOSEN,
                ...variants.map((v) => ({ value: v.key, label: `${v.label} (${POWERTRAIN_LABELS[v.powertrain]})` })),
              ]}
            />
            <PlannerField
              label="Where the accessory goes"
              name="place"
              {...field}
              options={ACCESSORY_PLACES.map((p) => ({ value: p, label: ACCESSORY_PLACE_LABELS[p] }))}
            />
            {variant && suggestion !== null ? (
              <p className="text-xs text-ink-soft" data-testid="vehicle-note">
                The 12 V battery sits in the {BATTERY_LOCATION_LABELS[variant.batteryLocation]} ({variant.batteryRunM} m to the
                firewall), so a typical run to this place is {suggestion} m.{" "}
                {typedRunKept
                  ? `Your ${values.oneWayLengthM} m is kept; use the typical run only if you have not measured.`
                  : "Measure yours and correct it."}
              </p>
            ) : null}
            <button
              type="submit"
              name="intent"
              value="prefill"
              onClick={variant ? takeSuggestion : undefined}
              className={`${buttonClass} border border-rule font-normal hover:bg-paper-deep`}
            >
              {suggestion !== null && typedRunKept ? `Use the typical ${suggestion} m` : "Use this vehicle's typical run"}
            </button>
          </fieldset>

          <div className="grid grid-cols-2 gap-3">
            <PlannerField
              label="System voltage"
              name="systemVoltage"
              {...field}
              options={opts([
                ["12", "12 V"],
                ["24", "24 V"],
              ])}
            />
            <PlannerField
              label="Load given in"
              name="loadKind"
              {...field}
              options={opts([
                ["watts", "watts (W)"],
                ["amps", "amps (A)"],
              ])}
            />
          </div>
          <PlannerField
            label={values.loadKind === "amps" ? "Load current (A)" : "Load power (W)"}
            name="load"
            {...field}
            inputMode="decimal"
          />
          {notice ? (
            <p className="-mt-3 text-sm text-spruce-800" role="status" data-testid="load-notice">
              {notice}
            </p>
          ) : null}
          <input type="hidden" name="loadUnit" value={values.loadKind} />
          <input type="hidden" name="runSource" value={values.runSource} />
          <label className="flex min-h-11 items-center gap-3 text-sm">
            <input
              type="checkbox"
              name="continuous"
              checked={values.continuous === "on"}
              onChange={() => {}}
              className="size-5 accent-spruce-700"
            />
            Runs 3 hours or more (continuous)
          </label>
          <div className="grid grid-cols-2 gap-3">
            <PlannerField label="One-way run (m)" name="oneWayLengthM" {...field} inputMode="decimal" />
            <PlannerField
              label="Return path"
              name="returnPath"
              {...field}
              options={opts([
                ["wire", "Own return wire"],
                ["chassis", "Chassis ground"],
              ])}
            />
            <PlannerField
              label="Wire runs in the"
              name="location"
              {...field}
              options={opts([
                ["engine-bay", "Engine bay"],
                ["cabin", "Cabin"],
              ])}
            />
            <PlannerField
              label="Insulation rating"
              name="insulationC"
              {...field}
              options={INSULATION_RATINGS_C.map((c) => ({ value: String(c), label: `${c} °C` }))}
            />
            <PlannerField label="Wires in the bundle" name="bundled" {...field} inputMode="numeric" />
            <PlannerField
              label="Drop limit (%)"
              name="dropLimitPct"
              {...field}
              inputMode="decimal"
              hint="3 for lighting, 10 otherwise"
            />
          </div>
          <fieldset className="min-w-0 space-y-3 border-t border-rule pt-4">
            <legend className="text-xs font-semibold uppercase tracking-wider text-ink-soft">Your choices (to check them)</legend>
            <div className="grid grid-cols-2 gap-3">
              <PlannerField label="Wire size" name="wire" {...field} options={[NOT_CHOSEN, ...WIRE_OPTIONS]} />
              <PlannerField
                label="Fuse"
                name="fuse"
                {...field}
                options={[NOT_CHOSEN, { value: "none", label: "No fuse" }, ...FUSE_OPTIONS]}
              />
              <PlannerField label="Fuse to battery (mm)" name="fuseDistanceMm" {...field} inputMode="numeric" />
              <PlannerField label="Switch rating (A)" name="switchRatingA" {...field} inputMode="decimal" />
              <PlannerField
                label="Relay"
                name="relay"
                {...field}
                options={opts([
                  ["", "Not decided"],
                  ["yes", "Used"],
                  ["no", "Not used"],
                ])}
              />
            </div>
          </fieldset>
          <input type="hidden" name="conductorTempC" value={values.conductorTempC} />
          <button type="submit" className={`${buttonClass} w-full bg-spruce-800 text-paper hover:bg-spruce-700`}>
            Check the circuit
          </button>
          <p className="text-xs text-ink-soft">
            The address of this page holds your plan: bookmark it or send it to share exactly this circuit.
          </p>
        </Form>

        <section aria-live="polite" aria-label="Results" className="min-w-0">
          {plan.ok ? (
            <div className="space-y-6">
              <div className="rounded-xl border border-rule bg-white p-4 shadow-sm sm:p-5">
                <h2 className="font-serif text-2xl font-semibold text-spruce-900">Results</h2>
                <CircuitResults result={plan.result} relay={plan.input.relay} />
              </div>
              <div className="rounded-xl border border-rule bg-white p-4 shadow-sm sm:p-5">
                <h2 className="font-serif text-xl font-semibold text-spruce-900">Wiring diagram</h2>
                <CircuitFigure input={plan.input} result={plan.result} id="planner" />
              </div>
              <div className="rounded-xl border border-rule bg-white p-4 shadow-sm sm:p-5">
                <h2 className="font-serif text-xl font-semibold text-spruce-900">Voltage drop against run length</h2>
                <p className="mt-1 text-sm text-ink-soft">
                  Each line is a wire size; the dashed line is your {plan.input.dropLimitPct}&nbsp;% limit and the marker your
                  run. Sizes under the limit at your run length are fine for drop; the fuse check still applies.
                </p>
                <div id="planner-chart">
                  <EngineSvg className="mt-3" svg={dropChartSvg(plan.input, plan.result, { idPrefix: "planner-chart" })} />
                </div>
                <FullSizeView
                  id="planner-chart"
                  title="Voltage drop against run length"
                  svg={dropChartSvg(plan.input, plan.result, { idPrefix: "planner-chart-full" })}
                />
              </div>
            </div>
          ) : (
            <div className="rounded-xl border-2 border-dashed border-rule p-6 text-ink-soft" role="status">
              <p className="font-medium text-ink">Some inputs need attention before the planner can compute:</p>
              <ul className="mt-2 list-disc pl-5">
                {Object.entries(errors).map(([field, message]) => (
                  <li key={field}>{message}</li>
                ))}
              </ul>
            </div>
          )}
        </section>
      </div>
    </div>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/error-page";
