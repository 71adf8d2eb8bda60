/**
 * Compact smoother rows with a table of distinct (A, M) pairs: decoding must give back every
 * stored value bit for bit (the V-cycle then computes exactly what it computed from the pooled
 * values), unused pool slots are dropped, and beyond 2¹⁶ distinct pairs the indices widen.
 */
import { describe, expect, it } from 'vitest';
import { compactRows } from '../../../src/space/multigrid/value-pairs';
import { seededRandom } from '../../spacetime/reference';

function pooled(rows: number, distinct: number, seed: number) {
  const rnd = seededRandom(seed);
  const palette = Float64Array.from({ length: 2 * distinct }, () => (rnd() - 0.5) * 2 ** Math.floor(40 * rnd() - 20));
  palette[0] = 0;
  palette[1] = -0; // +0 and −0 differ in their bits and must stay apart
  const rowStart = new Int32Array(rows);
  const rowEnd = new Int32Array(rows);
  const size = rows * 12;
  const cols = new Int32Array(size).map(() => Math.floor(rnd() * 1e6));
  const vals = new Float64Array(2 * size);
  for (let t = 0; t < size; t++) {
    const p = Math.floor(rnd() * distinct);
    vals[2 * t] = palette[2 * p]!;
    vals[2 * t + 1] = palette[2 * p + 1]!;
  }
  for (let k = 0; k < rows; k++) {
    rowStart[k] = Math.floor(rnd() * (size - 8));
    rowEnd[k] = rowStart[k]! + Math.floor(rnd() * 8);
  }
  return { rowStart, rowEnd, cols, vals };
}

describe('compact smoother rows with indexed value pairs', () => {
  for (const [distinct, wide] of [[40, false], [200_000, true]] as const) {
    it(`${distinct} distinct pairs: every entry decodes to its own bits, ${wide ? '32' : '16'}-bit indices`, () => {
      const { rowStart, rowEnd, cols, vals } = pooled(wide ? 60_000 : 3_000, distinct, 5 + distinct);
      const c = compactRows(rowStart, rowEnd, cols, vals);
      expect(c.pair instanceof Int32Array).toBe(wide);
      const bitsIn = new BigUint64Array(vals.buffer);
      const bitsTable = new BigUint64Array(c.pairValues.buffer);
      const seen = new Set<string>();
      let m = 0;
      let wrong = 0;
      for (let k = 0; k < rowStart.length; k++) {
        if (c.rowEnd[k]! - c.rowStart[k]! !== rowEnd[k]! - rowStart[k]!) wrong++;
        if (k > 0 && c.rowStart[k] !== c.rowEnd[k - 1]) wrong++;
        for (let t = rowStart[k]!, q = c.rowStart[k]!; t < rowEnd[k]!; t++, q++) {
          const p = c.pair[q]!;
          if (c.cols[q] !== cols[t] || bitsTable[2 * p] !== bitsIn[2 * t] || bitsTable[2 * p + 1] !== bitsIn[2 * t + 1]) wrong++;
          seen.add(`${bitsIn[2 * t]},${bitsIn[2 * t + 1]}`);
          m++;
        }
      }
      expect(wrong).toBe(0);
      expect(m).toBeGreaterThan(0);
      expect(c.cols.length).toBe(m);
      // the table holds each used pair once and nothing else
      expect(c.pairValues.length / 2).toBe(seen.size);
    });
  }
});
