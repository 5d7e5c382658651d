import fc from "fast-check";
import { calloutSchema } from "~/engine/callouts";
import { describe, expect, it } from "vitest";
import {
  addStep,
  bodyText,
  differingFields,
  duplicateStep,
  type EditorDraft,
  mergeDrafts,
  moveStep,
  newStep,
  removeStep,
} from "./draft-state";

const step = (title: string) => ({ ...newStep(), title });
const draft = (titles: string[], partSteps: (number | null)[] = []): EditorDraft => ({
  title: "Rack crossbars",
  summary: "",
  category: "racks",
  difficulty: 2,
  minutes: 60,
  steps: titles.map(step),
  fitment: [],
  parts: partSteps.map((stepIndex, i) => ({ name: `part ${i}`, quantity: 1, partNumber: null, notes: null, stepIndex })),
  tools: [],
});

/** The title of the step each part points at: what must survive every change to the step list. */
const partTargets = (d: EditorDraft) => d.parts.map((p) => (p.stepIndex == null ? null : d.steps[p.stepIndex].title));

describe("step changes keep parts pointing at their step", () => {
  it("moving, inserting and duplicating keep each part's step; removing a step frees its parts", () => {
    const d = draft(["a", "b", "c"], [0, 2, null]);
    expect(partTargets(moveStep(d, 0, 2))).toEqual(["a", "c", null]);
    expect(partTargets(addStep(d, 1))).toEqual(["a", "c", null]);
    expect(partTargets(duplicateStep(d, 0))).toEqual(["a", "c", null]);
    expect(duplicateStep(d, 0).steps.map((s) => s.title)).toEqual(["a", "a (copy)", "b", "c"]);
    expect(partTargets(removeStep(d, 2))).toEqual(["a", null, null]);
  });

  it("holds for any sequence of changes", () => {
    const change = fc.oneof(
      fc.record({ op: fc.constant("move" as const), from: fc.nat(6), to: fc.nat(6) }),
      fc.record({ op: fc.constant("add" as const), at: fc.nat(6) }),
      fc.record({ op: fc.constant("remove" as const), at: fc.nat(6) }),
      fc.record({ op: fc.constant("duplicate" as const), at: fc.nat(6) }),
    );
    fc.assert(
      fc.property(fc.array(change, { maxLength: 12 }), (changes) => {
        // Unique titles, so a part's step can be told by its title after every change.
        let d = draft(["s0", "s1", "s2", "s3"], [0, 1, 2, 3]);
        const expected = new Map(d.parts.map((p, i) => [i, d.steps[p.stepIndex ?? 0].title as string | null]));
        let serial = 0;
        for (const c of changes) {
          if (c.op === "move") d = moveStep(d, c.from, c.to);
          if (c.op === "add" && c.at <= d.steps.length) {
            d = addStep(d, c.at);
            d.steps[c.at].title = `new ${serial++}`;
          }
          if (c.op === "remove" && d.steps[c.at]) {
            for (const [i, t] of expected) if (t === d.steps[c.at].title) expected.set(i, null);
            d = removeStep(d, c.at);
          }
          if (c.op === "duplicate" && d.steps[c.at]) {
            d = duplicateStep(d, c.at);
            d.steps[c.at + 1].title = `copy ${serial++}`;
          }
        }
        expect(partTargets(d)).toEqual([...expected.values()]);
      }),
    );
  });
});

describe("conflicts", () => {
  it("lists the fields that differ and merges each from the chosen side", () => {
    const mine = draft(["a", "b"]);
    const theirs = { ...draft(["a", "B", "c"]), title: "Rack crossbars, revised" };
    const fields = differingFields(mine, theirs);
    expect(fields).toEqual([{ key: "title" }, { key: "step", index: 1 }, { key: "step", index: 2 }]);
    const merged = mergeDrafts(mine, theirs, { title: "theirs", "step-2": "theirs" });
    expect(merged.title).toBe("Rack crossbars, revised");
    expect(merged.steps.map((s) => s.title)).toEqual(["a", "b", "c"]);
    // Nothing chosen: mine, whole.
    expect(mergeDrafts(mine, theirs, {})).toEqual(mine);
    expect(differingFields(mine, mine)).toEqual([]);
  });

  it("ignores the display-only photo addresses when comparing", () => {
    const mine = draft(["a"]);
    mine.steps[0].photos = [{ mediaId: 3, alt: "The bracket", caption: null }];
    const theirs = structuredClone(mine);
    theirs.steps[0].photos[0].variants = [{ width: 480, format: "webp", url: "/media/x" }];
    expect(differingFields(mine, theirs)).toEqual([]);
  });

  it("sees a callout the server gave back in its own key order, or with a null for an absent field, as the same", () => {
    const mine = draft(["a"]);
    mine.steps[0].callouts = [{ kind: "torque", fastener: "Bracket bolt", unit: "N·m", value: 22 }];
    const theirs = structuredClone(mine);
    theirs.steps[0].callouts = [{ value: 22, unit: "N·m", kind: "torque", fastener: "Bracket bolt", threadlocker: null }];
    expect(differingFields(mine, theirs)).toEqual([]);
    // A circuit as typed against the same circuit with the defaults the schema adds (engine/callouts.ts).
    mine.steps[0].callouts.push({ kind: "circuit", feed: "battery", loadWatts: 110, oneWayLengthM: 3 });
    theirs.steps[0].callouts.push(calloutSchema.parse(mine.steps[0].callouts[1]));
    expect(differingFields(mine, theirs)).toEqual([]);
    theirs.steps[0].callouts[0] = { value: 24, unit: "N·m", kind: "torque", fastener: "Bracket bolt" };
    expect(differingFields(mine, theirs)).toEqual([{ key: "step", index: 0 }]);
  });

  it("reads a document's text for the side-by-side view", () => {
    const body = {
      type: "doc",
      content: [
        {
          type: "paragraph",
          content: [
            { type: "text", text: "Loosen the " },
            { type: "text", text: "bolt", marks: [{ type: "bold" }] },
          ],
        },
        {
          type: "bulletList",
          content: [{ type: "listItem", content: [{ type: "paragraph", content: [{ type: "text", text: "M8" }] }] }],
        },
      ],
    };
    expect(bodyText(body)).toBe("Loosen the bolt\nM8");
  });
});
