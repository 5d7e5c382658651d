/**
 * A least-recently-used map with a bound on the total weight of what it holds (entries, bytes …).
 * For things that never change once made, such as the view of a published revision: an entry is
 * dropped only to make room, never because it went stale.
 */
export class BoundedCache<K, V> {
  readonly #entries = new Map<K, { value: V; weight: number }>();
  #weight = 0;

  constructor(
    readonly maxWeight: number,
    readonly weigh: (value: V) => number = () => 1,
  ) {}

  get size() {
    return this.#entries.size;
  }

  get weight() {
    return this.#weight;
  }

  get(key: K): V | undefined {
    const entry = this.#entries.get(key);
    if (!entry) return undefined;
    // Map keeps insertion order: moving the entry to the end marks it most recently used.
    this.#entries.delete(key);
    this.#entries.set(key, entry);
    return entry.value;
  }

  /** Keeps `value` unless it alone outweighs the bound; drops the least recently used to make room. */
  set(key: K, value: V): void {
    this.delete(key);
    const weight = this.weigh(value);
    if (weight > this.maxWeight) return;
    this.#entries.set(key, { value, weight });
    this.#weight += weight;
    for (const [oldest, entry] of this.#entries) {
      if (this.#weight <= this.maxWeight) break;
      this.#entries.delete(oldest);
      this.#weight -= entry.weight;
    }
  }

  delete(key: K): void {
    const entry = this.#entries.get(key);
    if (!entry) return;
    this.#entries.delete(key);
    this.#weight -= entry.weight;
  }

  clear(): void {
    this.#entries.clear();
    this.#weight = 0;
  }
}
