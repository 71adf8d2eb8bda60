/**
 * The friendly one-call entry point: `solve(problem, …)` with the index set
 * chosen by the second argument. Dispatch is by runtime type
 * (typed-function), so a wrong argument gets one clear typed error instead
 * of failing somewhere inside.
 */
import { typed } from './vendor/typed-function';
import { InvalidArgumentError, ToleranceNotReachedError } from './errors';
import { solveAdaptive } from './adapt/adaptive-solver';
import { resolutionAdvice, toleranceForecast } from './adapt/forecast';
import type { AdaptiveOptions, AdaptiveResult, AdaptiveStep } from './adapt/adaptive-options';
import { SpaceTimeSolution } from './spacetime/space-time-solution';
import { validateAdaptiveOptions } from './adapt/adaptive-options';
import { DoubleTree, sparseGridUnknownEstimate } from './spacetime/double-tree';
import { checkSetOnDomain } from './spacetime/set-checks';
import { BYTES_PER_SYSTEM_UNKNOWN, checkInteger, checkMemory } from './validation/index';
import { HeatProblem } from './system/heat-problem';
import type { PcgResult } from './system/pcg';
import { SpaceTimeSystem } from './system/space-time-system';

/** Result of {@link solve}: the solution, its index set, and the PCG result or the adaptive history. */
export interface SolveResult {
  solution: SpaceTimeSolution;
  set: DoubleTree;
  /** PCG result for a fixed index set; null after an adaptive solve. */
  pcg: PcgResult | null;
  /** The adaptive history; null for a fixed index set. */
  history: AdaptiveStep[] | null;
  /** Why the adaptive run stopped (see `AdaptiveResult.stopReason`); null for a fixed index set. */
  stopReason: AdaptiveResult['stopReason'] | null;
  /** The held-value data error (see `AdaptiveResult.heldDataError`), not included in any estimate. */
  heldDataError: number;
}

function onSet(problem: HeatProblem, set: DoubleTree): SolveResult {
  checkSetOnDomain(set, problem.domain, 'how');
  checkMemory(set.size * BYTES_PER_SYSTEM_UNKNOWN, `the space-time system on ${set.size} unknowns`, 'how', 'choose a smaller index set');
  const heldDataError = problem.heldDataError().estimate; // before the solve: bad held data fail first
  const { solution, pcg } = new SpaceTimeSystem(problem, set).solve({ relTol: 1e-8 });
  return { solution, set, pcg, history: null, stopReason: null, heldDataError };
}

function onLevel(problem: HeatProblem, level: number): SolveResult {
  checkInteger(level, 'how', 0, 40);
  const unknowns = sparseGridUnknownEstimate(problem.domain, level);
  checkMemory(unknowns * BYTES_PER_SYSTEM_UNKNOWN, `the sparse grid of level ${level} (about ${unknowns.toExponential(1)} unknowns) with its space-time system`, 'how', 'choose a lower level');
  return onSet(problem, DoubleTree.sparseGrid(problem.domain, level));
}

function adaptive(problem: HeatProblem, opts: AdaptiveOptions): SolveResult {
  validateAdaptiveOptions(opts, problem, 'how');
  const r = solveAdaptive(problem, opts);
  const result: SolveResult = { solution: r.solution, set: r.set, pcg: null, history: r.history, stopReason: r.stopReason, heldDataError: r.heldDataError };
  // A tolerance asked for and a budget that stopped the run first: not the answer requested.
  // (A run the caller stopped, by its signal or its onStep callback, returns as it is.)
  const lastStep = r.history[r.history.length - 1]!;
  const estimate = lastStep.estimate;
  // the target E had to reach: tolerance + relativeTolerance · ‖u_δ‖_S of the last step
  const relative = (opts.relativeTolerance ?? 0) * (lastStep.solutionNorm ?? 0);
  const tolerance = (opts.tolerance ?? 0) + relative;
  const named = relative > 0 ? `${tolerance.toExponential(3)} (tolerance ${opts.tolerance ?? 0} + relativeTolerance ${opts.relativeTolerance} × the solution's norm ${lastStep.solutionNorm!.toExponential(3)})` : `${tolerance}`;
  // (Nor does a run whose E reached the rounding level: no budget would lower it, and the answer is
  // exact to working precision.)
  if (tolerance > 0 && !(estimate <= tolerance) && r.stopReason !== 'aborted' && r.stopReason !== 'callback' && r.stopReason !== 'rounding') {
    // A run stopped by the deepest trustworthy temporal level cannot go on with more budget.
    const f = r.stopReason === 'resolution' ? null : toleranceForecast(r.history, tolerance);
    throw new ToleranceNotReachedError(
      `solve: the estimator is ${estimate.toExponential(3)} at ${r.set.size} unknowns, above the tolerance ${named}, when the run stopped by '${r.stopReason}'; ` +
        (r.stopReason === 'resolution'
          ? resolutionAdvice('solution.state(T)')
          : 'raise that budget (maxUnknowns, maxSteps, maxSeconds, setMemoryBudget) or loosen the tolerance') +
        '; the result so far is in error.result (solveAdaptive returns it instead of throwing)' +
        (f ? `; at the rate of the recent steps (${f.rate.toFixed(2)}, since N was an eighth of its last value) E would reach the tolerance at about ${f.unknowns.toExponential(1)} unknowns ` +
          `after roughly ${f.seconds.toExponential(1)} s (toleranceForecast: an extrapolation, high early in a run)` : ''),
      estimate,
      tolerance,
      r.stopReason,
      result,
    );
  }
  return result;
}

type Dispatch = (...args: unknown[]) => SolveResult;
let dispatcher: Dispatch | null = null;

/**
 * The typed-function dispatcher, built on the first call: building it at module
 * load would be work every importer pays for and would keep bundlers from
 * dropping this module (and everything it reaches) when solve() is not used.
 */
function dispatch(): Dispatch {
  if (dispatcher === null) {
    const t = typed.create();
    t.addType({ name: 'HeatProblem', test: (x) => x instanceof HeatProblem });
    t.addType({ name: 'DoubleTree', test: (x) => x instanceof DoubleTree });
    dispatcher = t<Dispatch>('solve', {
      HeatProblem: (p: HeatProblem) => adaptive(p, {}),
      'HeatProblem, Object': (p: HeatProblem, o: AdaptiveOptions) => adaptive(p, o),
      'HeatProblem, number': onLevel,
      'HeatProblem, DoubleTree': (p: HeatProblem, set: DoubleTree) => onSet(p, set),
    });
  }
  return dispatcher;
}

/**
 * Solves a heat problem:
 * - `solve(problem)` / `solve(problem, options)`: adaptively (see {@link solveAdaptive});
 * - `solve(problem, L)`: on the sparse grid of level L;
 * - `solve(problem, set)`: on the given trial double tree.
 *
 * With a `tolerance` in the options, a run that a budget stops before its estimator reaches the
 * tolerance throws {@link ToleranceNotReachedError}, which carries the result so far
 * (`solveAdaptive` returns it with its `stopReason` instead). Without one, the run goes until a
 * budget stops it, and `stopReason` says which. A run that stops with `'rounding'` (E at the
 * rounding level of the solution, see {@link AdaptiveResult.stopReason}) returns, whatever the
 * tolerance: its answer is exact to working precision.
 *
 * @example
 * ```ts
 * import { HeatProblem, intervalDomain, solve } from 'chronomesh';
 * const problem = new HeatProblem({ domain: intervalDomain(0, 1, 2), T: 1, initial: () => 1 });
 * const fixed = solve(problem, 6);                          // sparse grid, level 6
 * const adapted = solve(problem, { maxUnknowns: 1000 });    // adaptive
 * console.log(fixed.pcg?.iterations, adapted.history?.length, adapted.solution.evaluate(0.05, [0.5]));
 * ```
 */
export function solve(problem: HeatProblem, how?: number | DoubleTree | AdaptiveOptions): SolveResult {
  try {
    return how === undefined ? dispatch()(problem) : dispatch()(problem, how);
  } catch (e) {
    const data = (e as { data?: { category?: string; index?: number; actual?: string[]; expected?: string[] } }).data;
    if (e instanceof TypeError && data?.category) {
      const i = data.index ?? 0;
      throw new InvalidArgumentError(
        `solve: argument ${i + 1} should be ${i === 0 ? 'a HeatProblem' : 'a sparse-grid level (number), a DoubleTree or an options object'}` +
          (data.actual ? `, received ${data.actual.join(', ')}` : ''),
        { field: i === 0 ? 'problem' : 'how', expected: (data.expected ?? []).join(' | ') },
      );
    }
    throw e;
  }
}
