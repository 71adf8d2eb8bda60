/**
 * The adaptive loop on smooth, compatible data reaches the sparse-grid rate (d = 2; d = 1 below). With
 * u0 = sin πx sin πy on the unit square and u = 0 on its boundary the solution is
 * u = e^{−2π²t} sin πx sin πy (separation of variables, common practice: ∂t u = Δu = −2π²u and the
 * boundary values are checked by hand), and for smooth solutions sparse tensor-product spaces of
 * piecewise linears reach N^{−1/2} in L2(0,T;H¹) (common practice; the 2D sparse-grid test of
 * tests/system/convergence.test.ts checks it on non-adaptive sets). Together with the u0 ≡ 1 runs,
 * whose rate stays near 0.35 (docs/adaptivity.md §7), this separates what the data cost from what
 * the method costs. True errors by `spaceTimeErrors` against the closed form.
 */
import { describe, expect, it } from 'vitest';
import { HeatProblem, intervalDomain, rectangleDomain, solveAdaptive, spaceTimeErrors, type KnownSolution } from '../../src/index';

const PI = Math.PI;
const exact = {
  value: (t: number, x: number, y: number) => Math.exp(-2 * PI * PI * t) * Math.sin(PI * x) * Math.sin(PI * y),
  gradient: (t: number, x: number, y: number, g: Float64Array) => {
    const e = Math.exp(-2 * PI * PI * t);
    g[0] = PI * e * Math.cos(PI * x) * Math.sin(PI * y);
    g[1] = PI * e * Math.sin(PI * x) * Math.cos(PI * y);
  },
};

interface Row { n: number; E: number; err: number }

/**
 * Runs the adaptive loop to `maxUnknowns` and records E and the true error from 10³ unknowns on,
 * every time #Λ has grown by `spacing`; returns the rows and the slopes between the first and last.
 */
function rowsAlongRun(problem: HeatProblem, known: KnownSolution, maxUnknowns: number, spacing: number) {
  const rows: Row[] = [];
  let next = 1000;
  solveAdaptive(problem, {
    maxUnknowns,
    maxSteps: 400,
    onStep: (s, sol) => {
      if (s.unknowns < next) return;
      rows.push({ n: s.unknowns, E: s.estimate, err: spaceTimeErrors(sol, known, { timePoints: 3 }).gradientL2 });
      next = spacing * s.unknowns;
    },
  });
  expect(rows.length).toBeGreaterThanOrEqual(3);
  const first = rows[0]!;
  const last = rows.at(-1)!;
  const slope = (k: 'E' | 'err') => -Math.log(last[k] / first[k]) / Math.log(last.n / first.n);
  return { rows, growth: last.n / first.n, slopeE: slope('E'), slopeErr: slope('err') };
}

describe('adaptive rate on a smooth solution', () => {
  it('d = 2: true error and E fall like N^-1/2 (slope ≥ 0.45 from 10³ to 1.5·10⁴ unknowns), err/E steady', () => {
    const problem = new HeatProblem({ domain: rectangleDomain(0, 1, 0, 1, 2, 2), T: 0.5, initial: (x, y) => exact.value(0, x, y) });
    const { rows, growth, slopeE, slopeErr } = rowsAlongRun(problem, exact, 15000, 3);
    expect(growth).toBeGreaterThan(8);
    // measured: 0.50 for both between 1 226 and 14 157 unknowns; err/E 1.46–1.51
    expect(slopeErr).toBeGreaterThanOrEqual(0.45);
    expect(slopeE).toBeGreaterThanOrEqual(0.45);
    const ratios = rows.map((r) => r.err / r.E);
    expect(Math.max(...ratios) / Math.min(...ratios)).toBeLessThan(1.5);
    expect(Math.min(...ratios)).toBeGreaterThan(0.5);
    expect(Math.max(...ratios)).toBeLessThan(3);
  });

  it('d = 1 (u0 = sin πx): true error and E fall like N^-1 (slope ≥ 0.9 from 10³ to 2·10⁴ unknowns), err/E near 1', () => {
    // u = e^{−π²t} sin πx (separation of variables, common practice); smooth sparse grids reach
    // about N^{−1} in d = 1 (log factors aside; tests/system/convergence.test.ts, 1D sparse grids)
    const u = (t: number, x: number) => Math.exp(-PI * PI * t) * Math.sin(PI * x);
    const exact1: KnownSolution = {
      value: (t, x) => u(t, x),
      gradient: (t, x, _y, g) => { g[0] = PI * Math.exp(-PI * PI * t) * Math.cos(PI * x); },
    };
    const problem = new HeatProblem({ domain: intervalDomain(0, 1, 2), T: 0.5, initial: (x) => u(0, x) });
    const { rows, growth, slopeE, slopeErr } = rowsAlongRun(problem, exact1, 20000, 4);
    expect(growth).toBeGreaterThan(10);
    // measured: 0.96–1.00 between doublings from 1 036 to 19 925 unknowns; err/E 1.00–1.02
    expect(slopeErr).toBeGreaterThanOrEqual(0.9);
    expect(slopeE).toBeGreaterThanOrEqual(0.9);
    for (const r of rows) {
      expect(r.err / r.E).toBeGreaterThan(0.8);
      expect(r.err / r.E).toBeLessThan(1.3);
    }
  });
});
