/**
 * Time panels of spaceTimeErrors (src/output/error-panels.ts) against the direct rule (Gauss
 * points on every breakpoint interval, kept as evaluateErrors(…, 'direct')):
 * - exact solutions polynomial in t (degree 2) and x (degree 2), which both rules integrate
 *   exactly (Gauss–Legendre with n points is exact to degree 2n − 1, common practice; the
 *   spatial rules of src/output/error-quadrature.ts are exact to degree 5), so both must give
 *   the same value up to rounding — 1e-12 relative — with and without held boundary values;
 * - the u0 ≡ 1 solution of Carslaw & Jaeger §3.3 (tests/helpers/heat-exact.ts), where the
 *   panels replace u by its degree-11 interpolant in t and give each panel the finer of the
 *   spatial rules of its times: agreement to 1e-9 (gradient) and 1e-7 (value) relative, and
 *   fewer exact evaluations. The value part's bound is looser because the direct value itself
 *   moves by ~3e-6 relative in 2D when its spatial rule is refined the same way (measured when
 *   written: 0.0089688714 → 0.0089688469), while its time rule is converged (3, 6, 10, 14 Gauss
 *   points per interval agree to 4e-10 beyond the graded intervals).
 */
import { describe, expect, it } from 'vitest';
import { DoubleTree, HeatProblem, SpaceTimeSolution, SpaceTimeSystem, intervalDomain, rectangleDomain, solveAdaptive, type SpatialDomain } from '../../src/index';
import { evaluateErrors, type KnownSolution } from '../../src/output/error-norms';
import { heatExact1D, heatExact2D } from '../helpers/heat-exact';

/** u = (1 + t + t²)·(x² − xy + 0.5y² + 0.3x) + t: quadratic in t and in x. */
const poly: KnownSolution = {
  value: (t, x, y) => (1 + t + t * t) * (x * x - x * y + 0.5 * y * y + 0.3 * x) + t,
  gradient: (t, x, y, g) => {
    const s = 1 + t + t * t;
    g[0] = s * (2 * x - y + 0.3);
    g[1] = s * (-x + y);
  },
};

function randomSolution(domain: SpatialDomain, set: DoubleTree, T: number): SpaceTimeSolution {
  const coef = new Float64Array(set.size).map((_, i) => Math.sin(0.37 * i + 0.1));
  return new SpaceTimeSolution(domain, set, coef, T);
}

function compare(sol: SpaceTimeSolution, exact: KnownSolution, opts = {}) {
  const p = evaluateErrors(sol, exact, opts, 'panels');
  const d = evaluateErrors(sol, exact, opts, 'direct');
  return { p, d, g: p.gradientL2 / d.gradientL2 - 1, v: p.valueL2 / d.valueL2 - 1 };
}

describe('time panels = direct rule where both are exact', () => {
  it('1D sparse grid, 2D full grid, 1D adaptive set, held boundary values: to 1e-12 relative', { timeout: 60_000 }, () => {
    const d1 = intervalDomain(0, 1, 2);
    const d2 = rectangleDomain(0, 1, 0, 1, 2, 2);
    const held = intervalDomain(0, 1, 2, { boundary: [{ kind: 'value', where: [[0]], value: (t: number) => 1 + 3 * t * t }] });
    const cases = [
      ['1D sparse L = 8', randomSolution(d1, DoubleTree.sparseGrid(d1, 8), 0.5)],
      ['2D full grid, time level 7, space level 1', randomSolution(d2, DoubleTree.fullGrid(d2, 7, 1), 1)],
      ['1D sparse L = 7, held value 1 + 3t² at x = 0', randomSolution(held, DoubleTree.sparseGrid(held, 7), 1)],
      ['1D adaptive set (u0 ≡ 1, 4000 unknowns at most)', randomSolution(d1, solveAdaptive(new HeatProblem({ domain: d1, T: 0.5, initial: () => 1 }), { maxUnknowns: 4000 }).solution.trialSet, 0.5)],
    ] as const;
    for (const [name, sol] of cases) {
      const r = compare(sol, poly);
      console.log(`${name}: panels ${r.p.gradientL2} / ${r.p.valueL2} (${r.p.slices} times), direct ${r.d.gradientL2} / ${r.d.valueL2} (${r.d.slices} times)`);
      expect(r.p.slices).toBeLessThan(r.d.slices); // the panels were used
      expect(Math.abs(r.g)).toBeLessThan(1e-12);
      expect(Math.abs(r.v)).toBeLessThan(1e-12);
    }
  });
});

describe('time panels on the singular solution u0 ≡ 1 (Carslaw & Jaeger §3.3)', () => {
  it('1D sparse grid and 2D full grid: agree with the direct rule, with fewer exact evaluations', () => {
    const T = 0.5;
    for (const dim of [1, 2] as const) {
      const domain = dim === 1 ? intervalDomain(0, 1, 2) : rectangleDomain(0, 1, 0, 1, 2, 2);
      const set = dim === 1 ? DoubleTree.sparseGrid(domain, 9) : DoubleTree.fullGrid(domain, 7, 2);
      const { solution } = new SpaceTimeSystem(new HeatProblem({ domain, T, initial: () => 1 }), set).solve({ relTol: 1e-10 });
      const r = compare(solution, dim === 1 ? heatExact1D() : heatExact2D());
      console.log(`${dim}D, N = ${set.size}: gradient ${r.p.gradientL2} vs ${r.d.gradientL2} (${r.g.toExponential(2)}), value ${r.p.valueL2} vs ${r.d.valueL2} (${r.v.toExponential(2)}); exact evaluations ${r.p.exactEvaluations} vs ${r.d.exactEvaluations}`);
      expect(Math.abs(r.g)).toBeLessThan(1e-9);
      expect(Math.abs(r.v)).toBeLessThan(1e-7);
      // 1D: 2^9 breakpoint intervals; 2D: 2^7, so panels start later (they need 5 intervals)
      expect(r.p.exactEvaluations).toBeLessThan(r.d.exactEvaluations / (dim === 1 ? 4 : 1));
    }
  }, 120_000);
});

describe('time panels on an exact solution with its own time scale', () => {
  it('u = sin(ωt) sin πx, zero discrete solution: ∫₀¹∫₀¹ |∂x u|² = (π²/2)(1/2 − sin 2ω/(4ω)) to 1e-10 for periods down to T/16', () => {
    // the panel cap T/16 is meant to resolve such time scales (docs/error-norms.md §3)
    const domain = intervalDomain(0, 1, 2);
    const set = DoubleTree.sparseGrid(domain, 10);
    const sol = new SpaceTimeSolution(domain, set, new Float64Array(set.size), 1);
    for (const w of [10, 30, 100]) {
      const exact: KnownSolution = {
        value: (t, x) => Math.sin(w * t) * Math.sin(Math.PI * x),
        gradient: (t, x, _y, g) => { g[0] = Math.PI * Math.sin(w * t) * Math.cos(Math.PI * x); },
      };
      const ref = (Math.PI ** 2 / 2) * (0.5 - Math.sin(2 * w) / (4 * w));
      const e = evaluateErrors(sol, exact, {}, 'panels');
      expect(Math.abs(e.gradientL2 ** 2 / ref - 1)).toBeLessThan(1e-10);
    }
  });
});
