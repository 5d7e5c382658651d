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
  const form = await request.formData();
  let values = valuesFromForm(form);
  if (form.get("intent") === "prefill") values = prefill(values, await variantsWithNames(await getDb()));
  return { values };
}

const input = "mt-1 w-full rounded-md border border-rule bg-paper px-3 py-2 text-sm aria-[invalid=true]:border-z-danger";
const labelClass = "block text-sm font-medium";

function Field({
  label,
  name,
  error,
  hint,
  children,
}: {
  label: string;
  name: string;
  error?: string;
  hint?: string;
  children: React.ReactNode;
}) {
  return (
    <div>
      <label htmlFor={name} className={labelClass}>
        {label}
      </label>
      {children}
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
  const aria = (name: string) => ({
    id: name,
    name,
    "aria-invalid": errors[name] ? true : undefined,
    "aria-describedby": errors[name] ? `${name}-error` : undefined,
  });

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
            <Field label="Vehicle" name="variant">
              <select {...aria("variant")} value={values.variant} onChange={() => {}} className={input}>
                <option value="">Not chosen</option>
                {variants.map((v) => (
                  <option key={v.key} value={v.key}>
                    {v.label} ({POWERTRAIN_LABELS[v.powertrain]})
                  </option>
                ))}
              </select>
            </Field>
            <Field label="Where the accessory goes" name="place">
              <select {...aria("place")} value={values.place} onChange={() => {}} className={input}>
                {ACCESSORY_PLACES.map((p) => (
                  <option key={p} value={p}>
                    {ACCESSORY_PLACE_LABELS[p]}
                  </option>
                ))}
              </select>
            </Field>
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
            <Field label="System voltage" name="systemVoltage" error={errors.systemVoltage}>
              <select {...aria("systemVoltage")} value={values.systemVoltage} onChange={() => {}} className={input}>
                <option value="12">12 V</option>
                <option value="24">24 V</option>
              </select>
            </Field>
            <Field label="Load given in" name="loadKind">
              <select {...aria("loadKind")} value={values.loadKind} onChange={() => {}} className={input}>
                <option value="watts">watts (W)</option>
                <option value="amps">amps (A)</option>
              </select>
            </Field>
          </div>
          <Field label={values.loadKind === "amps" ? "Load current (A)" : "Load power (W)"} name="load" error={errors.load}>
            <input {...aria("load")} inputMode="decimal" value={values.load} onChange={() => {}} className={input} />
          </Field>
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
            <Field label="One-way run (m)" name="oneWayLengthM" error={errors.oneWayLengthM}>
              <input
                {...aria("oneWayLengthM")}
                inputMode="decimal"
                value={values.oneWayLengthM}
                onChange={() => {}}
                className={input}
              />
            </Field>
            <Field label="Return path" name="returnPath" error={errors.returnPath}>
              <select {...aria("returnPath")} value={values.returnPath} onChange={() => {}} className={input}>
                <option value="wire">Own return wire</option>
                <option value="chassis">Chassis ground</option>
              </select>
            </Field>
            <Field label="Wire runs in the" name="location" error={errors.location}>
              <select {...aria("location")} value={values.location} onChange={() => {}} className={input}>
                <option value="engine-bay">Engine bay</option>
                <option value="cabin">Cabin</option>
              </select>
            </Field>
            <Field label="Insulation rating" name="insulationC" error={errors.insulationC}>
              <select {...aria("insulationC")} value={values.insulationC} onChange={() => {}} className={input}>
                {INSULATION_RATINGS_C.map((c) => (
                  <option key={c} value={c}>
                    {c} °C
                  </option>
                ))}
              </select>
            </Field>
            <Field label="Wires in the bundle" name="bundled" error={errors.bundled}>
              <input {...aria("bundled")} inputMode="numeric" value={values.bundled} onChange={() => {}} className={input} />
            </Field>
            <Field label="Drop limit (%)" name="dropLimitPct" error={errors.dropLimitPct} hint="3 for lighting, 10 otherwise">
              <input
                {...aria("dropLimitPct")}
                inputMode="decimal"
                value={values.dropLimitPct}
                onChange={() => {}}
                className={input}
              />
            </Field>
          </div>
          <fieldset className="space-y-3 border-t border-rule pt-4">
            <legend className="text-xs font-semibold uppercase tracking-wider text-ink-soft">Your choices (to check them)</legend>
            <div className="grid grid-cols-2 gap-3">
              <Field label="Wire size" name="wire" error={errors.wire}>
                <select {...aria("wire")} value={values.wire} onChange={() => {}} className={input}>
                  <option value="">Not chosen</option>
                  {WIRE_OPTIONS.map((o) => (
                    <option key={o.value} value={o.value}>
                      {o.label}
                    </option>
                  ))}
                </select>
              </Field>
              <Field label="Fuse" name="fuse" error={errors.fuse}>
                <select {...aria("fuse")} value={values.fuse} onChange={() => {}} className={input}>
                  <option value="">Not chosen</option>
                  <option value="none">No fuse</option>
                  {FUSE_OPTIONS.map((o) => (
                    <option key={o.value} value={o.value}>
                      {o.label}
                    </option>
                  ))}
                </select>
              </Field>
              <Field label="Fuse to battery (mm)" name="fuseDistanceMm" error={errors.fuseDistanceMm}>
                <input
                  {...aria("fuseDistanceMm")}
                  inputMode="numeric"
                  value={values.fuseDistanceMm}
                  onChange={() => {}}
                  className={input}
                />
              </Field>
              <Field label="Switch rating (A)" name="switchRatingA" error={errors.switchRatingA}>
                <input
                  {...aria("switchRatingA")}
                  inputMode="decimal"
                  value={values.switchRatingA}
                  onChange={() => {}}
                  className={input}
                />
              </Field>
              <Field label="Relay" name="relay" error={errors.relay}>
                <select {...aria("relay")} value={values.relay} onChange={() => {}} className={input}>
                  <option value="">Not decided</option>
                  <option value="yes">Used</option>
                  <option value="no">Not used</option>
                </select>
              </Field>
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
