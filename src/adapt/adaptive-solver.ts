/**
 * The adaptive loop SOLVE → ESTIMATE → MARK → REFINE (DESIGN.md §7), with
 * nested iteration: each PCG starts from the previous solution (zero on new
 * indices) and stops once its algebraic error estimate is a fraction of the
 * current estimator.
 */
import { InvalidArgumentError } from '../errors';
import { DoubleTree } from '../spacetime/double-tree';
import { SpaceTimeSolution } from '../output/space-time-solution';
import type { HeatProblem } from '../system/heat-problem';
import type { InnerSolver } from '../system/fibre-inverse';
import { SpaceTimeSystem } from '../system/space-time-system';
import { dorflerMark } from './dorfler';
import { enlargeDoubleTree } from './enlargement';
import { embeddingMap, prolongCoefficients } from './embedding';
import { residualIndicators } from './estimator';
import { refineDoubleTree } from './refine';

/** One pass of the adaptive loop, as recorded in the history. */
export interface AdaptiveStep {
  step: number;
  /** #Λ of the solve in this step. */
  unknowns: number;
  /** Estimator E of this step's solution. */
  estimate: number;
  pcgIterations: number;
  /** Deepest temporal level and spatial generation in Λ. */
  maxTimeLevel: number;
  /** Number of pairs marked for refinement (0 in the last step). */
  marked: number;
  /** Wall time of this step (solve + estimate + refine), seconds. */
  seconds: number;
}

/** Options of {@link solveAdaptive}. */
export interface AdaptiveOptions {
  /** Dörfler bulk parameter θ ∈ (0,1) (default 0.5). */
  theta?: number;
  /** Stop when E ≤ tolerance (default 0: run until another limit). */
  tolerance?: number;
  /** Stop before a step whose Λ would exceed this many unknowns (default 2e5). */
  maxUnknowns?: number;
  /** Maximum number of steps (default 40). */
  maxSteps?: number;
  /** Wall-time budget in seconds (default ∞). */
  maxSeconds?: number;
  /** Starting index set (default: the sparse grid of level 1). */
  initialSet?: DoubleTree;
  /** PCG stops when its algebraic error estimate is this fraction of E (default 0.1). */
  solverFraction?: number;
  /** Spatial inner solver for K_Y, K_X. */
  inner?: InnerSolver;
  /** Called after every step; return `false` to stop. */
  onStep?: (step: AdaptiveStep, solution: SpaceTimeSolution) => boolean | void;
}

/** Result of {@link solveAdaptive}. */
export interface AdaptiveResult {
  solution: SpaceTimeSolution;
  set: DoubleTree;
  history: AdaptiveStep[];
  /** Why the loop stopped. */
  stopReason: 'tolerance' | 'unknowns' | 'steps' | 'time' | 'callback';
}

/**
 * Solves `problem` adaptively.
 *
 * @example
 * ```ts
 * import { HeatProblem, intervalDomain, solveAdaptive } from 'chronomesh';
 * const domain = intervalDomain(0, 1, 2);
 * const problem = new HeatProblem({ domain, T: 1, initial: () => 1 });
 * const { history, solution } = solveAdaptive(problem, { maxUnknowns: 2000 });
 * console.log(history.map((h) => [h.unknowns, h.estimate]), solution.evaluate(0.01, [0.5]));
 * ```
 */
export function solveAdaptive(problem: HeatProblem, opts: AdaptiveOptions = {}): AdaptiveResult {
  const theta = opts.theta ?? 0.5;
  if (!(theta > 0 && theta < 1)) throw new InvalidArgumentError(`theta = ${theta} must lie in (0, 1)`, { field: 'theta', expected: '(0, 1)', received: theta });
  const tol = opts.tolerance ?? 0;
  const maxUnknowns = opts.maxUnknowns ?? 2e5;
  const maxSteps = opts.maxSteps ?? 40;
  const maxSeconds = opts.maxSeconds ?? Infinity;
  const fraction = opts.solverFraction ?? 0.1;
  for (const [name, v] of [['tolerance', tol], ['maxUnknowns', maxUnknowns], ['maxSteps', maxSteps], ['solverFraction', fraction]] as const) {
    if (!(v >= 0)) throw new InvalidArgumentError(`${name} = ${v} must be a number ≥ 0`, { field: name, received: v });
  }
  const domain = problem.domain;
  let set = opts.initialSet ?? DoubleTree.sparseGrid(domain, 1);
  const systemOpts = opts.inner ? { inner: opts.inner } : {};
  let system = new SpaceTimeSystem(problem, set, systemOpts);
  let b = system.rightHandSide();
  let u: Float64Array = new Float64Array(set.size);
  let lastEstimate = Infinity;
  const history: AdaptiveStep[] = [];
  const start = performance.now();
  for (let step = 0; ; step++) {
    const t0 = performance.now();
    const absTol = Number.isFinite(lastEstimate) ? fraction * lastEstimate : 0;
    const solved = system.solve({ rightHandSide: b, initialGuess: u, relTol: absTol > 0 ? 1e-12 : 1e-6, absTol, maxIterations: 500 });
    u = solved.pcg.solution;
    const solution = solved.solution;
    // ESTIMATE on the enlarged set.
    const bigSet = enlargeDoubleTree(domain, set);
    const bigSystem = new SpaceTimeSystem(problem, bigSet, systemOpts);
    const bigB = bigSystem.rightHandSide();
    const ind = residualIndicators(bigSystem, set, u, bigB);
    lastEstimate = ind.estimate;
    const record: AdaptiveStep = {
      step, unknowns: set.size, estimate: ind.estimate, pcgIterations: solved.pcg.iterations,
      maxTimeLevel: set.tree.maxLevel, marked: 0, seconds: 0,
    };
    let stop: AdaptiveResult['stopReason'] | null = null;
    if (ind.estimate <= tol) stop = 'tolerance';
    else if (step + 1 >= maxSteps) stop = 'steps';
    else if ((performance.now() - start) / 1000 >= maxSeconds) stop = 'time';
    let next: DoubleTree | null = null;
    if (!stop) {
      // MARK and REFINE.
      const marked = dorflerMark(ind.eta2, theta);
      record.marked = marked.length;
      next = refineDoubleTree(domain, set, bigSet, marked);
      if (next.size > maxUnknowns) stop = 'unknowns';
    }
    record.seconds = (performance.now() - t0) / 1000;
    history.push(record);
    if (opts.onStep && opts.onStep(record, solution) === false) stop = 'callback';
    if (stop || !next) return { solution, set, history, stopReason: stop ?? 'steps' };
    // Prolong u to the refined set (it lies between Λ and Λ̲) and rebuild the system there.
    u = prolongCoefficients(embeddingMap(set, next), u, next.size);
    set = next;
    system = new SpaceTimeSystem(problem, set, systemOpts);
    b = system.rightHandSide();
  }
}
