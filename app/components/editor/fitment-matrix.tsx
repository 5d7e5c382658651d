import { useState } from "react";
import { FitmentBadge } from "~/components/fitment";
import { BATTERY_LOCATION_LABELS, FITMENT_LABELS, FITMENT_STATUSES, type FitmentStatus, POWERTRAIN_LABELS } from "~/utils/vocab";
import { type FieldErrors, fieldId } from "./field-paths";
import { ChoiceGroup, FieldMessages, type Option, SelectField, smallButton, TextField } from "./fields";
import {
  type CatalogueMake,
  type CatalogueVariant,
  type FitmentChoice,
  type FitmentValue,
  type GenerationPick,
  changePick,
  choiceOf,
  initialPick,
  NOTE_REQUIRED,
  type PlacedVariant,
  pickedGeneration,
  pickOf,
  setFitmentNote,
  setFitmentStatus,
  typicalRuns,
  variantIndex,
  yearsWords,
} from "./fitment-state";
import { removeAt } from "./list-state";

const CHOICES: { value: FitmentChoice; label: string }[] = [
  ...FITMENT_STATUSES.map((s) => ({ value: s, label: FITMENT_LABELS[s] })),
  { value: "not-listed", label: "Not listed" },
];

const NOTE_LABEL: Record<FitmentStatus, string> = {
  fits: "Note (optional)",
  "fits-with-changes": "What has to change (required)",
  "does-not-fit": "Why it does not fit (optional)",
};

/** "in the cargo area", "under a seat": the vocabulary's label with the preposition it needs. */
export function batteryWhere(variant: Pick<CatalogueVariant, "batteryLocation">): string {
  const label = BATTERY_LOCATION_LABELS[variant.batteryLocation] ?? variant.batteryLocation;
  return variant.batteryLocation === "under-seat" ? label : `in the ${label}`;
}

function variantWords(variant: CatalogueVariant): string {
  return `${variant.name} · ${POWERTRAIN_LABELS[variant.powertrain] ?? variant.powertrain} ${variant.drivetrain}`;
}

/**
 * The guide's fitment: pick make → model → generation, then mark each variant of it. Rows chosen
 * for other generations stay listed below with a remove button. Controlled: `value` is the draft's
 * fitment array; a variant with no row is "not listed".
 */
export function FitmentMatrixEditor({
  catalogue,
  value,
  onChange,
  path,
  errors,
}: {
  catalogue: CatalogueMake[];
  value: FitmentValue[];
  onChange: (next: FitmentValue[]) => void;
  path: string;
  errors: FieldErrors;
}) {
  const [pick, setPick] = useState<GenerationPick>(() => initialPick(catalogue, value));
  // A note of a row set to "not listed", given back if the row is listed again.
  const [notes, setNotes] = useState<Record<number, string | null | undefined>>({});
  const index = variantIndex(catalogue);
  const make = catalogue.find((m) => m.slug === pick.make);
  const model = make?.models.find((m) => m.slug === pick.model);
  const generation = pickedGeneration(catalogue, pick);
  const shown = new Set(generation?.variants.map((v) => v.id) ?? []);
  const elsewhere = value.map((row, i) => ({ row, i })).filter(({ row }) => !shown.has(row.variantId));
  const listError = errors[path];

  const choose = (variantId: number, choice: FitmentChoice) => {
    const next = setFitmentStatus(value, variantId, choice, notes[variantId]);
    if (choice === "not-listed") setNotes({ ...notes, [variantId]: next.removedNote });
    onChange(next.value);
  };
  const pickSelect = (level: keyof GenerationPick, label: string, options: Option[], placeholder: string) => (
    <SelectField
      errors={{}}
      path={`${path}.pick.${level}`}
      label={label}
      value={pick[level]}
      options={[{ value: "", label: placeholder }, ...options]}
      onSelect={(slug) => setPick(changePick(catalogue, pick, level, slug))}
    />
  );

  return (
    <section
      id={fieldId(path)}
      tabIndex={-1}
      aria-label="Fitment"
      aria-describedby={listError ? `${fieldId(path)}-error` : undefined}
      className="min-w-0 space-y-4"
    >
      <FieldMessages id={fieldId(path)} error={listError} />
      {catalogue.length === 0 ? (
        <p className="text-sm text-ink-soft">The vehicle catalogue is empty: an admin adds makes, models and variants first.</p>
      ) : (
        <div className="grid gap-3 sm:grid-cols-3">
          {pickSelect(
            "make",
            "Make",
            catalogue.map((m) => ({ value: m.slug, label: m.name })),
            "Choose a make",
          )}
          {pickSelect(
            "model",
            "Model",
            (make?.models ?? []).map((m) => ({ value: m.slug, label: m.bodyStyle ? `${m.name} (${m.bodyStyle})` : m.name })),
            make ? "Choose a model" : "Choose a make first",
          )}
          {pickSelect(
            "generation",
            "Generation",
            (model?.generations ?? []).map((g) => ({ value: g.slug, label: `${g.name} (${yearsWords(g)})` })),
            model ? "Choose a generation" : "Choose a model first",
          )}
        </div>
      )}

      {generation && make && model ? (
        <div>
          <h3 className="font-medium">
            {make.name} {model.name} {generation.name}{" "}
            <span className="font-normal text-ink-soft">({yearsWords(generation)})</span>
          </h3>
          {generation.variants.length === 0 ? (
            <p className="mt-2 text-sm text-ink-soft">This generation has no variants in the catalogue yet.</p>
          ) : (
            <ul className="mt-2 space-y-3">
              {generation.variants.map((variant) => (
                <VariantRow
                  key={variant.id}
                  variant={variant}
                  value={value}
                  path={path}
                  errors={errors}
                  onChoose={(choice) => choose(variant.id, choice)}
                  onNote={(note) => onChange(setFitmentNote(value, variant.id, note))}
                />
              ))}
            </ul>
          )}
          <p className="mt-2 text-xs text-ink-soft">
            Typical runs are planning figures from where the 12 V battery sits (common practice: wires follow the body, not a
            straight line). Circuit callouts take the length you measured.
          </p>
        </div>
      ) : null}

      {elsewhere.length ? (
        <div>
          <h3 className="text-sm font-semibold">{generation ? "Listed for other vehicles" : "Listed so far"}</h3>
          <ul className="mt-2 divide-y divide-rule/70 rounded-lg border border-rule bg-white">
            {elsewhere.map(({ row, i }) => (
              <SummaryRow
                key={`${row.variantId}-${i}`}
                row={row}
                index={i}
                placed={index.get(row.variantId) ?? null}
                path={path}
                errors={errors}
                onOpen={(placed) => setPick(pickOf(placed))}
                onRemove={() => onChange(removeAt(value, i))}
              />
            ))}
          </ul>
        </div>
      ) : value.length === 0 ? (
        <p className="text-sm text-ink-soft">
          No variants listed yet: a guide needs at least one fitment row before it is submitted.
        </p>
      ) : null}
    </section>
  );
}

function VariantRow({
  variant,
  value,
  path,
  errors,
  onChoose,
  onNote,
}: {
  variant: CatalogueVariant;
  value: FitmentValue[];
  path: string;
  errors: FieldErrors;
  onChoose: (choice: FitmentChoice) => void;
  onNote: (note: string) => void;
}) {
  const i = value.findIndex((row) => row.variantId === variant.id);
  const row = i >= 0 ? value[i] : null;
  const rowPath = row ? `${path}.${i}` : `${path}.variant-${variant.id}`;
  const choice = choiceOf(value, variant.id);
  const runs = typicalRuns(variant);
  const needsNote = row?.status === "fits-with-changes" && !(row.note ?? "").trim();
  return (
    <li id={fieldId(rowPath)} tabIndex={-1} className="rounded-lg border border-rule bg-white p-3">
      <p className="font-medium">{variantWords(variant)}</p>
      <p className="mt-0.5 text-sm text-ink-soft" data-testid={`battery-${variant.id}`}>
        12&nbsp;V battery {batteryWhere(variant)}, {variant.batteryRunM}&nbsp;m to the firewall. Typical one-way run:{" "}
        {runs.map((r, n) => (
          <span key={r.place} className="whitespace-nowrap">
            {n ? " · " : ""}
            {r.words} {r.metres}&nbsp;m
          </span>
        ))}
        .
      </p>
      <ChoiceGroup
        className="mt-2"
        errors={errors}
        path={`${rowPath}.status`}
        label={<span className="sr-only">Fitment of {variant.name}</span>}
        value={choice}
        columns="grid-cols-2 sm:grid-cols-4"
        choices={CHOICES}
        onChoose={(next) => onChoose(next as FitmentChoice)}
      />
      <FieldMessages id={fieldId(`${rowPath}.variantId`)} error={errors[`${rowPath}.variantId`]} />
      {row ? (
        <TextField
          className="mt-2"
          errors={errors}
          path={`${rowPath}.note`}
          label={NOTE_LABEL[row.status] ?? "Note"}
          value={row.note ?? ""}
          maxLength={500}
          localError={needsNote ? NOTE_REQUIRED : null}
          onText={onNote}
        />
      ) : null}
    </li>
  );
}

function SummaryRow({
  row,
  index,
  placed,
  path,
  errors,
  onOpen,
  onRemove,
}: {
  row: FitmentValue;
  index: number;
  placed: PlacedVariant | null;
  path: string;
  errors: FieldErrors;
  onOpen: (placed: PlacedVariant) => void;
  onRemove: () => void;
}) {
  const rowPath = `${path}.${index}`;
  const name = placed
    ? `${placed.make.name} ${placed.model.name} ${placed.generation.name} ${placed.variant.name}`
    : `Variant ${row.variantId}`;
  const rowErrors = Object.entries(errors).filter(([key]) => key === rowPath || key.startsWith(`${rowPath}.`));
  const needsNote = row.status === "fits-with-changes" && !(row.note ?? "").trim();
  return (
    <li id={fieldId(rowPath)} tabIndex={-1} className="flex flex-wrap items-center gap-2 px-3 py-2 text-sm">
      <div className="min-w-0 flex-1">
        <p className="flex flex-wrap items-center gap-2">
          <span className="font-medium">{name}</span>
          {placed ? (
            <FitmentBadge
              row={{
                variantId: row.variantId,
                make: placed.make.name,
                model: placed.model.name,
                generation: placed.generation.name,
                powertrain: placed.variant.powertrain,
                drivetrain: placed.variant.drivetrain,
                status: row.status,
                note: row.note,
              }}
            />
          ) : (
            <span className="text-ink-soft">({FITMENT_LABELS[row.status] ?? row.status}; no longer in the catalogue)</span>
          )}
        </p>
        {row.note ? <p className="mt-0.5 text-ink-soft">{row.note}</p> : null}
        {rowErrors.map(([key, message]) => (
          <p key={key} className="mt-0.5 font-medium text-z-danger">
            {message}
          </p>
        ))}
        {needsNote && rowErrors.length === 0 ? <p className="mt-0.5 font-medium text-z-danger">{NOTE_REQUIRED}</p> : null}
      </div>
      {placed ? (
        <button type="button" className={smallButton} onClick={() => onOpen(placed)} aria-label={`Edit ${name}`}>
          Edit
        </button>
      ) : null}
      <button
        type="button"
        className={`${smallButton} text-z-danger`}
        onClick={onRemove}
        aria-label={`Remove ${name} from the fitment`}
      >
        Remove
      </button>
    </li>
  );
}
