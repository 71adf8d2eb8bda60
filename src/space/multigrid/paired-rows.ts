/**
 * Growable sparse rows of a symmetric matrix pair (K, M) with a shared pattern,
 * used while building the Galerkin hierarchy (docs/method.md §4.3).
 *
 * Row i keeps its off-diagonal entries (column, k, m) in a slot range of one
 * pooled array; the diagonal is held separately. A full row is moved to the end
 * of the pool with twice its capacity, so insertions cost amortised O(1) beyond
 * the linear search of the (short, bounded-valence) row.
 */
export class PairedRows {
  readonly n: number;
  readonly start: Int32Array;
  readonly len: Int32Array;
  readonly cap: Int32Array;
  /** Diagonal entries, interleaved (k, m) per row. */
  readonly diag: Float64Array;
  /** Column index per slot. */
  cols: Int32Array;
  /** Values per slot, interleaved (k, m). */
  vals: Float64Array;
  private top: number;

  /**
   * `capacity[i]` is the initial number of off-diagonal slots of row i (the array is taken over,
   * not copied); `reserve` extra slots are kept free at the end of the pool for {@link appendCopy}.
   */
  constructor(n: number, capacity: Int32Array, reserve = 0) {
    this.n = n;
    this.start = new Int32Array(n);
    this.len = new Int32Array(n);
    this.cap = capacity;
    this.diag = new Float64Array(2 * n);
    let total = 0;
    for (let i = 0; i < n; i++) {
      this.start[i] = total;
      total += capacity[i]!;
    }
    const poolSize = total + Math.max(reserve, total >> 3) + 16;
    this.cols = new Int32Array(poolSize);
    this.vals = new Float64Array(2 * poolSize);
    this.top = total;
  }

  /** Slot of column j in row i, or −1. */
  find(i: number, j: number): number {
    const cols = this.cols;
    const s = this.start[i]!;
    const e = s + this.len[i]!;
    for (let p = s; p < e; p++) if (cols[p] === j) return p;
    return -1;
  }

  /** K[i,j] += k, M[i,j] += m for i ≠ j (one triangle of the pair only). */
  add(i: number, j: number, k: number, m: number): void {
    let p = this.find(i, j);
    if (p < 0) {
      if (this.len[i] === this.cap[i]) this.grow(i);
      p = this.start[i]! + this.len[i]!;
      this.len[i] = this.len[i]! + 1;
      this.cols[p] = j;
      this.vals[2 * p] = 0;
      this.vals[2 * p + 1] = 0;
    }
    this.vals[2 * p] = this.vals[2 * p]! + k;
    this.vals[2 * p + 1] = this.vals[2 * p + 1]! + m;
  }

  /** Adds (k, m) to entries (i, j) and (j, i), or to the diagonal when i = j. */
  addSymmetric(i: number, j: number, k: number, m: number): void {
    if (i === j) {
      this.diag[2 * i] = this.diag[2 * i]! + k;
      this.diag[2 * i + 1] = this.diag[2 * i + 1]! + m;
    } else {
      this.add(i, j, k, m);
      this.add(j, i, k, m);
    }
  }

  /** Removes column j from row i (if present); the row order is not kept. */
  remove(i: number, j: number): void {
    const p = this.find(i, j);
    if (p < 0) return;
    const last = this.start[i]! + this.len[i]! - 1;
    this.cols[p] = this.cols[last]!;
    this.vals[2 * p] = this.vals[2 * last]!;
    this.vals[2 * p + 1] = this.vals[2 * last + 1]!;
    this.len[i] = this.len[i]! - 1;
  }

  /**
   * Appends a copy of row i (its current entries) at the end of the pool and returns the slot
   * where it starts; the copy is not a row of its own and is never changed by later updates.
   * Slot offsets stay valid when the pool is reallocated.
   */
  appendCopy(i: number): number {
    const s = this.start[i]!;
    const l = this.len[i]!;
    this.ensure(l);
    const t = this.top;
    const cols = this.cols, vals = this.vals;
    for (let p = 0; p < l; p++) {
      cols[t + p] = cols[s + p]!;
      vals[2 * (t + p)] = vals[2 * (s + p)]!;
      vals[2 * (t + p) + 1] = vals[2 * (s + p) + 1]!;
    }
    this.top += l;
    return t;
  }

  /** Makes room for `extra` more slots at the end of the pool. */
  private ensure(extra: number): void {
    if (this.top + extra <= this.cols.length) return;
    const size = Math.max(2 * this.cols.length, this.top + extra);
    const cols = new Int32Array(size);
    cols.set(this.cols.subarray(0, this.top));
    const vals = new Float64Array(2 * size);
    vals.set(this.vals.subarray(0, 2 * this.top));
    this.cols = cols;
    this.vals = vals;
  }

  private grow(i: number): void {
    const oldCap = this.cap[i]!;
    const newCap = Math.max(4, 2 * oldCap);
    this.ensure(newCap);
    const s = this.start[i]!;
    const l = this.len[i]!;
    this.cols.copyWithin(this.top, s, s + l);
    this.vals.copyWithin(2 * this.top, 2 * s, 2 * (s + l));
    this.start[i] = this.top;
    this.cap[i] = newCap;
    this.top += newCap;
  }
}
