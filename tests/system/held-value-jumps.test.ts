/**
 * Held values that jump in time (src/space/held-value-continuity.ts): refused before any work, and
 * the remedy the error names (split the run at the jump) checked against the exact solution.
 *
 * Reference outside the project: the step response S of a rod held at 1 at one end
 * (tests/helpers/step-response.ts, Carslaw & Jaeger §3.4) and its superposition.
 */
import { describe, expect, it } from 'vitest';
import { HeatProblem, InvalidArgumentError, intervalDomain, rectangleDomain, solveAdaptive } from '../../src/index';
import { stepResponse } from '../helpers/step-response';

const ts = 0.3;

const S = stepResponse;

const rod = (value: (t: number) => number) => intervalDomain(0, 1, 2, { boundary: [{ kind: 'value', where: [[0]], value: (t) => value(t) }] });

describe('held values that jump in time', () => {
  it('the reference: S(0⁺) = 0 inside, S → 1 − x, and S solves the heat equation', () => {
    expect(Math.abs(S(1e-6, 0.5))).toBeLessThan(1e-3);
    expect(S(5, 0.25)).toBeCloseTo(0.75, 12);
    // u_t = u_xx by central differences at an interior point
    const t = 0.05, x = 0.3, h = 1e-3, k = 1e-5;
    const ut = (S(t + k, x) - S(t - k, x)) / (2 * k);
    const uxx = (S(t, x + h) - 2 * S(t, x) + S(t, x - h)) / (h * h);
    expect(Math.abs(ut - uxx)).toBeLessThan(1e-4 * Math.abs(ut));
  });

  it('a quench is refused before any work, naming the part, the time and the remedy', () => {
    const problem = new HeatProblem({ domain: rod((t) => (t < ts ? 1 : 0)), T: 0.5 });
    let caught: unknown;
    try { solveAdaptive(problem, { maxUnknowns: 300 }); } catch (e) { caught = e; }
    expect(caught).toBeInstanceOf(InvalidArgumentError);
    expect((caught as InvalidArgumentError).field).toBe('boundary[0].value');
    expect(String(caught)).toMatch(/boundary\[0\]\.value jumps from 1 to 0 at t ≈ 0\.3 .*split the run at the jump/);
    // a jump just after t = 0, and one on a face in 2D
    expect(() => new HeatProblem({ domain: rod((t) => (t > 0 ? 1 : 0)), T: 0.5 }).heldDataError()).toThrow(/at t ≈ 0 .*Hold the value from t = 0/);
    const face = rectangleDomain(0, 1, 0, 1, 2, 2, { boundary: [{ kind: 'value', where: (mx) => mx < 1e-9, value: (t, _x, y) => (t < 0.2 ? y * (1 - y) : 0) }] });
    expect(() => new HeatProblem({ domain: face, T: 0.5 }).heldDataError()).toThrow(/boundary\[0\]\.value jumps/);
  });

  it('continuous data pass: a ramp over 10⁻⁴, a pulse of width 10⁻³, a smooth history', () => {
    for (const g of [(t: number) => (t < ts ? 1 : t < ts + 1e-4 ? 1 - (t - ts) / 1e-4 : 0), (t: number) => Math.exp(-(((t - ts) / 0.001) ** 2)), (t: number) => 20 + 5 * Math.sin(10 * t)]) {
      expect(() => new HeatProblem({ domain: rod(g), T: 0.5 }).heldDataError()).not.toThrow();
    }
  });

  it('the remedy: split at the jump and restart from the end state, against the exact solution', () => {
    const first = solveAdaptive(new HeatProblem({ domain: rod(() => 1), T: ts }), { maxUnknowns: 3000 });
    const end = first.solution.state(ts);
    const second = solveAdaptive(new HeatProblem({ domain: intervalDomain(0, 1, 2), T: 0.2, initial: end }), { maxUnknowns: 3000 });
    // measured: 0.14154 against 0.14195, 0.36551 against 0.36603, 0.08167 against 0.08155
    for (const [t, x] of [[0.35, 0.1], [0.35, 0.5], [0.45, 0.2]] as const) {
      expect(Math.abs(second.solution.evaluate(t - ts, [x])[0]! - (S(t, x) - S(t - ts, x)))).toBeLessThan(5e-3);
    }
  });
});
