import { type ReactNode, useEffect, useRef, useState } from "react";
import { parseDecimal } from "~/components/planner-form";
import { type FieldErrors, fieldId } from "./field-paths";

/** The planner's input look, so the editor and the planner read as one app; 44 px tall for a thumb. */
export const inputClass =
  "mt-1 block min-h-11 w-full min-w-0 rounded-md border border-rule bg-paper px-3 py-2 text-base sm:text-sm aria-[invalid=true]:border-z-danger";
export const smallButton =
  "inline-flex min-h-11 min-w-11 items-center justify-center rounded-md border border-rule bg-white px-3 text-sm font-medium text-spruce-800 hover:bg-paper-deep disabled:cursor-not-allowed disabled:opacity-40";
export const addButton =
  "inline-flex min-h-11 items-center justify-center gap-1 rounded-md border border-spruce-200 bg-spruce-50 px-3 text-sm font-semibold text-spruce-800 hover:bg-spruce-100 disabled:cursor-not-allowed disabled:opacity-50";

/** Longest text kept in a number input: more than any value the schemas accept needs. */
export const NUMBER_TEXT_MAX = 40;

type Described = { id: string; error?: string | null; hint?: ReactNode };

function describedBy({ id, error, hint }: Described): string | undefined {
  return [error ? `${id}-error` : null, hint ? `${id}-hint` : null].filter(Boolean).join(" ") || undefined;
}

export function FieldMessages({ id, error, hint }: Described) {
  return (
    <>
      {hint ? (
        <p id={`${id}-hint`} className="mt-1 text-xs text-ink-soft">
          {hint}
        </p>
      ) : null}
      {error ? (
        <p id={`${id}-error`} className="mt-1 text-sm font-medium text-z-danger">
          {error}
        </p>
      ) : null}
    </>
  );
}

type Base = {
  /** The field's full dotted path: its errors key and, dots as dashes, its id. */
  path: string;
  label: ReactNode;
  errors: FieldErrors;
  hint?: ReactNode;
  /** A message of the component's own (shown when the errors give none for this path). */
  localError?: string | null;
  /** Hide the label on wide screens, where a table header names the column. */
  labelClass?: string;
  className?: string;
};

function useField({ path, errors, localError, hint }: Pick<Base, "path" | "errors" | "localError" | "hint">) {
  const id = fieldId(path);
  const error = errors[path] ?? localError ?? null;
  return {
    id,
    error,
    hint,
    aria: { "aria-invalid": error ? true : undefined, "aria-describedby": describedBy({ id, error, hint }) },
  };
}

export function TextField({
  value,
  onText,
  maxLength,
  multiline = false,
  placeholder,
  ...base
}: Base & { value: unknown; onText: (text: string) => void; maxLength: number; multiline?: boolean; placeholder?: string }) {
  const { id, error, hint, aria } = useField(base);
  const text = typeof value === "string" ? value : "";
  const common = {
    id,
    value: text,
    maxLength,
    placeholder,
    className: inputClass,
    onChange: (event: { target: { value: string } }) => onText(event.target.value.slice(0, maxLength)),
    ...aria,
  };
  return (
    <div className={`min-w-0 ${base.className ?? ""}`}>
      <label htmlFor={id} className={`block text-sm font-medium ${base.labelClass ?? ""}`}>
        {base.label}
      </label>
      {multiline ? <textarea {...common} rows={3} /> : <input {...common} type="text" autoComplete="off" />}
      <FieldMessages id={id} error={error} hint={hint} />
    </div>
  );
}

/** What a number input shows for a value it was given. */
export function numberText(value: unknown): string {
  if (typeof value === "number" && Number.isFinite(value)) return String(value);
  return typeof value === "string" ? value : "";
}

/** Text → the number it means, undefined for nothing typed, "invalid" for text that is not a plain decimal. */
export function readNumber(text: string): number | undefined | "invalid" {
  const parsed = parseDecimal(text);
  if (parsed === undefined) return undefined;
  return typeof parsed === "number" && Number.isFinite(parsed) ? parsed : "invalid";
}

/**
 * A number input that keeps what the person typed ("2.", "1,5", "abc") while the value it hands on
 * is only ever a number or nothing. A new value from outside (a unit conversion, the server's
 * copy) replaces the text unless the text already means that value.
 */
export function NumberField({
  value,
  onValue,
  placeholder,
  inputMode = "decimal",
  ...base
}: Base & {
  value: unknown;
  onValue: (value: number | undefined) => void;
  placeholder?: string;
  inputMode?: "decimal" | "numeric";
}) {
  const [text, setText] = useState(() => numberText(value));
  const [seen, setSeen] = useState<unknown>(value);
  if (!Object.is(seen, value)) {
    setSeen(value);
    const meant = readNumber(text);
    if (!(typeof value === "number" && meant === value) && !(value === undefined && meant === "invalid")) {
      setText(numberText(value));
    }
  }
  const typedWrong = readNumber(text) === "invalid";
  const localError = typedWrong ? "Type a number, such as 25 or 2.5" : base.localError;
  const { id, error, hint, aria } = useField({ ...base, localError });
  return (
    <div className={`min-w-0 ${base.className ?? ""}`}>
      <label htmlFor={id} className={`block text-sm font-medium ${base.labelClass ?? ""}`}>
        {base.label}
      </label>
      <input
        id={id}
        type="text"
        inputMode={inputMode}
        autoComplete="off"
        value={text}
        maxLength={NUMBER_TEXT_MAX}
        placeholder={placeholder}
        className={inputClass}
        onChange={(event) => {
          const next = event.target.value.slice(0, NUMBER_TEXT_MAX);
          const meant = readNumber(next);
          const number = typeof meant === "number" ? meant : undefined;
          setText(next);
          setSeen(number);
          onValue(number);
        }}
        {...aria}
      />
      <FieldMessages id={id} error={error} hint={hint} />
    </div>
  );
}

export type Option = { value: string; label: string };

export function SelectField({
  value,
  options,
  onSelect,
  ...base
}: Base & { value: string; options: readonly Option[]; onSelect: (value: string) => void }) {
  const { id, error, hint, aria } = useField(base);
  return (
    <div className={`min-w-0 ${base.className ?? ""}`}>
      <label htmlFor={id} className={`block text-sm font-medium ${base.labelClass ?? ""}`}>
        {base.label}
      </label>
      <select id={id} value={value} className={inputClass} onChange={(event) => onSelect(event.target.value)} {...aria}>
        {options.map((o) => (
          <option key={o.value} value={o.value}>
            {o.label}
          </option>
        ))}
      </select>
      <FieldMessages id={id} error={error} hint={hint} />
    </div>
  );
}

export function CheckField({ checked, onCheck, ...base }: Base & { checked: boolean; onCheck: (checked: boolean) => void }) {
  const { id, error, hint, aria } = useField(base);
  return (
    <div className={`min-w-0 ${base.className ?? ""}`}>
      <label htmlFor={id} className="flex min-h-11 items-center gap-3 text-sm">
        <input
          id={id}
          type="checkbox"
          checked={checked}
          onChange={(event) => onCheck(event.target.checked)}
          className="size-5 shrink-0 accent-spruce-700"
          {...aria}
        />
        {base.label}
      </label>
      <FieldMessages id={id} error={error} hint={hint} />
    </div>
  );
}

export type Choice = { value: string; label: ReactNode; hint?: ReactNode };

/**
 * A group of radio buttons, each a 44 px target with its label beside it. The group carries the
 * field's id, so a jump to it lands on the chosen (or the first) choice.
 */
export function ChoiceGroup({
  value,
  choices,
  onChoose,
  columns = "sm:grid-cols-2",
  ...base
}: Base & { value: string | undefined; choices: readonly Choice[]; onChoose: (value: string) => void; columns?: string }) {
  const { id, error, hint } = useField(base);
  return (
    <fieldset
      id={id}
      className={`min-w-0 ${base.className ?? ""}`}
      aria-invalid={error ? true : undefined}
      aria-describedby={describedBy({ id, error, hint })}
    >
      <legend className={`text-sm font-medium ${base.labelClass ?? ""}`}>{base.label}</legend>
      <div className={`mt-1 grid gap-2 ${columns}`}>
        {choices.map((choice) => {
          const choiceId = `${id}-${choice.value}`;
          const on = value === choice.value;
          return (
            <label
              key={choice.value}
              htmlFor={choiceId}
              className={`flex min-h-11 cursor-pointer items-start gap-3 rounded-md border px-3 py-2 text-sm ${on ? "border-spruce-500 bg-spruce-50" : "border-rule bg-white"} ${error ? "border-z-danger" : ""}`}
            >
              <input
                id={choiceId}
                type="radio"
                name={id}
                value={choice.value}
                checked={on}
                onChange={() => onChoose(choice.value)}
                className="mt-0.5 size-5 shrink-0 accent-spruce-700"
              />
              <span className="min-w-0">
                <span className="block font-medium">{choice.label}</span>
                {choice.hint ? <span className="mt-0.5 block text-xs text-ink-soft">{choice.hint}</span> : null}
              </span>
            </label>
          );
        })}
      </div>
      <FieldMessages id={id} error={error} hint={hint} />
    </fieldset>
  );
}

/**
 * Move up, move down and remove for one row of a list. `name` says which row ("callout 2"), so a
 * screen reader hears which one each button acts on. After a move the focus follows the row.
 */
export function RowControls({
  rowId,
  name,
  index,
  count,
  onMove,
  onRemove,
}: {
  rowId: string;
  name: string;
  index: number;
  count: number;
  onMove: (delta: -1 | 1) => void;
  onRemove: () => void;
}) {
  return (
    <div className="flex shrink-0 flex-wrap gap-1">
      <button
        id={`${rowId}-up`}
        type="button"
        className={smallButton}
        disabled={index === 0}
        aria-label={`Move ${name} up`}
        onClick={() => onMove(-1)}
      >
        <span aria-hidden="true">↑</span>
      </button>
      <button
        id={`${rowId}-down`}
        type="button"
        className={smallButton}
        disabled={index === count - 1}
        aria-label={`Move ${name} down`}
        onClick={() => onMove(1)}
      >
        <span aria-hidden="true">↓</span>
      </button>
      <button
        id={`${rowId}-remove`}
        type="button"
        className={`${smallButton} text-z-danger`}
        aria-label={`Remove ${name}`}
        onClick={onRemove}
      >
        Remove
      </button>
    </div>
  );
}

/**
 * After a row moves, its buttons are re-rendered under new ids: this gives the focus to the moved
 * row's button (or, at an end of the list where that button is disabled, to its other one).
 */
export function useFocusAfterChange() {
  const pending = useRef<string[] | null>(null);
  useEffect(() => {
    const ids = pending.current;
    if (!ids) return;
    pending.current = null;
    for (const id of ids) {
      const element = document.getElementById(id);
      if (element && !(element as HTMLButtonElement).disabled) {
        element.focus();
        return;
      }
    }
  });
  return (...ids: string[]) => {
    pending.current = ids;
  };
}

/** The row's id and the ids to focus after it moved to `to`. */
export function focusAfterMove(listPath: string, to: number, delta: -1 | 1): string[] {
  const rowId = fieldId(`${listPath}.${to}`);
  return delta < 0 ? [`${rowId}-up`, `${rowId}-down`] : [`${rowId}-down`, `${rowId}-up`];
}

/** An "Undo" offer after a row was removed; kept by the list until the next change. */
export function UndoRemoved({ words, onUndo, onDismiss }: { words: string; onUndo: () => void; onDismiss: () => void }) {
  return (
    <div
      role="status"
      className="mt-3 flex flex-wrap items-center gap-2 rounded-md border-l-4 border-brass-500 bg-brass-50 px-3 py-1 text-sm"
    >
      <span className="min-w-0 flex-1">{words}</span>
      <button type="button" className={smallButton} onClick={onUndo}>
        Undo
      </button>
      <button type="button" className={smallButton} onClick={onDismiss} aria-label="Dismiss">
        <span aria-hidden="true">✕</span>
      </button>
    </div>
  );
}
