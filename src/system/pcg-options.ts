/**
 * Validation of the arguments of {@link pcg} and of `SpaceTimeSystem.solve`, done before any
 * work so that a wrong tolerance or a wrong-length vector is reported by its name instead of
 * surfacing later as a CG breakdown or a non-finite residual.
 */
import { checkAbortSignal, checkBoolean, checkFloat64Array, checkFunction, checkInteger, checkLinearOperator, checkNumber, checkOptions } from '../validation/index';
import type { PcgOptions } from './pcg';

/** Keys of {@link PcgOptions}; the Record type makes a new option a compile error until listed here. */
const PCG_KEYS: Record<keyof Required<PcgOptions>, true> = {
  preconditioner: true, relTol: true, absTol: true, maxIterations: true, initialGuess: true, estimateSpectrum: true,
  energyTol: true, energyDelay: true, signal: true, onIteration: true,
};

/** Options of `SpaceTimeSystem.solve` (PCG options without the preconditioner, plus a right-hand side). */
export type SystemSolveOptions = Omit<PcgOptions, 'preconditioner'> & {
  rightHandSide?: Float64Array;
  /**
   * Return an unconverged result instead of raising NotConvergedError when PCG stops at its
   * iteration cap (default false). The result then has `pcg.converged === false` and a `warning`.
   */
  allowUnconverged?: boolean;
};

const SOLVE_KEYS: Record<keyof Required<SystemSolveOptions>, true> = {
  relTol: true, absTol: true, maxIterations: true, initialGuess: true, estimateSpectrum: true, rightHandSide: true, allowUnconverged: true,
  energyTol: true, energyDelay: true, signal: true, onIteration: true,
};

function checkCommon(o: Partial<SystemSolveOptions>, n: number, field: string): void {
  if (o.relTol !== undefined) checkNumber(o.relTol, `${field}.relTol`, { min: 0, max: 1, maxOpen: true });
  if (o.absTol !== undefined) checkNumber(o.absTol, `${field}.absTol`, { min: 0 });
  if (o.maxIterations !== undefined) checkInteger(o.maxIterations, `${field}.maxIterations`, 1, 1e7);
  if (o.initialGuess !== undefined) checkFloat64Array(o.initialGuess, `${field}.initialGuess`, { length: n, finite: true });
  if (o.estimateSpectrum !== undefined) checkBoolean(o.estimateSpectrum, `${field}.estimateSpectrum`);
  if (o.energyTol !== undefined) checkNumber(o.energyTol, `${field}.energyTol`, { min: 0 });
  if (o.energyDelay !== undefined) checkInteger(o.energyDelay, `${field}.energyDelay`, 1, 100);
  if (o.onIteration !== undefined) checkFunction(o.onIteration, `${field}.onIteration`, 'a function (progress) => void');
  if (o.signal !== undefined) checkAbortSignal(o.signal, `${field}.signal`);
}

/**
 * Checks `pcg(S, b, opts)`: S a square operator, b a finite Float64Array of length S.inSize,
 * tolerances in range, initial guess and preconditioner of the right size. Returns the options
 * (`{}` for undefined).
 */
export function validatePcgArguments(S: unknown, b: unknown, opts?: unknown): PcgOptions {
  const op = checkLinearOperator(S, 'S', { square: true });
  const n = op.inSize;
  checkFloat64Array(b, 'b', { length: n, finite: true });
  const o = checkOptions<PcgOptions>(opts, 'opts', PCG_KEYS);
  checkCommon(o, n, 'opts');
  if (o.preconditioner !== undefined) checkLinearOperator(o.preconditioner, 'opts.preconditioner', { size: n });
  return o;
}

/**
 * Checks the options of `SpaceTimeSystem.solve` for a system with `n` unknowns: tolerances,
 * iteration cap, and finite vectors of length n for `initialGuess` and `rightHandSide`.
 */
export function validateSolveOptions(opts: unknown, n: number): SystemSolveOptions {
  const o = checkOptions<SystemSolveOptions>(opts, 'opts', SOLVE_KEYS);
  checkCommon(o, n, 'opts');
  if (o.rightHandSide !== undefined) checkFloat64Array(o.rightHandSide, 'opts.rightHandSide', { length: n, finite: true });
  if (o.allowUnconverged !== undefined) checkBoolean(o.allowUnconverged, 'opts.allowUnconverged');
  return o;
}
