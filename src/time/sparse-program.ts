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
  data = new Float64Array(64);
  length = 0;
  push(v: number): void {
    if (this.length === this.data.length) {
      const d = new Float64Array(this.data.length * 2);
      d.set(this.data);
      this.data = d;
    }
    this.data[this.length++] = v;
  }
  toArray(): Float64Array {
    return this.data.slice(0, this.length);
  }
}

class GrowI32 {
  data = new Int32Array(64);
  length = 0;
  push(v: number): void {
    if (this.length === this.data.length) {
      const d = new Int32Array(this.data.length * 2);
      d.set(this.data);
      this.data = d;
    }
    this.data[this.length++] = v;
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
  }

  add(srcSlot: number, dstSlot: number, w: number): void {
    if (w === 0) return;
    this.tSrc.push(srcSlot);
    this.tDst.push(dstSlot);
    this.tW.push(w);
  }

  endStep(): void {
    const m = this.tW.length;
    if (m === 0) return;
    const nr = this.hi - this.lo;
    // Counting sort by destination into shared scratch (plan building is synchronous).
    if (sortCnt.length < nr + 1) sortCnt = new Int32Array(2 * (nr + 1));
    if (sortFill.length < nr) sortFill = new Int32Array(2 * nr);
    if (sortOrder.length < m) sortOrder = new Int32Array(2 * m);
    const cnt = sortCnt;
    const fill = sortFill;
    const order = sortOrder;
    cnt.fill(0, 0, nr + 1);
    const td = this.tDst.data;
    const lo = this.lo;
    for (let e = 0; e < m; e++) cnt[td[e]! - lo + 1]!++;
    for (let r = 0; r < nr; r++) {
      cnt[r + 1]! += cnt[r]!;
      fill[r] = cnt[r]!;
    }
    for (let e = 0; e < m; e++) order[fill[td[e]! - lo]!++] = e;
    const ts = this.tSrc.data;
    const tw = this.tW.data;
    for (let r = 0; r < nr; r++) {
      for (let q0 = cnt[r]!; q0 < cnt[r + 1]!; q0 += 255) {
        const q1 = Math.min(q0 + 255, cnt[r + 1]!);
        this.rowDst.push(lo + r);
        this.rowLen.push(q1 - q0);
        for (let q = q0; q < q1; q++) {
          const e = order[q]!;
          this.col.push(ts[e]!);
          this.weight.push(tw[e]!);
        }
      }
    }
    this.stepSrc.push(this.src);
    this.stepDst.push(this.dst);
    this.stepRow.push(this.rowDst.length);
    this.stepEntry.push(this.col.length);
  }

  finish(): SparseProgram {
    return {
      workSize: this.workSize,
      stepSrc: Uint8Array.from(this.stepSrc.toArray()),
      stepDst: Uint8Array.from(this.stepDst.toArray()),
      stepRow: this.stepRow.toArray(),
      stepEntry: this.stepEntry.toArray(),
      rowDst: this.rowDst.toArray(),
      rowLen: Uint8Array.from(this.rowLen.toArray()),
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
