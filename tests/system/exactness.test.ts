/**
 * Consistency: when the exact solution lies in the trial space, the
 * minimal-residual solution must reproduce it (the residual can be made zero).
 * With an insulated boundary and reaction c > 0, u(t, x) = 1 + t solves
 *   ∂t u − ∇·(κ∇u) + c u = 1 + c(1 + t),  u(0) = 1,  κ∂u/∂n = 0,
 * and 1 + t is spanned by the two level-0 trial wavelets times the initial
 * hats (which sum to one). This checks loads, traces, S, b and PCG together.
 */
import { describe, expect, it } from 'vitest';
import { DoubleTree, HeatProblem, SpaceTimeSystem, intervalDomain, rectangleDomain, type SpatialDomain } from '../../src/index';

const c = 2;
const T = 0.7;

function check(domain: SpatialDomain, set: DoubleTree, separable: boolean): void {
  const source = separable
    ? [{ time: () => 1 + c, space: () => 1 }, { time: (t: number) => c * t, space: () => 1 }]
    : (t: number) => 1 + c * (1 + t);
  const sys = new SpaceTimeSystem(new HeatProblem({ domain, T, initial: () => 1, source }), set);
  const { solution, pcg } = sys.solve({ relTol: 1e-12 });
  expect(pcg.converged).toBe(true);
  const pts = domain.dim === 1 ? [0, 0.3, 1] : [0, 0, 0.4, 0.7, 1, 1];
  for (const t of [0, 0.1, 0.35, T]) {
    const v = solution.evaluate(t, pts);
    for (const u of v) expect(Math.abs(u - (1 + t))).toBeLessThan(1e-8);
  }
}

describe('exact reproduction of a solution in the trial space', () => {
  it.each([false, true])('d = 1, insulated ends, separable source: %s', (separable) => {
    const domain = intervalDomain(0, 1, 3, { insulated: () => true, reaction: c, kappa: (x) => 1 + x });
    check(domain, DoubleTree.sparseGrid(domain, 4), separable);
  });
  it.each([false, true])('d = 2, insulated square, separable source: %s', (separable) => {
    const domain = rectangleDomain(0, 1, 0, 1, 2, 2, { insulated: () => true, reaction: c });
    check(domain, DoubleTree.sparseGrid(domain, 3), separable);
  });
});
