/**
 * The time-stepping baseline's fast error (bench/separable-error.ts: exact factors evaluated once
 * per distinct quadrature coordinate, streamed step by step) against the plain per-point loop of
 * `steppingGradientError`, which evaluates the exact solution (Carslaw & Jaeger §3.3 product form,
 * tests/helpers/heat-exact.ts) at every quadrature point of every element.
 */
import { describe, expect, it } from 'vitest';
import { rectangleDomain } from '../../src/index';
import { SeparableGradientError } from '../../bench/separable-error';
import { UniformP1, steppingGradientError, timeStep } from '../../bench/time-stepping';
import { heatExact2D, unitSquare } from '../helpers/heat-exact';

describe('separable streaming error of the time-stepping baseline', () => {
  it('equals the per-point error on the unit square, uniform and graded steps', () => {
    const domain = rectangleDomain(0, 1, 0, 1, 2, 2);
    const d = new UniformP1(domain, domain.uniformSet(3));
    for (const method of ['euler', 'crank-nicolson'] as const) {
      const fast = new SeparableGradientError(d.mesh, unitSquare.factors!);
      let streamed = 0;
      const kept = timeStep(d, 0.5, () => 1, { method, steps: 8, grading: 3 });
      const streamedRun = timeStep(d, 0.5, () => 1, {
        method,
        steps: 8,
        grading: 3,
        keepStates: false,
        onStep: (_k, t0, t1, a, b) => (streamed += fast.interval(t0, t1, a, b)),
      });
      expect(streamedRun.states.length).toBe(2);
      expect(Array.from(streamedRun.states[1]!)).toEqual(Array.from(kept.states[8]!));
      const reference = steppingGradientError(kept, unitSquare);
      expect(Math.abs(Math.sqrt(streamed) - reference)).toBeLessThan(1e-12 * reference);
      // far fewer distinct coordinates than quadrature points (7 per element)
      const [nx, ny] = fast.distinctCoordinates;
      expect(nx + ny).toBeLessThan(d.mesh.elementCount);
    }
  });

  it('handles a rectangle with diffusivity (factors scaled per axis)', () => {
    const domain = rectangleDomain(-1, 2, 0, 0.5, 3, 1);
    const exact = heatExact2D({ x0: -1, x1: 2, y0: 0, y1: 0.5, kappa: 0.3 });
    const d = new UniformP1(domain, domain.uniformSet(2));
    const kept = timeStep(d, 0.2, () => 1, { method: 'euler', steps: 6, grading: 2 });
    const fast = new SeparableGradientError(d.mesh, exact.factors!);
    let e2 = 0;
    for (let k = 1; k < kept.states.length; k++) e2 += fast.interval(kept.times[k - 1]!, kept.times[k]!, kept.states[k - 1]!, kept.states[k]!);
    const reference = steppingGradientError(kept, exact);
    expect(Math.abs(Math.sqrt(e2) - reference)).toBeLessThan(1e-12 * reference);
  });
});
