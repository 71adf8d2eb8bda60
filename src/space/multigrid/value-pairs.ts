/**
 * Compact storage of the smoother rows of the Galerkin hierarchy: the off-diagonal entries of
 * each kept row are copied contiguously, and their (A, M) value pairs are replaced by indices into
 * a table of the distinct pairs.
 *
 * Why this is worth it: on meshes made by bisection the element matrices come in a few similarity
 * classes, A is invariant under scaling in 2D and M scales by a power of 2 per generation, and the
 * Galerkin products of nested P1 spaces reproduce the rediscretised matrices exactly; so a
 * hierarchy holds only a few dozen distinct pairs per generation (measured: 52 pairs among
 * 1.6·10⁷ entries on a uniform mesh of 10⁶ vertices). 16 bytes per entry become 2, which was
 * about 60 % of a V-cycle hierarchy's memory. The table keeps the values bit for bit, so the cycle
 * computes exactly what it computed from the values themselves. With more than 2¹⁶ distinct pairs
 * (variable coefficients) the indices are 32-bit, and the table holds every pair.
 */

/** Rows of {@link compactRows}: entries [rowStart[k], rowEnd[k]) of `cols` and `pair`. */
export interface CompactRows {
  rowStart: Int32Array;
  rowEnd: Int32Array;
  cols: Int32Array;
  /** Index of each entry's (A, M) pair in `pairValues`. */
  pair: Uint16Array | Int32Array;
  /** Distinct pairs, interleaved (A, M). */
  pairValues: Float64Array;
}

/**
 * Copies the row ranges [rowStart[k], rowEnd[k]) of a pooled (cols, interleaved vals) storage into
 * compact arrays with indexed value pairs (module comment). Slots of the pool that no row uses are
 * dropped.
 */
export function compactRows(rowStart: Int32Array, rowEnd: Int32Array, cols: Int32Array, vals: Float64Array): CompactRows {
  const nk = rowStart.length;
  let m = 0;
  for (let k = 0; k < nk; k++) m += rowEnd[k]! - rowStart[k]!;
  const start = new Int32Array(nk);
  const end = new Int32Array(nk);
  const outCols = new Int32Array(m);
  // 16-bit indices, widened to 32 bits if the table outgrows them.
  let pair: Uint16Array | Int32Array = new Uint16Array(m);
  const table = new PairTable();
  const bits = new Uint32Array(vals.buffer, vals.byteOffset, 2 * vals.length);
  let q = 0;
  for (let k = 0; k < nk; k++) {
    start[k] = q;
    for (let t = rowStart[k]!; t < rowEnd[k]!; t++, q++) {
      outCols[q] = cols[t]!;
      const id = table.intern(bits, 4 * t);
      if (id === 0x10000 && pair instanceof Uint16Array) {
        const wide = new Int32Array(m);
        wide.set(pair.subarray(0, q));
        pair = wide;
      }
      pair[q] = id;
    }
    end[k] = q;
  }
  return { rowStart: start, rowEnd: end, cols: outCols, pair, pairValues: table.values() };
}

/** 32-bit hash of a pair's four words (multiplicative mixing, common practice). */
function pairHash(b0: number, b1: number, b2: number, b3: number): number {
  const h = Math.imul(b0 ^ Math.imul(b1, 0x9e3779b1) ^ Math.imul(b2, 0x85ebca6b) ^ Math.imul(b3, 0xc2b2ae35), 0x27d4eb2d);
  return h ^ (h >>> 15);
}

/** Open-addressing hash set of (A, M) pairs keyed by their 128 bits. */
class PairTable {
  private slots = new Int32Array(256).fill(-1);
  private mask = 255;
  private store = new Float64Array(64);
  private words = new Uint32Array(this.store.buffer);
  private count = 0;

  /** Index of the pair whose four 32-bit words start at bits[w], added if new. */
  intern(bits: Uint32Array, w: number): number {
    const b0 = bits[w]!, b1 = bits[w + 1]!, b2 = bits[w + 2]!, b3 = bits[w + 3]!;
    const words = this.words;
    for (let s = pairHash(b0, b1, b2, b3) & this.mask; ; s = (s + 1) & this.mask) {
      const id = this.slots[s]!;
      if (id < 0) {
        this.slots[s] = this.count;
        return this.add(b0, b1, b2, b3);
      }
      const o = 4 * id;
      if (words[o] === b0 && words[o + 1] === b1 && words[o + 2] === b2 && words[o + 3] === b3) return id;
    }
  }

  private add(b0: number, b1: number, b2: number, b3: number): number {
    const id = this.count++;
    if (4 * this.count > this.words.length) {
      const store = new Float64Array(2 * this.store.length);
      store.set(this.store);
      this.store = store;
      this.words = new Uint32Array(store.buffer);
    }
    const o = 4 * id;
    this.words[o] = b0;
    this.words[o + 1] = b1;
    this.words[o + 2] = b2;
    this.words[o + 3] = b3;
    if (2 * this.count > this.mask) this.rehash();
    return id;
  }

  /** Doubles the slot array and reinserts every pair (load factor stays ≤ 1/2). */
  private rehash(): void {
    const size = 2 * (this.mask + 1);
    this.slots = new Int32Array(size).fill(-1);
    this.mask = size - 1;
    const words = this.words;
    for (let id = 0; id < this.count; id++) {
      const o = 4 * id;
      let s = pairHash(words[o]!, words[o + 1]!, words[o + 2]!, words[o + 3]!) & this.mask;
      while (this.slots[s]! >= 0) s = (s + 1) & this.mask;
      this.slots[s] = id;
    }
  }

  values(): Float64Array {
    return this.store.slice(0, 2 * this.count);
  }
}
