import fc from "fast-check";
import { describe, expect, it } from "vitest";
import type { Callout } from "~/engine/callouts";
import { type DiffRevision, type DiffStep, revisionDiff, wordDiff } from "./revision-diff";

const circuit = (over: Partial<Extract<Callout, { kind: "circuit" }>> = {}): Callout =>
  ({
    kind: "circuit",
    label: "Lamp feed",
    systemVoltage: 12,
    loadWatts: 110,
    continuous: true,
    oneWayLengthM: 5,
    returnPath: "wire",
    location: "engine-bay",
    insulationC: 105,
    bundled: 1,
    dropLimitPct: 3,
    conductorTempC: 20,
    wire: { awg: 12 },
    fuseA: 15,
    switchRatingA: 10,
    relay: true,
    ...over,
  }) as Callout;

const step = (title: string, over: Partial<DiffStep> = {}): DiffStep => ({
  title,
  text: `Do the ${title.toLowerCase()} carefully.`,
  liftsVehicle: false,
  disconnectsBattery: false,
  callouts: [],
  photos: [],
  ...over,
});

const revision = (over: Partial<DiffRevision> = {}): DiffRevision => ({
  title: "Auxiliary lamps",
  summary: "Two lamps on the hood hinge brackets.",
  category: "lighting",
  difficulty: 3,
  minutes: 120,
  steps: [step("Disconnect the battery"), step("Mount the brackets"), step("Wire the relay", { callouts: [circuit()] })],
  fitment: [{ variantId: 1, vehicle: "Kestrel K2 diesel", status: "fits", note: null }],
  parts: [{ name: "Relay 40 A", quantity: 1, partNumber: "R-40", notes: null, stepIndex: 2 }],
  tools: [{ name: "Crimping tool" }],
  ...over,
});

/** The text a word diff reads as before (without what it adds) and after (without what it removes). */
const sides = (parts: { value: string; added?: true; removed?: true }[]) => ({
  before: parts
    .filter((p) => !p.added)
    .map((p) => p.value)
    .join(""),
  after: parts
    .filter((p) => !p.removed)
    .map((p) => p.value)
    .join(""),
});

describe("the review diff", () => {
  it("finds nothing between a revision and its copy", () => {
    const diff = revisionDiff(revision(), structuredClone(revision()));
    expect(diff.changed).toBe(false);
    expect(diff.steps.map((s) => s.status)).toEqual(["same", "same", "same"]);
  });

  it("names a changed callout value old → new (fuse 15 A → 20 A, wire 12 AWG → 10 AWG)", () => {
    const before = revision();
    const after = revision();
    after.steps[2] = step("Wire the relay", { callouts: [circuit({ fuseA: 20, wire: { awg: 10 } })] });
    const diff = revisionDiff(before, after);
    const wired = diff.steps[2];
    expect(wired.status).toBe("changed");
    expect(wired.callouts).toEqual([
      {
        kind: "circuit",
        name: "circuit “Lamp feed”",
        status: "changed",
        values: [
          { field: "fuseA", label: "fuse", from: "15 A", to: "20 A" },
          { field: "wire", label: "wire size", from: "12 AWG", to: "10 AWG" },
        ],
      },
    ]);
    expect(diff.steps.filter((s) => s.status === "changed")).toHaveLength(1);
  });

  it("says when a fuse was taken out, and a torque value old → new with its unit", () => {
    const before = revision({
      steps: [step("Bolt the bracket", { callouts: [{ kind: "torque", fastener: "M8 bracket bolt", value: 25, unit: "N·m" }] })],
    });
    const after = revision({
      steps: [step("Bolt the bracket", { callouts: [{ kind: "torque", fastener: "M8 bracket bolt", value: 22, unit: "N·m" }] })],
    });
    expect(revisionDiff(before, after).steps[0].callouts[0].values).toEqual([
      { field: "value", label: "torque", from: "25 N·m", to: "22 N·m" },
    ]);
    const noFuse = revision();
    noFuse.steps[2] = step("Wire the relay", { callouts: [circuit({ fuseA: null })] });
    expect(revisionDiff(revision(), noFuse).steps[2].callouts[0].values).toEqual([
      { field: "fuseA", label: "fuse", from: "15 A", to: "no fuse" },
    ]);
  });

  it("diffs text word by word: only the changed words are marked", () => {
    const before = revision();
    const after = revision();
    after.steps[1] = { ...after.steps[1], text: "Do the mount the brackets gently." };
    const text = revisionDiff(before, after).steps[1].text ?? [];
    expect(text.filter((p) => p.removed).map((p) => p.value.trim())).toEqual(["carefully"]);
    expect(text.filter((p) => p.added).map((p) => p.value.trim())).toEqual(["gently"]);
  });

  it("marks a changed caution's words and its signal word", () => {
    const caution = (signalWord: "WARNING" | "DANGER", text: string): Callout => ({ kind: "caution", signalWord, text });
    const before = revision({
      steps: [step("Work near the battery", { callouts: [caution("WARNING", "Wear eye protection near the battery.")] })],
    });
    const after = revision({
      steps: [step("Work near the battery", { callouts: [caution("DANGER", "Wear eye and hand protection near the battery.")] })],
    });
    const [change] = revisionDiff(before, after).steps[0].callouts;
    expect(change.values).toEqual([{ field: "signalWord", label: "signal word", from: "WARNING", to: "DANGER" }]);
    expect(change.text?.filter((p) => p.added).map((p) => p.value.trim())).toEqual(["and hand"]);
  });

  it("keeps later steps aligned when a step is put in between", () => {
    const after = revision();
    after.steps.splice(1, 0, step("Remove the grille", { photos: [{ mediaId: 9, alt: "Grille clips" }] }));
    const diff = revisionDiff(revision(), after);
    expect(diff.steps.map((s) => [s.status, s.from, s.to])).toEqual([
      ["same", 0, 0],
      ["added", null, 1],
      ["same", 1, 2],
      ["same", 2, 3],
    ]);
    expect(diff.steps[1].photos.added).toEqual(["Grille clips"]);
  });

  it("pairs a renamed step with the one it replaced, and lists photos added and removed", () => {
    const before = revision();
    before.steps[1] = step("Mount the brackets", { photos: [{ mediaId: 1, alt: "Old bracket" }] });
    const after = revision();
    after.steps[1] = step("Mount both brackets", { photos: [{ mediaId: 2, alt: "New bracket" }] });
    const [, mounted] = revisionDiff(before, after).steps;
    expect(mounted.status).toBe("changed");
    expect(mounted.titleChange).toMatchObject({ from: "Mount the brackets", to: "Mount both brackets" });
    expect(mounted.photos).toEqual({ added: ["New bracket"], removed: ["Old bracket"] });
  });

  it("lists a removed step, the step flags, fitment, parts and tools changes", () => {
    const after = revision({
      fitment: [
        { variantId: 1, vehicle: "Kestrel K2 diesel", status: "fits-with-changes", note: "Trim the liner" },
        { variantId: 2, vehicle: "Kestrel K2 gasoline", status: "fits", note: null },
      ],
      parts: [
        { name: "relay 40 a", quantity: 2, partNumber: "R-40", notes: null, stepIndex: 2 },
        { name: "Fuse holder", quantity: 1, partNumber: null, notes: null, stepIndex: null },
      ],
      tools: [{ name: "Wire stripper" }],
    });
    after.steps = [step("Disconnect the battery", { disconnectsBattery: true }), after.steps[2]];
    const diff = revisionDiff(revision(), after);
    expect(diff.steps.map((s) => s.status)).toEqual(["changed", "removed", "same"]);
    expect(diff.steps[0].flags).toEqual([
      { field: "disconnectsBattery", label: "disconnects the battery", from: "no", to: "yes" },
    ]);
    expect(diff.fitment).toEqual([
      {
        name: "Kestrel K2 diesel",
        status: "changed",
        values: [
          { field: "status", label: "fitment", from: "fits", to: "fits-with-changes" },
          { field: "note", label: "note", from: "none", to: "Trim the liner" },
        ],
      },
      {
        name: "Kestrel K2 gasoline",
        status: "added",
        values: [{ field: "status", label: "fitment", from: "not listed", to: "fits" }],
      },
    ]);
    expect(diff.parts).toEqual([
      { name: "relay 40 a", status: "changed", values: [{ field: "quantity", label: "quantity", from: "1", to: "2" }] },
      { name: "Fuse holder", status: "added", values: [] },
    ]);
    expect(diff.tools).toEqual([
      { name: "Wire stripper", status: "added", values: [] },
      { name: "Crimping tool", status: "removed", values: [] },
    ]);
  });

  it("a word diff reads as the new text without its removals, and as the old text (up to spacing) without its additions", () => {
    // What jsdiff's change objects promise (diff 9 types.d.ts, ChangeObject.value): a common part
    // carries the new string's text, and diffWords treats runs of spacing as alike.
    const spacing = (text: string) => text.replace(/\s+/g, " ").trim();
    const words = fc.array(fc.constantFrom("fuse", "wire", "15 A", "relay", "the", ",", "\n", "  "), { maxLength: 30 });
    fc.assert(
      fc.property(words, words, (a, b) => {
        const from = a.join(" ");
        const to = b.join(" ");
        const parts = wordDiff(from, to);
        if (from === to) return parts === null;
        const { before, after } = sides(parts ?? []);
        return after === to && spacing(before) === spacing(from);
      }),
    );
  });
});
