import type { ChangeEvent, ReactNode } from "react";
import { Form } from "react-router";

export type PickerOption = { id: number; name: string };

/** What the picker offers for the steps chosen so far (app/models/vehicle-picker.server.ts). */
export type PickerOptions = {
  makes: PickerOption[];
  models: PickerOption[];
  generations: PickerOption[];
  variants: PickerOption[];
  years: number[];
  chosen: { make: number | null; model: number | null; generation: number | null };
};

const control = "mt-1 min-h-11 w-full rounded-md border border-rule bg-paper px-3 py-2";
const label = "block text-sm font-semibold text-ink";

/** With JavaScript a choice moves on by itself; without it the "Next" button sends the step. */
const submitStep = (event: ChangeEvent<HTMLSelectElement>) => event.currentTarget.form?.requestSubmit();

function StepSelect({
  name,
  text,
  options,
  value,
  idPrefix,
}: {
  name: string;
  text: string;
  options: PickerOption[];
  value: number | null;
  idPrefix: string;
}) {
  const id = `${idPrefix}-${name}`;
  return (
    <div>
      <label htmlFor={id} className={label}>
        {text}
      </label>
      <select id={id} name={name} defaultValue={value ?? ""} onChange={submitStep} className={control}>
        <option value="">Choose…</option>
        {options.map((o) => (
          <option key={o.id} value={o.id}>
            {o.name}
          </option>
        ))}
      </select>
    </div>
  );
}

/**
 * Make → model → generation by plain GET steps on the page itself (`stepsAction`, the address
 * keeps `vmake`, `vmodel`, `vgen`), then variant and model year posted to `saveAction`. Works
 * without JavaScript; with it each choice moves on at once. `children` go inside the final form
 * (hidden fields, a nickname), `submitLabel` names its button.
 */
export function VehiclePicker({
  options,
  stepsAction,
  saveAction,
  submitLabel,
  idPrefix = "picker",
  children,
}: {
  options: PickerOptions;
  stepsAction: string;
  saveAction: string;
  submitLabel: string;
  idPrefix?: string;
  children?: ReactNode;
}) {
  const { chosen } = options;
  return (
    <div className="space-y-4">
      <Form method="get" action={stepsAction} preventScrollReset replace className="grid gap-3 sm:grid-cols-3 sm:items-end">
        <StepSelect name="vmake" text="Make" options={options.makes} value={chosen.make} idPrefix={idPrefix} />
        {chosen.make ? (
          <StepSelect name="vmodel" text="Model" options={options.models} value={chosen.model} idPrefix={idPrefix} />
        ) : null}
        {chosen.model ? (
          <StepSelect name="vgen" text="Generation" options={options.generations} value={chosen.generation} idPrefix={idPrefix} />
        ) : null}
        {chosen.generation ? null : (
          <div>
            <button
              type="submit"
              className="min-h-11 w-full rounded-md border border-rule bg-white px-4 py-2 font-semibold text-spruce-800 hover:bg-paper-deep sm:w-auto"
            >
              Next
            </button>
          </div>
        )}
      </Form>
      {chosen.generation ? (
        <Form method="post" action={saveAction} className="grid gap-3 sm:grid-cols-3 sm:items-end">
          <div>
            <label htmlFor={`${idPrefix}-variant`} className={label}>
              Variant
            </label>
            <select id={`${idPrefix}-variant`} name="variantId" required defaultValue="" className={control}>
              <option value="" disabled>
                Choose…
              </option>
              {options.variants.map((v) => (
                <option key={v.id} value={v.id}>
                  {v.name}
                </option>
              ))}
            </select>
          </div>
          <div>
            <label htmlFor={`${idPrefix}-year`} className={label}>
              Model year
            </label>
            <select id={`${idPrefix}-year`} name="year" required defaultValue="" className={control}>
              <option value="" disabled>
                Choose…
              </option>
              {options.years.map((y) => (
                <option key={y} value={y}>
                  {y}
                </option>
              ))}
            </select>
          </div>
          {children}
          <div>
            <button
              type="submit"
              className="min-h-11 w-full rounded-md bg-spruce-800 px-4 py-2 font-semibold text-paper hover:bg-spruce-700 sm:w-auto"
            >
              {submitLabel}
            </button>
          </div>
        </Form>
      ) : null}
    </div>
  );
}
