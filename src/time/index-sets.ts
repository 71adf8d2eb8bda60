/**
 * Sorted sparse index sets of one level (docs/method.md §3.3: "per-level sparse single-scale vectors as
 * sorted index arrays") and a cursor for near-monotone look-ups while building plans.
 */

/** Union of integer ranges [a, b] as a sorted array without duplicates; linear after sorting the ranges. */
export class RangeUnion {
  private lo: number[] = [];
  private hi: number[] = [];
  private sorted = true;

  push(a: number, b: number): void {
    if (a > b) return;
    const n = this.lo.length;
    if (n > 0 && a < this.lo[n - 1]!) this.sorted = false;
    this.lo.push(a);
    this.hi.push(b);
  }

  values(): Float64Array {
    const n = this.lo.length;
    let order: number[] | null = null;
    if (!this.sorted) {
      order = Array.from({ length: n }, (_, i) => i);
      order.sort((i, j) => this.lo[i]! - this.lo[j]!);
    }
    // count first, then fill
    let total = 0;
    let cur = -Infinity;
    for (let r = 0; r < n; r++) {
      const i = order ? order[r]! : r;
      const a = Math.max(this.lo[i]!, cur + 1);
      const b = this.hi[i]!;
      if (b >= a) {
        total += b - a + 1;
        cur = b;
      }
    }
    const out = new Float64Array(total);
    let m = 0;
    cur = -Infinity;
    for (let r = 0; r < n; r++) {
      const i = order ? order[r]! : r;
      const b = this.hi[i]!;
      for (let v = Math.max(this.lo[i]!, cur + 1); v <= b; v++) out[m++] = v;
      if (b > cur) cur = b;
    }
    return out;
  }
}

/** Position look-ups in a sorted array, fast when successive queries are close (amortised O(1)). */
export class SortedCursor {
  private pos = 0;
  constructor(private readonly vals: Float64Array) {}

  /** Position of v, or −1. */
  find(v: number): number {
    const a = this.vals;
    let p = this.pos;
    while (p > 0 && a[p - 1]! >= v) p--;
    while (p < a.length && a[p]! < v) p++;
    this.pos = p;
    return p < a.length && a[p] === v ? p : -1;
  }
}
