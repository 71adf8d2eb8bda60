/**
 * Where a run that stopped short of its tolerance would have reached it, extrapolated from its own
 * history (docs/adaptivity.md §9): E ≈ E_last · (N / N_last)^(−r) with r the rate observed over
 * the second half of the steps, and a whole run's time proportional to its final #Λ (each step
 * costs O(#Λ), and with a steady growth g per step the whole run costs about 1/(1 − 1/g) times its
 * last step, docs/adaptivity.md §7.1).
 */
import { bad } from './field-errors';
import { observedRate } from './run';

/** Result of {@link toleranceForecast}. */
export interface ToleranceForecast {
  /** The rate used: least-squares slope of −log E against log N over the second half of the steps. */
  rate: number;
  /** Unknowns #Λ at which E would reach the tolerance at that rate. */
  unknowns: number;
  /** Seconds of a whole run (from its first step) to that size, at the cost per unknown seen so far. */
  seconds: number;
}

/**
 * Below this observed rate E is not falling steadily (a stagnating or rising estimator, or a run
 * of a few steps), and an extrapolation would mean nothing.
 */
const LEAST_RATE = 0.05;

/**
 * Extrapolates a run's history to the size and time at which its estimator would reach
 * `tolerance`; null when the tolerance is already reached or E has not been falling steadily over
 * the second half of the steps (rate below 0.05, or too few steps to tell).
 *
 * An extrapolation, not a promise: on rough data the rate usually still rises with N, so early in a
 * run the forecast over-estimates (on the u0 ≡ 1 reference runs, from a fifth of the final size:
 * 1.06× the unknowns the run needed in 2D and 1.2–1.6× in 1D; from a thirtieth, 4.4× in 2D;
 * docs/adaptivity.md §9); and a run may stop for other reasons first (memory, the deepest
 * temporal level).
 *
 * @example
 * ```ts
 * import { toleranceForecast } from 'chronomesh/problem-file';
 * // E = N^(-1/2) exactly: E = 0.01 needs N = 10⁴; the three steps took 0.1 + 0.4 + 1.6 s up to N = 1600
 * const steps = [{ dofs: 100, estimate: 0.1, seconds: 0.1 }, { dofs: 400, estimate: 0.05, seconds: 0.4 }, { dofs: 1600, estimate: 0.025, seconds: 1.6 }];
 * const f = toleranceForecast(steps, 0.01)!;
 * console.log(f.rate.toFixed(2), Math.round(f.unknowns), f.seconds.toFixed(2)); // → 0.50 10000 13.13
 * ```
 */
export function toleranceForecast(steps: readonly { dofs: number; estimate: number; seconds: number }[], tolerance: number): ToleranceForecast | null {
  if (!Array.isArray(steps)) bad('steps', `must be an array of {dofs, estimate, seconds}, found ${typeof steps}`, steps);
  if (typeof tolerance !== 'number' || !(tolerance > 0) || !Number.isFinite(tolerance)) bad('tolerance', `must be a finite number > 0, found ${String(tolerance)}`, tolerance);
  steps.forEach((s, i) => {
    if (s === null || typeof s !== 'object') bad(`steps[${i}]`, `must be an object {dofs, estimate, seconds}, found ${String(s)}`, s);
    if (!(Number.isFinite(s.dofs) && s.dofs > 0)) bad(`steps[${i}].dofs`, `must be a finite number > 0, found ${String(s.dofs)}`, s.dofs);
    if (!(Number.isFinite(s.estimate) && s.estimate >= 0)) bad(`steps[${i}].estimate`, `must be a finite number ≥ 0, found ${String(s.estimate)}`, s.estimate);
    if (!(Number.isFinite(s.seconds) && s.seconds >= 0)) bad(`steps[${i}].seconds`, `must be a finite number ≥ 0, found ${String(s.seconds)}`, s.seconds);
  });
  const last = steps[steps.length - 1];
  if (last === undefined || last.estimate <= tolerance) return null;
  const rate = observedRate(steps.map((s) => ({ dofs: s.dofs, estimate: s.estimate })));
  if (rate === null || !(rate >= LEAST_RATE)) return null;
  const unknowns = last.dofs * (last.estimate / tolerance) ** (1 / rate);
  let seconds = 0;
  for (const s of steps) seconds += s.seconds;
  return { rate, unknowns, seconds: (seconds * unknowns) / last.dofs };
}
