/**
 * The program builder shares one set of growable buffers between the plans compiled one after the
 * other (src/time/sparse-program.ts). What it compiles must not depend on what was compiled before
 * it, nor on a second builder being open at the same time. Checked by applying the plans to the
 * identity (a dense matrix of the fast operator), whose values the dense references of
 * operators.test.ts check independently.
 */
import { describe, expect, it } from 'vitest';
import { TreeOperatorPlan } from '../../src/time/index';
import { ProgramBuilder } from '../../src/time/sparse-program';
import { gradedTree, sparseTree } from './random-trees';

function matrixOf(plan: TreeOperatorPlan): Float64Array {
  const nI = plan.inTree.functionCount;
  const nO = plan.outTree.functionCount;
  const x = new Float64Array(nI * nI);
  for (let j = 0; j < nI; j++) x[j * nI + j] = 1;
  const y = new Float64Array(nO * nI);
  plan.apply(x, y, nI);
  return y;
}

describe('ProgramBuilder buffer reuse', () => {
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

  it('a builder opened while another is unfinished gets buffers of its own', () => {
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
});
