/**
 * The adaptive loop on a smooth, compatible 2D problem reaches the sparse-grid rate. With
 * u0 = sin πx sin πy on the unit square and u = 0 on its boundary the solution is
 * u = e^{−2π²t} sin πx sin πy (separation of variables, common practice: ∂t u = Δu = −2π²u and the
 * boundary values are checked by hand), and for smooth solutions sparse tensor-product spaces of
 * piecewise linears reach N^{−1/2} in L2(0,T;H¹) (common practice; the 2D sparse-grid test of
 * tests/system/convergence.test.ts checks it on non-adaptive sets). Together with the u0 ≡ 1 runs,
 * whose rate stays near 0.35 (docs/adaptivity.md §7), this separates what the data cost from what
 * the method costs. True errors by `spaceTimeErrors` against the closed form.
 */
import { describe, expect, it } from 'vitest';
import { HeatProblem, rectangleDomain, solveAdaptive, spaceTimeErrors } from '../../src/index';

const PI = Math.PI;
const exact = {
  value: (t: number, x: number, y: number) => Math.exp(-2 * PI * PI * t) * Math.sin(PI * x) * Math.sin(PI * y),
  gradient: (t: number, x: number, y: number, g: Float64Array) => {
    const e = Math.exp(-2 * PI * PI * t);
    g[0] = PI * e * Math.cos(PI * x) * Math.sin(PI * y);
    g[1] = PI * e * Math.sin(PI * x) * Math.cos(PI * y);
  },
};

describe('adaptive rate on a smooth solution (d = 2)', () => {
  it('true error and E fall like N^-1/2 (slope ≥ 0.45 from 10³ to 1.5·10⁴ unknowns), err/E steady', () => {
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
});
