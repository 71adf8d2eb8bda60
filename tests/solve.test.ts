/** The friendly `solve` entry point dispatches by argument type and reports wrong arguments. */
import { describe, expect, it } from 'vitest';
import { DoubleTree, HeatProblem, InvalidArgumentError, ToleranceNotReachedError, intervalDomain, solve, solveAdaptive, toleranceForecast, type SolveResult } from '../src/index';

describe('solve()', () => {
  const domain = intervalDomain(0, 1, 2);
  const problem = new HeatProblem({ domain, T: 1, initial: (x) => Math.sin(Math.PI * x) });
  it('level, set and adaptive forms give consistent solutions', () => {
    const a = solve(problem, 6);
    const b = solve(problem, DoubleTree.sparseGrid(domain, 6));
    const c = solve(problem, { maxUnknowns: 800 });
    expect(a.pcg!.converged).toBe(true);
    expect(a.set.size).toBe(b.set.size);
    expect(c.history!.length).toBeGreaterThan(1);
    // u = e^{−π²t} sin(πx) (separation of variables, common practice)
    const exact = Math.exp(-(Math.PI ** 2) * 0.1);
    for (const r of [a, b, c]) expect(r.solution.evaluate(0.1, [0.5])[0]).toBeCloseTo(exact, 2);
  });
  it('rejects wrong arguments with a typed error', () => {
    expect(() => solve({} as never)).toThrow(InvalidArgumentError);
    expect(() => solve(problem, 'six' as never)).toThrow(/argument 2 should be a sparse-grid level/);
  });
  it('reports why an adaptive run stopped; a fixed set has no stop reason', () => {
    expect(solve(problem, 4).stopReason).toBeNull();
    expect(solve(problem, { maxUnknowns: 300 }).stopReason).toBe('unknowns');
    const met = solve(problem, { tolerance: 0.05 });
    expect(met.stopReason).toBe('tolerance');
    expect(met.history!.at(-1)!.estimate).toBeLessThanOrEqual(0.05);
  });
  it('a tolerance a budget keeps out of reach is a typed error that carries the result', () => {
    let caught: unknown;
    try {
      solve(problem, { tolerance: 1e-6, maxUnknowns: 300 });
    } catch (e) {
      caught = e;
    }
    expect(caught).toBeInstanceOf(ToleranceNotReachedError);
    const e = caught as ToleranceNotReachedError<SolveResult>;
    expect(e.code).toBe('tolerance-not-reached');
    expect(e.field).toBe('tolerance');
    expect(e.stopReason).toBe('unknowns');
    expect(e.tolerance).toBe(1e-6);
    expect(e.estimate).toBeGreaterThan(1e-6);
    expect(e.message).toMatch(/above the tolerance 0\.000001, when the run stopped by 'unknowns'/);
    // with the forecast of toleranceForecast on the result's history (tests/adapt/forecast.test.ts)
    const f = toleranceForecast(e.result.history!, 1e-6)!;
    expect(e.message).toContain(`(${f.rate.toFixed(2)}, since N was an eighth of its last value) E would reach the tolerance at about ${f.unknowns.toExponential(1)} unknowns`);
    // The work is not lost: the result is the one solveAdaptive returns for the same options.
    const direct = solveAdaptive(problem, { tolerance: 1e-6, maxUnknowns: 300 });
    expect(e.result.stopReason).toBe(direct.stopReason);
    expect(e.result.set.size).toBe(direct.set.size);
    expect(e.estimate).toBe(direct.history.at(-1)!.estimate);
    expect(e.result.solution.evaluate(0.1, [0.5])[0]).toBe(direct.solution.evaluate(0.1, [0.5])[0]);
    // Other budgets alike.
    expect(() => solve(problem, { tolerance: 1e-6, maxSteps: 2 })).toThrow(ToleranceNotReachedError);
  });
  it("a run stopped by 'resolution' says that no budget helps, and gives no forecast", () => {
    // κT/L² = 1e14: the layer of u0 ≡ 1 sits ~47 temporal levels below T, so the run reaches the
    // deepest trustworthy level within a few steps (tests/adapt/adaptive-loop.test.ts)
    const deep = new HeatProblem({ domain: intervalDomain(0, 1, 2), T: 1e14, initial: () => 1 });
    expect(() => solve(deep, { tolerance: 1e-9, maxSteps: 200 })).toThrow(ToleranceNotReachedError);
    try {
      solve(deep, { tolerance: 1e-9, maxSteps: 200 });
    } catch (e) {
      const err = e as ToleranceNotReachedError;
      expect(err.stopReason).toBe('resolution');
      expect(err.message).toMatch(/a larger budget would not help .*solve over a shorter horizon and continue from its end state/);
      expect(err.message).not.toMatch(/raise that budget|would reach the tolerance/);
    }
  });
  it('a run the caller stopped returns as it is, tolerance or not', () => {
    let calls = 0;
    const r = solve(problem, { tolerance: 1e-6, onStep: () => ++calls < 2 });
    expect(r.stopReason).toBe('callback');
    expect(r.history!.length).toBe(2);
  });
});
