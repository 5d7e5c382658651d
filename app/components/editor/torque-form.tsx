import { useState } from "react";
import { TorqueCallout } from "~/components/callouts";
import { METRIC_SIZES, PROPERTY_CLASSES, TORQUE_UNITS } from "~/engine/torque";
import { TORQUE_SOURCES } from "~/engine/torque-sources";
import { type DraftCallout, setField, setOptionalText, setTorqueOrigin, torqueOrigin, torquePreview } from "./callout-state";
import type { FieldErrors } from "./field-paths";
import { ChoiceGroup, NumberField, type Option, SelectField, TextField } from "./fields";

const ORIGIN_WORDS: Record<(typeof TORQUE_SOURCES)[number], { label: string; hint?: string }> = {
  "vehicle-maker": { label: "The vehicle maker's service manual" },
  "accessory-maker": { label: "The accessory maker's fitting instructions" },
  "author-measured": { label: "Measured by me", hint: "Say how in the step text." },
  estimate: {
    label: "No maker's value: estimate it",
    hint: "From the bolt size and property class; readers see it labelled an estimate.",
  },
};

/** A value the callout holds that a menu does not list stays visible (and the schema says what is wrong with it). */
function withCurrent(options: Option[], value: unknown, note: string): Option[] {
  if (typeof value !== "string" || value === "" || options.some((o) => o.value === value)) return options;
  return [...options, { value, label: `${value} (${note})` }];
}

const LUBRICATION: Option[] = [
  { value: "", label: "Not said" },
  { value: "dry", label: "Dry (clean threads)" },
  { value: "lubricated", label: "Lubricated (oiled or anti-seize)" },
];

export function TorqueForm({
  callout,
  onChange,
  path,
  errors,
}: {
  callout: DraftCallout;
  onChange: (next: DraftCallout) => void;
  path: string;
  errors: FieldErrors;
}) {
  // The maker's value and unit, kept while the author tries an estimate, so switching back restores them.
  const [stashed, setStashed] = useState<{ value?: unknown; unit?: unknown }>({});
  const origin = torqueOrigin(callout);
  const estimating = callout.estimate === true;
  const preview = torquePreview(callout);
  const p = (field: string) => `${path}.${field}`;
  const common = { errors };

  const sizeOptions = withCurrent(
    [{ value: "", label: "Choose a size" }, ...METRIC_SIZES.map((s) => ({ value: s, label: s }))],
    callout.size,
    "cannot be estimated",
  );
  const classOptions = withCurrent(
    [{ value: "", label: "Choose a class" }, ...PROPERTY_CLASSES.map((c) => ({ value: c, label: `class ${c}` }))],
    callout.propertyClass,
    "cannot be estimated",
  );
  const unitOptions = withCurrent(
    [
      ...(callout.unit === undefined ? [{ value: "", label: "Choose a unit" }] : []),
      ...TORQUE_UNITS.map((u) => ({ value: u, label: u })),
    ],
    callout.unit,
    "not a unit",
  );

  return (
    <div className="space-y-4">
      <TextField
        {...common}
        path={p("fastener")}
        label="Fastener"
        hint="Which bolt or nut, as a reader would find it: “bumper bracket bolts (4)”."
        value={callout.fastener}
        maxLength={200}
        onText={(text) => onChange(setField(callout, "fastener", text))}
      />
      <ChoiceGroup
        {...common}
        path={p("valueSource")}
        label="Where the value comes from"
        value={origin || undefined}
        choices={TORQUE_SOURCES.map((source) => ({ value: source, ...ORIGIN_WORDS[source] }))}
        onChoose={(value) => {
          const next = setTorqueOrigin(callout, value as (typeof TORQUE_SOURCES)[number], stashed);
          if (value === "estimate") setStashed(next.set);
          onChange(next.callout);
        }}
        localError={errors[p("estimate")]}
      />
      {estimating ? null : (
        <div className="grid grid-cols-[minmax(0,1fr)_8rem] gap-3">
          <NumberField
            {...common}
            path={p("value")}
            label="Torque value"
            value={callout.value}
            onValue={(value) => onChange(setField(callout, "value", value))}
          />
          <SelectField
            {...common}
            path={p("unit")}
            label="Unit"
            value={typeof callout.unit === "string" ? callout.unit : ""}
            options={unitOptions}
            onSelect={(value) => onChange(setField(callout, "unit", value === "" ? undefined : value))}
          />
        </div>
      )}
      <div className="grid gap-3 sm:grid-cols-3">
        {estimating ? (
          <>
            <SelectField
              {...common}
              path={p("size")}
              label="Bolt size"
              value={typeof callout.size === "string" ? callout.size : ""}
              options={sizeOptions}
              onSelect={(value) => onChange(setOptionalText(callout, "size", value))}
            />
            <SelectField
              {...common}
              path={p("propertyClass")}
              label="Property class"
              value={typeof callout.propertyClass === "string" ? callout.propertyClass : ""}
              options={classOptions}
              hint="Stamped on the bolt head."
              onSelect={(value) => onChange(setOptionalText(callout, "propertyClass", value))}
            />
          </>
        ) : (
          <>
            <TextField
              {...common}
              path={p("size")}
              label="Bolt size (optional)"
              placeholder="M8, 5/16-18"
              value={callout.size}
              maxLength={40}
              onText={(text) => onChange(setOptionalText(callout, "size", text))}
            />
            <TextField
              {...common}
              path={p("propertyClass")}
              label="Property class (optional)"
              placeholder="8.8, 10.9"
              value={callout.propertyClass}
              maxLength={20}
              onText={(text) => onChange(setOptionalText(callout, "propertyClass", text))}
            />
          </>
        )}
        <SelectField
          {...common}
          path={p("lubricated")}
          label="Threads"
          value={callout.lubricated === true ? "lubricated" : callout.lubricated === false ? "dry" : ""}
          options={LUBRICATION}
          hint={estimating && callout.lubricated === undefined ? "Not said: the estimate takes dry threads." : undefined}
          onSelect={(value) => onChange(setField(callout, "lubricated", value === "" ? undefined : value === "lubricated"))}
        />
      </div>
      <TextField
        {...common}
        path={p("threadlocker")}
        label="Threadlocker (optional)"
        placeholder="medium strength, removable"
        value={callout.threadlocker}
        maxLength={200}
        onText={(text) => onChange(setOptionalText(callout, "threadlocker", text))}
      />
      <section aria-label="As readers will see this torque" aria-live="polite" className="rounded-md bg-paper p-3">
        <p className="mb-2 text-xs font-semibold uppercase tracking-wider text-ink-soft">Readers will see</p>
        {preview.kind === "missing" ? (
          <p className="text-sm text-ink-soft" data-testid="torque-missing">
            {preview.words}
          </p>
        ) : (
          <TorqueCallout
            callout={{ ...callout, kind: "torque", fastener: callout.fastener || "Fastener not named yet" }}
            result={
              preview.kind === "value" ? { values: preview.values, estimate: null } : { values: null, estimate: preview.estimate }
            }
          />
        )}
        {origin === "" && preview.kind === "value" ? (
          <p className="mt-2 text-xs text-ink-soft">
            Say where the value comes from: until then readers are told it was not recorded.
          </p>
        ) : null}
      </section>
    </div>
  );
}
