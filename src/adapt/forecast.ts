/**
 * Rates and forecasts from an adaptive run's history (docs/adaptivity.md §9): the observed rate r of
 * E ≈ C·N^(−r) over the later steps, and where a run that stopped short of its tolerance would have
 * reached it, E_last · (N / N_last)^(−r) = tolerance, with a whole run's time proportional to its
 * final #Λ (each step costs O(#Λ), and with a steady growth g per step the whole run costs about
 * 1/(1 − 1/g) times its last step, docs/adaptivity.md §7.1).
 */
import { InvalidArgumentError } from '../errors';
import { checkNumber, checkObject } from '../validation/index';
import { DEEPEST_SET_LEVEL } from './initial-set';

/** Result of {@link toleranceForecast}. */
export interface ToleranceForecast {
  /** The rate used: the least-squares slope of −log E against log N over the last eightfold growth of N. */
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
 * Least N_max / N_min over the steps of a fit. A slope over a smaller span is dominated by the
 * step-to-step scatter of E: the last two steps of a run stopped at the deepest temporal level grew
 * from 151 to 153 unknowns while E fell by 12 %, which reads as a "rate" of 10.
 */
const LEAST_SPAN = 2;

/**
 * A forecast fits the steps since N was 1/8 of its last value. On rough data the rate still rises
 * along a run, so the recent steps predict the next ones better than the second half of the run
 * does: on the d = 2 reference run the forecast from 1/35 of the final size was 2.6× the size
 * needed instead of 4.4×, and within 0.91–1.63× from 1/13 on (docs/adaptivity.md §9). Reaching
 * back only to a quarter fell further short late in the run (0.84×).
 */
const RECENT_GROWTH = 8;

/**
 * Least-squares slope of −log E against log N over the second half of the steps (the later, more
 * nearly asymptotic part); null when N grew less than twofold over that half (too few steps, or
 * steps that hardly grew, for a slope to mean anything). Steps with E = 0 are left out; an N that
 * is not a positive number or an E that is not a number ≥ 0 is a typed error naming it.
 *
 * @example
 * ```ts
 * import { convergenceRate } from 'chronomesh';
 * console.log(convergenceRate([{ unknowns: 100, estimate: 1 }, { unknowns: 400, estimate: 0.5 }, { unknowns: 1600, estimate: 0.25 }])); // → 0.5
 * ```
 */
export function convergenceRate(history: readonly { unknowns: number; estimate: number }[]): number | null {
  checkHistory(history, false);
  return fittedRate(history);
}

/**
 * Extrapolates a run's history (such as {@link AdaptiveResult}.history) to the size and time at
 * which its estimator would reach `tolerance`, at the rate of its recent steps (those since N was
 * an eighth of its last value); null when the tolerance is already reached or E has not been
 * falling steadily over those steps (rate below 0.05, or N grew less than twofold: too few steps
 * to tell).
 *
 * An extrapolation, not a promise: on rough data the rate usually still rises with N, so early in a
 * run the forecast tends to over-estimate (on the u0 ≡ 1 reference runs, from about a fifth of the
 * final size: 0.91× the unknowns the run needed in 2D and 1.08× in 1D; from a thirty-fifth, 2.6×
 * in 2D; docs/adaptivity.md §9); and a run may stop for other reasons first (memory, the deepest
 * temporal level).
 *
 * @example
 * ```ts
 * import { toleranceForecast } from 'chronomesh';
 * // E = N^(-1/2) exactly: E = 0.01 needs N = 10⁴; the three steps took 0.2 + 0.4 + 1.6 s up to N = 1600,
 * // so the whole run would take 2.2 s × 10⁴ / 1600
 * const history = [{ unknowns: 100, estimate: 0.1, seconds: 0.2 }, { unknowns: 400, estimate: 0.05, seconds: 0.4 }, { unknowns: 1600, estimate: 0.025, seconds: 1.6 }];
 * const f = toleranceForecast(history, 0.01)!;
 * console.log(f.rate.toFixed(2), Math.round(f.unknowns), f.seconds.toFixed(2)); // → 0.50 10000 13.75
 * ```
 */
export function toleranceForecast(history: readonly { unknowns: number; estimate: number; seconds: number }[], tolerance: number): ToleranceForecast | null {
  checkHistory(history, true);
  checkNumber(tolerance, 'tolerance', { min: 0, minOpen: true });
  const last = history[history.length - 1];
  if (last === undefined || last.estimate <= tolerance) return null;
  const rate = recentRate(history);
  if (rate === null || !(rate >= LEAST_RATE)) return null;
  const unknowns = last.unknowns * (last.estimate / tolerance) ** (1 / rate);
  let seconds = 0;
  for (const s of history) seconds += s.seconds;
  return { rate, unknowns, seconds: (seconds * unknowns) / last.unknowns };
}

/** Checks every step of a history: N > 0, E ≥ 0 and, with `withSeconds`, seconds ≥ 0. */
function checkHistory(history: unknown, withSeconds: boolean): asserts history is readonly { unknowns: number; estimate: number; seconds: number }[] {
  const shape = withSeconds ? '{unknowns, estimate, seconds}' : '{unknowns, estimate}';
  if (!Array.isArray(history)) throw new InvalidArgumentError(`history must be an array of ${shape}, received ${typeof history}`, { field: 'history', expected: 'array' });
  history.forEach((s: unknown, i) => {
    const step = checkObject(s, `history[${i}]`, `an object ${shape}`);
    checkNumber(step.unknowns, `history[${i}].unknowns`, { min: 0, minOpen: true });
    checkNumber(step.estimate, `history[${i}].estimate`, { min: 0 });
    if (withSeconds) checkNumber(step.seconds, `history[${i}].seconds`, { min: 0 });
  });
}

/** The slope of {@link convergenceRate} on a checked history. */
function fittedRate(history: readonly { unknowns: number; estimate: number }[]): number | null {
  return slope(history.slice(Math.floor(history.length / 2)));
}

/** The slope over the steps from the last one with N ≤ N_last / RECENT_GROWTH (or the first) on. */
function recentRate(history: readonly { unknowns: number; estimate: number }[]): number | null {
  const last = history[history.length - 1]!.unknowns;
  let k = history.length - 1;
  while (k > 0 && history[k]!.unknowns > last / RECENT_GROWTH) k--;
  return slope(history.slice(k));
}

/** Least-squares slope of −log E against log N over `steps` (E = 0 left out); null when N spans less than LEAST_SPAN. */
function slope(steps: readonly { unknowns: number; estimate: number }[]): number | null {
  const tail = steps.filter((s) => s.estimate > 0);
  if (tail.length < 2) return null;
  const xs = tail.map((s) => Math.log(s.unknowns));
  if (Math.max(...xs) - Math.min(...xs) < Math.log(LEAST_SPAN) - 1e-12) return null; // (rounding of the logs)
  const ys = tail.map((s) => -Math.log(s.estimate));
  const mx = xs.reduce((a, b) => a + b, 0) / xs.length;
  const my = ys.reduce((a, b) => a + b, 0) / ys.length;
  let sxy = 0, sxx = 0;
  for (let i = 0; i < xs.length; i++) { sxy += (xs[i]! - mx) * (ys[i]! - my); sxx += (xs[i]! - mx) ** 2; }
  return sxx > 0 ? sxy / sxx : null;
}

/**
 * What to tell a user whose run stopped with `'resolution'` above its tolerance: no budget lets it
 * go on (the next set would need temporal levels beyond the deepest the loop trusts,
 * docs/adaptivity.md §6), but a shorter horizon does; `endState` names how the caller gets the end
 * state to continue from. One wording for every front end. @internal
 */
export function resolutionAdvice(endState: string): string {
  return `a larger budget would not help (the next set needed time scales below T·2^-${DEEPEST_SET_LEVEL}, docs/adaptivity.md §6): ` +
    `solve over a shorter horizon and continue from its end state (${endState}), or loosen the tolerance`;
}
