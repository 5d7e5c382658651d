import { describe, expect, it } from "vitest";
import { candidateIds, fieldId, focusField } from "./field-paths";
import { focusAfterMove } from "./fields";
import { insertAt, moveItem, removeAt, replaceAt, RowKeys } from "./list-state";

describe("moving, removing and restoring rows", () => {
  const rows = ["a", "b", "c", "d"];

  it("moves a row one place up or down and leaves the original alone", () => {
    expect(moveItem(rows, 2, -1)).toEqual(["a", "c", "b", "d"]);
    expect(moveItem(rows, 0, 1)).toEqual(["b", "a", "c", "d"]);
    expect(rows).toEqual(["a", "b", "c", "d"]);
  });

  it("does nothing for a move past either end", () => {
    expect(moveItem(rows, 0, -1)).toEqual(rows);
    expect(moveItem(rows, 3, 1)).toEqual(rows);
    expect(moveItem(rows, 9, -1)).toEqual(rows);
  });

  it("puts a removed row back where it was (undo)", () => {
    const removed = removeAt(rows, 1);
    expect(removed).toEqual(["a", "c", "d"]);
    expect(insertAt(removed, 1, "b")).toEqual(rows);
    expect(insertAt(["a"], 5, "z")).toEqual(["a", "z"]);
    expect(replaceAt(rows, 3, "D")).toEqual(["a", "b", "c", "D"]);
  });
});

describe("row keys", () => {
  it("follow a row through moves and through edits that replace it", () => {
    const keys = new RowKeys();
    const [x, y, z] = [{ n: 1 }, { n: 2 }, { n: 3 }];
    const before = keys.keysFor([x, y, z]);
    expect(keys.keysFor(moveItem([x, y, z], 2, -1))).toEqual([before[0], before[2], before[1]]);
    const edited = { n: 20 };
    keys.carry(y, edited);
    expect(keys.keysFor([x, edited, z])).toEqual(before);
  });

  it("never repeat within a list, even when one object is in it twice", () => {
    const keys = new RowKeys();
    const same = { n: 1 };
    const list = keys.keysFor([same, same, "text", "text"]);
    expect(new Set(list).size).toBe(4);
  });
});

describe("field ids and jumps", () => {
  it("turn a message's dotted path into the input's id", () => {
    expect(fieldId("steps.2.callouts.1.value")).toBe("field-steps-2-callouts-1-value");
    expect(fieldId("fitment.3.note")).toBe("field-fitment-3-note");
  });

  it("fall back from a field to its callout, its step and its list", () => {
    expect(candidateIds("steps.1.callouts.0.loadWatts")).toEqual([
      "field-steps-1-callouts-0-loadWatts",
      "field-steps-1-callouts-0-loadAmps",
      "field-steps-1-callouts-0",
      "field-steps-1-callouts",
      "field-steps-1",
      "field-steps",
    ]);
  });

  it("focus the nearest element on the page", () => {
    const focused: string[] = [];
    const element = (id: string, tag: string) => ({
      id,
      matches: (selector: string) => selector.split(/,\s*/).includes(tag),
      hasAttribute: () => false,
      querySelector: () => null,
      scrollIntoView: () => {},
      focus: () => focused.push(id),
    });
    const page = new Map([["field-steps-1-callouts-0-loadAmps", element("field-steps-1-callouts-0-loadAmps", "input")]]);
    const root = { getElementById: (id: string) => (page.get(id) ?? null) as unknown as HTMLElement | null };
    expect(focusField("steps.1.callouts.0.loadWatts", root)).not.toBeNull();
    expect(focused).toEqual(["field-steps-1-callouts-0-loadAmps"]);
    expect(focusField("parts.4.name", root)).toBeNull();
  });

  it("hand the focus to the moved row's button, or its other one at an end of the list", () => {
    expect(focusAfterMove("tools", 0, -1)).toEqual(["field-tools-0-up", "field-tools-0-down"]);
    expect(focusAfterMove("tools", 3, 1)).toEqual(["field-tools-3-down", "field-tools-3-up"]);
  });
});
