/**
 * The program builder (src/time/sparse-program.ts): what it compiles must not depend on what was
 * compiled before nor on a second builder being open at the same time, and a step's entries are
 * grouped into rows by destination in the order they came, whether they came sorted (no sort) or
 * not (counting sort). Plans are checked by applying them to the identity (a dense matrix of the
 * fast operator), whose values the dense references of operators.test.ts check independently;
 * single steps against a naive grouping.
 */
import { describe, expect, it } from 'vitest';
import { TreeOperatorPlan } from '../../src/time/index';
import { ProgramBuilder } from '../../src/time/sparse-program';
import { gradedTree, rng, sparseTree } from './random-trees';

function matrixOf(plan: TreeOperatorPlan): Float64Array {
  const nI = plan.inTree.functionCount;
  const nO = plan.outTree.functionCount;
  const x = new Float64Array(nI * nI);
  for (let j = 0; j < nI; j++) x[j * nI + j] = 1;
  const y = new Float64Array(nO * nI);
  plan.apply(x, y, nI);
  return y;
}

describe('ProgramBuilder', () => {
  const small = (): TreeOperatorPlan => new TreeOperatorPlan('derivIn', sparseTree('trial', 6, 12, 5), sparseTree('test', 6, 12, 6), 'full', 0.7);
  const large = (): TreeOperatorPlan => new TreeOperatorPlan('mass', gradedTree('trial', 40, 0, 3, 7), gradedTree('test', 40, 0, 3, 8), 'full', 2);

  it('compiles the same program whatever was compiled before (small after large, and back)', () => {
    const first = small();
    const a = matrixOf(first);
    const b0 = matrixOf(large());
    const again = small();
    expect(again.entryCount).toBe(first.entryCount);
    expect(Array.from(matrixOf(again))).toEqual(Array.from(a));
    expect(Array.from(matrixOf(large()))).toEqual(Array.from(b0));
  });

  it('a builder opened while another is unfinished does not disturb it', () => {
    const outer = new ProgramBuilder();
    outer.beginStep(0, 2, 0, 2);
    outer.add(1, 0, 2.5);
    outer.add(0, 1, -1);
    // a whole plan compiled in between, with the outer builder's step still open
    const inner = small();
    outer.add(0, 0, 4);
    outer.endStep();
    const p = outer.finish();
    expect(Array.from(p.rowDst)).toEqual([0, 1]);
    expect(Array.from(p.rowLen)).toEqual([2, 1]);
    expect(Array.from(p.col)).toEqual([1, 0, 0]);
    expect(Array.from(p.weight)).toEqual([2.5, 4, -1]);
    expect(Array.from(matrixOf(inner))).toEqual(Array.from(matrixOf(small())));
  });

  it('splits rows longer than 255 entries, in the order the entries came', () => {
    const b = new ProgramBuilder();
    b.beginStep(0, 2, 3, 4);
    for (let k = 0; k < 600; k++) b.add(k, 3, k + 1);
    b.endStep();
    const p = b.finish();
    expect(Array.from(p.rowLen)).toEqual([255, 255, 90]);
    expect(Array.from(p.rowDst)).toEqual([3, 3, 3]);
    expect(Array.from(p.col)).toEqual(Array.from({ length: 600 }, (_, k) => k));
  });

  it('groups a step by destination, stably, whether the entries came sorted or not (random steps)', () => {
    for (let seed = 1; seed <= 20; seed++) {
      const r = rng(seed);
      const lo = Math.floor(r() * 5);
      const nr = 1 + Math.floor(r() * 40);
      const m = Math.floor(r() * 700);
      const dst = Array.from({ length: m }, () => lo + Math.floor(r() * nr) * (r() < (seed % 4 < 2 ? 0.2 : 0.6) ? 0 : 1));
      if (seed % 2) dst.sort((a, b) => a - b); // the ascending path
      const b = new ProgramBuilder();
      b.beginStep(0, 2, lo, lo + nr);
      dst.forEach((d, e) => b.add(e, d, e + 0.5));
      b.endStep();
      const p = b.finish();
      // naive reference: rows in ascending destination, entries in the order they came, ≤ 255 a row
      const rowDst: number[] = [], rowLen: number[] = [], col: number[] = [];
      for (let d = lo; d < lo + nr; d++) {
        const mine = dst.map((x, e) => (x === d ? e : -1)).filter((e) => e >= 0);
        for (let q = 0; q < mine.length; q += 255) {
          rowDst.push(d);
          rowLen.push(Math.min(255, mine.length - q));
          col.push(...mine.slice(q, q + 255));
        }
      }
      expect(Array.from(p.rowDst)).toEqual(rowDst);
      expect(Array.from(p.rowLen)).toEqual(rowLen);
      expect(Array.from(p.col)).toEqual(col);
      expect(Array.from(p.weight)).toEqual(col.map((e) => e + 0.5));
    }
  });
});
