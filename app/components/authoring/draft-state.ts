import { calloutSchema } from "~/engine/callouts";
import { moveItem } from "~/components/editor/list-state";

/**
 * The editor's working copy of a draft and the pure changes made to it. Shapes follow the API
 * (`PUT /api/guides/:id/draft`); photos also carry what the editor needs to show them.
 */

export type PhotoVariant = { width: number; format: string; url: string };
export type EditorPhoto = { mediaId: number; alt: string; caption: string | null; variants?: PhotoVariant[] };
export type EditorStep = {
  title: string;
  body: Record<string, unknown>;
  liftsVehicle: boolean;
  disconnectsBattery: boolean;
  photos: EditorPhoto[];
  callouts: unknown[];
};
export type EditorFitment = { variantId: number; status: "fits" | "fits-with-changes" | "does-not-fit"; note?: string | null };
/** Half-filled rows are kept as typed; the server names what is missing when it saves. */
export type EditorPart = {
  name: string;
  quantity?: number;
  partNumber?: string | null;
  notes?: string | null;
  stepIndex?: number | null;
};
export type EditorDraft = {
  title: string;
  summary: string;
  category: string;
  difficulty: number;
  minutes: number;
  steps: EditorStep[];
  fitment: EditorFitment[];
  parts: EditorPart[];
  tools: { name: string }[];
};

export const EMPTY_BODY: Record<string, unknown> = { type: "doc", content: [{ type: "paragraph" }] };

export function newStep(): EditorStep {
  return { title: "", body: EMPTY_BODY, liftsVehicle: false, disconnectsBattery: false, photos: [], callouts: [] };
}

/**
 * Where a step went after a move, removal or insertion, for the parts that point at steps: a
 * part keeps pointing at the step it was for, and loses its step when that one is removed.
 */
function remapParts(parts: EditorPart[], map: (index: number) => number | null): EditorPart[] {
  return parts.map((p) => (p.stepIndex === null || p.stepIndex === undefined ? p : { ...p, stepIndex: map(p.stepIndex) }));
}

export function addStep(draft: EditorDraft, at = draft.steps.length): EditorDraft {
  const steps = [...draft.steps];
  steps.splice(at, 0, newStep());
  return { ...draft, steps, parts: remapParts(draft.parts, (i) => (i >= at ? i + 1 : i)) };
}

export function duplicateStep(draft: EditorDraft, index: number): EditorDraft {
  const source = draft.steps[index];
  if (!source) return draft;
  const copy: EditorStep = structuredClone(source);
  copy.title = source.title ? `${source.title} (copy)` : "";
  const steps = [...draft.steps];
  steps.splice(index + 1, 0, copy);
  return { ...draft, steps, parts: remapParts(draft.parts, (i) => (i > index ? i + 1 : i)) };
}

export function removeStep(draft: EditorDraft, index: number): EditorDraft {
  if (!draft.steps[index]) return draft;
  return {
    ...draft,
    steps: draft.steps.filter((_, i) => i !== index),
    parts: remapParts(draft.parts, (i) => (i === index ? null : i > index ? i - 1 : i)),
  };
}

export function moveStep(draft: EditorDraft, from: number, to: number): EditorDraft {
  if (to < 0 || to >= draft.steps.length || from === to || !draft.steps[from]) return draft;
  const order = moveItem(
    draft.steps.map((_, i) => i),
    from,
    to - from,
  );
  const where = new Map(order.map((old, now) => [old, now]));
  return { ...draft, steps: order.map((i) => draft.steps[i]), parts: remapParts(draft.parts, (i) => where.get(i) ?? null) };
}

export function updateStep(draft: EditorDraft, index: number, change: Partial<EditorStep>): EditorDraft {
  return { ...draft, steps: draft.steps.map((s, i) => (i === index ? { ...s, ...change } : s)) };
}

/** What PUT accepts: the draft without the display-only photo fields. */
export function draftBody(draft: EditorDraft, version: number) {
  return {
    ...draft,
    version,
    steps: draft.steps.map((s) => ({
      ...s,
      photos: s.photos.map((p) => ({ mediaId: p.mediaId, alt: p.alt, caption: p.caption })),
    })),
  };
}

// ── Conflicts ─────────────────────────────────────────────────────────

export type ConflictField =
  | { key: "title" | "summary" | "category" | "difficulty" | "minutes" }
  | { key: "step"; index: number }
  | { key: "fitment" | "parts" | "tools" };

export type ConflictChoice = "mine" | "theirs";

export const fieldId = (f: ConflictField) => (f.key === "step" ? `step-${f.index}` : f.key);

/**
 * A comparable form of a value: keys in order, an absent field and a null one alike (the server
 * gives back what it stored in its own key order), photos by their id, alt and caption only.
 */
function comparable(value: unknown): string {
  return canonical(value);
}

/** A step as the server keeps it: each callout that parses, with the defaults its schema fills in. */
function comparableStep(step: EditorStep | undefined): string {
  if (!step) return canonical(step);
  return canonical({
    ...step,
    callouts: step.callouts.map((c) => {
      const parsed = calloutSchema.safeParse(c);
      return parsed.success ? parsed.data : c;
    }),
  });
}

function canonical(value: unknown): string {
  return JSON.stringify(value, (key, v) => {
    if (key === "variants" || v === null) return undefined;
    if (typeof v !== "object" || Array.isArray(v)) return v;
    return Object.fromEntries(Object.entries(v as Record<string, unknown>).sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0)));
  });
}

/** The fields where two drafts differ, in the order the editor shows them. */
export function differingFields(mine: EditorDraft, theirs: EditorDraft): ConflictField[] {
  const out: ConflictField[] = [];
  for (const key of ["title", "summary", "category", "difficulty", "minutes"] as const) {
    if (mine[key] !== theirs[key]) out.push({ key });
  }
  const steps = Math.max(mine.steps.length, theirs.steps.length);
  for (let index = 0; index < steps; index++) {
    if (comparableStep(mine.steps[index]) !== comparableStep(theirs.steps[index])) out.push({ key: "step", index });
  }
  for (const key of ["fitment", "parts", "tools"] as const) {
    if (comparable(mine[key]) !== comparable(theirs[key])) out.push({ key });
  }
  return out;
}

/**
 * The draft made of each field's chosen side (mine where nothing was chosen). Steps are taken
 * by position: a step that only one side has is kept when that side is chosen for it.
 */
export function mergeDrafts(mine: EditorDraft, theirs: EditorDraft, choices: Record<string, ConflictChoice>): EditorDraft {
  const pick = (id: string) => (choices[id] === "theirs" ? theirs : mine);
  const steps: EditorStep[] = [];
  const count = Math.max(mine.steps.length, theirs.steps.length);
  for (let index = 0; index < count; index++) {
    const step = pick(`step-${index}`).steps[index];
    if (step) steps.push(step);
  }
  const merged: EditorDraft = {
    title: pick("title").title,
    summary: pick("summary").summary,
    category: pick("category").category,
    difficulty: pick("difficulty").difficulty,
    minutes: pick("minutes").minutes,
    steps,
    fitment: pick("fitment").fitment,
    parts: pick("parts").parts,
    tools: pick("tools").tools,
  };
  // A part that points past the last step kept loses its step rather than failing the save.
  return {
    ...merged,
    parts: merged.parts.map((p) =>
      typeof p.stepIndex === "number" && p.stepIndex >= steps.length ? { ...p, stepIndex: null } : p,
    ),
  };
}

/** Plain text of a Tiptap document, for showing two versions of a step side by side. */
export function bodyText(body: unknown): string {
  const parts: string[] = [];
  const walk = (node: unknown) => {
    if (!node || typeof node !== "object") return;
    const n = node as { type?: string; text?: string; content?: unknown[] };
    if (typeof n.text === "string") parts.push(n.text);
    if (Array.isArray(n.content)) {
      for (const child of n.content) walk(child);
      if (n.type === "paragraph" || n.type === "heading" || n.type === "listItem") parts.push("\n");
    }
  };
  walk(body);
  return parts.join("").replace(/\n+/g, "\n").trim();
}
