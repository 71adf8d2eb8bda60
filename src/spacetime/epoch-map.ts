/**
 * A map whose entries remember the epoch of their last use, so that caches shared across the steps
 * of an adaptive run can release what the recent steps did not touch (docs/adaptivity.md §5).
 * @internal
 */
export class EpochMap<V> {
  private readonly items = new Map<number, { value: V; epoch: number }>();
  private epoch = 0;

  /** The value under `key`, built by `make` on first use; marks it used in the current epoch. */
  getOrMake(key: number, make: () => V): V {
    let item = this.items.get(key);
    if (item === undefined) {
      item = { value: make(), epoch: this.epoch };
      this.items.set(key, item);
    } else item.epoch = this.epoch;
    return item.value;
  }

  /** Starts a new epoch and deletes the entries not used during the last `keep` epochs. */
  advance(keep: number): void {
    this.epoch++;
    for (const [key, item] of this.items) if (item.epoch < this.epoch - keep) this.items.delete(key);
  }

  /** Deletes the entries not used during the current epoch (what the current step did not ask for). */
  prune(): void {
    for (const [key, item] of this.items) if (item.epoch < this.epoch) this.items.delete(key);
  }

  /** Deletes every entry. */
  clear(): void {
    this.items.clear();
  }

  /** The values currently held. */
  *values(): IterableIterator<V> {
    for (const item of this.items.values()) yield item.value;
  }

  get size(): number {
    return this.items.size;
  }
}
