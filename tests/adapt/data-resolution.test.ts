/**
 * Data with features far below the initial mesh size (a localized source, a hot spot in the initial
 * state): the first set of an adaptive run resolves them, so that the estimator sees them
 * (src/space/data-resolution.ts, docs/adaptivity.md §2.1).
 *
 * References outside the project: the free-space heat kernel of the plane, under which a Gaussian
 * A·exp(−r²/a) becomes A·a/(a + 4t)·exp(−r²/(a + 4t)) after a time t (Carslaw & Jaeger, Conduction
 * of Heat in Solids, 2nd ed., 1959, §10.2, from memory; checked here by the heat equation itself),
 * made zero on the walls of the unit square by the method of images (ibid., §10.10, from memory);
 * a constant source is integrated over its emission times by an independent quadrature.
 */
import { describe, expect, it } from 'vitest';
import { HeatProblem, InvalidArgumentError, rectangleDomain, intervalDomain, solveAdaptive } from '../../src/index';
import { defaultInitialSet } from '../../src/adapt/initial-set';

/** Σ over images of the unit square (zero walls) of a/(a + 4s)·exp(−|p − c_i|²/(a + 4s)), signed. */
function gaussianImages(a: number, s: number, c: readonly number[], x: number, y: number): number {
  const sp = a + 4 * s;
  let sum = 0;
  for (let i = -3; i <= 3; i++) {
    for (let j = -3; j <= 3; j++) {
      for (const sx of [1, -1]) {
        for (const sy of [1, -1]) sum += sx * sy * Math.exp(-((x - (2 * i + sx * c[0]!)) ** 2 + (y - (2 * j + sy * c[1]!)) ** 2) / sp);
      }
    }
  }
  return (a / sp) * sum;
}

/** ∫₀ᵗ A·(images at age s) ds, with s = a(e^z − 1)/4 to follow the 1/(a + 4s) peak (3-point Gauss). */
function sourceReference(A: number, a: number, t: number, c: readonly number[], x: number, y: number): number {
  const Z = Math.log(1 + (4 * t) / a), n = 2000;
  let sum = 0;
  for (let k = 0; k < n; k++) {
    for (const [g, w] of [[-Math.sqrt(3 / 5), 5 / 9], [0, 8 / 9], [Math.sqrt(3 / 5), 5 / 9]] as const) {
      const z = ((k + 0.5 + g / 2) * Z) / n;
      sum += ((a * Math.exp(z)) / 4) * (Z / n) * (w / 2) * A * gaussianImages(a, (a * (Math.exp(z) - 1)) / 4, c, x, y);
    }
  }
  return sum;
}

describe('data finer than the initial mesh', () => {
  it('the reference: the spreading Gaussian solves the heat equation (finite differences)', () => {
    const a = 1e-3, c = [0.3, 0.6], h = 1e-4;
    const u = (t: number, x: number, y: number) => gaussianImages(a, t, c, x, y);
    for (const [t, x, y] of [[0.01, 0.32, 0.55], [0.003, 0.3, 0.6], [0.02, 0.1, 0.9]] as const) {
      const ut = (u(t + h, x, y) - u(t - h, x, y)) / (2 * h);
      const lap = (u(t, x + h, y) + u(t, x - h, y) + u(t, x, y + h) + u(t, x, y - h) - 4 * u(t, x, y)) / (h * h);
      expect(Math.abs(ut - lap)).toBeLessThan(1e-3 * Math.max(1, Math.abs(ut)));
    }
    expect(Math.abs(u(0.01, 0, 0.4))).toBeLessThan(1e-12); // zero on the walls
  });

  it('a localized source (width 0.003) is seen from the first step, and the run converges to the reference', () => {
    const A = 1000, a = 1e-5, T = 0.02, c = [0.5, 0.5];
    const problem = new HeatProblem({ domain: rectangleDomain(0, 1, 0, 1, 2, 2), T, source: (_t, x, y) => A * Math.exp(-((x - c[0]!) ** 2 + (y - c[1]!) ** 2) / a) });
    const r = solveAdaptive(problem, { tolerance: 2e-4, maxUnknowns: 3e4 });
    expect(r.stopReason).toBe('tolerance');
    // before: E = 3e-16 at the first step (the source between all quadrature points); now E falls from 1.1e-3
    expect(r.history[0]!.estimate).toBeGreaterThan(5e-4);
    for (const h of r.history) expect(h.estimate).toBeLessThanOrEqual(1.05 * r.history[0]!.estimate);
    for (const [x, y] of [[0.5, 0.5], [0.52, 0.5], [0.55, 0.55], [0.6, 0.5], [0.7, 0.6]] as const) {
      const want = sourceReference(A, a, T, c, x, y);
      expect(Math.abs(r.solution.evaluate(T, [x, y])[0]! - want)).toBeLessThan(0.02 * want); // 0.2–0.8 % measured
    }
  });

  it('a hot spot in the initial state (width 0.01) is seen from the first step', () => {
    const A = 100, a = 1e-4, T = 0.01, c = [0.3, 0.6];
    const problem = new HeatProblem({ domain: rectangleDomain(0, 1, 0, 1, 2, 2), T, initial: (x, y) => A * Math.exp(-((x - c[0]!) ** 2 + (y - c[1]!) ** 2) / a) });
    const r = solveAdaptive(problem, { tolerance: 0.1, maxUnknowns: 3e4 });
    // before: E = 0.034 at the first step, then rising to 0.52 as the loop found the spot, so a
    // tolerance of 0.05 stopped a run at once; now the first E is the largest within 1 %
    const first = r.history[0]!.estimate;
    expect(first).toBeGreaterThan(0.3);
    for (const h of r.history) expect(h.estimate).toBeLessThanOrEqual(1.01 * first);
    for (const [x, y] of [[0.3, 0.6], [0.35, 0.6], [0.45, 0.5]] as const) {
      const want = A * gaussianImages(a, T, c, x, y);
      expect(Math.abs(r.solution.evaluate(T, [x, y])[0]! - want)).toBeLessThan(0.05 * want);
    }
  });

  it('smooth data and the reference problem leave the first set as it was', () => {
    for (const [initial, source] of [[() => 1, undefined], [(x: number, y: number) => Math.sin(Math.PI * x) * Math.sin(Math.PI * y), (t: number, x: number) => t * x * (1 - x)]] as const) {
      const domain = rectangleDomain(0, 1, 0, 1, 2, 2);
      const bare = defaultInitialSet(new HeatProblem({ domain, T: 0.5 }));
      const withData = defaultInitialSet(new HeatProblem({ domain, T: 0.5, initial, ...(source ? { source } : {}) }));
      expect(withData.size).toBe(bare.size);
    }
    const d1 = intervalDomain(0, 1, 2);
    const spiky = defaultInitialSet(new HeatProblem({ domain: d1, T: 0.5, initial: (x) => Math.exp(-((x - 0.37) ** 2) / 1e-6) }));
    expect(spiky.size).toBeGreaterThan(defaultInitialSet(new HeatProblem({ domain: d1, T: 0.5 })).size);
  });

  it('data that are not finite somewhere inside an element are refused before any work, naming the field', () => {
    const problem = new HeatProblem({ domain: rectangleDomain(0, 1, 0, 1, 2, 2), T: 0.1, source: (_t, x, y) => (Math.hypot(x - 0.31, y - 0.62) < 0.02 ? Number.NaN : 1) });
    let caught: unknown = null;
    try { solveAdaptive(problem, { maxUnknowns: 500 }); } catch (e) { caught = e; }
    expect(caught).toBeInstanceOf(InvalidArgumentError);
    expect((caught as InvalidArgumentError).field).toMatch(/^source \(at t = /);
  });
});
