/** PCG against an independent dense solver (ml-matrix), and its failure modes. */
import { describe, expect, it } from 'vitest';
import { Matrix, solve } from 'ml-matrix';
import { InvalidArgumentError, SolverBreakdownError, pcg, type LinearOperator } from '../../src/index';
import { seededRandom } from '../spacetime/reference';

function denseOperator(A: Matrix): LinearOperator {
  const n = A.rows;
  return {
    inSize: n, outSize: n,
    apply: (x, y) => { for (let i = 0; i < n; i++) { let s = 0; for (let j = 0; j < n; j++) s += A.get(i, j) * x[j]!; y[i] = s; } },
  };
}

describe('preconditioned conjugate gradients', () => {
  it('solves a random SPD system like ml-matrix does, and estimates its spectrum', () => {
    const rand = seededRandom(9);
    const n = 40;
    const R = Matrix.rand(n, n, { random: rand });
    const A = R.transpose().mmul(R).add(Matrix.eye(n).mul(0.5));
    const b = Float64Array.from({ length: n }, () => rand() - 0.5);
    const jacobi: LinearOperator = { inSize: n, outSize: n, apply: (x, y) => { for (let i = 0; i < n; i++) y[i] = x[i]! / A.get(i, i); } };
    const r = pcg(denseOperator(A), b, { preconditioner: jacobi, relTol: 1e-12, maxIterations: 500, estimateSpectrum: true });
    const ref = solve(A, Matrix.columnVector(Array.from(b))).getColumn(0);
    expect(r.converged).toBe(true);
    for (let i = 0; i < n; i++) expect(r.solution[i]).toBeCloseTo(ref[i]!, 8);
    expect(r.residualHistory.length).toBe(r.iterations + 1);
    expect(r.spectrum!.condition).toBeGreaterThan(1);
  });

  it('Lanczos estimate recovers the extreme eigenvalues of a diagonal operator', () => {
    const d = [1, 2, 3, 5, 8, 13, 21];
    const op: LinearOperator = { inSize: d.length, outSize: d.length, apply: (x, y) => d.forEach((v, i) => (y[i] = v * x[i]!)) };
    const r = pcg(op, Float64Array.from(d, () => 1), { relTol: 1e-14, estimateSpectrum: true });
    expect(r.spectrum!.min).toBeCloseTo(1, 8);
    expect(r.spectrum!.max).toBeCloseTo(21, 8);
  });

  it('reports breakdown on an indefinite operator and rejects mismatched sizes', () => {
    const op: LinearOperator = { inSize: 2, outSize: 2, apply: (x, y) => { y[0] = x[0]!; y[1] = -x[1]!; } };
    expect(() => pcg(op, Float64Array.of(0, 1))).toThrow(SolverBreakdownError);
    expect(() => pcg(op, Float64Array.of(0, 1))).toThrow(/pᵀSp = -1 is not positive/);
    expect(() => pcg(op, Float64Array.of(1, 2, 3))).toThrow(InvalidArgumentError);
    const nan: LinearOperator = { inSize: 1, outSize: 1, apply: (_x, y) => { y[0] = NaN; } };
    expect(() => pcg(nan, Float64Array.of(1))).toThrow(SolverBreakdownError);
  });
});
