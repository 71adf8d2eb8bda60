/**
 * What the estimator's fused loop rests on (src/system/enlarged-residual.ts, docs/adaptivity.md §3):
 * for a trial set Λ, its candidate set Λ̲ ⊇ Λ and the test set Y of Λ̲, the intermediate fibres of
 * the two spatial halves that run on the test side lie in the test fibres, function by function:
 *   Θ of B: Λ → Y  (Θ(f) = ∪ fibres of Λ on f's level that overlap f)            ⊆ Y(f)
 *   Σ of Bᵀ: Y → Λ̲ (Σ(f) = ∪ fibres of Λ̲ one level finer that overlap f)          ⊆ Y(f)
 * so one leaf mesh per test fibre serves both and K_Y. Checked on random double trees in d = 1, 2
 * (the derivation is in the docs; this checks it on sets the fixtures make, not on one mesh).
 */
import { describe, expect, it } from 'vitest';
import { enlargeDoubleTree } from '../../src/index';
import { SpatialPlanCache } from '../../src/spacetime/spatial-plan-cache';
import { TensorOperatorPlan } from '../../src/spacetime/tensor-apply';
import { testIndexSet } from '../../src/spacetime/test-index-set';
import type { DoubleTree } from '../../src/spacetime/double-tree';
import { randomDoubleTree, smallDomain, type TreeShape } from './fixtures';
import { seededRandom } from './reference';

/** Whether sorted `a` is a subset of sorted `b`. */
function subset(a: Int32Array, b: Int32Array): boolean {
  let j = 0;
  for (let i = 0; i < a.length; i++) {
    while (j < b.length && b[j]! < a[i]!) j++;
    if (b[j] !== a[i]) return false;
  }
  return true;
}

/** Number of functions f whose fibre in `inner` is not inside their fibre in `outer` (same temporal tree). */
function outside(inner: DoubleTree, outer: DoubleTree): number {
  expect(inner.functionCount).toBe(outer.functionCount);
  let bad = 0;
  for (let f = 0; f < inner.functionCount; f++) {
    if (!subset(inner.pool.get(inner.functionFibre[f]!), outer.pool.get(outer.functionFibre[f]!))) bad++;
  }
  return bad;
}

const shapes: TreeShape[] = ['uniform', 'sparse', 'graded-start', 'graded-end', 'random'];

describe.each([1, 2] as const)('test-side intermediate sets lie in the test fibres, d = %i', (dim) => {
  it.each(shapes)('%s trial sets, their candidate sets and test sets', (shape) => {
    for (const seed of [1, 2, 3]) {
      const rand = seededRandom(7000 * dim + seed);
      const domain = smallDomain(dim, seed % 4);
      const set = randomDoubleTree(domain, shape, rand);
      const big = enlargeDoubleTree(domain, set);
      const test = testIndexSet(big);
      const cache = new SpatialPlanCache(domain, big.pool);
      const B = new TensorOperatorPlan('derivIn', 'mass', set, test, cache, 1);
      const Bt = new TensorOperatorPlan('derivOut', 'mass', test, big, cache, 1);
      expect(big.size).toBeGreaterThan(set.size); // the candidates add something to check
      expect(outside(B.timeFirstSet, test)).toBe(0);
      expect(outside(Bt.spaceFirstSet, test)).toBe(0);
    }
  });
});
