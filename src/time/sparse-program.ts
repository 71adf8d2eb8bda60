/**
 * A linear "program": a sequence of sparse gather steps dst[r] += Σ w·src[c] over flat
 * Float64Arrays, where src is the input x or the scratch buffer and dst the scratch buffer
 * or the output y. Tree-operator plans compile into one of these; applying it is a single
 * pass over typed arrays (DESIGN §3.3, §10).
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

/** Compiled program; see {@link runProgram}. */
export interface SparseProgram {
  /** Scratch slots needed per batch column. */
  readonly workSize: number;
  readonly stepSrc: Uint8Array;
  readonly stepDst: Uint8Array;
  /** Rows of step s are [stepRow[s], stepRow[s+1]). */
  readonly stepRow: Int32Array;
  /** Destination slot of each row. */
  readonly rowDst: Int32Array;
  /** Entries of row r are [rowPtr[r], rowPtr[r+1]). */
  readonly rowPtr: Int32Array;
  readonly col: Int32Array;
  readonly weight: Float64Array;
}

/**
 * Collects steps. Entries of one step may come in any order; `endStep` sorts them by
 * destination (counting sort, linear) and drops empty rows.
 */
export class ProgramBuilder {
  workSize = 0;
  private readonly stepSrc = new GrowI32();
  private readonly stepDst = new GrowI32();
  private readonly stepRow = new GrowI32();
  private readonly rowDst = new GrowI32();
  private readonly rowPtr = new GrowI32();
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
    this.rowPtr.push(0);
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
    const cnt = new Int32Array(nr + 1);
    const td = this.tDst.data;
    for (let e = 0; e < m; e++) cnt[td[e]! - this.lo + 1]!++;
    for (let r = 0; r < nr; r++) cnt[r + 1]! += cnt[r]!;
    const order = new Int32Array(m);
    const fill = cnt.slice(0, nr);
    for (let e = 0; e < m; e++) order[fill[td[e]! - this.lo]!++] = e;
    const ts = this.tSrc.data;
    const tw = this.tW.data;
    for (let r = 0; r < nr; r++) {
      if (cnt[r + 1] === cnt[r]) continue;
      this.rowDst.push(this.lo + r);
      for (let q = cnt[r]!; q < cnt[r + 1]!; q++) {
        const e = order[q]!;
        this.col.push(ts[e]!);
        this.weight.push(tw[e]!);
      }
      this.rowPtr.push(this.col.length);
    }
    this.stepSrc.push(this.src);
    this.stepDst.push(this.dst);
    this.stepRow.push(this.rowDst.length);
  }

  finish(): SparseProgram {
    return {
      workSize: this.workSize,
      stepSrc: Uint8Array.from(this.stepSrc.toArray()),
      stepDst: Uint8Array.from(this.stepDst.toArray()),
      stepRow: this.stepRow.toArray(),
      rowDst: this.rowDst.toArray(),
      rowPtr: this.rowPtr.toArray(),
      col: this.col.toArray(),
      weight: this.weight.toArray(),
    };
  }
}

/** Rows [r0, r1) of one step, one column. */
function gather1(src: Float64Array, dst: Float64Array, rowDst: Int32Array, rowPtr: Int32Array, col: Int32Array, weight: Float64Array, r0: number, r1: number): void {
  let q = rowPtr[r0]!;
  for (let r = r0; r < r1; r++) {
    const q1 = rowPtr[r + 1]!;
    let acc = 0;
    for (; q < q1; q++) acc += weight[q]! * src[col[q]!]!;
    dst[rowDst[r]!] += acc;
  }
}

/** Rows [r0, r1) of one step, `batch` interleaved columns. */
function gatherBatch(
  src: Float64Array, dst: Float64Array, rowDst: Int32Array, rowPtr: Int32Array, col: Int32Array, weight: Float64Array,
  r0: number, r1: number, batch: number,
): void {
  for (let r = r0; r < r1; r++) {
    const d = rowDst[r]! * batch;
    const q1 = rowPtr[r + 1]!;
    for (let q = rowPtr[r]!; q < q1; q++) {
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
  const { stepSrc, stepDst, stepRow, rowDst, rowPtr, col, weight } = p;
  const ns = stepSrc.length;
  for (let s = 0; s < ns; s++) {
    const src = stepSrc[s] === SRC_X ? x : work;
    const dst = stepDst[s] === DST_Y ? y : work;
    if (batch === 1) gather1(src, dst, rowDst, rowPtr, col, weight, stepRow[s]!, stepRow[s + 1]!);
    else gatherBatch(src, dst, rowDst, rowPtr, col, weight, stepRow[s]!, stepRow[s + 1]!, batch);
  }
}
