/**
 * The data error of held boundary values interpolated along the initial edges
 * (src/space/held-data-error.ts, docs/error-norms.md §8).
 *
 * References outside the project:
 * - linear interpolation reproduces affine functions exactly (common practice);
 * - the Dirichlet energy of the bounded harmonic extension of sin(kπs/ℓ) into the half-strip
 *   (0, ℓ) × (0, ∞), w = sin(kπs/ℓ) e^{−kπn/ℓ}: ∫∫ |∇w|² = (kπ/ℓ)² · (ℓ/2) · ℓ/(2kπ) = kπ/2,
 *   worked by hand (separation of variables, common practice);
 * - true errors of runs against a manufactured solution written out by hand:
 *   u = sin(πx)(1 − y), with ∂t u − Δu = π² sin(πx)(1 − y), held at sin(πx) on y = 0 and zero on the
 *   other edges of the unit square.
 */
import { describe, expect, it } from 'vitest';
import { HeatProblem, InvalidArgumentError, rectangleDomain, solve, solveAdaptive, spaceTimeErrors, type BoundaryPart } from '../../src/index';

const PI = Math.PI;
type G = (t: number, x: number, y: number) => number;
const bottom = (value: G): BoundaryPart[] => [{ kind: 'value', where: (_x: number, y: number) => y < 1e-9, value }];

describe('held-value data error', () => {
  it('is zero for held values affine along every initial edge, however they depend on t', () => {
    for (const g of [(t: number) => 20 + 5 * t, (t: number, x: number) => Math.exp(-t) * (1 + 3 * x), (t: number, x: number, y: number) => t * t * (x - 2 * y) + Math.sin(t)]) {
      const domain = rectangleDomain(0, 1, 0, 1, 3, 2, { boundary: [{ kind: 'value', where: () => true, value: g }] });
      const d = new HeatProblem({ domain, T: 2 }).heldDataError();
      expect(d.estimate).toBeLessThan(1e-12);
      expect(d.worst).toBeNull();
    }
  });

  it('equals the half-strip energy of a sine profile, weighted by ½, κ and the time integral', () => {
    // One initial edge along y = 0 from x = 0 to 2 (the interpolant of g is 0 there, so e = g).
    for (const [k, kappa, T] of [[1, 1, 1], [3, 2, 0.5], [5, 0.25, 3]] as const) {
      const domain = rectangleDomain(0, 2, 0, 1, 1, 1, { kappa, boundary: bottom((_t, x) => Math.sin((k * PI * x) / 2)) });
      const d = new HeatProblem({ domain, T }).heldDataError();
      expect(d.estimate).toBeCloseTo(Math.sqrt(0.5 * kappa * T * ((k * PI) / 2)), 10);
      expect(d.worst).toMatchObject({ part: 0, from: [0, 0], to: [2, 0], share: 1 });
    }
    // g = t·sin(πx/2): ∫₀ᵀ t² dt = T³/3 (the time rule is exact for polynomials).
    const domain = rectangleDomain(0, 2, 0, 1, 1, 1, { boundary: bottom((t, x) => t * Math.sin((PI * x) / 2)) });
    expect(new HeatProblem({ domain, T: 1.5 }).heldDataError().estimate).toBeCloseTo(Math.sqrt(0.5 * (PI / 2) * 1.5 ** 3 / 3), 10);
  });

  it('falls like h^{3/2} as the initial mesh is refined along the held face (interpolation error of smooth data in H^{1/2})', () => {
    const D = [2, 4, 8, 16].map((n) => new HeatProblem({ domain: rectangleDomain(0, 1, 0, 1, n, n, { boundary: bottom((_t, x) => Math.sin(PI * x)) }), T: 0.5 }).heldDataError().estimate);
    for (let i = 1; i < D.length; i++) expect(Math.log2(D[i - 1]! / D[i]!)).toBeGreaterThan(1.4);
  });

  it('is a lower bound of the true error of adaptive runs, which stalls at it while E keeps falling', () => {
    const exact = {
      value: (_t: number, x: number, y: number) => Math.sin(PI * x) * (1 - y),
      gradient: (_t: number, x: number, y: number, g: Float64Array) => { g[0] = PI * Math.cos(PI * x) * (1 - y); g[1] = -Math.sin(PI * x); },
    };
    for (const n of [2, 4]) {
      const domain = rectangleDomain(0, 1, 0, 1, n, n, { boundary: bottom((_t, x) => Math.sin(PI * x)) });
      const problem = new HeatProblem({ domain, T: 0.5, initial: (x, y) => exact.value(0, x, y), source: (_t, x, y) => PI * PI * exact.value(0, x, y) });
      const r = solveAdaptive(problem, { maxUnknowns: 3000 });
      const err = spaceTimeErrors(r.solution, exact).gradientL2;
      const E = r.history[r.history.length - 1]!.estimate;
      expect(r.heldDataError).toBe(problem.heldDataError().estimate);
      // D ≤ error, and the error is mostly D (0.190 against 0.238 and 0.070 against 0.076 measured)
      expect(r.heldDataError).toBeLessThanOrEqual(err);
      expect(r.heldDataError).toBeGreaterThan(0.7 * err);
      expect(E).toBeLessThan(0.5 * err); // what the estimator alone would have claimed
    }
  });

  it('refuses a tolerance below it before any work, naming the part and the edge, and accepts one above it', () => {
    const domain = rectangleDomain(0, 1, 0, 1, 2, 2, { boundary: bottom((_t, x) => Math.sin(PI * x)) });
    const problem = new HeatProblem({ domain, T: 0.5 });
    let progressCalls = 0;
    const onProgress = (): void => { progressCalls++; };
    let caught: unknown = null;
    try { solveAdaptive(problem, { tolerance: 0.1, onProgress }); } catch (e) { caught = e; }
    expect(caught).toBeInstanceOf(InvalidArgumentError);
    const e = caught as InvalidArgumentError;
    expect(e.field).toBe('opts.tolerance');
    expect(e.message).toMatch(/boundary part 0, edge \((0|0\.5), 0\)–\((0\.5|1), 0\)/);
    expect(progressCalls).toBe(0);
    expect(() => solve(problem, { tolerance: 0.1 })).toThrow(InvalidArgumentError);
    const r = solveAdaptive(problem, { tolerance: 0.3, maxUnknowns: 500 });
    expect(r.stopReason).toBe('tolerance');
    expect(r.heldDataError).toBeGreaterThan(0.15);
  });

  it('rejects held data that are not finite between the initial vertices, before any work', () => {
    // NaN only inside the edge (0.5, 0)–(1, 0): the initial vertices alone would not show it.
    const domain = rectangleDomain(0, 1, 0, 1, 2, 2, { boundary: bottom((_t, x) => (x > 0.7 && x < 0.8 ? Number.NaN : 1)) });
    const problem = new HeatProblem({ domain, T: 0.5 });
    expect(() => solveAdaptive(problem, { maxUnknowns: 500 })).toThrow(/boundary part 0 is NaN/);
    expect(() => solve(problem, 2)).toThrow(InvalidArgumentError);
  });
});
