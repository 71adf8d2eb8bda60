/**
 * Validation of the options of {@link solveAdaptive} (before any work): numbers in range,
 * integers where counts are meant, callbacks that are functions, a starting set from the
 * problem's own domain, and no unknown keys (a misspelt key is answered with the nearest name).
 */
import { InvalidArgumentError } from '../errors';
import { checkFunction, checkInstance, checkInteger, checkNumber, checkOptions } from '../validation/index';
import { checkSetOnDomain } from '../spacetime/set-checks';
import { HeatProblem } from '../system/heat-problem';
import { validateInnerSolver } from '../system/system-options';
import type { AdaptiveOptions } from './adaptive-solver';

const ADAPTIVE_KEYS: Record<keyof Required<AdaptiveOptions>, true> = {
  theta: true, tolerance: true, maxUnknowns: true, maxSteps: true, maxSeconds: true,
  initialSet: true, solverFraction: true, inner: true, onStep: true, onProgress: true, signal: true, enlargement: true, markSeparately: true,
  checkpoint: true, resume: true,
};

/** Checks `solveAdaptive(problem, opts)`: the problem, then the options (`undefined` gives `{}`). */
export function validateAdaptiveOptions(opts: unknown, problem: HeatProblem, field = 'opts'): AdaptiveOptions {
  checkInstance(problem, HeatProblem, 'problem', 'a HeatProblem');
  const o = checkOptions<AdaptiveOptions>(opts, field, ADAPTIVE_KEYS);
  if (o.theta !== undefined) checkNumber(o.theta, `${field}.theta`, { min: 0, max: 1, minOpen: true, maxOpen: true });
  if (o.tolerance !== undefined) checkNumber(o.tolerance, `${field}.tolerance`, { min: 0 });
  if (o.maxUnknowns !== undefined) checkInteger(o.maxUnknowns, `${field}.maxUnknowns`, 1, 2 ** 31 - 1);
  if (o.maxSteps !== undefined) checkInteger(o.maxSteps, `${field}.maxSteps`, 1, 1e6);
  if (o.maxSeconds !== undefined) checkNumber(o.maxSeconds, `${field}.maxSeconds`, { min: 0, minOpen: true, allowInfinity: true });
  if (o.solverFraction !== undefined) checkNumber(o.solverFraction, `${field}.solverFraction`, { min: 0, max: 1, minOpen: true });
  if (o.inner !== undefined) validateInnerSolver(o.inner, `${field}.inner`);
  if (o.onStep !== undefined) checkFunction(o.onStep, `${field}.onStep`, 'a function (step, solution) => boolean | void');
  if (o.onProgress !== undefined) checkFunction(o.onProgress, `${field}.onProgress`, 'a function (progress) => void');
  if (o.signal !== undefined && !(typeof o.signal === 'object' && o.signal !== null && typeof (o.signal as AbortSignal).aborted === 'boolean')) {
    throw new InvalidArgumentError(`${field}.signal must be an AbortSignal`, { field: `${field}.signal`, expected: 'AbortSignal', received: typeof o.signal });
  }
  if (o.enlargement !== undefined) {
    const e = checkOptions<{ spatialGenerations?: number }>(o.enlargement, `${field}.enlargement`, ['spatialGenerations']);
    if (e.spatialGenerations !== undefined) checkInteger(e.spatialGenerations, `${field}.enlargement.spatialGenerations`, 1, 8);
  }
  if (o.checkpoint !== undefined) checkFunction(o.checkpoint, `${field}.checkpoint`, 'a function (bytes, info) => void');
  if (o.resume !== undefined && !(o.resume instanceof Uint8Array)) {
    throw new InvalidArgumentError(`${field}.resume must be the bytes of a checkpoint (a Uint8Array)`, { field: `${field}.resume`, expected: 'Uint8Array', received: o.resume === null ? 'null' : typeof o.resume });
  }
  if (o.resume !== undefined && o.initialSet !== undefined) {
    throw new InvalidArgumentError(`give either ${field}.initialSet or ${field}.resume, not both (a resumed run continues with the saved set)`, { field: `${field}.initialSet`, expected: 'undefined when resume is given', received: 'a DoubleTree' });
  }
  if (o.initialSet !== undefined) checkSetOnDomain(o.initialSet, problem.domain, `${field}.initialSet`);
  return o;
}
