import { useRef, useState } from "react";
import { CautionCallout, SIGNAL_STYLE } from "~/components/callouts";
import { SIGNAL_WORDS, type SignalWord } from "~/engine/callouts";
import { SUPPORT_TEXT } from "~/engine/rules";
import { CALLOUT_KINDS, type CalloutKind } from "~/utils/vocab";
import { asDraft, type DraftCallout, newCallout, setField, signalWordOf } from "./callout-state";
import { CircuitForm } from "./circuit-form";
import { type FieldErrors, fieldId } from "./field-paths";
import {
  addButton,
  ChoiceGroup,
  FieldMessages,
  focusAfterMove,
  RowControls,
  TextField,
  UndoRemoved,
  useFocusAfterChange,
} from "./fields";
import { insertAt, moveItem, removeAt, replaceAt, RowKeys } from "./list-state";
import { TorqueForm } from "./torque-form";

/** The step schema's limit (app/models/guide-input.ts). */
export const MAX_CALLOUTS = 20;

export const KIND_LABELS: Record<CalloutKind, string> = { torque: "Torque", circuit: "Circuit", caution: "Caution", tip: "Tip" };

/**
 * What each signal word is for, in our words after ANSI Z535.6 (which defines the four words by
 * how bad the harm is and how sure it is to happen if the hazard is not avoided).
 */
export const SIGNAL_WORD_HINTS: Record<SignalWord, string> = {
  DANGER: "A hazard that will kill or seriously injure if not avoided.",
  WARNING: "A hazard that could kill or seriously injure if not avoided.",
  CAUTION: "A hazard that could cause minor or moderate injury if not avoided.",
  NOTICE: "No risk of injury: damage to the vehicle, the parts or property.",
};

/** Offered when a step lifts the vehicle and no caution of it mentions stands (rule support-caution-missing). */
export const STANDS_CAUTION = {
  kind: "caution",
  signalWord: "WARNING",
  text: "Raise the vehicle only at the maker's lifting points and support it on rated stands on firm, level ground before you reach under it. Never rely on a jack alone.",
} as const;

export type StepFlags = { liftsVehicle: boolean; disconnectsBattery: boolean };

function kindOf(callout: unknown): CalloutKind | null {
  const kind = asDraft(callout).kind;
  return (CALLOUT_KINDS as readonly unknown[]).includes(kind) ? (kind as CalloutKind) : null;
}

/** Whether the step already carries a caution about supporting the vehicle, as the safety rule reads it. */
export function hasStandsCaution(callouts: readonly unknown[]): boolean {
  return callouts.some((c) => {
    const draft = asDraft(c);
    return draft.kind === "caution" && typeof draft.text === "string" && SUPPORT_TEXT.test(draft.text);
  });
}

/**
 * A step's callouts: add (torque, circuit, caution, tip), edit each in its own form, move, remove
 * (with an undo). Controlled: `callouts` are the API's callout objects and every change hands on
 * the whole new list.
 */
export function CalloutListEditor({
  callouts,
  onChange,
  path,
  errors,
  stepFlags,
}: {
  callouts: unknown[];
  onChange: (next: unknown[]) => void;
  path: string;
  errors: FieldErrors;
  stepFlags: StepFlags;
}) {
  const rowKeys = useRef(new RowKeys()).current;
  const keys = rowKeys.keysFor(callouts);
  const focusLater = useFocusAfterChange();
  const [removed, setRemoved] = useState<{ index: number; callout: unknown } | null>(null);
  const full = callouts.length >= MAX_CALLOUTS;
  const listError = errors[path];
  const removedKind = removed ? kindOf(removed.callout) : null;

  const change = (next: unknown[]) => {
    setRemoved(null);
    onChange(next);
  };
  const add = (callout: unknown) => {
    if (full) return;
    focusLater(fieldId(`${path}.${callouts.length}`));
    change([...callouts, callout]);
  };

  return (
    <section
      id={fieldId(path)}
      tabIndex={-1}
      aria-label="Callouts"
      aria-describedby={listError ? `${fieldId(path)}-error` : undefined}
      className="min-w-0 space-y-3"
    >
      {stepFlags.liftsVehicle && !hasStandsCaution(callouts) ? (
        <div role="note" className="rounded-md border-l-4 border-z-danger bg-red-50 px-3 py-2 text-sm">
          <p>
            This step lifts the vehicle: it needs a caution about supporting it on stands before it can be submitted (rule{" "}
            <code>support-caution-missing</code>, blocking).
          </p>
          <button type="button" className={`${addButton} mt-2`} disabled={full} onClick={() => add({ ...STANDS_CAUTION })}>
            Add a caution about stands
          </button>
        </div>
      ) : null}
      {callouts.length === 0 ? (
        <p className="text-sm text-ink-soft">
          No callouts yet. Add the torque of each fastener, each circuit, and every caution.
        </p>
      ) : null}
      <ol className="space-y-3">
        {callouts.map((raw, index) => {
          const itemPath = `${path}.${index}`;
          const kind = kindOf(raw);
          const name = `callout ${index + 1}`;
          const callout = asDraft(raw);
          const update = (next: DraftCallout) => {
            rowKeys.carry(raw, next);
            change(replaceAt(callouts, index, next));
          };
          const itemError = errors[itemPath] ?? errors[`${itemPath}.kind`];
          return (
            <li key={keys[index]}>
              <fieldset
                id={fieldId(itemPath)}
                tabIndex={-1}
                aria-labelledby={`${fieldId(itemPath)}-title`}
                className="min-w-0 rounded-lg border border-rule bg-white p-3 sm:p-4"
              >
                <div className="mb-3 flex flex-wrap items-center justify-between gap-2">
                  <h4 id={`${fieldId(itemPath)}-title`} className="font-medium">
                    <span className="text-ink-soft">Callout {index + 1}:</span> {kind ? KIND_LABELS[kind] : "Unknown type"}
                  </h4>
                  <RowControls
                    rowId={fieldId(itemPath)}
                    name={name}
                    index={index}
                    count={callouts.length}
                    onMove={(delta) => {
                      focusLater(...focusAfterMove(path, index + delta, delta));
                      change(moveItem(callouts, index, delta));
                    }}
                    onRemove={() => {
                      onChange(removeAt(callouts, index));
                      setRemoved({ index, callout: raw });
                      focusLater(`${fieldId(path)}-undo`, `${fieldId(path)}-add-torque`);
                    }}
                  />
                </div>
                <FieldMessages id={fieldId(itemPath)} error={itemError} />
                {kind === "torque" ? <TorqueForm callout={callout} onChange={update} path={itemPath} errors={errors} /> : null}
                {kind === "circuit" ? (
                  <CircuitForm
                    callout={callout}
                    onChange={update}
                    path={itemPath}
                    errors={errors}
                    disconnectsBattery={stepFlags.disconnectsBattery}
                  />
                ) : null}
                {kind === "caution" ? <CautionForm callout={callout} onChange={update} path={itemPath} errors={errors} /> : null}
                {kind === "tip" ? (
                  <TextField
                    errors={errors}
                    path={`${itemPath}.text`}
                    label="Tip"
                    multiline
                    maxLength={2000}
                    value={callout.text}
                    onText={(text) => update(setField(callout, "text", text))}
                  />
                ) : null}
                {kind === null ? (
                  <p className="text-sm text-ink-soft">This callout is not a torque, circuit, caution or tip; remove it.</p>
                ) : null}
              </fieldset>
            </li>
          );
        })}
      </ol>
      {removed ? (
        <div id={`${fieldId(path)}-undo`} tabIndex={-1}>
          <UndoRemoved
            words={`Removed callout ${removed.index + 1} (${removedKind ? KIND_LABELS[removedKind].toLowerCase() : "unknown type"}).`}
            onUndo={() => {
              focusLater(fieldId(`${path}.${Math.min(removed.index, callouts.length)}`));
              change(insertAt(callouts, removed.index, removed.callout));
            }}
            onDismiss={() => setRemoved(null)}
          />
        </div>
      ) : null}
      <div className="flex flex-wrap items-center gap-2">
        <span className="text-sm font-medium">Add a callout:</span>
        {CALLOUT_KINDS.map((kind) => (
          <button
            key={kind}
            id={`${fieldId(path)}-add-${kind}`}
            type="button"
            className={addButton}
            disabled={full}
            onClick={() => add(newCallout(kind))}
          >
            <span aria-hidden="true">+</span> {KIND_LABELS[kind]}
          </button>
        ))}
      </div>
      {full ? (
        <p className="text-sm text-ink-soft">A step holds at most {MAX_CALLOUTS} callouts: split it into two steps.</p>
      ) : null}
      <FieldMessages id={fieldId(path)} error={listError} />
    </section>
  );
}

function CautionForm({
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
  const word = signalWordOf(callout);
  const text = typeof callout.text === "string" ? callout.text : "";
  return (
    <div className="space-y-4">
      <ChoiceGroup
        errors={errors}
        path={`${path}.signalWord`}
        label="Signal word (ANSI Z535.6)"
        value={word}
        choices={SIGNAL_WORDS.map((w) => ({
          value: w,
          label: (
            <span className={`inline-block rounded px-2 py-0.5 text-xs font-bold tracking-[0.15em] ${SIGNAL_STYLE[w].bar}`}>
              {w}
            </span>
          ),
          hint: SIGNAL_WORD_HINTS[w],
        }))}
        onChoose={(value) => onChange(setField(callout, "signalWord", value))}
      />
      <TextField
        errors={errors}
        path={`${path}.text`}
        label="Caution text"
        multiline
        maxLength={2000}
        value={callout.text}
        hint="Say what the hazard is, what it can do, and how to avoid it. Electrical work on a hybrid, plug-in hybrid or electric variant needs a DANGER or WARNING that names the high-voltage system; an editor signs off every caution."
        onText={(next) => onChange(setField(callout, "text", next))}
      />
      {word && text.trim() ? (
        <div>
          <p className="mb-2 text-xs font-semibold uppercase tracking-wider text-ink-soft">Readers will see</p>
          <CautionCallout signalWord={word} text={text} />
        </div>
      ) : null}
    </div>
  );
}
