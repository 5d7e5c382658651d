import { useEffect, useRef, useState } from "react";
import { useFetcher } from "react-router";
import type { ChecklistView } from "~/models/checklist-input";
import { CHECKLIST_LIMITS } from "~/models/checklist-input";
import type { FormFailure } from "~/utils/forms";
import { isQueuedAnswer, QUEUED_TEXT } from "~/utils/offline-checklist";

type Item = ChecklistView["items"][number];
type Answer = { ok: true; text: string | null } | FormFailure;

export function Progress({ checked, total, label }: { checked: number; total: number; label: string }) {
  const percent = total === 0 ? 0 : Math.round((checked / total) * 100);
  return (
    <div className="mt-2">
      <p className="text-sm text-ink-soft">
        {checked} of {total} ticked
      </p>
      <progress
        className="mt-1 block h-2 w-full appearance-none overflow-hidden rounded-full bg-paper-deep print:hidden [&::-moz-progress-bar]:bg-spruce-700 [&::-webkit-progress-bar]:bg-paper-deep [&::-webkit-progress-value]:bg-spruce-700"
        value={checked}
        max={Math.max(total, 1)}
        aria-label={`${label}: ${percent} % ticked`}
      />
    </div>
  );
}

/** True once the page runs in the browser: fetcher forms then say so, and get data back instead of a redirect. */
export function useHydrated() {
  const [hydrated, setHydrated] = useState(false);
  useEffect(() => setHydrated(true), []);
  return hydrated;
}

function Via() {
  return useHydrated() ? <input type="hidden" name="via" value="fetcher" /> : null;
}

const failureOf = (answer: unknown) => {
  const a = answer as Answer | undefined;
  return a && a.ok === false ? a : null;
};

function Failed({ failure }: { failure: FormFailure | null }) {
  if (!failure) return null;
  const fields = Object.values(failure.fields ?? {});
  return (
    <p role="alert" className="mt-1 text-sm font-medium text-z-danger">
      Not saved: {fields.length ? fields.join(" ") : failure.message}
    </p>
  );
}

const button =
  "inline-flex min-h-11 min-w-11 items-center justify-center rounded-md border border-rule px-3 text-sm font-medium text-spruce-800 hover:bg-paper-deep";

/**
 * One item: the tick answers at once (the fetcher's own form data is shown until the server has
 * it; a refusal or a lost connection with nothing to queue it puts the tick back and says so), and
 * quantity and note save from a small form beneath. Without signal the service worker queues the
 * change: the row keeps it and says it is on this device (`queued`, the reader's changes not yet
 * sent, are already applied to `item`). Without JavaScript the same forms post and the page comes back.
 */
export function ChecklistItemRow({ item, queued = false, onQueued }: { item: Item; queued?: boolean; onQueued?: () => void }) {
  const tick = useFetcher<Answer>({ key: `tick-${item.id}` });
  const edit = useFetcher<Answer>({ key: `edit-${item.id}` });
  const remove = useFetcher<Answer>({ key: `remove-${item.id}` });
  // The answer to a change the worker queued: shown until the page's list of queued changes has it.
  const tickQueued = tick.state === "idle" && isQueuedAnswer(tick.data) ? tick.data.change : null;
  const editQueued = edit.state === "idle" && isQueuedAnswer(edit.data) ? edit.data.change : null;
  useEffect(() => {
    if (isQueuedAnswer(tick.data) || isQueuedAnswer(edit.data)) onQueued?.();
  }, [tick.data, edit.data, onQueued]);
  const pendingTick = tick.formData?.get("checked");
  const checked = pendingTick ? pendingTick === "true" : (tickQueued?.checked ?? item.checked);
  const pendingEdit = edit.formData;
  const quantity = pendingEdit ? Number(pendingEdit.get("quantity")) || item.quantity : (editQueued?.quantity ?? item.quantity);
  const note = pendingEdit ? String(pendingEdit.get("note") ?? "") : (editQueued?.note ?? item.note ?? "");
  const failure = tick.state === "idle" ? failureOf(tick.data) : null;
  const editFailure = edit.state === "idle" ? failureOf(edit.data) : null;
  const removeFailure = remove.state === "idle" ? failureOf(remove.data) : null;
  const canRemove = item.own || item.removed;
  if (remove.state !== "idle") return null;
  return (
    <li className={`flex items-start gap-3 py-3 ${item.removed ? "text-ink-soft" : ""}`} data-item={item.id}>
      <tick.Form method="post" className="shrink-0">
        <Via />
        <input type="hidden" name="intent" value="tick" />
        <input type="hidden" name="itemId" value={item.id} />
        <input type="hidden" name="checked" value={String(!checked)} />
        <button
          type="submit"
          aria-pressed={checked}
          className={`grid size-11 place-items-center rounded-md border-2 text-xl font-bold ${checked ? "border-spruce-700 bg-spruce-700 text-paper" : "border-spruce-700 bg-white text-transparent"}`}
        >
          <span aria-hidden="true">✓</span>
          <span className="sr-only">Ticked off: {item.name}</span>
        </button>
      </tick.Form>
      <div className="min-w-0 flex-1">
        <p className={`break-words font-medium ${checked ? "line-through decoration-2" : ""}`}>
          <span className="font-mono tabular-nums text-ink-soft">{quantity}×</span> {item.name}
        </p>
        <p className="text-xs text-ink-soft">
          {[
            item.kind === "tool" ? "Tool" : item.own ? "Your own item" : "Part",
            item.partNumber ? `no. ${item.partNumber}` : null,
            item.step ? `step ${item.step}` : null,
            item.removed ? "no longer in the guide" : null,
          ]
            .filter(Boolean)
            .join(" · ")}
        </p>
        {note ? <p className="mt-1 break-words text-sm">{note}</p> : null}
        {queued || tickQueued || editQueued ? (
          <p role="status" className="mt-1 text-sm text-brass-700">
            {QUEUED_TEXT}
          </p>
        ) : null}
        <Failed failure={failure} />
        <Failed failure={editFailure} />
        <Failed failure={removeFailure} />
        <details className="mt-1 print:hidden" open={!!editFailure}>
          <summary className="inline-flex min-h-11 cursor-pointer items-center text-sm text-spruce-700 underline">
            Quantity and note
          </summary>
          <edit.Form method="post" className="mt-2 flex flex-wrap items-end gap-3">
            <Via />
            <input type="hidden" name="intent" value="item" />
            <input type="hidden" name="itemId" value={item.id} />
            <label className="flex flex-col text-sm">
              Quantity
              <input
                type="number"
                name="quantity"
                min={1}
                max={CHECKLIST_LIMITS.quantity}
                defaultValue={item.quantity}
                required
                className="mt-1 min-h-11 w-24 rounded-md border border-rule px-2"
              />
            </label>
            <label className="flex min-w-0 flex-1 basis-48 flex-col text-sm">
              Note
              <input
                type="text"
                name="note"
                maxLength={CHECKLIST_LIMITS.note}
                defaultValue={item.note ?? ""}
                className="mt-1 min-h-11 w-full rounded-md border border-rule px-2"
              />
            </label>
            <button type="submit" className={button}>
              Save
            </button>
          </edit.Form>
          {canRemove ? (
            <remove.Form method="post" className="mt-2">
              <Via />
              <input type="hidden" name="intent" value="remove" />
              <input type="hidden" name="itemId" value={item.id} />
              <button type="submit" className={button}>
                Remove from the checklist
              </button>
            </remove.Form>
          ) : null}
        </details>
      </div>
    </li>
  );
}

/** The reader's own item: shown at once as it is sent, the form emptied; a refusal keeps what was typed. */
export function AddItemForm({ posted }: { posted: FormFailure | null }) {
  const add = useFetcher<Answer>({ key: "add-item" });
  const form = useRef<HTMLFormElement>(null);
  // A refusal comes back to the fetcher, or (without JavaScript) to the page as its action's answer.
  const failure = (add.state === "idle" ? failureOf(add.data) : null) ?? posted;
  const pending = add.formData?.get("name");
  useEffect(() => {
    if (add.state === "idle" && add.data?.ok) form.current?.reset();
  }, [add.state, add.data]);
  return (
    <div className="print:hidden">
      {pending ? (
        <p className="py-2 text-ink-soft" aria-live="polite">
          Adding {String(pending)}…
        </p>
      ) : null}
      <add.Form ref={form} method="post" className="mt-2 flex flex-wrap items-end gap-3" noValidate>
        <Via />
        <input type="hidden" name="intent" value="add" />
        <label className="flex min-w-0 flex-1 basis-48 flex-col text-sm">
          Your own item
          <input
            type="text"
            name="name"
            maxLength={CHECKLIST_LIMITS.name}
            required
            aria-invalid={failure?.fields?.name ? true : undefined}
            defaultValue={failure?.values?.name}
            className="mt-1 min-h-11 w-full rounded-md border border-rule px-2"
          />
        </label>
        <label className="flex flex-col text-sm">
          Quantity
          <input
            type="number"
            name="quantity"
            min={1}
            max={CHECKLIST_LIMITS.quantity}
            defaultValue={failure?.values?.quantity ?? "1"}
            className="mt-1 min-h-11 w-24 rounded-md border border-rule px-2"
          />
        </label>
        <button
          type="submit"
          className="min-h-11 rounded-md bg-spruce-800 px-4 py-2 font-semibold text-paper hover:bg-spruce-700"
        >
          Add
        </button>
      </add.Form>
      <Failed failure={failure} />
    </div>
  );
}
