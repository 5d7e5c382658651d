import { type ReactNode, useRef, useState } from "react";
import { type FieldErrors, fieldId } from "./field-paths";
import {
  addButton,
  FieldMessages,
  focusAfterMove,
  NumberField,
  type Option,
  RowControls,
  SelectField,
  TextField,
  UndoRemoved,
  useFocusAfterChange,
} from "./fields";
import { insertAt, moveItem, removeAt, replaceAt, RowKeys } from "./list-state";

/** A parts row of the draft (`PUT /api/guides/:id/draft`); `quantity` is absent while what was typed is not a number. */
export type PartRow = {
  name: string;
  quantity?: number;
  partNumber?: string | null;
  notes?: string | null;
  stepIndex?: number | null;
};
export type ToolRow = { name: string };

/** The draft schema's limits (app/models/guide-input.ts). */
export const MAX_PARTS = 200;
export const MAX_TOOLS = 100;

export const newPart = (): PartRow => ({ name: "", quantity: 1, partNumber: "", notes: "", stepIndex: null });
export const newTool = (): ToolRow => ({ name: "" });

/** The step menu: every step by number and title, plus a step the part points at that is gone, so nothing changes unseen. */
export function stepOptions(stepTitles: readonly string[], current: unknown): Option[] {
  const options: Option[] = [
    { value: "", label: "Not tied to a step" },
    ...stepTitles.map((title, i) => ({ value: String(i), label: `Step ${i + 1}${title.trim() ? `: ${title.trim()}` : ""}` })),
  ];
  if (typeof current === "number" && Number.isInteger(current) && current >= stepTitles.length) {
    options.push({ value: String(current), label: `Step ${current + 1} (no longer in the guide)` });
  }
  return options;
}

type ListProps<T> = {
  rows: T[];
  onChange: (next: T[]) => void;
  path: string;
  errors: FieldErrors;
  max: number;
  noun: string;
  empty: string;
  make: () => T;
  renderRow: (row: T, update: (next: T) => void, rowPath: string) => ReactNode;
  /** "card": a title line with the buttons over the fields; "inline": the buttons beside one field from 640 px up. */
  layout: "card" | "inline";
};

/** The list both editors share: rows with move and remove, an undo for the last removal, an add button. */
function RowList<T extends { name: string }>({
  rows,
  onChange,
  path,
  errors,
  max,
  noun,
  empty,
  make,
  renderRow,
  layout,
}: ListProps<T>) {
  const rowKeys = useRef(new RowKeys()).current;
  const keys = rowKeys.keysFor(rows);
  const focusLater = useFocusAfterChange();
  const [removed, setRemoved] = useState<{ index: number; row: T } | null>(null);
  const change = (next: T[]) => {
    setRemoved(null);
    onChange(next);
  };
  const listId = fieldId(path);
  return (
    <div id={listId} tabIndex={-1} aria-describedby={errors[path] ? `${listId}-error` : undefined} className="min-w-0">
      {rows.length === 0 ? <p className="text-sm text-ink-soft">{empty}</p> : null}
      <ol className="space-y-3">
        {rows.map((row, index) => {
          const rowPath = `${path}.${index}`;
          const update = (next: T) => {
            rowKeys.carry(row, next);
            change(replaceAt(rows, index, next));
          };
          const controls = (
            <RowControls
              rowId={fieldId(rowPath)}
              name={`${noun.toLowerCase()} ${index + 1}`}
              index={index}
              count={rows.length}
              onMove={(delta) => {
                focusLater(...focusAfterMove(path, index + delta, delta));
                change(moveItem(rows, index, delta));
              }}
              onRemove={() => {
                onChange(removeAt(rows, index));
                setRemoved({ index, row });
                focusLater(`${listId}-undo`, `${listId}-add`);
              }}
            />
          );
          return (
            <li
              key={keys[index]}
              id={fieldId(rowPath)}
              tabIndex={-1}
              aria-label={`${noun} ${index + 1}`}
              className="min-w-0 rounded-lg border border-rule bg-white p-3"
            >
              {layout === "card" ? (
                <>
                  <div className="mb-1 flex flex-wrap items-center justify-between gap-2">
                    <span className="text-sm font-medium text-ink-soft">
                      {noun} {index + 1}
                    </span>
                    {controls}
                  </div>
                  {renderRow(row, update, rowPath)}
                </>
              ) : (
                <div className="flex flex-col gap-2 sm:flex-row sm:items-start">
                  <div className="min-w-0 flex-1">{renderRow(row, update, rowPath)}</div>
                  {/* Level with the input, under its label, whether or not a message shows below it. */}
                  <div className="sm:pt-6">{controls}</div>
                </div>
              )}
            </li>
          );
        })}
      </ol>
      {removed ? (
        <div id={`${listId}-undo`} tabIndex={-1}>
          <UndoRemoved
            words={`Removed ${noun.toLowerCase()} ${removed.index + 1}${removed.row.name.trim() ? ` (${removed.row.name.trim()})` : ""}.`}
            onUndo={() => change(insertAt(rows, removed.index, removed.row))}
            onDismiss={() => setRemoved(null)}
          />
        </div>
      ) : null}
      <div className="mt-3 flex flex-wrap items-center gap-2">
        <button
          id={`${listId}-add`}
          type="button"
          className={addButton}
          disabled={rows.length >= max}
          onClick={() => {
            focusLater(fieldId(`${path}.${rows.length}.name`));
            change([...rows, make()]);
          }}
        >
          <span aria-hidden="true">+</span> Add a {noun.toLowerCase()}
        </button>
        {rows.length >= max ? <span className="text-sm text-ink-soft">A guide lists at most {max}.</span> : null}
      </div>
      <FieldMessages id={listId} error={errors[path]} />
    </div>
  );
}

/** The guide's parts list: name, quantity, part number, notes, and the step that uses each part. */
export function PartsEditor({
  parts,
  onChange,
  stepTitles,
  path,
  errors,
}: {
  parts: PartRow[];
  onChange: (next: PartRow[]) => void;
  stepTitles: string[];
  path: string;
  errors: FieldErrors;
}) {
  return (
    <RowList
      rows={parts}
      onChange={onChange}
      path={path}
      errors={errors}
      max={MAX_PARTS}
      noun="Part"
      empty="No parts yet. List everything a reader buys: the accessory, wire, fuses, connectors, fixings."
      make={newPart}
      layout="card"
      renderRow={(part, update, rowPath) => (
        <div className="grid grid-cols-[5.5rem_minmax(0,1fr)] gap-3 md:grid-cols-[minmax(0,2fr)_5.5rem_minmax(0,1fr)_minmax(0,1fr)]">
          <TextField
            className="col-span-2 md:col-span-1"
            errors={errors}
            path={`${rowPath}.name`}
            label="Name"
            value={part.name}
            maxLength={160}
            onText={(name) => update({ ...part, name })}
          />
          <NumberField
            errors={errors}
            path={`${rowPath}.quantity`}
            label="Quantity"
            inputMode="numeric"
            value={part.quantity}
            onValue={(quantity) => {
              const { quantity: _old, ...rest } = part;
              update(quantity === undefined ? rest : { ...rest, quantity });
            }}
          />
          <TextField
            errors={errors}
            path={`${rowPath}.partNumber`}
            label="Part number"
            value={part.partNumber ?? ""}
            maxLength={80}
            onText={(partNumber) => update({ ...part, partNumber })}
          />
          <SelectField
            className="col-span-2 md:col-span-1"
            errors={errors}
            path={`${rowPath}.stepIndex`}
            label="Used in"
            value={typeof part.stepIndex === "number" ? String(part.stepIndex) : ""}
            options={stepOptions(stepTitles, part.stepIndex)}
            onSelect={(value) => update({ ...part, stepIndex: value === "" ? null : Number(value) })}
          />
          <TextField
            className="col-span-2 md:col-span-4"
            errors={errors}
            path={`${rowPath}.notes`}
            label="Notes"
            value={part.notes ?? ""}
            maxLength={500}
            onText={(notes) => update({ ...part, notes })}
          />
        </div>
      )}
    />
  );
}

/** The guide's tools list. */
export function ToolsEditor({
  tools,
  onChange,
  path,
  errors,
}: {
  tools: ToolRow[];
  onChange: (next: ToolRow[]) => void;
  path: string;
  errors: FieldErrors;
}) {
  return (
    <RowList
      rows={tools}
      onChange={onChange}
      path={path}
      errors={errors}
      max={MAX_TOOLS}
      noun="Tool"
      empty="No tools yet. Name sizes where they matter: “10 mm socket”, “torque wrench, 5–60 N·m”."
      make={newTool}
      layout="inline"
      renderRow={(tool, update, rowPath) => (
        <TextField
          errors={errors}
          path={`${rowPath}.name`}
          label="Tool"
          value={tool.name}
          maxLength={160}
          onText={(name) => update({ ...tool, name })}
        />
      )}
    />
  );
}
