import type { ReactNode } from "react";
import { Form } from "react-router";
import { FieldFrame, Notice, SubmitButton } from "~/components/form";
import { FIRST_MODEL_YEAR, lastModelYear, MAX_BATTERY_RUN_M } from "~/models/catalogue-input";
import { type FormFailure, failureOf } from "~/utils/forms";
import { round } from "~/utils/format";
import {
  BATTERY_LOCATION_LABELS,
  BATTERY_LOCATIONS,
  DRIVETRAINS,
  POWERTRAIN_LABELS,
  POWERTRAINS,
  type BatteryLocation,
  type Powertrain,
} from "~/utils/vocab";
import type { Route } from "./+types/admin.catalogue";
import { catalogueAction, catalogueLoader } from "./admin.catalogue.server";

export const meta: Route.MetaFunction = () => [
  { title: "Vehicle catalogue · Admin · Torqueleaf" },
  { name: "robots", content: "noindex" },
];

export const loader = (args: Route.LoaderArgs) => catalogueLoader(args);
export const action = (args: Route.ActionArgs) => catalogueAction(args);

type Makes = Route.ComponentProps["loaderData"]["makes"];
type Make = Makes[number];
type Model = Make["models"][number];
type Generation = Model["generations"][number];
type Variant = Generation["variants"][number];

const inputClass = (error?: string) =>
  `mt-1 min-h-11 w-full rounded-md border bg-paper px-3 py-2 text-sm ${error ? "border-z-danger" : "border-rule"}`;
const summaryClass =
  "inline-flex min-h-11 cursor-pointer list-none items-center rounded-md border border-rule bg-white px-3 text-sm font-semibold text-spruce-800 hover:bg-paper-deep";

/** The failure for this form (by its key), so only the form that was sent shows its messages and typed values. */
function failureFor(failure: FormFailure | null, formKey: string) {
  return failure?.values?.formKey === formKey ? failure : null;
}

function TextInput({
  form,
  name,
  label,
  value,
  failure,
  type = "text",
  hint,
  required = true,
  ...rest
}: {
  form: string;
  name: string;
  label: string;
  value?: string | number | null;
  failure: FormFailure | null;
  type?: string;
  hint?: string;
  required?: boolean;
  min?: number;
  max?: number;
  step?: string;
  maxLength?: number;
}) {
  const id = `${form}-${name}`;
  const error = failure?.fields?.[name];
  const shown = failure ? (failure.values?.[name] ?? "") : value === null || value === undefined ? "" : String(value);
  return (
    <FieldFrame id={id} label={label} error={error} hint={hint} className="min-w-0">
      {(described) => (
        <input
          id={id}
          name={name}
          type={type}
          defaultValue={shown}
          required={required}
          aria-invalid={error ? true : undefined}
          aria-describedby={described}
          className={inputClass(error)}
          {...rest}
        />
      )}
    </FieldFrame>
  );
}

function SelectInput({
  form,
  name,
  label,
  value,
  failure,
  options,
}: {
  form: string;
  name: string;
  label: string;
  value?: string;
  failure: FormFailure | null;
  options: { value: string; label: string }[];
}) {
  const id = `${form}-${name}`;
  const error = failure?.fields?.[name];
  return (
    <FieldFrame id={id} label={label} error={error} className="min-w-0">
      {(described) => (
        <select
          id={id}
          name={name}
          defaultValue={failure ? (failure.values?.[name] ?? "") : (value ?? "")}
          aria-invalid={error ? true : undefined}
          aria-describedby={described}
          className={inputClass(error)}
        >
          {value === undefined && !failure ? <option value="">Choose…</option> : null}
          {options.map((o) => (
            <option key={o.value} value={o.value}>
              {o.label}
            </option>
          ))}
        </select>
      )}
    </FieldFrame>
  );
}

/** A change form that opens from a button; it opens by itself again when its post was refused. */
function ChangeForm({
  formKey,
  label,
  intent,
  hidden,
  failure,
  submit,
  children,
}: {
  formKey: string;
  label: string;
  intent: string;
  hidden: Record<string, string | number>;
  failure: FormFailure | null;
  submit: string;
  children: ReactNode;
}) {
  const mine = failureFor(failure, formKey);
  return (
    <details open={mine ? true : undefined} className="group">
      <summary className={summaryClass}>{label}</summary>
      <Form method="post" aria-label={label} className="mt-3 rounded-lg border border-rule bg-paper p-3">
        <input type="hidden" name="formKey" value={formKey} />
        {Object.entries(hidden).map(([name, value]) => (
          <input key={name} type="hidden" name={name} value={value} />
        ))}
        {mine ? (
          <div className="mb-3 text-sm font-medium text-z-danger" role="alert">
            {mine.message}
          </div>
        ) : null}
        <div className="grid gap-3 sm:grid-cols-2">{children}</div>
        <div className="mt-3">
          <SubmitButton name="intent" value={intent} tone="quiet">
            {submit}
          </SubmitButton>
        </div>
      </Form>
    </details>
  );
}

const buttonClass = {
  quiet: "border-rule text-spruce-800 hover:bg-paper-deep",
  danger: "border-z-danger/60 text-z-danger hover:bg-z-danger/10",
};

/** A one-click change (retire, offer again, delete): a small outlined button, so the page is not a wall of red. */
function OneButton({
  intent,
  id,
  label,
  tone = "quiet",
  formKey,
}: {
  intent: string;
  id: number;
  label: string;
  tone?: "quiet" | "danger";
  formKey: string;
}) {
  return (
    <Form method="post" className="inline">
      <input type="hidden" name="formKey" value={formKey} />
      <input type="hidden" name="id" value={id} />
      <button
        type="submit"
        name="intent"
        value={intent}
        className={`inline-flex min-h-11 items-center rounded-md border bg-white px-3 text-sm font-semibold ${buttonClass[tone]}`}
      >
        {label}
      </button>
    </Form>
  );
}

const yearsLabel = (first: number, last: number | null) => (last ? `${first}–${last}` : `${first} on`);

const yearHint = `Years from ${FIRST_MODEL_YEAR} to ${lastModelYear()}.`;

function GenerationFields({ form, failure, g }: { form: string; failure: FormFailure | null; g?: Generation }) {
  return (
    <>
      <div className="sm:col-span-2">
        <TextInput form={form} name="name" label="Generation name" value={g?.name} failure={failure} maxLength={40} />
      </div>
      <div className="grid grid-cols-2 gap-3 sm:col-span-2">
        <TextInput
          form={form}
          name="firstYear"
          label="First model year"
          type="number"
          value={g?.firstYear}
          failure={failure}
          min={FIRST_MODEL_YEAR}
          max={lastModelYear()}
        />
        <TextInput
          form={form}
          name="lastYear"
          label="Last model year"
          type="number"
          value={g?.lastYear}
          failure={failure}
          required={false}
          min={FIRST_MODEL_YEAR}
          max={lastModelYear()}
          hint={`Empty while it is still made. ${yearHint}`}
        />
      </div>
    </>
  );
}

function VariantFields({ form, failure, v }: { form: string; failure: FormFailure | null; v?: Variant }) {
  return (
    <>
      <TextInput
        form={form}
        name="name"
        label="Variant name"
        value={v?.name}
        failure={failure}
        maxLength={60}
        hint="Such as “2.0 hybrid AWD”."
      />
      <SelectInput
        form={form}
        name="powertrain"
        label="Powertrain"
        value={v?.powertrain}
        failure={failure}
        options={POWERTRAINS.map((p) => ({ value: p, label: POWERTRAIN_LABELS[p] }))}
      />
      <SelectInput
        form={form}
        name="drivetrain"
        label="Drivetrain"
        value={v?.drivetrain}
        failure={failure}
        options={DRIVETRAINS.map((d) => ({ value: d, label: d }))}
      />
      <SelectInput
        form={form}
        name="batteryLocation"
        label="12 V battery location"
        value={v?.batteryLocation}
        failure={failure}
        options={BATTERY_LOCATIONS.map((b) => ({ value: b, label: BATTERY_LOCATION_LABELS[b] }))}
      />
      <TextInput
        form={form}
        name="batteryRunM"
        label="Battery-to-firewall run (m)"
        type="number"
        step="0.1"
        min={0.1}
        max={MAX_BATTERY_RUN_M}
        value={v?.batteryRunM}
        failure={failure}
        hint="The cable run from the 12 V battery to the firewall pass-through, in metres."
      />
    </>
  );
}

function VariantRow({ v, used, failure }: { v: Variant; used: number; failure: FormFailure | null }) {
  const key = `variant-${v.id}`;
  const mine = failureFor(failure, key);
  const retired = v.retiredAt !== null;
  return (
    <li id={key} className="px-3 py-3">
      <div className="flex flex-wrap items-baseline justify-between gap-x-3 gap-y-1">
        <p className="font-medium">
          {v.name}
          {retired ? (
            <span className="ml-2 rounded bg-paper-deep px-2 py-0.5 text-xs font-semibold uppercase tracking-wider text-ink-soft">
              Retired
            </span>
          ) : null}
        </p>
        <p className="text-sm text-ink-soft">
          {used ? `In the fitment of ${used} ${used === 1 ? "guide" : "guides"}` : "Not used by any guide"}
        </p>
      </div>
      <p className="mt-0.5 text-sm text-ink-soft">
        {POWERTRAIN_LABELS[v.powertrain as Powertrain]} · {v.drivetrain} · 12 V battery:{" "}
        {BATTERY_LOCATION_LABELS[v.batteryLocation as BatteryLocation]} · run to firewall{" "}
        <span className="whitespace-nowrap">{round(v.batteryRunM, 2)} m</span>
      </p>
      {mine && !mine.fields ? (
        <div className="mt-2">
          <Notice tone="error">{mine.message}</Notice>
        </div>
      ) : null}
      <div className="mt-2 flex flex-wrap items-start gap-2">
        <ChangeForm
          formKey={key}
          label="Edit"
          intent="edit-variant"
          hidden={{ id: v.id }}
          failure={mine?.fields ? failure : null}
          submit="Save the variant"
        >
          <VariantFields form={key} failure={mine?.fields ? mine : null} v={v} />
        </ChangeForm>
        {retired ? (
          <OneButton intent="restore-variant" id={v.id} label="Offer again" formKey={key} />
        ) : (
          <OneButton intent="retire-variant" id={v.id} label="Retire" formKey={key} />
        )}
        {/* A variant in some guide's fitment can only be retired; the server refuses a delete too. */}
        {used ? null : <OneButton intent="delete-variant" id={v.id} label="Delete" tone="danger" formKey={key} />}
      </div>
    </li>
  );
}

/** A level's own row: its title, its edit form and its delete button; a refusal shows under it. */
function LevelHead({
  formKey,
  title,
  level,
  editIntent,
  deleteIntent,
  id,
  failure,
  children,
  as: Heading,
  empty,
}: {
  formKey: string;
  title: ReactNode;
  level: string;
  editIntent: string;
  deleteIntent: string;
  id: number;
  failure: FormFailure | null;
  children: ReactNode;
  as: "h2" | "h3" | "h4";
  /** Only an empty level can go; until then the button is not offered (the server refuses it anyway). */
  empty: boolean;
}) {
  const mine = failureFor(failure, formKey);
  const size = { h2: "text-2xl", h3: "text-xl", h4: "text-lg" }[Heading];
  return (
    <div>
      <Heading className={`break-words font-serif font-semibold text-spruce-900 ${size}`}>{title}</Heading>
      {mine && !mine.fields ? (
        <div className="mt-2">
          <Notice tone="error">{mine.message}</Notice>
        </div>
      ) : null}
      <div className="mt-2 flex flex-wrap items-start gap-2">
        <ChangeForm
          formKey={formKey}
          label={`Edit the ${level}`}
          intent={editIntent}
          hidden={{ id }}
          failure={mine?.fields ? failure : null}
          submit={`Save the ${level}`}
        >
          {children}
        </ChangeForm>
        {empty ? <OneButton intent={deleteIntent} id={id} label={`Delete the ${level}`} tone="danger" formKey={formKey} /> : null}
      </div>
    </div>
  );
}

export default function AdminCatalogue({ loaderData, actionData }: Route.ComponentProps) {
  const { makes, used } = loaderData;
  const failure = failureOf(actionData);
  const editFailure = (key: string) => (failure?.values?.formKey === key && failure.fields ? failure : null);

  return (
    <div className="mx-auto max-w-5xl px-4 py-10 sm:px-6">
      <h1 className="font-serif text-3xl font-semibold tracking-tight text-spruce-900 sm:text-4xl">Vehicle catalogue</h1>
      <p className="mt-2 max-w-3xl text-ink-soft">
        The makes, models, generations and variants that guides’ fitment and the Library’s filters name. A variant that a guide’s
        fitment names cannot be deleted: retire it, and it stays on those guides but is offered for no new fitment. Every change
        is kept in the audit log.
      </p>
      {failure && !failure.values?.formKey ? (
        <div className="mt-4">
          <Notice tone="error">{failure.message}</Notice>
        </div>
      ) : null}

      <div className="mt-8 space-y-10">
        {makes.map((make) => {
          const makeKey = `make-${make.id}`;
          return (
            <section
              key={make.id}
              id={makeKey}
              aria-label={make.name}
              className="rounded-xl border border-rule bg-white p-3 shadow-sm sm:p-5"
            >
              <LevelHead
                formKey={makeKey}
                title={make.name}
                level="make"
                editIntent="edit-make"
                deleteIntent="delete-make"
                id={make.id}
                failure={failure}
                as="h2"
                empty={make.models.length === 0}
              >
                <TextInput
                  form={makeKey}
                  name="name"
                  label="Make name"
                  value={make.name}
                  failure={editFailure(makeKey)}
                  maxLength={60}
                />
              </LevelHead>

              <div className="mt-6 space-y-8">
                {make.models.map((model) => {
                  const modelKey = `model-${model.id}`;
                  return (
                    <div key={model.id} id={modelKey} className="border-spruce-100 sm:border-l-4 sm:pl-4">
                      <LevelHead
                        formKey={modelKey}
                        title={
                          <>
                            {make.name} {model.name}
                            {model.bodyStyle ? (
                              <span className="font-sans text-base font-normal text-ink-soft"> · {model.bodyStyle}</span>
                            ) : null}
                          </>
                        }
                        level="model"
                        editIntent="edit-model"
                        deleteIntent="delete-model"
                        id={model.id}
                        failure={failure}
                        as="h3"
                        empty={model.generations.length === 0}
                      >
                        <TextInput
                          form={modelKey}
                          name="name"
                          label="Model name"
                          value={model.name}
                          failure={editFailure(modelKey)}
                          maxLength={60}
                        />
                        <TextInput
                          form={modelKey}
                          name="bodyStyle"
                          label="Body style"
                          value={model.bodyStyle}
                          failure={editFailure(modelKey)}
                          required={false}
                          maxLength={40}
                        />
                      </LevelHead>

                      <div className="mt-4 space-y-6">
                        {model.generations.map((g) => {
                          const genKey = `generation-${g.id}`;
                          return (
                            <div key={g.id} id={genKey} className="rounded-lg border border-rule p-2 sm:p-3">
                              <LevelHead
                                formKey={genKey}
                                title={
                                  <>
                                    {g.name}{" "}
                                    <span className="font-sans text-base font-normal text-ink-soft">
                                      model years {yearsLabel(g.firstYear, g.lastYear)}
                                    </span>
                                  </>
                                }
                                level="generation"
                                editIntent="edit-generation"
                                deleteIntent="delete-generation"
                                id={g.id}
                                failure={failure}
                                as="h4"
                                empty={g.variants.length === 0}
                              >
                                <GenerationFields form={genKey} failure={editFailure(genKey)} g={g} />
                              </LevelHead>
                              {g.variants.length ? (
                                <ul
                                  aria-label={`Variants of ${make.name} ${model.name} ${g.name}`}
                                  className="mt-3 divide-y divide-rule rounded-lg border border-rule"
                                >
                                  {g.variants.map((v) => (
                                    <VariantRow key={v.id} v={v} used={used[v.id] ?? 0} failure={failure} />
                                  ))}
                                </ul>
                              ) : (
                                <p className="mt-3 text-sm text-ink-soft">No variants yet.</p>
                              )}
                              <div className="mt-3">
                                <ChangeForm
                                  formKey={`add-variant-${g.id}`}
                                  label="Add a variant"
                                  intent="add-variant"
                                  hidden={{ generationId: g.id }}
                                  failure={failure}
                                  submit="Add the variant"
                                >
                                  <VariantFields
                                    form={`add-variant-${g.id}`}
                                    failure={failureFor(failure, `add-variant-${g.id}`)}
                                  />
                                </ChangeForm>
                              </div>
                            </div>
                          );
                        })}
                        {model.generations.length === 0 ? <p className="text-sm text-ink-soft">No generations yet.</p> : null}
                        <ChangeForm
                          formKey={`add-generation-${model.id}`}
                          label={`Add a generation of the ${model.name}`}
                          intent="add-generation"
                          hidden={{ modelId: model.id }}
                          failure={failure}
                          submit="Add the generation"
                        >
                          <GenerationFields
                            form={`add-generation-${model.id}`}
                            failure={failureFor(failure, `add-generation-${model.id}`)}
                          />
                        </ChangeForm>
                      </div>
                    </div>
                  );
                })}
                {make.models.length === 0 ? <p className="text-sm text-ink-soft">No models yet.</p> : null}
                <ChangeForm
                  formKey={`add-model-${make.id}`}
                  label={`Add a ${make.name} model`}
                  intent="add-model"
                  hidden={{ makeId: make.id }}
                  failure={failure}
                  submit="Add the model"
                >
                  <TextInput
                    form={`add-model-${make.id}`}
                    name="name"
                    label="Model name"
                    failure={failureFor(failure, `add-model-${make.id}`)}
                    maxLength={60}
                  />
                  <TextInput
                    form={`add-model-${make.id}`}
                    name="bodyStyle"
                    label="Body style"
                    failure={failureFor(failure, `add-model-${make.id}`)}
                    required={false}
                    maxLength={40}
                    hint="Such as “compact SUV” (optional)."
                  />
                </ChangeForm>
              </div>
            </section>
          );
        })}
        {makes.length === 0 ? <p className="text-ink-soft">The catalogue is empty: add the first make below.</p> : null}
        <section aria-label="Add a make" className="rounded-xl border border-dashed border-rule p-4 sm:p-5">
          <ChangeForm formKey="add-make" label="Add a make" intent="add-make" hidden={{}} failure={failure} submit="Add the make">
            <TextInput form="add-make" name="name" label="Make name" failure={failureFor(failure, "add-make")} maxLength={60} />
          </ChangeForm>
        </section>
      </div>
    </div>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/error-page";
