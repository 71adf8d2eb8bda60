/**
 * relativeTolerance: the stop test E ≤ tolerance + relativeTolerance · ‖u_δ‖_S (the usual
 * absolute-plus-relative test, common practice), through solveAdaptive, solve() and problem files.
 */
import { describe, expect, it } from 'vitest';
import { HeatProblem, InvalidArgumentError, ToleranceNotReachedError, rectangleDomain, solve, solveAdaptive } from '../../src/index';
import { buildProblem, parseProblem, runProblem } from '../../src/problem-file/index';

const square = () => new HeatProblem({ domain: rectangleDomain(0, 1, 0, 1, 2, 2), T: 0.5, initial: () => 1 });

describe('relativeTolerance', () => {
  it('stops at the first step with E ≤ relativeTolerance · solutionNorm, not before', () => {
    const r = solveAdaptive(square(), { relativeTolerance: 0.12, maxUnknowns: 1e5 });
    expect(r.stopReason).toBe('tolerance');
    const last = r.history[r.history.length - 1]!;
    expect(last.estimate).toBeLessThanOrEqual(0.12 * last.solutionNorm!);
    for (const h of r.history.slice(0, -1)) expect(h.estimate).toBeGreaterThan(0.12 * h.solutionNorm!);
    // u0 ≡ 1 on the unit square: the norm is close to ‖u0‖_{L2} = 1, so this is about E ≤ 0.12
    expect(last.estimate).toBeLessThan(0.125);
  });

  it('adds to an absolute tolerance', () => {
    const both = solveAdaptive(square(), { tolerance: 0.05, relativeTolerance: 0.1, maxUnknowns: 1e5 });
    const last = both.history[both.history.length - 1]!;
    expect(both.stopReason).toBe('tolerance');
    expect(last.estimate).toBeLessThanOrEqual(0.05 + 0.1 * last.solutionNorm!);
    expect(both.history[both.history.length - 2]!.estimate).toBeGreaterThan(0.05 + 0.1 * both.history[both.history.length - 2]!.solutionNorm!);
  });

  it('is checked before any work, naming the field', () => {
    for (const bad of [1, -0.1, Number.NaN, 2]) {
      expect(() => solveAdaptive(square(), { relativeTolerance: bad })).toThrow(InvalidArgumentError);
      expect(() => solveAdaptive(square(), { relativeTolerance: bad })).toThrow(/opts\.relativeTolerance/);
    }
    expect(() => parseProblem({ domain: { shape: 'interval', from: 0, to: 1 }, horizon: 1, relativeTolerance: 1 })).toThrow(/^relativeTolerance: must be in \[0, 1\)/);
  });

  it('solve() names the relative target when a budget stops the run first', () => {
    let caught: unknown;
    try {
      solve(square(), { relativeTolerance: 0.01, maxUnknowns: 800 });
    } catch (e) {
      caught = e;
    }
    expect(caught).toBeInstanceOf(ToleranceNotReachedError);
    expect((caught as Error).message).toMatch(/above the tolerance \S+ \(tolerance 0 \+ relativeTolerance 0\.01 × the solution's norm \S+\)/);
  });

  it('problem files: the field reaches the loop and the run reports the target it had to reach', () => {
    const spec = parseProblem({ domain: { shape: 'rectangle', from: [0, 0], to: [1, 1], cells: [2, 2] }, horizon: 0.5, initial: '1', relativeTolerance: 0.12, maxDofs: 1e5 });
    const run = runProblem(buildProblem(spec));
    expect(run.stopReason).toBe('tolerance');
    const last = run.steps[run.steps.length - 1]!;
    expect(last.relativeEstimate!).toBeLessThanOrEqual(0.12);
    expect(run.target).toBeCloseTo(0.12 * (last.estimate / last.relativeEstimate!), 12);
    // the sparse strategy uses the same test
    const sparse = runProblem(buildProblem({ ...spec, strategy: 'sparse', relativeTolerance: 0.3 }));
    expect(sparse.stopReason).toBe('tolerance');
    expect(sparse.steps[sparse.steps.length - 1]!.relativeEstimate!).toBeLessThanOrEqual(0.3);
  });
});
