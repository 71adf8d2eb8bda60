/**
 * Boundary data that the loads' fixed rules would miss: a flux spot much narrower than a boundary
 * edge (src/space/boundary-data-resolution.ts) and fluxes, ambient values and held values that
 * vary fast in time (src/system/load-time-rule.ts); docs/adaptivity.md §2.3.
 *
 * References outside the project (balances that hold whatever the solver):
 * - On the unit square with u = 0 on x = 0 and x = 1, y = 1 insulated and a flux q(t, x) into the
 *   body on y = 0, the first-mode content B(t) = ∫∫ u sin πx obeys B' = −π²B + ∫₀¹ q sin πx dx
 *   (multiply u_t = Δu by sin πx, integrate, and use Green's formula: the held sides and the
 *   insulated side pass nothing to this mode; common practice).
 * - On the rod (0, 1) with u(t, 0) = g(t), u(t, 1) = 0 and u0 = 0, B(t) = ∫ u sin πx obeys
 *   B' = −π²B + π g(t) (the same computation; common practice).
 * - ∫ exp(−s²/w²) cos(πs) ds over ℝ = w√π exp(−π²w²/4) (Abramowitz & Stegun, Handbook of
 *   Mathematical Functions, 1964, 7.4.6).
 * Both balances are solved by B(t) = ∫₀ᵗ e^{−π²(t−s)} Q(s) ds, computed here by a fine midpoint rule.
 */
import { describe, expect, it } from 'vitest';
import { HeatProblem, intervalDomain, rectangleDomain, solveAdaptive, type SpaceTimeSolution } from '../../src/index';
import { boundaryDataResolvedSet } from '../../src/space/boundary-data-resolution';
import { loadTimeBreakpoints } from '../../src/system/load-time-rule';

const PI = Math.PI;

/** ∫₀ᵗ e^{−π²(t−s)} Q(s) ds by the midpoint rule on n cells. */
function duhamel(Q: (s: number) => number, t: number, n = 200_000): number {
  let sum = 0;
  const h = t / n;
  for (let i = 0; i < n; i++) {
    const s = (i + 0.5) * h;
    sum += Math.exp(-PI * PI * (t - s)) * Q(s) * h;
  }
  return sum;
}

/** ∫∫ u sin πx over the unit square by the midpoint rule on 200 × 200 cells. */
function squareContent(u: SpaceTimeSolution, t: number): number {
  const n = 200;
  const pts: number[] = [];
  for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) pts.push((i + 0.5) / n, (j + 0.5) / n);
  const v = u.evaluate(t, pts);
  let B = 0;
  for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) B += (v[i * n + j]! * Math.sin((PI * (i + 0.5)) / n)) / (n * n);
  return B;
}

/** Flux `q` into the body on y = 0, y = 1 insulated, x = 0 and x = 1 held at 0 (the default). */
function squareWithFlux(q: (t: number, x: number) => number) {
  return rectangleDomain(0, 1, 0, 1, 2, 2, {
    boundary: [
      { kind: 'flux', where: (_mx, my) => my < 1e-9, flux: (t, x) => q(t, x) },
      { kind: 'flux', where: (_mx, my) => my > 1 - 1e-9, flux: 0 },
    ],
  });
}

describe('boundary data finer than the initial mesh or than the time rule', () => {
  it('a flux spot narrower than a boundary edge is resolved in the first set (exact heat balance)', () => {
    const w = 0.003;
    const domain = squareWithFlux((_t, x) => 100 * Math.exp(-(((x - 0.3) / w) ** 2)));
    const Q = 100 * w * Math.sqrt(PI) * Math.sin(0.3 * PI) * Math.exp(-((PI * w) ** 2) / 4);
    const r = solveAdaptive(new HeatProblem({ domain, T: 0.1 }), { maxUnknowns: 3000, tolerance: 1e-3 });
    // before: E = 2.4·10⁻⁸ at the first step, "converged" with u ≈ 10⁻²⁴; measured now: E = 0.082
    // at the first step, B within 0.2 % at t = 0.02 and 0.05 % at t = 0.1
    expect(r.history[0]!.estimate).toBeGreaterThan(0.01);
    for (const t of [0.02, 0.1]) {
      const exact = duhamel(() => Q, t);
      expect(Math.abs(squareContent(r.solution, t) / exact - 1)).toBeLessThan(0.02);
    }
  });

  it('a flux pulse in time is loaded and seen from the first step (exact heat balance)', () => {
    const q = (t: number) => (t > 0.3 && t < 0.301 ? 1000 : 0);
    const problem = new HeatProblem({ domain: squareWithFlux(q), T: 0.5 });
    const breaks = loadTimeBreakpoints(problem).times;
    expect(breaks.length).toBeGreaterThan(5);
    expect(breaks.filter((t) => t > 0.28 && t < 0.32).length).toBeGreaterThan(breaks.length / 2);
    const r = solveAdaptive(problem, { maxUnknowns: 3000, tolerance: 1e-3 });
    // before: E = 0 and u ≡ 0 ("converged" at once); measured now: E = 6.9 at the first step, B
    // within 0.5 % at t = 0.31 and 1.8 % at t = 0.4 at 2 753 unknowns
    expect(r.history[0]!.estimate).toBeGreaterThan(1);
    for (const t of [0.31, 0.4]) {
      const exact = duhamel((s) => (q(s) * 2) / PI, t);
      expect(Math.abs(squareContent(r.solution, t) / exact - 1)).toBeLessThan(0.05);
    }
  });

  it('a held value that pulses in time is loaded and seen from the first step (exact heat balance)', () => {
    const g = (t: number) => Math.exp(-(((t - 0.3) / 0.001) ** 2));
    const domain = intervalDomain(0, 1, 2, { boundary: [{ kind: 'value', where: [[0]], value: (t) => g(t) }] });
    const problem = new HeatProblem({ domain, T: 0.5 });
    expect(loadTimeBreakpoints(problem).times.length).toBeGreaterThan(5);
    // a flux pulse at the end x = 1 of a rod is watched too
    const rod = intervalDomain(0, 1, 2, { boundary: [{ kind: 'flux', where: [[2]], flux: (t) => (t > 0.3 && t < 0.301 ? 1000 : 0) }] });
    expect(loadTimeBreakpoints(new HeatProblem({ domain: rod, T: 0.5 })).times.length).toBeGreaterThan(5);
    const r = solveAdaptive(problem, { maxUnknowns: 1500, tolerance: 1e-3 });
    // before: E = 3·10⁻³⁵ and u ≡ 0; measured now: E = 1.15 at the first step
    expect(r.history[0]!.estimate).toBeGreaterThan(0.1);
    const n = 2000;
    const pts = Array.from({ length: n }, (_, i) => (i + 0.5) / n);
    const content = (t: number) => r.solution.evaluate(t, pts).reduce((acc, v, i) => acc + (v * Math.sin(PI * pts[i]!)) / n, 0);
    const exact = duhamel((s) => PI * g(s), 0.31);
    expect(Math.abs(content(0.31) / exact - 1)).toBeLessThan(0.05);
  });

  it('ambient values: a pulse makes breakpoints only where h > 0; smooth data make none and refine nothing', () => {
    const pulse = (t: number) => (t > 0.3 && t < 0.301 ? 50 : 0);
    const domain = (h: number, ambient: (t: number, x: number) => number) =>
      rectangleDomain(0, 1, 0, 1, 2, 2, { boundary: [{ kind: 'convection', where: (_mx, my) => my < 1e-9, transferCoefficient: h, ambient: (t, x) => ambient(t, x) }] });
    expect(loadTimeBreakpoints(new HeatProblem({ domain: domain(5, pulse), T: 0.5 })).times.length).toBeGreaterThan(5);
    expect(loadTimeBreakpoints(new HeatProblem({ domain: domain(0, pulse), T: 0.5 })).times.length).toBe(0);
    const smooth = domain(5, (t, x) => 20 + 10 * t * Math.sin(PI * x));
    expect(loadTimeBreakpoints(new HeatProblem({ domain: smooth, T: 0.5 })).times.length).toBe(0);
    expect(boundaryDataResolvedSet(smooth.vertexClosure(), [0, 0.25, 0.5])).toEqual(smooth.close([]));
    // a jet of width 0.003 hitting the face at x = 0.7: the set grows toward it
    const jet = domain(5, (_t, x) => 100 * Math.exp(-(((x - 0.7) / 0.003) ** 2)));
    const set = boundaryDataResolvedSet(jet.vertexClosure(), [0]);
    const onFace = Array.from(set, (v) => [jet.coordinate(v, 0), jet.coordinate(v, 1)] as const).filter(([, y]) => y < 1e-12).map(([x]) => x).sort((a, b) => a - b);
    // the face is split finest at the jet (spacing 1/256 measured, about its width), elsewhere coarse
    const gapAt = (x: number) => Math.min(...onFace.slice(1).map((b, i) => (Math.abs((b + onFace[i]!) / 2 - x) < 0.01 ? b - onFace[i]! : Infinity)));
    expect(gapAt(0.7)).toBeLessThanOrEqual(0.004);
    expect(onFace.filter((x) => x < 0.5).length).toBeLessThan(4);
  });

  it('non-finite flux data are an input error naming the part', () => {
    const domain = squareWithFlux((_t, x) => (x > 0.9 ? Number.NaN : 1));
    expect(() => solveAdaptive(new HeatProblem({ domain, T: 0.5 }), { maxUnknowns: 500 })).toThrow(/boundary\[0\]\.flux/);
  });
});
