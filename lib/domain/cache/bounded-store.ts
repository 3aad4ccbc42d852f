/**
 * A least-recently-used store bounded both in entries and in bytes: reading an entry makes it the most
 * recent, and adding one drops the least recent until both bounds hold. An entry larger than a quarter of
 * the byte bound is not kept at all, so one huge answer cannot empty the store.
 */
export class BoundedStore<V extends { bytes: number }> {
  private readonly entries = new Map<string, V>();
  private total = 0;

  constructor(
    readonly maxEntries: number,
    readonly maxBytes: number,
  ) {}

  get size(): number {
    return this.entries.size;
  }

  get bytes(): number {
    return this.total;
  }

  get(key: string): V | undefined {
    const value = this.entries.get(key);
    if (value === undefined) return undefined;
    // a Map iterates in insertion order, so re-inserting marks the entry most recent
    this.entries.delete(key);
    this.entries.set(key, value);
    return value;
  }

  set(key: string, value: V): void {
    this.delete(key);
    if (value.bytes > this.maxBytes / 4) return;
    this.entries.set(key, value);
    this.total += value.bytes;
    for (const [oldest, dropped] of this.entries) {
      if (this.entries.size <= this.maxEntries && this.total <= this.maxBytes) break;
      this.entries.delete(oldest);
      this.total -= dropped.bytes;
    }
  }

  delete(key: string): void {
    const value = this.entries.get(key);
    if (value === undefined) return;
    this.entries.delete(key);
    this.total -= value.bytes;
  }

  clear(): void {
    this.entries.clear();
    this.total = 0;
  }
}
