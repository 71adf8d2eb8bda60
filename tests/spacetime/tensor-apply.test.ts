/**
 * The unidirectional tensor apply against dense assembly (docs/method.md §5.2),
 * and the test index set against its defining formula (§5.1).
 */
import { describe, expect, it } from 'vitest';
import { nodeSupport } from '../../src/time/index';
import { SpatialPlanCache } from '../../src/spacetime/spatial-plan-cache';
import { TensorOperatorPlan, applyTensorOperatorOnce } from '../../src/spacetime/tensor-apply';
import { testIndexSet } from '../../src/spacetime/test-index-set';
import { randomDoubleTree, smallDomain, type TreeShape } from './fixtures';
import { denseTensorOperator, matVec, randomVector, relativeError, seededRandom, labels } from './reference';

const shapes: TreeShape[] = ['uniform', 'sparse', 'graded-start', 'graded-end', 'random'];
const T = 1.7;

describe.each([1, 2] as const)('tensor-product apply, d = %i', (dim) => {
  it.each(shapes)('B and Bᵀ equal dense assembly on %s double trees (rel. error ≤ 1e-12)', (shape) => {
    for (const seed of shape === 'uniform' || shape === 'sparse' ? [1, 3] : [1, 2, 3, 4]) {
      const rand = seededRandom(1000 * dim + seed);
      const domain = smallDomain(dim, seed % 4);
      const trial = randomDoubleTree(domain, shape, rand);
      const test = testIndexSet(trial);
      const cache = new SpatialPlanCache(domain, trial.pool);
      const B = new TensorOperatorPlan('derivIn', 'mass', trial, test, cache, T);
      const Bt = new TensorOperatorPlan('derivOut', 'mass', test, trial, cache, T);
      const Bd = denseTensorOperator(domain, 'derivIn', 'mass', trial, test, T);
      const Btd = denseTensorOperator(domain, 'derivOut', 'mass', test, trial, T);
      // The dense transpose identity is itself a check of the dense temporal reference.
      expect(relativeError(Btd.to1DArray(), Bd.transpose().to1DArray())).toBeLessThan(1e-13);
      const x = randomVector(trial.size, rand);
      const y = new Float64Array(test.size);
      B.apply(x, y);
      expect(relativeError(y, matVec(Bd, x))).toBeLessThan(1e-12);
      const v = randomVector(test.size, rand);
      const w = new Float64Array(trial.size);
      Bt.apply(v, w);
      expect(relativeError(w, matVec(Btd, v))).toBeLessThan(1e-12);
      // Intermediate sets stay proportional to the input and output (linear cost, §5.2).
      const io = trial.size + test.size;
      expect(B.timeFirstSet.size + B.spaceFirstSet.size).toBeLessThan(4 * io);
      // One-shot plans (spatial plans built during the apply and dropped, as the estimator does)
      // against the same dense reference; their cache stays empty.
      const oneShot = new SpatialPlanCache(domain, trial.pool);
      const y1 = new Float64Array(test.size);
      applyTensorOperatorOnce('derivIn', 'mass', trial, test, oneShot, T, x, y1);
      expect(relativeError(y1, matVec(Bd, x))).toBeLessThan(1e-12);
      const w1 = new Float64Array(trial.size);
      applyTensorOperatorOnce('derivOut', 'mass', test, trial, oneShot, T, v, w1);
      expect(relativeError(w1, matVec(Btd, v))).toBeLessThan(1e-12);
      // Accumulating into a vector that already holds something (the estimator's w += B(−u)).
      const start = randomVector(test.size, rand);
      const y2 = Float64Array.from(start);
      applyTensorOperatorOnce('derivIn', 'mass', trial, test, oneShot, T, x, y2, true);
      const Bx = matVec(Bd, x);
      expect(relativeError(y2, Float64Array.from(start, (s0, i) => s0 + Bx[i]!))).toBeLessThan(1e-12);
      // The time-direction passes in parts of about 40 coefficients (many vertex ranges), as the
      // estimator runs them on large sets to bound their memory.
      const y3 = Float64Array.from(start);
      applyTensorOperatorOnce('derivIn', 'mass', trial, test, oneShot, T, x, y3, true, undefined, 40);
      expect(relativeError(y3, Float64Array.from(start, (s0, i) => s0 + Bx[i]!))).toBeLessThan(1e-12);
      const w3 = new Float64Array(trial.size).fill(7);
      applyTensorOperatorOnce('derivOut', 'mass', test, trial, oneShot, T, v, w3, false, undefined, 40);
      expect(relativeError(w3, matVec(Btd, v))).toBeLessThan(1e-12);
      expect(oneShot.size).toBe(0);
    }
  });

  it('the test index set is the one defined pair by pair', () => {
    const rand = seededRandom(77 + dim);
    const domain = smallDomain(dim);
    const trial = randomDoubleTree(domain, 'random', rand);
    const test = testIndexSet(trial);
    const expected = new Set<string>();
    const s = new Float64Array(2);
    const tl = labels(trial);
    for (const { fn, vertex } of tl) {
      const l = trial.tree.level[fn]!;
      nodeSupport('trial', l, trial.tree.index[fn]!, s);
      const a = s[0]! * 2 ** -l;
      const b = s[1]! * 2 ** -l;
      for (let m = 0; m <= l; m++) {
        const count = m === 0 ? 1 : 2 ** (m - 1);
        for (let j = 0; j < count; j++) {
          const lo = m === 0 ? 0 : j * 2 ** -(m - 1);
          const hi = m === 0 ? 1 : (j + 1) * 2 ** -(m - 1);
          if (Math.min(hi, b) - Math.max(lo, a) > 0) expected.add(`${m}:${j}:${vertex}`);
        }
      }
    }
    const got = new Set<string>();
    const ll = labels(test);
    for (const { fn, vertex } of ll) got.add(`${test.tree.level[fn >> 1]}:${test.tree.index[fn >> 1]}:${vertex}`);
    expect([...got].sort()).toEqual([...expected].sort());
  });
});
