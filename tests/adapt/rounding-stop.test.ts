/**
 * Solutions that lie in the discrete space: the adaptive loop stops with 'rounding' instead of
 * refining rounding errors, and reports the size of its solution (AdaptiveStep.solutionNorm).
 *
 * Outside references: closed forms checked by hand against the equation (below), and, for the
 * norm, ‖u0‖_{L2(Ω)} of u0 ≡ 1 on the unit square (= 1) and ‖sin πx‖_{H⁻¹(0,1)} = (1/2)^{1/2}/π
 * from its sine series (common practice).
 */
import { describe, expect, it } from 'vitest';
import { HeatProblem, intervalDomain, rectangleDomain, solve, solveAdaptive, SpaceTimeSystem } from '../../src/index';

describe("adaptive loop: stop reason 'rounding'", () => {
  it('a kinked solution with its point source, u = t(½ − |x − ½|) on (0, 1): exact to rounding, stops at once', () => {
    // ∂t u = ½ − |x − ½|, −∂xx u = 2t δ(x − ½), u(t, 0) = u(t, 1) = 0, u(0, ·) = 0.
    const problem = new HeatProblem({
      domain: intervalDomain(0, 1, 3),
      T: 1,
      source: (_t, x) => 0.5 - Math.abs(x - 0.5),
      curveSources: [{ curve: [[0.5]], time: (t) => 2 * t }],
    });
    const r = solveAdaptive(problem, { maxSteps: 200, maxUnknowns: 1e4 });
    expect(r.stopReason).toBe('rounding');
    // Before the stop existed the loop ran its 200 steps on this problem, the noise growing with
    // every spatial generation (E from 7e-17 to 1e-8, true error to 7e-8).
    expect(r.history.length).toBeLessThanOrEqual(3);
    const last = r.history[r.history.length - 1]!;
    expect(last.estimate).toBeLessThanOrEqual(1e-10 * last.solutionNorm!);
    for (const t of [0.1, 0.5, 1]) {
      const xs = [0.05, 0.3, 0.5, 0.62, 0.97];
      const v = r.solution.evaluate(t, xs);
      xs.forEach((x, i) => expect(Math.abs(v[i]! - t * (0.5 - Math.abs(x - 0.5)))).toBeLessThan(1e-12));
    }
  });

  it('u = t on the unit square (insulated all round, reaction 1, f = 1 + t): exact to rounding, stops at once', () => {
    // ∂t u + u = 1 + t with zero flux; u0 = 0.
    const problem = new HeatProblem({ domain: rectangleDomain(0, 1, 0, 1, 2, 2, { insulated: () => true, reaction: 1 }), T: 1, source: (t) => 1 + t });
    const r = solveAdaptive(problem, { maxSteps: 50 });
    expect(r.stopReason).toBe('rounding');
    expect(r.history.length).toBeLessThanOrEqual(3);
    const v = r.solution.evaluate(0.7, [0.2, 0.9, 0.5, 0.5]);
    expect(Math.abs(v[0]! - 0.7)).toBeLessThan(1e-12);
    expect(Math.abs(v[1]! - 0.7)).toBeLessThan(1e-12);
  });

  it('a tolerance below the rounding level is not an error for solve(): the answer is exact to working precision', () => {
    const problem = new HeatProblem({ domain: rectangleDomain(0, 1, 0, 1, 2, 2, { insulated: () => true, reaction: 1 }), T: 1, source: (t) => 1 + t });
    const r = solve(problem, { tolerance: 1e-30 });
    expect(r.stopReason).toBe('rounding');
  });

  it('ordinary runs never meet it: the reference run (u0 ≡ 1 on the unit square) is far above the level', () => {
    const r = solveAdaptive(new HeatProblem({ domain: rectangleDomain(0, 1, 0, 1, 2, 2), T: 0.5, initial: () => 1 }), { maxUnknowns: 3000 });
    expect(r.stopReason).toBe('unknowns');
    for (const h of r.history) expect(h.estimate / h.solutionNorm!).toBeGreaterThan(1e-3);
  });
});

describe('AdaptiveStep.solutionNorm: the size of the solution in the norm E measures', () => {
  it('f = 0, zero boundary values: tends to ‖u0‖_{L2(Ω)} (u0 ≡ 1 on the unit square: 1)', () => {
    const r = solveAdaptive(new HeatProblem({ domain: rectangleDomain(0, 1, 0, 1, 2, 2), T: 0.5, initial: () => 1 }), { maxUnknowns: 3000 });
    const norms = r.history.map((h) => h.solutionNorm!);
    // (γ0 u_δ, u0) approaches ‖u0‖² from below as the boundary layer of u0 ≡ 1 is resolved
    expect(norms[norms.length - 1]!).toBeGreaterThan(0.93);
    expect(norms[norms.length - 1]!).toBeLessThan(1.01);
  });

  it('u0 = 0, f = sin πx on (0, 1): close to ‖f‖_{L2(0,T;H⁻¹)} = (T/2)^{1/2}/π with exact inner solves', () => {
    const T = 0.5;
    const problem = new HeatProblem({ domain: intervalDomain(0, 1, 2), T, source: (_t, x) => Math.sin(Math.PI * x) });
    const r = solveAdaptive(problem, { maxUnknowns: 600, inner: { kind: 'exact' } });
    const expected = Math.sqrt(T / 2) / Math.PI;
    const last = r.history[r.history.length - 1]!;
    expect(Math.abs(last.solutionNorm! / expected - 1)).toBeLessThan(0.02);
    // and it is what u_δᵀ b gives for the system of the final set
    const system = new SpaceTimeSystem(problem, r.set, { inner: { kind: 'exact' } });
    const b = system.rightHandSide();
    let ub = 0;
    for (let i = 0; i < b.length; i++) ub += b[i]! * r.solution.coefficients[i]!;
    expect(Math.abs(Math.sqrt(ub) / last.solutionNorm! - 1)).toBeLessThan(1e-12);
    // With the default V-cycles inside K_Y the norm is an equivalent one, a little off this value.
    const mg = solveAdaptive(problem, { maxUnknowns: 600 });
    expect(Math.abs(mg.history[mg.history.length - 1]!.solutionNorm! / expected - 1)).toBeLessThan(0.25);
  });
});
