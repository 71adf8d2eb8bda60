/** P1 element matrices and the 5-point Laplacian, checked against closed forms. */
import { EigenvalueDecomposition, Matrix } from 'ml-matrix';
import { describe, expect, it } from 'vitest';
import { SpatialOperatorPlan, intervalDomain, rectangleDomain, triangulatedDomain, type SpatialDomain } from '../../src/space/index';

/** Dense M and A of a plan by applying it to unit vectors. */
function planMatrices(dom: SpatialDomain, set: Int32Array): { M: number[][]; A: number[][] } {
  const plan = new SpatialOperatorPlan(dom, set, set);
  const n = set.length;
  const M: number[][] = [], A: number[][] = [];
  const e = new Float64Array(n), yM = new Float64Array(n), yA = new Float64Array(n);
  for (let j = 0; j < n; j++) {
    e.fill(0);
    e[j] = 1;
    plan.applySplit(e, 0, yM, 0, yA, 0);
    M.push(Array.from(yM));
    A.push(Array.from(yA));
  }
  // columns were pushed as rows; both matrices are symmetric, transpose anyway
  const t = (X: number[][]) => X[0]!.map((_, i) => X.map((r) => r[i]!));
  return { M: t(M), A: t(A) };
}

function expectClose(X: number[][], Y: number[][], tol = 1e-14): void {
  for (let i = 0; i < Y.length; i++) for (let j = 0; j < Y.length; j++) expect(Math.abs(X[i]![j]! - Y[i]![j]!)).toBeLessThan(tol);
}

describe('P1 element matrices (closed forms, Braess, Finite Elements, ch. II (from memory))', () => {
  it('reference right triangle: K = ½[[2,−1,−1],[−1,1,0],[−1,0,1]], M = 1/24 [[2,1,1],[1,2,1],[1,1,2]]', () => {
    const dom = triangulatedDomain([0, 0, 1, 0, 0, 1], [0, 1, 2], { insulated: () => true, reaction: 1e-300 });
    const { M, A } = planMatrices(dom, dom.initialFreeVertices());
    expectClose(M, [[2, 1, 1], [1, 2, 1], [1, 1, 2]].map((r) => r.map((v) => v / 24)));
    expectClose(A, [[2, -1, -1], [-1, 1, 0], [-1, 0, 1]].map((r) => r.map((v) => v / 2)));
  });

  it('obtuse clockwise triangle with κ = 3, c = 2: K_ij = −(κ/2) cot θ_k, mass |T|/12 (1 + δ_ij)', () => {
    const P = [[0.1, 0.2], [0.5, 1.9], [2.3, 0.4]]; // clockwise: gets reoriented, vertex ids unchanged
    const dom = triangulatedDomain(P, [[0, 1, 2]], { insulated: () => true, kappa: 3, reaction: 2 });
    expect(dom.reorientedTriangles).toBe(1);
    const { M, A } = planMatrices(dom, dom.initialFreeVertices());
    const ang = (k: number) => {
      const [a, b, c] = [P[k]!, P[(k + 1) % 3]!, P[(k + 2) % 3]!];
      const u = [b[0]! - a[0]!, b[1]! - a[1]!], v = [c[0]! - a[0]!, c[1]! - a[1]!];
      return Math.acos((u[0]! * v[0]! + u[1]! * v[1]!) / (Math.hypot(u[0]!, u[1]!) * Math.hypot(v[0]!, v[1]!)));
    };
    const area = 0.5 * Math.abs((P[1]![0]! - P[0]![0]!) * (P[2]![1]! - P[0]![1]!) - (P[2]![0]! - P[0]![0]!) * (P[1]![1]! - P[0]![1]!));
    const K = [[0, 0, 0], [0, 0, 0], [0, 0, 0]];
    for (let k = 0; k < 3; k++) {
      const i = (k + 1) % 3, j = (k + 2) % 3;
      K[i]![j] = K[j]![i] = -1.5 / Math.tan(ang(k));
    }
    for (let i = 0; i < 3; i++) K[i]![i] = -K[i]![(i + 1) % 3]! - K[i]![(i + 2) % 3]!;
    const Mref = [0, 1, 2].map((i) => [0, 1, 2].map((j) => (area / 12) * (i === j ? 2 : 1)));
    expectClose(M, Mref);
    expectClose(A, K.map((r, i) => r.map((v, j) => v + 2 * Mref[i]![j]!)), 1e-13);
    // angles sum to π — sanity of the hand-computed reference
    expect(ang(0) + ang(1) + ang(2)).toBeCloseTo(Math.PI, 14);
  });

  it('1D: κ/h [1 −1; −1 1] and h/6 [2 1; 1 2]', () => {
    const dom = intervalDomain(1, 3, 1, { kappa: 5, reaction: 0.5, insulated: () => true });
    const { M, A } = planMatrices(dom, dom.initialFreeVertices());
    const h = 2;
    expectClose(M, [[2, 1], [1, 2]].map((r) => r.map((v) => (v * h) / 6)));
    expectClose(A, [[1, -1], [-1, 1]].map((r, i) => r.map((v, j) => (5 / h) * v + 0.5 * M[i]![j]!)));
  });
});

describe('structured right-triangle mesh of the unit square', () => {
  it('P1 stiffness is the 5-point Laplacian with eigenvalues 4 sin²(iπh/2) + 4 sin²(jπh/2) (common practice)', () => {
    const n = 8, h = 1 / n;
    const dom = rectangleDomain(0, 1, 0, 1, n, n);
    const set = dom.initialFreeVertices();
    expect(set.length).toBe((n - 1) ** 2);
    const { A } = planMatrices(dom, set);
    // stencil: 4 on the diagonal, −1 for the four axis neighbours, 0 for diagonal neighbours
    const pos = (v: number) => [v % (n + 1), Math.floor(v / (n + 1))] as const;
    for (let p = 0; p < set.length; p++) {
      for (let q = 0; q < set.length; q++) {
        const [i, j] = pos(set[p]!), [k, l] = pos(set[q]!);
        const d = Math.abs(i - k) + Math.abs(j - l);
        const expected = d === 0 ? 4 : d === 1 ? -1 : 0;
        expect(Math.abs(A[p]![q]! - expected)).toBeLessThan(1e-13);
      }
    }
    const ev = new EigenvalueDecomposition(new Matrix(A), { assumeSymmetric: true }).realEigenvalues.sort((a, b) => a - b);
    const ref: number[] = [];
    for (let i = 1; i < n; i++) for (let j = 1; j < n; j++) ref.push(4 * Math.sin((i * Math.PI * h) / 2) ** 2 + 4 * Math.sin((j * Math.PI * h) / 2) ** 2);
    ref.sort((a, b) => a - b);
    for (const k of [0, 1, 2, ref.length - 2, ref.length - 1]) expect(Math.abs(ev[k]! - ref[k]!)).toBeLessThan(1e-12);
  });
});
