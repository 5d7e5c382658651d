import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { firstInOrder } from "./library-index.server";

// The reference is Array.prototype.sort (ECMAScript 2019 and later: a stable sort) followed by slice.
describe("firstInOrder", () => {
  it("gives the first k items of the stable sorted order, for any items and k", () => {
    fc.assert(
      fc.property(fc.array(fc.integer({ min: 0, max: 20 }), { maxLength: 200 }), fc.integer({ min: 0, max: 220 }), (keys, k) => {
        const items = keys.map((key, position) => ({ key, position }));
        const before = (a: (typeof items)[number], b: (typeof items)[number]) =>
          a.key < b.key || (a.key === b.key && a.position < b.position);
        const expected = [...items].sort((a, b) => a.key - b.key).slice(0, k);
        expect(firstInOrder(items, k, before)).toEqual(expected);
      }),
    );
  });
});
