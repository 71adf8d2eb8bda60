/**
 * Probe values carry the value of the step before the last (`previous`), the practical check of a
 * point value's accuracy (E bounds a global norm, not point values). The check here: `previous`
 * is exactly the final probe value of the same deterministic run stopped one step earlier; and on
 * the rod (u0 ≡ 1, u = 0 at both ends: Fourier series of Carslaw & Jaeger, Conduction of Heat in
 * Solids, 2nd ed., 1959, §3.3; tests/helpers/heat-exact.ts) the change is of the size of the true
 * error of the final value (0.7–1.5 times it in these runs: an indication, not a bound).
 */
import { describe, expect, it } from 'vitest';
import { buildProblem, parseProblem, runProblem } from '../../src/problem-file/index';
import { heatExact1D } from '../helpers/heat-exact';

const ROD = { domain: { shape: 'interval', from: 0, to: 1, cells: 2 }, horizon: 0.5, initial: '1', probes: [[0.02, 0.5], [0.3, 0.1]] };

describe('probe values of the step before the last', () => {
  for (const strategy of ['adaptive', 'sparse'] as const) {
    it(`${strategy}: previous equals the run stopped one step earlier; the change is of the size of the true error`, () => {
      const steps = strategy === 'adaptive' ? 12 : 5;
      const full = runProblem(buildProblem(parseProblem({ ...ROD, strategy, maxSteps: steps, maxDofs: 1e5 })));
      const shorter = runProblem(buildProblem(parseProblem({ ...ROD, strategy, maxSteps: steps - 1, maxDofs: 1e5 })));
      expect(full.steps).toHaveLength(steps);
      const exact = heatExact1D();
      full.probes.forEach((p, i) => {
        expect(p.previous).toBe(shorter.probes[i]!.value);
        const err = Math.abs(p.value - exact.value(p.t, p.x, 0));
        const change = Math.abs(p.value - p.previous!);
        console.log(`${strategy} u(${p.t}, ${p.x}) = ${p.value.toFixed(6)}, previous ${p.previous!.toFixed(6)}, exact ${exact.value(p.t, p.x, 0).toFixed(6)}: error ${err.toExponential(1)}, change ${change.toExponential(1)}`);
        expect(change).toBeGreaterThan(0);
        expect(err).toBeLessThan(3 * change);
        expect(change).toBeLessThan(3 * err);
      });
    }, 60_000);
  }

  it('a single step has no previous value', () => {
    const run = runProblem(buildProblem(parseProblem({ ...ROD, maxSteps: 1, maxDofs: 1e5 })));
    expect(run.probes.map((p) => p.previous)).toEqual([null, null]);
  });
});
