/**
 * G, K_Y, K_X and the Schur complement S = Bᵀ K_Y B + G against dense
 * assembly (DESIGN.md §6), with exact inner spatial solves.
 */
import { describe, expect, it } from 'vitest';
import { CholeskyDecomposition, Matrix, inverse } from 'ml-matrix';
import { derivativeNorms, traceVector } from '../../src/time/index';
import { HeatProblem } from '../../src/system/heat-problem';
import { SpaceTimeSystem } from '../../src/system/space-time-system';
import { randomDoubleTree, smallDomain, type TreeShape } from '../spacetime/fixtures';
import {
  denseBlockDiagonal, denseInitialTrace, denseTensorOperator, matVec, randomVector, relativeError, seededRandom,
} from '../spacetime/reference';

const T = 0.8;
const shapes: TreeShape[] = ['sparse', 'graded-start', 'random'];

describe.each([1, 2] as const)('space-time system operators, d = %i', (dim) => {
  it.each(shapes)('S, G, K_Y, K_X equal their dense definitions on %s sets', (shape) => {
    const rand = seededRandom(31 * dim + shape.length);
    const domain = smallDomain(dim, shape === 'random' ? 2 : 0);
    const trial = randomDoubleTree(domain, shape, rand);
    const problem = new HeatProblem({ domain, T });
    const sys = new SpaceTimeSystem(problem, trial, { inner: { kind: 'exact' } });
    const test = sys.testSet;

    const Gd = denseInitialTrace(domain, trial, traceVector(trial.tree, 0, T));
    const KYd = denseBlockDiagonal(domain, test, (_M, A) => inverse(A));
    const alpha = derivativeNorms(trial.tree, T);
    const KXd = denseBlockDiagonal(domain, trial, (M, A, f) => {
      const inv = inverse(Matrix.add(A, Matrix.mul(M, alpha[f]!)));
      return inv.mmul(A).mmul(inv);
    });
    const Bd = denseTensorOperator(domain, 'derivIn', 'mass', trial, test, T);
    const Sd = Bd.transpose().mmul(KYd).mmul(Bd).add(Gd);

    const x = randomVector(trial.size, rand);
    const y = new Float64Array(trial.size);
    sys.G.apply(x, y);
    expect(relativeError(y, matVec(Gd, x))).toBeLessThan(1e-12);
    sys.S.apply(x, y);
    expect(relativeError(y, matVec(Sd, x))).toBeLessThan(1e-12);
    sys.KX.apply(x, y);
    expect(relativeError(y, matVec(KXd, x))).toBeLessThan(1e-12);
    const v = randomVector(test.size, rand);
    const w = new Float64Array(test.size);
    sys.KY.apply(v, w);
    expect(relativeError(w, matVec(KYd, v))).toBeLessThan(1e-12);
    // S is symmetric positive definite (Cholesky succeeds), as the theory says.
    expect(new CholeskyDecomposition(Sd.add(Sd.transpose()).mul(0.5)).isPositiveDefinite()).toBe(true);
  });

  it('with V-cycle inner solves, K_Y and K_X are symmetric and S stays symmetric', () => {
    const rand = seededRandom(5 + dim);
    const domain = smallDomain(dim);
    const trial = randomDoubleTree(domain, 'random', rand);
    const sys = new SpaceTimeSystem(new HeatProblem({ domain, T }), trial);
    const n = trial.size;
    const x = randomVector(n, rand);
    const z = randomVector(n, rand);
    const ax = new Float64Array(n);
    const az = new Float64Array(n);
    for (const op of [sys.S, sys.KX]) {
      op.apply(x, ax);
      op.apply(z, az);
      let l = 0, r = 0;
      for (let i = 0; i < n; i++) { l += az[i]! * x[i]!; r += ax[i]! * z[i]!; }
      expect(Math.abs(l - r)).toBeLessThan(1e-10 * Math.max(1, Math.abs(l)));
    }
  });
});
