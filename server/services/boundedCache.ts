/**
 * A map that keeps the most recently used entries while their total weight (e.g. characters of JSON)
 * stays within `maxWeight`; the least recently used go first. An entry heavier than the whole budget is not kept.
 */
export class WeightedLru<K, V> {
  private readonly entries = new Map<K, { value: V; weight: number }>();
  private total = 0;

  constructor(private readonly maxWeight: number) {}

  get(key: K): V | undefined {
    const entry = this.entries.get(key);
    if (!entry) return undefined;
    this.entries.delete(key);
    this.entries.set(key, entry);
    return entry.value;
  }

  set(key: K, value: V, weight: number): void {
    this.delete(key);
    if (weight > this.maxWeight) return;
    this.entries.set(key, { value, weight });
    this.total += weight;
    for (const [oldest] of this.entries) {
      if (this.total <= this.maxWeight) break;
      this.delete(oldest);
    }
  }

  delete(key: K): void {
    const entry = this.entries.get(key);
    if (!entry) return;
    this.entries.delete(key);
    this.total -= entry.weight;
  }

  get weight(): number {
    return this.total;
  }

  get size(): number {
    return this.entries.size;
  }
}
