/** The friendly `solve` entry point dispatches by argument type and reports wrong arguments. */
import { describe, expect, it } from 'vitest';
import { DoubleTree, HeatProblem, InvalidArgumentError, intervalDomain, solve } from '../src/index';

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
});
