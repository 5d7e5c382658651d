import { useCallback, useEffect, useRef, useState } from "react";
import { useRevalidator } from "react-router";
import { CHECKLIST_LIMITS } from "~/models/checklist-input";
import { askWorker, SYNCED_EVENT } from "./offline-client";
import { type ItemChange, QUEUED_HEADER, type ReaderId } from "./offline-protocol";

/**
 * The checklist page without signal: a tick, quantity or note the route action could not send goes
 * as `PATCH /api/checklists/:id/items/:itemId`, which the service worker queues (app/service-worker/worker.ts),
 * and the page shows the reader's queued changes over the state it was kept with until the server has them.
 */

/** The fetcher's answer to a change the worker queued: nothing reached the server yet, so nothing revalidates (`offline`). */
export type QueuedAnswer = { ok: true; offline: true; queued: true; itemId: number; change: ItemChange; text: string };

export const QUEUED_TEXT = "No signal: saved on this device, and sent to your account when the signal returns.";

export function isQueuedAnswer(value: unknown): value is QueuedAnswer {
  return !!value && typeof value === "object" && (value as { queued?: unknown }).queued === true;
}

const whole = (value: FormDataEntryValue | null) =>
  typeof value === "string" && /^\d{1,10}$/.test(value) ? Number(value) : null;

/** The item change a checklist form asks for, if it is one the API takes (a tick, or a quantity and note). */
export function itemChangeOf(form: FormData): { itemId: number; change: ItemChange } | null {
  const itemId = whole(form.get("itemId"));
  if (itemId === null || itemId < 1) return null;
  const intent = form.get("intent");
  if (intent === "tick") {
    const checked = form.get("checked");
    return checked === "true" || checked === "false" ? { itemId, change: { checked: checked === "true" } } : null;
  }
  if (intent === "item") {
    const quantity = whole(form.get("quantity"));
    const note = String(form.get("note") ?? "").trim();
    if (quantity === null || quantity < 1 || quantity > CHECKLIST_LIMITS.quantity || note.length > CHECKLIST_LIMITS.note)
      return null;
    return { itemId, change: { quantity, note } };
  }
  return null;
}

async function refusal(response: Response): Promise<string> {
  try {
    const body = (await response.json()) as { error?: { message?: string } };
    return body.error?.message ?? `The server answered ${response.status}.`;
  } catch {
    return `The server answered ${response.status}.`;
  }
}

/**
 * Sends the change through the item API, where the service worker queues it without signal. Null
 * when it cannot be sent at all (no worker to queue it): the caller answers as offline.
 */
export async function sendItemChange(checklist: number, itemId: number, change: ItemChange) {
  let response: Response;
  try {
    response = await fetch(`/api/checklists/${checklist}/items/${itemId}`, {
      method: "PATCH",
      headers: { "content-type": "application/json", accept: "application/json" },
      body: JSON.stringify(change),
    });
  } catch {
    return null;
  }
  if (response.status === 202 && response.headers.get(QUEUED_HEADER)) {
    return { ok: true, offline: true, queued: true, itemId, change, text: QUEUED_TEXT } satisfies QueuedAnswer;
  }
  if (response.ok) return { ok: true as const, text: null };
  return { ok: false as const, message: await refusal(response) };
}

/** The item with the reader's queued changes applied, in the order they were made. */
export function withQueued<I extends { id: number; checked: boolean; quantity: number; note: string | null }>(
  item: I,
  changes: ItemChange | undefined,
): I {
  if (!changes) return item;
  return {
    ...item,
    checked: changes.checked ?? item.checked,
    quantity: changes.quantity ?? item.quantity,
    note: changes.note === undefined ? item.note : changes.note || null,
  };
}

/**
 * The reader's changes to this checklist still waiting in the worker's queue, merged per item. Read
 * on load, when asked (after a change was queued) and after the worker sent its queue, when the page
 * reads its data again first so the server's state replaces the queued one without a flicker.
 */
export function useQueuedItems(reader: ReaderId, checklist: number) {
  const [queued, setQueued] = useState<ReadonlyMap<number, ItemChange>>(() => new Map());
  const revalidator = useRevalidator();
  // Held in a ref: the listener below is set up once per checklist, whatever the revalidator's identity.
  const revalidate = useRef(revalidator.revalidate);
  revalidate.current = revalidator.revalidate;

  const refresh = useCallback(async () => {
    if (reader === null) return;
    const reply = await askWorker({ type: "queued-items", reader, checklist }, 5_000);
    const merged = new Map<number, ItemChange>();
    for (const { itemId, change } of reply?.ok ? (reply.changes ?? []) : []) {
      merged.set(itemId, { ...merged.get(itemId), ...change });
    }
    setQueued(merged);
  }, [reader, checklist]);

  useEffect(() => {
    void refresh();
    const synced = async () => {
      if (navigator.onLine) await revalidate.current();
      await refresh();
    };
    const listener = () => void synced();
    window.addEventListener(SYNCED_EVENT, listener);
    return () => window.removeEventListener(SYNCED_EVENT, listener);
  }, [refresh]);

  return { queued, refresh };
}
