/**
 * Work vectors by slot, shared by operators that are never applied at the same time and grown to
 * the largest request. Example: a V-cycle needs about 8 doubles of work per vertex, and an adaptive
 * step holds hundreds of hierarchies (one per distinct fibre of K_Y and K_X) but applies one at a
 * time, so one set of work vectors, as long as the largest fibre, serves them all
 * (docs/adaptivity.md §5). @internal
 */
export class WorkVectors {
  private vectors: Float64Array[] = [];

  /** Work vector number `slot`, with at least `size` entries; its contents are undefined. */
  get(slot: number, size: number): Float64Array {
    let v = this.vectors[slot];
    if (v === undefined || v.length < size) {
      v = new Float64Array(size);
      this.vectors[slot] = v;
    }
    return v;
  }

  /** Drops the vectors (they are allocated again on next use). */
  release(): void {
    this.vectors = [];
  }
}
