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
import { HeatProblem, intervalDomain, rectangleDomain, solveAdaptive, spaceTimeErrors } from '../../src/index';

const PI = Math.PI;
const exact = {
  value: (t: number, x: number, y: number) => Math.exp(-2 * PI * PI * t) * Math.sin(PI * x) * Math.sin(PI * y),
  gradient: (t: number, x: number, y: number, g: Float64Array) => {
    const e = Math.exp(-2 * PI * PI * t);
    g[0] = PI * e * Math.cos(PI * x) * Math.sin(PI * y);
    g[1] = PI * e * Math.sin(PI * x) * Math.cos(PI * y);
  },
};

describe('adaptive rate on a smooth solution', () => {
  it('d = 2: true error and E fall like N^-1/2 (slope ≥ 0.45 from 10³ to 1.5·10⁴ unknowns), err/E steady', () => {
    const problem = new HeatProblem({ domain: rectangleDomain(0, 1, 0, 1, 2, 2), T: 0.5, initial: (x, y) => exact.value(0, x, y) });
    const rows: { n: number; E: number; err: number }[] = [];
    let next = 1000;
    solveAdaptive(problem, {
      maxUnknowns: 15000,
      maxSteps: 200,
      onStep: (s, sol) => {
        if (s.unknowns < next) return;
        rows.push({ n: s.unknowns, E: s.estimate, err: spaceTimeErrors(sol, exact, { timePoints: 3 }).gradientL2 });
        next = 3 * s.unknowns;
      },
    });
    expect(rows.length).toBeGreaterThanOrEqual(3);
    const first = rows[0]!;
    const last = rows.at(-1)!;
    expect(last.n / first.n).toBeGreaterThan(8);
    const slope = (k: 'E' | 'err') => -Math.log(last[k] / first[k]) / Math.log(last.n / first.n);
    // measured: 0.50 for both between 1 226 and 14 157 unknowns; err/E 1.46–1.51
    expect(slope('err')).toBeGreaterThanOrEqual(0.45);
    expect(slope('E')).toBeGreaterThanOrEqual(0.45);
    const ratios = rows.map((r) => r.err / r.E);
    expect(Math.max(...ratios) / Math.min(...ratios)).toBeLessThan(1.5);
    expect(Math.min(...ratios)).toBeGreaterThan(0.5);
    expect(Math.max(...ratios)).toBeLessThan(3);
  });

  it('d = 1 (u0 = sin πx): true error and E fall like N^-1 (slope ≥ 0.9 from 10³ to 2·10⁴ unknowns), err/E near 1', () => {
    // u = e^{−π²t} sin πx (separation of variables, common practice); smooth sparse grids reach
    // about N^{−1} in d = 1 (log factors aside; tests/system/convergence.test.ts, 1D sparse grids)
    const u = (t: number, x: number) => Math.exp(-PI * PI * t) * Math.sin(PI * x);
    const exact1 = {
      value: (t: number, x: number) => u(t, x),
      gradient: (t: number, x: number, _y: number, g: Float64Array) => { g[0] = PI * Math.exp(-PI * PI * t) * Math.cos(PI * x); },
    };
    const problem = new HeatProblem({ domain: intervalDomain(0, 1, 2), T: 0.5, initial: (x) => u(0, x) });
    const rows: { n: number; E: number; err: number }[] = [];
    let next = 1000;
    solveAdaptive(problem, {
      maxUnknowns: 20000,
      maxSteps: 400,
      onStep: (s, sol) => {
        if (s.unknowns < next) return;
        rows.push({ n: s.unknowns, E: s.estimate, err: spaceTimeErrors(sol, exact1, { timePoints: 3 }).gradientL2 });
        next = 4 * s.unknowns;
      },
    });
    expect(rows.length).toBeGreaterThanOrEqual(3);
    const first = rows[0]!;
    const last = rows.at(-1)!;
    expect(last.n / first.n).toBeGreaterThan(10);
    const slope = (k: 'E' | 'err') => -Math.log(last[k] / first[k]) / Math.log(last.n / first.n);
    // measured: 0.96–1.00 between doublings from 1 036 to 19 925 unknowns; err/E 1.00–1.02
    expect(slope('err')).toBeGreaterThanOrEqual(0.9);
    expect(slope('E')).toBeGreaterThanOrEqual(0.9);
    for (const r of rows) {
      expect(r.err / r.E).toBeGreaterThan(0.8);
      expect(r.err / r.E).toBeLessThan(1.3);
    }
  });
});
