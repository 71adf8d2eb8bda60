/**
 * SpatialPlanCache shares one leaf mesh (with its element tables and nodal scratch) between the
 * plans whose fibre pairs have the same union (docs/adaptivity.md §5). Checked: the sharing itself,
 * that interleaved applies of plans on one mesh still equal the dense spatial matrices
 * (tests/space/reference.ts, assembled element by element), and that the cache drops a mesh once
 * no cached plan uses it.
 */
import { describe, expect, it } from 'vitest';
import { SpatialPlanCache } from '../../src/spacetime/spatial-plan-cache';
import { denseSpatialMatrices } from '../space/reference';
import { randomDoubleTree, smallDomain } from './fixtures';
import { randomVector, relativeError, seededRandom } from './reference';

function denseApply(D: number[][], x: Float64Array): Float64Array {
  return Float64Array.from(D, (row) => row.reduce((s, v, j) => s + v * x[j]!, 0));
}

describe.each([1, 2] as const)('spatial plan cache, d = %i', (dim) => {
  const rand = seededRandom(400 + dim);
  const domain = smallDomain(dim, 1);
  const tree = randomDoubleTree(domain, 'graded-start', rand);
  // Two nested fibres of different sizes: a parent's fibre contains its children's.
  const ids = [...new Set(Array.from({ length: tree.tree.size }, (_, i) => tree.nodeFibre[i]!))]
    .sort((p, q) => tree.pool.get(q).length - tree.pool.get(p).length);
  const big = ids[0]!;
  const small = ids.find((id) => {
    const s = tree.pool.get(id), b = new Set(tree.pool.get(big));
    return s.length < b.size && s.length > 0 && s.every((v) => b.has(v));
  })!;

  it('plans whose pairs have the same union share one mesh and its scratch', () => {
    expect(small).toBeDefined();
    const cache = new SpatialPlanCache(domain, tree.pool);
    const a = cache.get(small, big), b = cache.get(big, small), c = cache.get(big, big);
    expect(a.shared).toBe(b.shared);
    expect(b.shared).toBe(c.shared);
    expect(cache.get(small, small).shared).not.toBe(a.shared);
  });

  it('interleaved applies on a shared mesh equal the dense matrices (rel. error ≤ 1e-13)', () => {
    const cache = new SpatialPlanCache(domain, tree.pool);
    const S = tree.pool.get(small), B = tree.pool.get(big);
    const pairs: [Int32Array, Int32Array, number, number][] = [[S, B, small, big], [B, S, big, small], [B, B, big, big]];
    for (let round = 0; round < 3; round++) {
      for (const [inSet, outSet, i, o] of pairs) {
        const plan = cache.get(i, o);
        const { M, A } = denseSpatialMatrices(domain, inSet, outSet);
        const x = randomVector(inSet.length, rand), x2 = randomVector(inSet.length, rand);
        const yM = new Float64Array(outSet.length), yA = new Float64Array(outSet.length), y = new Float64Array(outSet.length);
        plan.applySplit(x, 0, yM, 0, yA, 0);
        expect(relativeError(yM, denseApply(M, x))).toBeLessThan(1e-13);
        expect(relativeError(yA, denseApply(A, x))).toBeLessThan(1e-13);
        plan.applySum(x, 0, x2, 0, y, 0);
        const ref = denseApply(M, x).map((v, k) => v + denseApply(A, x2)[k]!);
        expect(relativeError(y, ref)).toBeLessThan(1e-13);
      }
    }
  });

  it('drops a mesh with the last plan that uses it, keeps it while one remains', () => {
    const cache = new SpatialPlanCache(domain, tree.pool);
    const first = cache.get(small, big).shared;
    cache.advanceEpoch(0); // nothing was asked for in the new epoch yet: everything goes
    expect(cache.size).toBe(0);
    expect(cache.get(small, big).shared).not.toBe(first);
    const kept = cache.get(big, big).shared; // same union as (small, big)
    cache.advanceEpoch(1);
    cache.get(big, big);
    cache.advanceEpoch(1); // (small, big) was not asked for during the last epoch: dropped
    expect(cache.size).toBe(1);
    expect(cache.get(small, big).shared).toBe(kept); // rebuilt, on the surviving mesh
    cache.clear();
    expect(cache.get(big, big).shared).not.toBe(kept);
  });
});
