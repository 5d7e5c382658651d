import { del, get, set } from "idb-keyval";
import { useCallback, useEffect, useRef, useState } from "react";
import { draftBody, type EditorDraft } from "./draft-state";

/** What the editor says about saving, in words an author reads at a glance. */
export type SaveState =
  | { kind: "saved"; at: Date | null }
  | { kind: "saving" }
  | { kind: "retrying"; message: string }
  | { kind: "offline" }
  | { kind: "invalid"; fields: Record<string, string>; message: string }
  | { kind: "conflict"; theirs: EditorDraft; theirsVersion: number }
  | { kind: "frozen"; message: string };

/** Unsaved work kept in this browser until the server has it. */
export type KeptDraft = { draft: EditorDraft; baseVersion: number; keptAt: string };

const keyFor = (guideId: number) => `torqueleaf:draft:${guideId}`;
export const readKept = (guideId: number) => get<KeptDraft>(keyFor(guideId)).catch(() => undefined);
export const forgetKept = (guideId: number) => del(keyFor(guideId)).catch(() => undefined);

/** Idle time after the last keystroke before a save; typing on keeps pushing it back. */
const QUIET_MS = 1200;
const RETRY_MS = [2_000, 5_000, 10_000, 30_000];

type Findings = unknown[];

type ServerAnswer =
  | { ok: true; version: number; findings: Findings }
  | {
      ok: false;
      status: number;
      body: { error?: { code?: string; message?: string; fields?: Record<string, string>; current?: unknown } };
    };

async function put(guideId: number, draft: EditorDraft, version: number): Promise<ServerAnswer> {
  const response = await fetch(`/api/guides/${guideId}/draft`, {
    method: "PUT",
    headers: { "Content-Type": "application/json" },
    body: JSON.stringify(draftBody(draft, version)),
  });
  const body = await response.json().catch(() => ({}));
  if (response.ok) return { ok: true, version: body.version, findings: body.findings ?? [] };
  return { ok: false, status: response.status, body };
}

/** The server's copy of the draft, for the conflict view. */
async function fetchCurrent(guideId: number): Promise<{ draft: EditorDraft; version: number } | null> {
  const response = await fetch(`/api/guides/${guideId}/draft`, { headers: { Accept: "application/json" } });
  if (!response.ok) return null;
  const body = await response.json();
  return { draft: body.draft, version: body.draft?.version ?? body.revision?.version };
}

/**
 * Keeps the draft on this device at every change and on the server a moment after typing stops.
 * A stale version is never overwritten: the server's copy comes back for the author to merge.
 */
export function useAutosave({
  guideId,
  draft,
  initialVersion,
  editable,
  onFindings,
}: {
  guideId: number;
  draft: EditorDraft;
  initialVersion: number;
  editable: boolean;
  onFindings: (findings: Findings) => void;
}) {
  const [state, setState] = useState<SaveState>({ kind: "saved", at: null });
  const version = useRef(initialVersion);
  const latest = useRef(draft);
  const sentDraft = useRef<EditorDraft | null>(null);
  const dirty = useRef(false);
  const inFlight = useRef(false);
  const timer = useRef<ReturnType<typeof setTimeout>>(undefined);
  const attempt = useRef(0);
  const onFindingsRef = useRef(onFindings);
  onFindingsRef.current = onFindings;
  const stateRef = useRef(state);
  stateRef.current = state;

  const saveRef = useRef<() => Promise<void>>(async () => undefined);
  const schedule = useCallback((ms: number) => {
    clearTimeout(timer.current);
    timer.current = setTimeout(() => void saveRef.current(), ms);
  }, []);

  const save = useCallback(async () => {
    clearTimeout(timer.current);
    const blocked = stateRef.current.kind === "conflict" || stateRef.current.kind === "frozen";
    if (!dirty.current || inFlight.current || blocked) return;
    if (typeof navigator !== "undefined" && navigator.onLine === false) {
      setState({ kind: "offline" });
      return;
    }
    inFlight.current = true;
    const sending = latest.current;
    sentDraft.current = sending;
    dirty.current = false;
    setState({ kind: "saving" });
    try {
      const answer = await put(guideId, sending, version.current);
      if (answer.ok) {
        version.current = answer.version;
        attempt.current = 0;
        onFindingsRef.current(answer.findings);
        if (latest.current === sending) await forgetKept(guideId);
        else
          await set(keyFor(guideId), { draft: latest.current, baseVersion: version.current, keptAt: new Date().toISOString() });
        setState({ kind: "saved", at: new Date() });
      } else {
        dirty.current = true;
        const error = answer.body.error ?? {};
        if (answer.status === 409 && error.code !== "frozen" && error.code !== "wrong-state") {
          const current = await fetchCurrent(guideId);
          if (current) setState({ kind: "conflict", theirs: current.draft, theirsVersion: current.version });
          else setState({ kind: "retrying", message: "Another save came first and its copy could not be read." });
        } else if (answer.status === 409) {
          setState({ kind: "frozen", message: error.message ?? "This revision can no longer be edited." });
        } else if (answer.status === 400 || answer.status === 413 || answer.status === 422) {
          setState({ kind: "invalid", fields: error.fields ?? {}, message: error.message ?? "Some fields need attention." });
        } else if (answer.status === 401 || answer.status === 403) {
          setState({ kind: "retrying", message: "You are signed out: sign in again in another tab, your work stays here." });
          schedule(RETRY_MS[RETRY_MS.length - 1]);
        } else {
          setState({ kind: "retrying", message: error.message ?? `The server answered ${answer.status}.` });
          schedule(RETRY_MS[Math.min(attempt.current++, RETRY_MS.length - 1)]);
        }
      }
    } catch {
      dirty.current = true;
      if (typeof navigator !== "undefined" && navigator.onLine === false) setState({ kind: "offline" });
      else {
        setState({ kind: "retrying", message: "The server could not be reached." });
        schedule(RETRY_MS[Math.min(attempt.current++, RETRY_MS.length - 1)]);
      }
    } finally {
      inFlight.current = false;
      // Edits made while this save was on its way go next.
      if (dirty.current && stateRef.current.kind === "saving") schedule(QUIET_MS);
    }
  }, [guideId, schedule]);
  saveRef.current = save;

  // Every change is kept on this device at once and sent when typing pauses.
  const first = useRef(true);
  useEffect(() => {
    if (first.current) {
      first.current = false;
      return;
    }
    if (!editable) return;
    latest.current = draft;
    dirty.current = true;
    void set(keyFor(guideId), { draft, baseVersion: version.current, keptAt: new Date().toISOString() }).catch(() => undefined);
    // A change not yet on the server never reads as saved.
    if (stateRef.current.kind !== "conflict" && stateRef.current.kind !== "frozen" && stateRef.current.kind !== "offline") {
      setState({ kind: "saving" });
    }
    schedule(QUIET_MS);
  }, [draft, editable, guideId, schedule]);

  useEffect(() => {
    const online = () => void save();
    const offline = () => dirty.current && setState({ kind: "offline" });
    const hidden = () => document.visibilityState === "hidden" && void save();
    window.addEventListener("online", online);
    window.addEventListener("offline", offline);
    document.addEventListener("visibilitychange", hidden);
    return () => {
      window.removeEventListener("online", online);
      window.removeEventListener("offline", offline);
      document.removeEventListener("visibilitychange", hidden);
      clearTimeout(timer.current);
    };
  }, [save]);

  /** After the author settled a conflict: the merged draft goes on top of the server's version. */
  const resolve = useCallback(
    (merged: EditorDraft, theirsVersion: number) => {
      version.current = theirsVersion;
      latest.current = merged;
      dirty.current = true;
      setState({ kind: "saving" });
      stateRef.current = { kind: "saving" };
      void save();
    },
    [save],
  );

  return { state, saveNow: save, resolve, version };
}
