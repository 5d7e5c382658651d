/**
 * Pure helpers for the editor's ordered lists (callouts, parts, tools, fitment rows). Each returns
 * a new array and leaves the one it was given alone, so React sees every change.
 */

/** Moves the item at `from` by `delta` places; a move past either end leaves the list as it was. */
export function moveItem<T>(list: readonly T[], from: number, delta: number): T[] {
  const to = from + delta;
  if (from < 0 || from >= list.length || to < 0 || to >= list.length || delta === 0) return [...list];
  const next = [...list];
  const [item] = next.splice(from, 1);
  next.splice(to, 0, item);
  return next;
}

export function removeAt<T>(list: readonly T[], index: number): T[] {
  return list.filter((_, i) => i !== index);
}

export function replaceAt<T>(list: readonly T[], index: number, item: T): T[] {
  return list.map((current, i) => (i === index ? item : current));
}

/** Puts `item` back at `index` (clamped to the list), as an undo of `removeAt` does. */
export function insertAt<T>(list: readonly T[], index: number, item: T): T[] {
  const at = Math.max(0, Math.min(index, list.length));
  return [...list.slice(0, at), item, ...list.slice(at)];
}

/**
 * Keys that follow a row through moves, so what a row keeps in local state (a half-typed number)
 * moves with it. A row object keeps its key while it is the same object; `carry` hands a key on
 * to the edited copy that replaces a row. A list that holds one object twice gets the second
 * occurrence its own key, so React never sees two rows with one key.
 */
export class RowKeys {
  private keys = new WeakMap<object, string>();
  private counter = 0;

  private keyOf(item: unknown, index: number): string {
    if (typeof item !== "object" || item === null) return `at-${index}`;
    let key = this.keys.get(item);
    if (key === undefined) {
      key = `row-${this.counter++}`;
      this.keys.set(item, key);
    }
    return key;
  }

  keysFor(items: readonly unknown[]): string[] {
    const seen = new Set<string>();
    return items.map((item, index) => {
      let key = this.keyOf(item, index);
      if (seen.has(key)) key = `${key}-at-${index}`;
      seen.add(key);
      return key;
    });
  }

  /** The edited copy `to` takes over the key of the row `from` it replaces. */
  carry(from: unknown, to: unknown): void {
    if (typeof from !== "object" || from === null || typeof to !== "object" || to === null) return;
    const key = this.keys.get(from);
    if (key !== undefined) this.keys.set(to, key);
  }
}
