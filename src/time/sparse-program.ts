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

class GrowF64 {
  data: Float64Array;
  length = 0;
  constructor(capacity: number) {
    this.data = new Float64Array(capacity);
  }
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
  data: Int32Array;
  length = 0;
  constructor(capacity: number) {
    this.data = new Int32Array(capacity);
  }
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

/** The growable arrays of one builder: program entries and the entries of the open step. */
class BuilderBuffers {
  readonly stepSrc = new GrowI32(INITIAL_CAPACITY);
  readonly stepDst = new GrowI32(INITIAL_CAPACITY);
  readonly stepRow = new GrowI32(INITIAL_CAPACITY);
  readonly stepEntry = new GrowI32(INITIAL_CAPACITY);
  readonly rowDst = new GrowI32(INITIAL_CAPACITY);
  readonly rowLen = new GrowI32(INITIAL_CAPACITY);
  readonly col = new GrowI32(INITIAL_CAPACITY);
  readonly weight = new GrowF64(INITIAL_CAPACITY);
  readonly tSrc = new GrowI32(INITIAL_CAPACITY);
  readonly tDst = new GrowI32(INITIAL_CAPACITY);
  readonly tW = new GrowF64(INITIAL_CAPACITY);
}

/**
 * Entries each array of a builder starts with. Every builder has arrays of its own: sharing one
 * set between the plans compiled one after the other made compiling about 30 % faster (the growth
 * of fresh arrays for every small plan), but raised the peak of the d = 2 reference run by 60–100 MB
 * (1.45–1.54 → 1.56–1.62 GB, both with a fixed shared capacity of 2¹⁴ entries and with one kept
 * at its largest size), above the target of 1.5 KB per unknown: less garbage made by compiling
 * means later garbage collections, and more of the freed system still resident during the
 * estimate (docs/adaptivity.md §5).
 */
const INITIAL_CAPACITY = 64;

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
  private buffers: BuilderBuffers | null;
  private src = -1;
  private dst = -1;
  private lo = 0;
  private hi = 0;
  // Destination of the last entry of the open step, and whether they came in ascending order
  private lastDst = -1;
  private ascending = true;

  constructor() {
    this.buffers = new BuilderBuffers();
    this.buffers.stepRow.push(0);
    this.buffers.stepEntry.push(0);
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
    const b = this.buffers!;
    b.tSrc.length = 0;
    b.tDst.length = 0;
    b.tW.length = 0;
    this.lastDst = -1;
    this.ascending = true;
  }

  add(srcSlot: number, dstSlot: number, w: number): void {
    if (w === 0) return;
    const b = this.buffers!;
    b.tSrc.push(srcSlot);
    b.tDst.push(dstSlot);
    b.tW.push(w);
    if (dstSlot < this.lastDst) this.ascending = false;
    this.lastDst = dstSlot;
  }

  endStep(): void {
    const b = this.buffers!;
    const m = b.tW.length;
    if (m === 0) return;
    const td = b.tDst.data;
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
    const ts = b.tSrc.data;
    const tw = b.tW.data;
    // Room for all rows and entries of the step at once, then plain stores.
    b.rowDst.grow(b.rowDst.length + rows);
    b.rowLen.grow(b.rowLen.length + rows);
    b.col.grow(b.col.length + m);
    b.weight.grow(b.weight.length + m);
    const rowDst = b.rowDst.data, rowLen = b.rowLen.data, col = b.col.data, weight = b.weight.data;
    let nrow = b.rowDst.length;
    let nent = b.col.length;
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
    b.rowDst.length = nrow;
    b.rowLen.length = nrow;
    b.col.length = nent;
    b.weight.length = nent;
    b.stepSrc.push(this.src);
    b.stepDst.push(this.dst);
    b.stepRow.push(nrow);
    b.stepEntry.push(nent);
  }

  /** The compiled program (copies of the entries); the builder cannot be used afterwards. */
  finish(): SparseProgram {
    const b = this.buffers!;
    const program: SparseProgram = {
      workSize: this.workSize,
      stepSrc: Uint8Array.from(b.stepSrc.data.subarray(0, b.stepSrc.length)),
      stepDst: Uint8Array.from(b.stepDst.data.subarray(0, b.stepDst.length)),
      stepRow: b.stepRow.toArray(),
      stepEntry: b.stepEntry.toArray(),
      rowDst: b.rowDst.toArray(),
      rowLen: Uint8Array.from(b.rowLen.data.subarray(0, b.rowLen.length)),
      col: b.col.toArray(),
      weight: b.weight.toArray(),
    };
    this.buffers = null;
    return program;
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
