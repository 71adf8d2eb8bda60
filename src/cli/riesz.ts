/**
 * Riesz condition numbers of the trial wavelets (docs/method.md §3.1), computed
 * with the library's own tree operators: the L2 Gram matrix from the Σ ← Σ
 * mass plan, and the H¹ Gram matrix as N + DᵀD, where D maps into the full
 * test tree of the same depth (whose span contains every σ′, so DᵀD is the
 * exact Gram matrix of the derivatives). Eigenvalues by ml-matrix.
 */
import { EigenvalueDecomposition, Matrix } from 'ml-matrix';
import { TemporalTree, TreeOperatorPlan } from '../time/index';

function denseOf(plan: TreeOperatorPlan, n: number, m: number): Matrix {
  const out = new Matrix(m, n);
  const e = new Float64Array(n);
  const y = new Float64Array(m);
  for (let j = 0; j < n; j++) {
    e.fill(0);
    e[j] = 1;
    plan.apply(e, y);
    for (let i = 0; i < m; i++) out.set(i, j, y[i]!);
  }
  return out;
}

function condition(G: Matrix): number {
  const sym = Matrix.add(G, G.transpose()).mul(0.5);
  const ev = new EigenvalueDecomposition(sym, { assumeSymmetric: true }).realEigenvalues;
  return Math.max(...ev) / Math.min(...ev);
}

/** Condition numbers of the L2- and H¹-normalised trial wavelet Gram matrices of all levels ≤ L. */
export function rieszConditionNumbers(L: number): { l2: number; h1: number } {
  const trial = TemporalTree.full('trial', L);
  const test = TemporalTree.full('test', L);
  const n = trial.functionCount;
  const N = denseOf(new TreeOperatorPlan('mass', trial, trial, 'full'), n, n);
  const D = denseOf(new TreeOperatorPlan('derivIn', trial, test, 'full'), n, test.functionCount);
  const H = Matrix.add(N, D.transpose().mmul(D));
  const s = new Matrix(n, n);
  for (let i = 0; i < n; i++) s.set(i, i, 1 / Math.sqrt(H.get(i, i)));
  return { l2: condition(N), h1: condition(s.mmul(H).mmul(s)) };
}
