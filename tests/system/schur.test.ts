/**
 * G, K_Y, K_X and the Schur complement S = Bᵀ K_Y B + G against dense
 * assembly (docs/method.md §6), with exact inner spatial solves.
 */
import { describe, expect, it } from 'vitest';
import { CholeskyDecomposition, Matrix, inverse } from 'ml-matrix';
import { derivativeNorms, traceVector } from '../../src/time/index';
import { HeatProblem } from '../../src/system/heat-problem';
import { SpaceTimeSystem } from '../../src/system/space-time-system';
import { randomDoubleTree, smallDomain, type TreeShape } from '../spacetime/fixtures';
import {
  denseBlockDiagonal, denseInitialTrace, denseSpatialOnUnion, denseTensorOperator, labels, matVec, randomVector, relativeError, seededRandom,
} from '../spacetime/reference';
import type { DoubleTree } from '../../src/spacetime/double-tree';

const T = 0.8;

/**
 * Dense ½ P (T·A + M)⁻¹ Pᵀ: the subspace of functions constant in time, 1 ⊗ v with v on the
 * common fibre F of the two level-0 trial nodes, 1 = √(T/3)(σ_{0,0} + σ_{0,1}) (σ_{0,j} are the
 * L2-normalised hats √(3/T)(1 − t/T), √(3/T)·t/T). Assembled from the definitions, independently
 * of the fast code's index bookkeeping.
 */
function denseConstantInTime(domain: ReturnType<typeof smallDomain>, trial: DoubleTree): Matrix {
  const sp = denseSpatialOnUnion(domain, [trial]);
  const l = labels(trial);
  const rows0 = new Map<number, number>();
  const rows1 = new Map<number, number>();
  l.forEach((lab, r) => {
    if (trial.tree.level[lab.fn] !== 0) return;
    (trial.tree.index[lab.fn] === 0 ? rows0 : rows1).set(lab.vertex, r);
  });
  const F = [...rows0.keys()].filter((v) => rows1.has(v));
  const out = new Matrix(trial.size, trial.size);
  if (F.length === 0) return out;
  const K = new Matrix(F.length, F.length);
  F.forEach((u, i) => F.forEach((w, j) => K.set(i, j, T * sp.A[sp.pos.get(u)!]![sp.pos.get(w)!]! + sp.M[sp.pos.get(u)!]![sp.pos.get(w)!]!)));
  const Ki = inverse(K);
  const c = T / 3 / 2;
  F.forEach((u, i) => F.forEach((w, j) => {
    for (const ru of [rows0.get(u)!, rows1.get(u)!]) for (const rw of [rows0.get(w)!, rows1.get(w)!]) out.set(ru, rw, out.get(ru, rw) + c * Ki.get(i, j));
  }));
  return out;
}
const shapes: TreeShape[] = ['sparse', 'graded-start', 'random'];
/** Domain variant per shape: the sparse grid runs on the domain with value, flux and convection parts. */
const variant = (shape: TreeShape): number => (shape === 'random' ? 2 : shape === 'sparse' ? 3 : 0);

describe.each([1, 2] as const)('space-time system operators, d = %i', (dim) => {
  it.each(shapes)('S, G, K_Y, K_X equal their dense definitions on %s sets', (shape) => {
    const rand = seededRandom(31 * dim + shape.length);
    const domain = smallDomain(dim, variant(shape));
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
    KXd.add(denseConstantInTime(domain, trial));
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
