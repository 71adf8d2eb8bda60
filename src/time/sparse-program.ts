/**
 * A linear "program": a sequence of sparse gather steps dst[r] += Σ w·src[c] over flat
 * Float64Arrays, where src is the input x or the scratch buffer and dst the scratch buffer
 * or the output y. Tree-operator plans compile into one of these; applying it is a single
 * pass over typed arrays (docs/method.md §3.3, §10).
 */

export const SRC_X = 0;
export const SRC_WORK = 1;
export const DST_WORK = 1;
export const DST_Y = 2;

/**
 * Entries each growable array starts with. Every builder has arrays of its own: sharing one
 * set between the plans compiled one after the other made compiling about 30 % faster (the growth
 * of fresh arrays for every small plan), but raised the peak of the d = 2 reference run by 60–100 MB
 * (1.45–1.54 → 1.56–1.62 GB, both with a fixed shared capacity of 2¹⁴ entries and with one kept
 * at its largest size), above the target of 1.5 KB per unknown: less garbage made by compiling
 * means later garbage collections, and more of the freed system still resident during the
 * estimate (docs/adaptivity.md §5).
 */
const INITIAL_CAPACITY = 64;

class GrowF64 {
  data = new Float64Array(INITIAL_CAPACITY);
  length = 0;
  push(v: number): void {
    if (this.length === this.data.length) this.grow(this.length + 1);
    this.data[this.length++] = v;
  }
  /** Makes room for `n` entries in all (amortised doubling). */
  grow(n: number): void {
    if (n <= this.data.length) return;
    const d = new Float64Array(Math.max(n, 2 * this.data.length));
    d.set(this.data.subarray(0, this.length));
    this.data = d;
  }
  toArray(): Float64Array {
    return this.data.slice(0, this.length);
  }
}

class GrowI32 {
  data = new Int32Array(INITIAL_CAPACITY);
  length = 0;
  push(v: number): void {
    if (this.length === this.data.length) this.grow(this.length + 1);
    this.data[this.length++] = v;
  }
  /** Makes room for `n` entries in all (amortised doubling). */
  grow(n: number): void {
    if (n <= this.data.length) return;
    const d = new Int32Array(Math.max(n, 2 * this.data.length));
    d.set(this.data.subarray(0, this.length));
    this.data = d;
  }
  toArray(): Int32Array {
    return this.data.slice(0, this.length);
  }
}

// Scratch of ProgramBuilder.endStep, shared by all builders and grown on demand.
let sortCnt = new Int32Array(256);
let sortFill = new Int32Array(256);
let sortOrder = new Int32Array(256);

/** Compiled program; see {@link runProgram}. */
export interface SparseProgram {
  /** Scratch slots needed per batch column. */
  readonly workSize: number;
  readonly stepSrc: Uint8Array;
  readonly stepDst: Uint8Array;
  /** Rows of step s are [stepRow[s], stepRow[s+1]), its entries start at stepEntry[s]. */
  readonly stepRow: Int32Array;
  readonly stepEntry: Int32Array;
  /** Destination slot and number of entries (≤ 255) of each row; entries follow row by row. */
  readonly rowDst: Int32Array;
  readonly rowLen: Uint8Array;
  readonly col: Int32Array;
  readonly weight: Float64Array;
}

/**
 * Collects steps. Entries of one step may come in any order; `endStep` sorts them by
 * destination (counting sort, linear), drops empty rows and splits rows longer than 255.
 */
export class ProgramBuilder {
  workSize = 0;
  private readonly stepSrc = new GrowI32();
  private readonly stepDst = new GrowI32();
  private readonly stepRow = new GrowI32();
  private readonly stepEntry = new GrowI32();
  private readonly rowDst = new GrowI32();
  private readonly rowLen = new GrowI32();
  private readonly col = new GrowI32();
  private readonly weight = new GrowF64();
  // entries of the open step
  private readonly tSrc = new GrowI32();
  private readonly tDst = new GrowI32();
  private readonly tW = new GrowF64();
  private src = -1;
  private dst = -1;
  private lo = 0;
  private hi = 0;
  // Destination of the last entry of the open step, and whether they came in ascending order
  private lastDst = -1;
  private ascending = true;

  constructor() {
    this.stepRow.push(0);
    this.stepEntry.push(0);
  }

  /** Reserves n scratch slots; returns the first. */
  alloc(n: number): number {
    const base = this.workSize;
    this.workSize += n;
    return base;
  }

  /** Opens a step whose destinations lie in [dstLo, dstHi). */
  beginStep(src: number, dst: number, dstLo: number, dstHi: number): void {
    this.src = src;
    this.dst = dst;
    this.lo = dstLo;
    this.hi = dstHi;
    this.tSrc.length = 0;
    this.tDst.length = 0;
    this.tW.length = 0;
    this.lastDst = -1;
    this.ascending = true;
  }

  add(srcSlot: number, dstSlot: number, w: number): void {
    if (w === 0) return;
    this.tSrc.push(srcSlot);
    this.tDst.push(dstSlot);
    this.tW.push(w);
    if (dstSlot < this.lastDst) this.ascending = false;
    this.lastDst = dstSlot;
  }

  endStep(): void {
    const m = this.tW.length;
    if (m === 0) return;
    const td = this.tDst.data;
    const lo = this.lo;
    const nr = this.hi - this.lo;
    // Entries whose destinations came in ascending order (output-driven steps) are already grouped
    // into rows; the others are grouped by a counting sort (stable, so the order within a row is
    // the order of `add` either way).
    let order: Int32Array | null = null;
    let cnt = sortCnt; // row starts of the sorted entries (counting sort only)
    let rows = 0;
    if (this.ascending) {
      for (let e = 0; e < m; ) {
        let f = e + 1;
        while (f < m && td[f] === td[e]) f++;
        rows += Math.ceil((f - e) / 255);
        e = f;
      }
    } else {
      if (sortCnt.length < nr + 1) sortCnt = new Int32Array(2 * (nr + 1));
      if (sortFill.length < nr) sortFill = new Int32Array(2 * nr);
      if (sortOrder.length < m) sortOrder = new Int32Array(2 * m);
      cnt = sortCnt;
      const fill = sortFill;
      order = sortOrder;
      cnt.fill(0, 0, nr + 1);
      for (let e = 0; e < m; e++) cnt[td[e]! - lo + 1]!++;
      for (let r = 0; r < nr; r++) {
        const len = cnt[r + 1]!;
        if (len > 0) rows += Math.ceil(len / 255);
        cnt[r + 1]! += cnt[r]!;
        fill[r] = cnt[r]!;
      }
      for (let e = 0; e < m; e++) order[fill[td[e]! - lo]!++] = e;
    }
    const ts = this.tSrc.data;
    const tw = this.tW.data;
    // Room for all rows and entries of the step at once, then plain stores.
    this.rowDst.grow(this.rowDst.length + rows);
    this.rowLen.grow(this.rowLen.length + rows);
    this.col.grow(this.col.length + m);
    this.weight.grow(this.weight.length + m);
    const rowDst = this.rowDst.data, rowLen = this.rowLen.data, col = this.col.data, weight = this.weight.data;
    let nrow = this.rowDst.length;
    let nent = this.col.length;
    if (order === null) {
      for (let e = 0; e < m; ) {
        let f = e + 1;
        while (f < m && td[f] === td[e]) f++;
        for (let q0 = e; q0 < f; q0 += 255) {
          const q1 = Math.min(q0 + 255, f);
          rowDst[nrow] = td[e]!;
          rowLen[nrow++] = q1 - q0;
          for (let q = q0; q < q1; q++) {
            col[nent] = ts[q]!;
            weight[nent++] = tw[q]!;
          }
        }
        e = f;
      }
    } else {
      for (let r = 0; r < nr; r++) {
        for (let q0 = cnt[r]!; q0 < cnt[r + 1]!; q0 += 255) {
          const q1 = Math.min(q0 + 255, cnt[r + 1]!);
          rowDst[nrow] = lo + r;
          rowLen[nrow++] = q1 - q0;
          for (let q = q0; q < q1; q++) {
            const e = order[q]!;
            col[nent] = ts[e]!;
            weight[nent++] = tw[e]!;
          }
        }
      }
    }
    this.rowDst.length = nrow;
    this.rowLen.length = nrow;
    this.col.length = nent;
    this.weight.length = nent;
    this.stepSrc.push(this.src);
    this.stepDst.push(this.dst);
    this.stepRow.push(nrow);
    this.stepEntry.push(nent);
  }

  /** The compiled program (copies of the entries). */
  finish(): SparseProgram {
    return {
      workSize: this.workSize,
      stepSrc: Uint8Array.from(this.stepSrc.data.subarray(0, this.stepSrc.length)),
      stepDst: Uint8Array.from(this.stepDst.data.subarray(0, this.stepDst.length)),
      stepRow: this.stepRow.toArray(),
      stepEntry: this.stepEntry.toArray(),
      rowDst: this.rowDst.toArray(),
      rowLen: Uint8Array.from(this.rowLen.data.subarray(0, this.rowLen.length)),
      col: this.col.toArray(),
      weight: this.weight.toArray(),
    };
  }
}

/** Rows [r0, r1) of one step with entries from q, one column. */
function gather1(
  src: Float64Array, dst: Float64Array, rowDst: Int32Array, rowLen: Uint8Array, col: Int32Array, weight: Float64Array,
  r0: number, r1: number, q: number,
): void {
  for (let r = r0; r < r1; r++) {
    const q1 = q + rowLen[r]!;
    let acc = 0;
    for (; q < q1; q++) acc += weight[q]! * src[col[q]!]!;
    dst[rowDst[r]!] += acc;
  }
}

/** Rows [r0, r1) of one step, `batch` interleaved columns. */
function gatherBatch(p: SparseProgram, src: Float64Array, dst: Float64Array, r0: number, r1: number, q: number, batch: number): void {
  const { rowDst, rowLen, col, weight } = p;
  for (let r = r0; r < r1; r++) {
    const d = rowDst[r]! * batch;
    const q1 = q + rowLen[r]!;
    for (; q < q1; q++) {
      const w = weight[q]!;
      const c = col[q]! * batch;
      for (let b = 0; b < batch; b++) dst[d + b] += w * src[c + b]!;
    }
  }
}

/**
 * Runs the program: `work` must hold ≥ workSize·batch zeros on entry, y is accumulated into
 * (the caller zeroes it). Slot s of column b lives at s·batch + b in x, work and y.
 */
export function runProgram(p: SparseProgram, x: Float64Array, work: Float64Array, y: Float64Array, batch: number): void {
  const { stepSrc, stepDst, stepRow, stepEntry, rowDst, rowLen, col, weight } = p;
  const ns = stepSrc.length;
  for (let s = 0; s < ns; s++) {
    const src = stepSrc[s] === SRC_X ? x : work;
    const dst = stepDst[s] === DST_Y ? y : work;
    const r0 = stepRow[s]!;
    const r1 = stepRow[s + 1]!;
    const q = stepEntry[s]!;
    if (batch === 1) gather1(src, dst, rowDst, rowLen, col, weight, r0, r1, q);
    else gatherBatch(p, src, dst, r0, r1, q, batch);
  }
}
