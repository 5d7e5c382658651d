import { useState } from "react";
import { Form } from "react-router";
import { SafetyNotice } from "~/components/chrome";
import { CircuitFigure, CircuitResults, EngineSvg } from "~/components/circuit-results";
import { FUSE_OPTIONS, type PlannerValues, planCircuit, valuesFromForm, WIRE_OPTIONS } from "~/components/planner-form";
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

/** Fills the run length from the chosen vehicle's battery location and where the accessory goes. */
function prefill(values: PlannerValues, variants: VariantOption[]): PlannerValues {
  const variant = variants.find((v) => v.key === values.variant);
  if (!variant) return values;
  const place = (ACCESSORY_PLACES as readonly string[]).includes(values.place) ? (values.place as AccessoryPlace) : "front";
  return { ...values, oneWayLengthM: String(typicalRunLengthM(variant, place)) };
}

export async function loader({ request }: Route.LoaderArgs) {
  const variants = await variantsWithNames(await getDb());
  const params = new URL(request.url).searchParams;
  let values = valuesFromForm(params);
  if (params.get("variant")) values = prefill(values, variants);
  return { variants, values };
}

/** Without JavaScript the form posts here and the page is computed on the server. */
export async function action({ request }: Route.ActionArgs) {
  return forPage(async () => {
    const form = await readFormData(request);
    let values = valuesFromForm(form);
    if (form.get("intent") === "prefill") values = prefill(values, await variantsWithNames(await getDb()));
    return { values };
  });
}

const inputClass = "mt-1 w-full rounded-md border border-rule bg-paper px-3 py-2 text-sm aria-[invalid=true]:border-z-danger";

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
 * onChange keeps current; without JavaScript the browser posts the same names.
 */
function PlannerField({ label, name, values, errors, hint, options, inputMode }: FieldProps) {
  const error = errors[name];
  const common = {
    id: name,
    name,
    value: values[name],
    onChange: () => {},
    className: inputClass,
    "aria-invalid": error ? true : undefined,
    "aria-describedby": error ? `${name}-error` : undefined,
  };
  return (
    <div>
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
        <input {...common} inputMode={inputMode} />
      )}
      {error ? (
        <p id={`${name}-error`} className="mt-1 text-sm font-medium text-z-danger">
          {error}
        </p>
      ) : hint ? (
        <p className="mt-1 text-xs text-ink-soft">{hint}</p>
      ) : null}
    </div>
  );
}

const opts = (pairs: [string, string][]) => pairs.map(([value, label]) => ({ value, label }));
const NOT_CHOSEN = { value: "", label: "Not chosen" };

export default function CircuitPlanner({ loaderData, actionData }: Route.ComponentProps) {
  const { variants } = loaderData;
  const submitted = actionData?.values ?? loaderData.values;
  const [values, setValues] = useState<PlannerValues>(submitted);
  const [seen, setSeen] = useState(submitted);
  if (seen !== submitted) {
    // A server round trip (no-JS post or prefill) replaces what is on screen.
    setSeen(submitted);
    setValues(submitted);
  }
  const plan = planCircuit(values);
  const errors = plan.ok ? {} : plan.errors;
  const variant = variants.find((v) => v.key === values.variant);
  const onChange = (event: React.FormEvent<HTMLFormElement>) => {
    let next = valuesFromForm(new FormData(event.currentTarget));
    const target = event.target as HTMLInputElement;
    if (target.name === "variant" || target.name === "place") next = prefill(next, variants);
    setValues(next);
  };
  const field = { values, errors };

  return (
    <div className="mx-auto max-w-6xl px-6 py-10">
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

      <div className="mt-8 grid gap-8 lg:grid-cols-[22rem_1fr]">
        <Form
          method="post"
          onChange={onChange}
          className="h-fit space-y-5 rounded-xl border border-rule bg-white p-5 shadow-sm"
          aria-label="Circuit"
        >
          <fieldset className="space-y-3 rounded-lg bg-paper p-3">
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
            {variant ? (
              <p className="text-xs text-ink-soft" data-testid="vehicle-note">
                The 12 V battery sits in the {BATTERY_LOCATION_LABELS[variant.batteryLocation]} ({variant.batteryRunM} m to the
                firewall), so a typical run to this place is {values.oneWayLengthM} m. Measure yours and correct it.
              </p>
            ) : null}
            <button
              type="submit"
              name="intent"
              value="prefill"
              className="rounded-md border border-rule px-3 py-1.5 text-sm hover:bg-paper-deep"
            >
              Use this vehicle's typical run
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
          <label className="flex items-center gap-2 text-sm">
            <input
              type="checkbox"
              name="continuous"
              checked={values.continuous === "on"}
              onChange={() => {}}
              className="accent-spruce-700"
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
          <fieldset className="space-y-3 border-t border-rule pt-4">
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
          <button
            type="submit"
            className="w-full rounded-md bg-spruce-800 px-4 py-2 font-semibold text-paper hover:bg-spruce-700"
          >
            Check the circuit
          </button>
        </Form>

        <section aria-live="polite" aria-label="Results" className="min-w-0">
          {plan.ok ? (
            <div className="space-y-6">
              <div className="rounded-xl border border-rule bg-white p-5 shadow-sm">
                <h2 className="font-serif text-2xl font-semibold text-spruce-900">Results</h2>
                <CircuitResults result={plan.result} relay={plan.input.relay} />
              </div>
              <div className="rounded-xl border border-rule bg-white p-5 shadow-sm">
                <h2 className="font-serif text-xl font-semibold text-spruce-900">Wiring diagram</h2>
                <CircuitFigure input={plan.input} result={plan.result} id="planner" />
              </div>
              <div className="rounded-xl border border-rule bg-white p-5 shadow-sm">
                <h2 className="font-serif text-xl font-semibold text-spruce-900">Voltage drop against run length</h2>
                <p className="mt-1 text-sm text-ink-soft">
                  Each line is a wire size; the dashed line is your {plan.input.dropLimitPct} % limit and the marker your run.
                  Sizes under the limit at your run length are fine for drop; the fuse check still applies.
                </p>
                <EngineSvg className="mt-3" svg={dropChartSvg(plan.input, plan.result, { idPrefix: "planner-chart" })} />
              </div>
            </div>
          ) : (
            <div className="rounded-xl border-2 border-dashed border-rule p-8 text-ink-soft" role="status">
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
