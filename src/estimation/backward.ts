/**
 * Backward (final-value) problems
 *   −∂t p − ∇·(κ∇p) + c p = g  in (0,T) × Ω,   p(T) = p_T,
 * solved through the forward machinery by time reversal: q(s) = p(T − s) satisfies
 * ∂s q − ∇·(κ∇q) + c q = g(T − s), q(0) = p_T. The trial index set passed in is read in the
 * reversed time s: its refinement near s = 0 resolves the layer of p near t = T.
 */
import { ConvergenceError, InvalidArgumentError } from '../errors';
import { SpaceTimeSolution } from '../spacetime/space-time-solution';
import type { SpatialDomain } from '../space/index';
import type { DoubleTree } from '../spacetime/double-tree';
import { HeatProblem, type SeparableTerm } from '../system/heat-problem';
import type { PcgOptions, PcgResult } from '../system/pcg';
import { SpaceTimeSystem, type SpaceTimeSystemOptions } from '../system/space-time-system';

/** Input of {@link solveBackward}. */
export interface BackwardProblemSpec {
  domain: SpatialDomain;
  /** Final time T > 0. */
  T: number;
  /** Terminal state p_T(x, y) (default 0). */
  terminal?: (x: number, y: number) => number;
  /** Source g(t, x, y) or separable terms g_i(t) h_i(x, y) in the original time t (default 0). */
  source?: ((t: number, x: number, y: number) => number) | SeparableTerm[];
}

/**
 * The solution p(t, x) of a backward problem: a {@link SpaceTimeSolution} whose time argument is
 * the original t (all outputs — evaluate, slice, sampleGrid, probe tables, VTK — work unchanged).
 * Its `coefficients` and `trialSet` are those of the time-reversed forward solution.
 *
 * @example
 * ```ts
 * import { DoubleTree, intervalDomain, solveBackward } from 'chronomesh';
 * const domain = intervalDomain(0, 1, 2);
 * const { solution } = solveBackward({ domain, T: 1, terminal: (x) => Math.sin(Math.PI * x) }, DoubleTree.sparseGrid(domain, 5));
 * console.log(solution.evaluate(0.9, [0.5])[0]); // ≈ exp(−π² · 0.1) = 0.373
 * ```
 */
export class BackwardSolution extends SpaceTimeSolution {
  override spatialCoefficients(t: number): { set: Int32Array; coeffs: Float64Array } {
    if (!Number.isFinite(t) || t < 0 || t > this.T) {
      throw new InvalidArgumentError(`time t = ${t} is outside [0, ${this.T}]`, { field: 't', expected: `[0, ${this.T}]`, received: t });
    }
    return super.spatialCoefficients(Math.max(0, this.T - t));
  }
}

/**
 * Solves a backward problem on a trial index set (read in reversed time s = T − t) by PCG.
 *
 * @example
 * ```ts
 * import { DoubleTree, intervalDomain, solveBackward } from 'chronomesh';
 * const domain = intervalDomain(0, 1, 2);
 * // adjoint of a tracking problem: source = misfit, zero terminal state
 * const { solution, pcg } = solveBackward({ domain, T: 1, source: (t, x) => (t > 0.5 ? x : 0) }, DoubleTree.sparseGrid(domain, 5), { relTol: 1e-10 });
 * console.log(pcg.converged, solution.evaluate(0, [0.5])[0]);
 * ```
 */
export function solveBackward(
  spec: BackwardProblemSpec, trialSet: DoubleTree,
  opts: Omit<PcgOptions, 'preconditioner' | 'initialGuess'> & SpaceTimeSystemOptions = {},
): { solution: BackwardSolution; pcg: PcgResult; system: SpaceTimeSystem } {
  if (spec === null || typeof spec !== 'object') throw new InvalidArgumentError('backward problem specification must be an object', { field: 'spec' });
  const { T } = spec;
  if (typeof T !== 'number' || !Number.isFinite(T) || T <= 0) {
    throw new InvalidArgumentError(`final time T = ${String(T)} must be a finite number > 0`, { field: 'T', expected: 'finite number > 0', received: T });
  }
  if (spec.terminal !== undefined && typeof spec.terminal !== 'function') throw new InvalidArgumentError('terminal must be a function (x, y) => number', { field: 'terminal' });
  const g = spec.source;
  let source: ((t: number, x: number, y: number) => number) | SeparableTerm[] | undefined;
  if (typeof g === 'function') source = (s, x, y) => g(Math.max(0, T - s), x, y);
  else if (Array.isArray(g)) source = g.map((term) => ({ time: (s: number) => term.time(Math.max(0, T - s)), space: term.space }));
  else if (g !== undefined) throw new InvalidArgumentError('source must be a function (t, x, y) => number or an array of separable terms', { field: 'source' });
  const problem = new HeatProblem({ domain: spec.domain, T, ...(spec.terminal ? { initial: spec.terminal } : {}), ...(source ? { source } : {}) });
  const { inner, preconditionerInner, ...pcgOpts } = opts;
  const sysOpts: SpaceTimeSystemOptions = {};
  if (inner) sysOpts.inner = inner;
  if (preconditionerInner) sysOpts.preconditionerInner = preconditionerInner;
  const system = new SpaceTimeSystem(problem, trialSet, sysOpts);
  // allowUnconverged: the check below raises the error with the backward problem's own wording
  const { pcg } = system.solve({ ...pcgOpts, allowUnconverged: true });
  if (!pcg.converged) {
    const reached = pcg.residualHistory[pcg.residualHistory.length - 1]! / (pcg.residualHistory[0]! || 1);
    throw new ConvergenceError(`backward PCG solve stopped after ${pcg.iterations} iterations at relative residual ${reached.toExponential(2)}; raise maxIterations or relTol`, {
      field: 'backward', expected: `relative residual ≤ ${pcgOpts.relTol ?? 1e-8}`, received: reached,
    });
  }
  return { solution: new BackwardSolution(spec.domain, trialSet, pcg.solution, T), pcg, system };
}
