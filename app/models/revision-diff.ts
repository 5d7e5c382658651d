import { diffArrays, diffWords } from "diff";
import type { Callout } from "~/engine/callouts";
import { CIRCUIT_FIELD_LABELS } from "~/engine/circuit-input";

/**
 * What changed between the published revision and the one under review, for the review desk:
 * per step the words of its text (jsdiff's word diff), callout values old → new ("fuse 15 A →
 * 20 A"), photos added or removed and the step's flags; the fitment, parts and tools; the
 * guide's details. Pure: the caller loads both revisions into `DiffRevision`.
 */

export type DiffStep = {
  title: string;
  text: string;
  liftsVehicle: boolean;
  disconnectsBattery: boolean;
  callouts: Callout[];
  photos: { mediaId: number; alt: string }[];
};

export type DiffRevision = {
  title: string;
  summary: string;
  category: string;
  difficulty: number;
  minutes: number;
  steps: DiffStep[];
  fitment: { variantId: number; vehicle: string; status: string; note: string | null }[];
  parts: { name: string; quantity: number; partNumber: string | null; notes: string | null; stepIndex: number | null }[];
  tools: { name: string }[];
};

export type TextPart = { value: string; added?: true; removed?: true };
export type ValueChange = { field: string; label: string; from: string; to: string };
export type CalloutChange = {
  kind: Callout["kind"];
  /** How the review desk names the callout: "circuit "Rear charger feed"", "torque: bracket bolts" … */
  name: string;
  status: "added" | "removed" | "changed";
  values: ValueChange[];
  /** The caution's or tip's words, when they changed. */
  text?: TextPart[];
};
export type StepDiff = {
  status: "added" | "removed" | "changed" | "same";
  /** 0-based positions in the published revision and the one under review. */
  from: number | null;
  to: number | null;
  title: string;
  titleChange: ValueChange | null;
  text: TextPart[] | null;
  flags: ValueChange[];
  callouts: CalloutChange[];
  photos: { added: string[]; removed: string[] };
};
export type ListChange = { name: string; status: "added" | "removed" | "changed"; values: ValueChange[] };
export type RevisionDiff = {
  details: ValueChange[];
  steps: StepDiff[];
  fitment: ListChange[];
  parts: ListChange[];
  tools: ListChange[];
  /** Whether anything at all differs. */
  changed: boolean;
};

/** Past this many words changed, a text is shown as replaced whole rather than word by word. */
const MAX_EDIT_LENGTH = 4000;

export function wordDiff(from: string, to: string): TextPart[] | null {
  if (from === to) return null;
  const changes = diffWords(from, to, { maxEditLength: MAX_EDIT_LENGTH });
  if (!changes) {
    return [...(from ? [{ value: from, removed: true as const }] : []), ...(to ? [{ value: to, added: true as const }] : [])];
  }
  return changes.map((c) => ({
    value: c.value,
    ...(c.added ? { added: true as const } : {}),
    ...(c.removed ? { removed: true as const } : {}),
  }));
}

const yesNo = (v: unknown) => (v === true ? "yes" : v === false ? "no" : "not said");
const lower = (label: string) => label.charAt(0).toLowerCase() + label.slice(1);

/** How each callout value reads on the desk; a value that is absent reads "not set". */
function shown(field: string, value: unknown): string {
  if (value === undefined) return "not set";
  switch (field) {
    case "fuseA":
      return value === null ? "no fuse" : `${value} A`;
    case "wire":
    case "switchFeed.wire": {
      const wire = value as { awg?: number; mm2?: number };
      return wire.awg !== undefined ? `${wire.awg} AWG` : `${wire.mm2} mm²`;
    }
    case "loadWatts":
      return `${value} W`;
    case "loadAmps":
    case "switchRatingA":
    case "switchFeed.fuseA":
      return `${value} A`;
    case "systemVoltage":
      return `${value} V`;
    case "oneWayLengthM":
      return `${value} m`;
    case "fuseDistanceMm":
      return `${value} mm`;
    case "insulationC":
    case "conductorTempC":
      return `${value} °C`;
    case "dropLimitPct":
      return `${value} %`;
    case "continuous":
    case "relay":
    case "estimate":
    case "lubricated":
      return yesNo(value);
    default:
      return typeof value === "object" ? JSON.stringify(value) : String(value);
  }
}

const CIRCUIT_FIELDS = [
  "label",
  "fuseA",
  "wire",
  "loadWatts",
  "loadAmps",
  "systemVoltage",
  "continuous",
  "oneWayLengthM",
  "returnPath",
  "location",
  "insulationC",
  "bundled",
  "dropLimitPct",
  "conductorTempC",
  "fuseDistanceMm",
  "switchRatingA",
  "relay",
  "feed",
] as const;

const TORQUE_LABELS: Record<string, string> = {
  fastener: "fastener",
  value: "torque",
  size: "bolt size",
  propertyClass: "property class",
  threadlocker: "threadlocker",
  estimate: "estimate",
  lubricated: "lubricated",
  valueSource: "torque source",
};

function valueChanges(from: Callout, to: Callout): ValueChange[] {
  const a = from as Record<string, unknown>;
  const b = to as Record<string, unknown>;
  const changes: ValueChange[] = [];
  const compare = (field: string, label: string, x: unknown, y: unknown, show = (v: unknown) => shown(field, v)) => {
    if (JSON.stringify(x) !== JSON.stringify(y)) changes.push({ field, label, from: show(x), to: show(y) });
  };
  if (from.kind === "circuit" && to.kind === "circuit") {
    for (const field of CIRCUIT_FIELDS) compare(field, lower(CIRCUIT_FIELD_LABELS[field]), a[field], b[field]);
    const feedA = from.switchFeed;
    const feedB = to.switchFeed;
    compare("switchFeed.from", "switch feed", feedA?.from, feedB?.from);
    compare(
      "switchFeed.fuseA",
      "switch feed fuse",
      feedA?.from === "tap" ? feedA.fuseA : undefined,
      feedB?.from === "tap" ? feedB.fuseA : undefined,
    );
    compare("switchFeed.wire", "switch feed wire", feedA?.wire, feedB?.wire);
  } else if (from.kind === "torque" && to.kind === "torque") {
    const torque = (c: typeof from) => (c.value === undefined ? undefined : `${c.value} ${c.unit ?? "N·m"}`);
    compare("value", TORQUE_LABELS.value, torque(from), torque(to), (v) => (v === undefined ? "not set" : String(v)));
    for (const field of ["fastener", "size", "propertyClass", "threadlocker", "estimate", "lubricated", "valueSource"]) {
      compare(field, TORQUE_LABELS[field], a[field], b[field]);
    }
  } else if (from.kind === "caution" && to.kind === "caution") {
    compare("signalWord", "signal word", from.signalWord, to.signalWord);
  }
  return changes;
}

function calloutName(callout: Callout): string {
  switch (callout.kind) {
    case "circuit":
      return callout.label ? `circuit “${callout.label}”` : "circuit";
    case "torque":
      return `torque: ${callout.fastener}`;
    case "caution":
      return callout.signalWord;
    case "tip":
      return "tip";
  }
}

const calloutText = (c: Callout) => (c.kind === "caution" || c.kind === "tip" ? c.text : "");

/** Callouts of one step paired by kind, in order (the second circuit with the second circuit). */
function diffCallouts(from: Callout[], to: Callout[]): CalloutChange[] {
  const changes: CalloutChange[] = [];
  const kinds = [...new Set([...from, ...to].map((c) => c.kind))];
  for (const kind of kinds) {
    const a = from.filter((c) => c.kind === kind);
    const b = to.filter((c) => c.kind === kind);
    for (let i = 0; i < Math.max(a.length, b.length); i++) {
      const old = a[i];
      const now = b[i];
      if (old && !now) changes.push({ kind, name: calloutName(old), status: "removed", values: [] });
      else if (!old && now) {
        const text = calloutText(now);
        changes.push({
          kind,
          name: calloutName(now),
          status: "added",
          values: [],
          ...(text ? { text: [{ value: text, added: true }] } : {}),
        });
      } else if (old && now) {
        const values = valueChanges(old, now);
        const text = wordDiff(calloutText(old), calloutText(now));
        if (values.length || text)
          changes.push({ kind, name: calloutName(now), status: "changed", values, ...(text ? { text } : {}) });
      }
    }
  }
  return changes;
}

function diffPhotos(from: DiffStep["photos"], to: DiffStep["photos"]) {
  const had = new Set(from.map((p) => p.mediaId));
  const has = new Set(to.map((p) => p.mediaId));
  return {
    added: to.filter((p) => !had.has(p.mediaId)).map((p) => p.alt),
    removed: from.filter((p) => !has.has(p.mediaId)).map((p) => p.alt),
  };
}

function diffFlags(from: DiffStep, to: DiffStep): ValueChange[] {
  const flags: ValueChange[] = [];
  if (from.liftsVehicle !== to.liftsVehicle) {
    flags.push({ field: "liftsVehicle", label: "lifts the vehicle", from: yesNo(from.liftsVehicle), to: yesNo(to.liftsVehicle) });
  }
  if (from.disconnectsBattery !== to.disconnectsBattery) {
    flags.push({
      field: "disconnectsBattery",
      label: "disconnects the battery",
      from: yesNo(from.disconnectsBattery),
      to: yesNo(to.disconnectsBattery),
    });
  }
  return flags;
}

function pairSteps(from: DiffStep, to: DiffStep, fromIndex: number, toIndex: number): StepDiff {
  const text = wordDiff(from.text, to.text);
  const flags = diffFlags(from, to);
  const callouts = diffCallouts(from.callouts, to.callouts);
  const photos = diffPhotos(from.photos, to.photos);
  const titleChange = from.title === to.title ? null : { field: "title", label: "title", from: from.title, to: to.title };
  const changed = !!(titleChange || text || flags.length || callouts.length || photos.added.length || photos.removed.length);
  return {
    status: changed ? "changed" : "same",
    from: fromIndex,
    to: toIndex,
    title: to.title,
    titleChange,
    text,
    flags,
    callouts,
    photos,
  };
}

function loneStep(step: DiffStep, status: "added" | "removed", index: number): StepDiff {
  const mark = status === "added" ? { added: true as const } : { removed: true as const };
  return {
    status,
    from: status === "removed" ? index : null,
    to: status === "added" ? index : null,
    title: step.title,
    titleChange: null,
    text: step.text ? [{ value: step.text, ...mark }] : null,
    flags: [],
    callouts: step.callouts.map((c) => ({ kind: c.kind, name: calloutName(c), status, values: [] })),
    photos:
      status === "added"
        ? { added: step.photos.map((p) => p.alt), removed: [] }
        : { added: [], removed: step.photos.map((p) => p.alt) },
  };
}

/**
 * Steps aligned by title (jsdiff's array diff), so a step put in between does not make every later
 * step look rewritten; within a run of removed and added steps, they pair by position as edits.
 */
function diffSteps(from: DiffStep[], to: DiffStep[]): StepDiff[] {
  const runs = diffArrays(from, to, { comparator: (a, b) => a.title === b.title });
  const out: StepDiff[] = [];
  let i = 0;
  let j = 0;
  for (let k = 0; k < runs.length; k++) {
    const run = runs[k];
    if (!run.added && !run.removed) {
      for (let n = 0; n < run.count; n++) out.push(pairSteps(from[i + n], to[j + n], i + n, j + n));
      i += run.count;
      j += run.count;
      continue;
    }
    // A removed run followed by an added one (or the other way round) is one place that was rewritten.
    const next = runs[k + 1];
    const removed = run.removed ? run.count : next?.removed ? next.count : 0;
    const added = run.added ? run.count : next?.added ? next.count : 0;
    if (next && (next.added || next.removed) && next.added !== run.added) k++;
    const paired = Math.min(removed, added);
    for (let n = 0; n < paired; n++) out.push(pairSteps(from[i + n], to[j + n], i + n, j + n));
    for (let n = paired; n < removed; n++) out.push(loneStep(from[i + n], "removed", i + n));
    for (let n = paired; n < added; n++) out.push(loneStep(to[j + n], "added", j + n));
    i += removed;
    j += added;
  }
  return out;
}

function diffFitment(from: DiffRevision["fitment"], to: DiffRevision["fitment"]): ListChange[] {
  const before = new Map(from.map((f) => [f.variantId, f]));
  const after = new Map(to.map((f) => [f.variantId, f]));
  const changes: ListChange[] = [];
  for (const row of to) {
    const old = before.get(row.variantId);
    if (!old) {
      changes.push({
        name: row.vehicle,
        status: "added",
        values: [{ field: "status", label: "fitment", from: "not listed", to: row.status }],
      });
      continue;
    }
    const values: ValueChange[] = [];
    if (old.status !== row.status) values.push({ field: "status", label: "fitment", from: old.status, to: row.status });
    if ((old.note ?? "") !== (row.note ?? ""))
      values.push({ field: "note", label: "note", from: old.note ?? "none", to: row.note ?? "none" });
    if (values.length) changes.push({ name: row.vehicle, status: "changed", values });
  }
  for (const row of from) {
    if (!after.has(row.variantId)) {
      changes.push({
        name: row.vehicle,
        status: "removed",
        values: [{ field: "status", label: "fitment", from: row.status, to: "not listed" }],
      });
    }
  }
  return changes;
}

const key = (name: string) => name.trim().toLowerCase();

function diffParts(from: DiffRevision["parts"], to: DiffRevision["parts"]): ListChange[] {
  const before = new Map(from.map((p) => [key(p.name), p]));
  const after = new Set(to.map((p) => key(p.name)));
  const step = (n: number | null) => (n === null ? "none" : `step ${n + 1}`);
  const changes: ListChange[] = [];
  for (const part of to) {
    const old = before.get(key(part.name));
    if (!old) {
      changes.push({ name: part.name, status: "added", values: [] });
      continue;
    }
    const values: ValueChange[] = [];
    const compare = (field: string, label: string, x: string, y: string) => {
      if (x !== y) values.push({ field, label, from: x, to: y });
    };
    compare("quantity", "quantity", String(old.quantity), String(part.quantity));
    compare("partNumber", "part number", old.partNumber ?? "none", part.partNumber ?? "none");
    compare("notes", "notes", old.notes ?? "none", part.notes ?? "none");
    compare("stepIndex", "used in", step(old.stepIndex), step(part.stepIndex));
    if (values.length) changes.push({ name: part.name, status: "changed", values });
  }
  for (const part of from) if (!after.has(key(part.name))) changes.push({ name: part.name, status: "removed", values: [] });
  return changes;
}

function diffTools(from: DiffRevision["tools"], to: DiffRevision["tools"]): ListChange[] {
  const had = new Set(from.map((t) => key(t.name)));
  const has = new Set(to.map((t) => key(t.name)));
  return [
    ...to.filter((t) => !had.has(key(t.name))).map((t) => ({ name: t.name, status: "added" as const, values: [] })),
    ...from.filter((t) => !has.has(key(t.name))).map((t) => ({ name: t.name, status: "removed" as const, values: [] })),
  ];
}

function diffDetails(from: DiffRevision, to: DiffRevision): ValueChange[] {
  const changes: ValueChange[] = [];
  const compare = (field: string, label: string, x: string, y: string) => {
    if (x !== y) changes.push({ field, label, from: x, to: y });
  };
  compare("title", "title", from.title, to.title);
  compare("summary", "summary", from.summary, to.summary);
  compare("category", "category", from.category, to.category);
  compare("difficulty", "difficulty", `${from.difficulty}/5`, `${to.difficulty}/5`);
  compare("minutes", "time", `${from.minutes} min`, `${to.minutes} min`);
  return changes;
}

export function revisionDiff(from: DiffRevision, to: DiffRevision): RevisionDiff {
  const details = diffDetails(from, to);
  const steps = diffSteps(from.steps, to.steps);
  const fitment = diffFitment(from.fitment, to.fitment);
  const parts = diffParts(from.parts, to.parts);
  const tools = diffTools(from.tools, to.tools);
  const changed = !!(details.length || steps.some((s) => s.status !== "same") || fitment.length || parts.length || tools.length);
  return { details, steps, fitment, parts, tools, changed };
}
