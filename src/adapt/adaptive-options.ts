/**
 * The options, progress reports, step records and result of {@link solveAdaptive}, and the
 * validation of the options (before any work): numbers in range, integers where counts are meant,
 * callbacks that are functions, a starting set from the problem's own domain, and no unknown keys
 * (a misspelt key is answered with the nearest name).
 */
import { InvalidArgumentError, InvalidMeshError } from '../errors';
import { FLAT_ELEMENT_LIMIT, meshFlatness } from '../space/flat-elements';
import type { SpatialDomain } from '../space/domain';
import { checkBoolean, checkFunction, checkInstance, checkInteger, checkNumber, checkOptions } from '../validation/index';
import { checkSetOnDomain } from '../spacetime/set-checks';
import { HeatProblem } from '../system/heat-problem';
import { validateInnerSolver } from '../system/system-options';
import type { DoubleTree } from '../spacetime/double-tree';
import type { SpaceTimeSolution } from '../spacetime/space-time-solution';
import type { InnerSolver } from '../system/fibre-inverse';
import type { EnlargementOptions } from './enlargement';
import type { AdaptiveCheckpointInfo } from './checkpoint';

/** One pass of the adaptive loop, as recorded in the history. */
export interface AdaptiveStep {
  step: number;
  /** #Λ of the solve in this step. */
  unknowns: number;
  /** Estimator E of this step's solution. */
  estimate: number;
  /**
   * Size of this step's solution u_δ in the norm of the least-squares system, ‖u_δ‖_S =
   * (u_δᵀ b)^{1/2} ≈ (u_δᵀ S u_δ)^{1/2} (b the system's right-hand side, u_δ solved): equivalent to
   * the norm E measures, and close to the size of the data, ‖f‖_{L2(0,T;H⁻¹)} + ‖u0‖_{L2} (for
   * f = 0 and zero boundary values it tends to ‖u0‖_{L2(Ω)}). E / solutionNorm is the estimate
   * relative to the solution (where values are held on the boundary, relative to the part of u
   * beyond them, which the unknowns carry). null for steps restored from a checkpoint written
   * before the field existed. docs/adaptivity.md §6.
   */
  solutionNorm: number | null;
  /** PCG iterations of this step (all resumptions included). */
  pcgIterations: number;
  /** Estimated S-energy norm of the algebraic error of the solution (≤ `solverFraction`·E). */
  algebraicError: number;
  /**
   * Tighter re-solves of this step because E came out above the previous step's (0 on most steps;
   * at most 2). A rise that persists after them is genuine, not the solve's (docs/adaptivity.md §4).
   */
  riseChecks: number;
  /** Deepest temporal level in Λ. */
  maxTimeLevel: number;
  /** Deepest spatial vertex generation in Λ. */
  maxSpaceGeneration: number;
  /** Number of distinct spatial vertices used by Λ (the union of its fibres). */
  spatialVertices: number;
  /** #Λ̲, the size of the enlarged set the estimator worked on. */
  enlargedUnknowns: number;
  /** Number of pairs marked for refinement (0 in the last step). */
  marked: number;
  /** Wall time of this step (setup + solve + estimate + refine), seconds. */
  seconds: number;
  /** The same wall time split into its phases, seconds. */
  timings: { setup: number; solve: number; estimate: number; refine: number };
}

/** Progress of a running adaptive solve, passed to {@link AdaptiveOptions.onProgress}. */
export interface AdaptiveProgress {
  step: number;
  phase: 'setup' | 'solve' | 'estimate' | 'refine';
  unknowns: number;
  /** PCG iteration within the step (solve phase only; 0 otherwise). */
  iteration: number;
  /** Seconds since the run started. */
  elapsed: number;
}

/** Options of {@link solveAdaptive}. */
export interface AdaptiveOptions {
  /**
   * Dörfler bulk parameter θ ∈ (0,1) (default {@link defaultBulk}: 0.5 in 1D, 0.7 in 2D — the
   * values that reached a given estimate in the least CPU time on the reference runs,
   * docs/adaptivity.md §7).
   */
  theta?: number;
  /**
   * Stop when E ≤ tolerance (default 0: run until another limit). E estimates the error in the
   * method's space-time norm; it is an estimate, not a bound: against exact solutions the
   * L2(0,T;H¹₀) error was 0.7–2.3 times E (docs/adaptivity.md §3), so ask for a tolerance a few
   * times below the error you can accept.
   */
  tolerance?: number;
  /**
   * Stop when E ≤ tolerance + relativeTolerance · ‖u_δ‖_S ({@link AdaptiveStep.solutionNorm}, the
   * size of the solution in the norm E measures); in [0, 1), default 0. The usual absolute-plus-
   * relative test (common practice): `relativeTolerance: 0.05` asks for an estimate of 5 % of the
   * solution, whatever the units of u. Like `tolerance`, it bounds an estimate, not the error.
   */
  relativeTolerance?: number;
  /**
   * Stop before a step whose Λ would exceed this many unknowns (default 2e5). The first step runs on
   * the first set whatever its size: the default one grows with data it must resolve (narrow
   * sources, hot spots, pulses; docs/adaptivity.md §2.1–2.3), so it can exceed a small budget.
   */
  maxUnknowns?: number;
  /** Maximum number of steps (default 40). */
  maxSteps?: number;
  /**
   * Wall-time budget in seconds (default ∞), checked at every phase and PCG iteration; the step in
   * progress when it runs out is discarded. The first step always completes.
   */
  maxSeconds?: number;
  /**
   * Starting index set (default: the sparse grid of level 1, or a finer one if that is empty,
   * graded toward t = 0 down to the shortest diffusion time h²/κ of the initial mesh so that the
   * estimator sees the initial layer over long horizons, and refined where the load quadrature
   * would miss features of the source or the initial state, so that it sees localized data;
   * docs/adaptivity.md §2, §2.1).
   */
  initialSet?: DoubleTree;
  /** PCG runs until its estimated S-energy error is at most this fraction of E (default 0.1). */
  solverFraction?: number;
  /** Spatial inner solver for K_Y, K_X. */
  inner?: InnerSolver;
  /**
   * Dörfler marking separately among the spatial and among the temporal candidates (each with bulk
   * θ), instead of once over all candidates (default false).
   */
  markSeparately?: boolean;
  /** How the candidate set Λ̲ is built (default: h halves in the spatial candidates). */
  enlargement?: EnlargementOptions;
  /** Called after every step; return `false` to stop (stop reason `'callback'`). */
  onStep?: (step: AdaptiveStep, solution: SpaceTimeSolution) => boolean | void;
  /** Called at every phase change and PCG iteration (progress bars, logs). Keep it cheap. */
  onProgress?: (progress: AdaptiveProgress) => void;
  /**
   * Cancels the run: checked at every phase and PCG iteration. The run then returns the last
   * completed step's result with stop reason `'aborted'` (the step in progress is discarded, never
   * half-applied). The loop is synchronous, so abort from a callback (`onProgress`, `onStep`) or use
   * {@link solveAdaptiveAsync}, which lets timers and other events run between steps.
   */
  signal?: AbortSignal;
  /**
   * Called after every completed step with a checkpoint of the run (bytes in the solution-file
   * format, docs/solution-files.md): the step's solution, the set of the next step and the history.
   * Store it (e.g. `checkpointToFile(path)` of `chronomesh/files` writes it atomically) and pass it
   * as `resume` to continue the run later. With this option the set of the next step is also built
   * after the last step, so that a finished run can be continued with larger limits.
   */
  checkpoint?: (bytes: Uint8Array, info: AdaptiveCheckpointInfo) => void;
  /**
   * Continue the run saved in this checkpoint (bytes from the `checkpoint` option) instead of
   * starting anew: the problem must be the same (checked by its fingerprint) and its domain built
   * like the saved one and not refined since (the saved bisections are replayed into it). The
   * history starts with the saved steps and the next step is the saved step + 1; `maxSteps`
   * counts all steps, `maxSeconds` this process's time. Not together with `initialSet`. A
   * checkpoint of a run that could not continue (E = 0) returns its saved result at once.
   */
  resume?: Uint8Array;
  /**
   * Run even if the bulk of the initial mesh is flat as the diffusion sees it (default false). The
   * loop refuses, before any work, a mesh whose initial elements covering half its area have mapped
   * anisotropy above 128 (for an anisotropic material: any of its elements; see
   * {@link SpatialDomain.mappedAnisotropy}): bisection keeps elements as flat as the initial ones,
   * and on such meshes the estimator was measured to read 3 to 12 times below the true error, and
   * PCG to stall (docs/adaptivity.md §2.6); a few slivers are accepted. The remedy is more
   * vertices along the long sides (more cells along a thin strip's length), or, for anisotropic K,
   * elements stretched along its strong direction. Set this only where you check the error by
   * other means.
   */
  acceptFlatElements?: boolean;
}

/** Result of {@link solveAdaptive}. */
export interface AdaptiveResult {
  solution: SpaceTimeSolution;
  set: DoubleTree;
  history: AdaptiveStep[];
  /**
   * Why the loop stopped: `'tolerance'` (E ≤ tolerance + relativeTolerance · solutionNorm), `'unknowns'` (the next set would exceed
   * maxUnknowns), `'steps'` (maxSteps), `'time'` (maxSeconds; the step in progress is discarded),
   * `'callback'` (onStep returned false), `'aborted'` (the signal fired; the step in progress is
   * discarded) or `'memory'` (the next step's estimated memory — the system on Λ and the estimator
   * on Λ̲, see {@link adaptiveStepBytes}, with #Λ̲ extrapolated from this step's ratio #Λ̲/#Λ —
   * would exceed the memory budget, see {@link setMemoryBudget}; the last completed step is returned)
   * or `'resolution'` (the next set would go below temporal level 50, i.e. need time scales under
   * T·2⁻⁵⁰: on a set at level 51 the estimate was measured to rise while the true error fell, and
   * at MAX_TEMPORAL_LEVEL = 52 it would have no finer temporal candidates; the last completed
   * step, whose estimate is trustworthy, is returned — docs/adaptivity.md §6) or `'rounding'`
   * (E ≤ 10⁻¹⁰ · {@link AdaptiveStep.solutionNorm}: the discrete solution solves the problem to
   * the rounding level of double precision, as when the exact solution lies in the discrete space;
   * refining further would only resolve rounding errors, which grow with every spatial generation).
   */
  stopReason: 'tolerance' | 'unknowns' | 'steps' | 'time' | 'callback' | 'aborted' | 'memory' | 'resolution' | 'rounding';
  /**
   * The estimated error that held values leave because they are interpolated linearly along the
   * initial boundary edges ({@link HeatProblem.heldDataError}; 0 when they are affine there). E does
   * not include it and refinement does not reduce it: when it is not well below E, the error of the
   * solution is about √(E² + heldDataError²) at best, and a finer initial mesh along the held part
   * is what reduces it (docs/error-norms.md §8).
   */
  heldDataError: number;
}

const ADAPTIVE_KEYS: Record<keyof Required<AdaptiveOptions>, true> = {
  theta: true, tolerance: true, relativeTolerance: true, maxUnknowns: true, maxSteps: true, maxSeconds: true,
  initialSet: true, solverFraction: true, inner: true, onStep: true, onProgress: true, signal: true, enlargement: true, markSeparately: true,
  checkpoint: true, resume: true, acceptFlatElements: true,
};

/** Checks `solveAdaptive(problem, opts)`: the problem, then the options (`undefined` gives `{}`). */
export function validateAdaptiveOptions(opts: unknown, problem: HeatProblem, field = 'opts'): AdaptiveOptions {
  checkInstance(problem, HeatProblem, 'problem', 'a HeatProblem');
  const o = checkOptions<AdaptiveOptions>(opts, field, ADAPTIVE_KEYS);
  if (o.theta !== undefined) checkNumber(o.theta, `${field}.theta`, { min: 0, max: 1, minOpen: true, maxOpen: true });
  if (o.tolerance !== undefined) checkNumber(o.tolerance, `${field}.tolerance`, { min: 0 });
  if (o.relativeTolerance !== undefined) checkNumber(o.relativeTolerance, `${field}.relativeTolerance`, { min: 0, max: 1, maxOpen: true });
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
    const e = checkOptions<{ spatialGenerations?: number; temporalLevels?: number }>(o.enlargement, `${field}.enlargement`, ['spatialGenerations', 'temporalLevels']);
    if (e.spatialGenerations !== undefined) checkInteger(e.spatialGenerations, `${field}.enlargement.spatialGenerations`, 1, 8);
    if (e.temporalLevels !== undefined) checkInteger(e.temporalLevels, `${field}.enlargement.temporalLevels`, 1, 4);
  }
  if (o.checkpoint !== undefined) checkFunction(o.checkpoint, `${field}.checkpoint`, 'a function (bytes, info) => void');
  if (o.resume !== undefined && !(o.resume instanceof Uint8Array)) {
    throw new InvalidArgumentError(`${field}.resume must be the bytes of a checkpoint (a Uint8Array)`, { field: `${field}.resume`, expected: 'Uint8Array', received: o.resume === null ? 'null' : typeof o.resume });
  }
  if (o.resume !== undefined && o.initialSet !== undefined) {
    throw new InvalidArgumentError(`give either ${field}.initialSet or ${field}.resume, not both (a resumed run continues with the saved set)`, { field: `${field}.initialSet`, expected: 'undefined when resume is given', received: 'a DoubleTree' });
  }
  if (o.initialSet !== undefined) checkSetOnDomain(o.initialSet, problem.domain, `${field}.initialSet`);
  if (o.tolerance !== undefined && o.tolerance > 0) problem.checkTolerance(o.tolerance, `${field}.tolerance`);
  if (o.acceptFlatElements !== undefined) checkBoolean(o.acceptFlatElements, `${field}.acceptFlatElements`);
  if (o.acceptFlatElements !== true) checkFlatElements(problem.domain);
  return o;
}

/** Refuses an initial mesh whose elements are too flat for the estimator and the inner solvers (docs/adaptivity.md §2.6). */
function checkFlatElements(domain: SpatialDomain): void {
  const flat = meshFlatness(domain);
  if (flat === null || flat.bulk <= FLAT_ELEMENT_LIMIT) return;
  const at = flat.vertices.map(([x, y]) => `(${Number(x.toPrecision(6))}, ${Number(y.toPrecision(6))})`).join(', ');
  const A = Number(flat.anisotropy.toPrecision(3));
  const share = `${flat.flatCount} of ${domain.forest.initialElementCount} initial elements, ${Number((100 * flat.flatShare).toPrecision(3))} % of the area`;
  throw new InvalidMeshError(
    `the initial mesh is too flat for the adaptive loop (${share}, beyond mapped anisotropy ${FLAT_ELEMENT_LIMIT}); the flattest, element ${flat.element} with vertices ${at}, has ${A}` +
    `${domain.anisotropic ? ' (its shape as the diffusion tensor sees it)' : ''}. Bisection keeps its descendants as flat, and on such elements the ` +
    'estimator reads several times below the true error and PCG stalls (docs/adaptivity.md §2.6). Use an initial mesh with more vertices along the long sides ' +
    '(e.g. more cells along a thin strip, so that cells are at most about 4 times longer than wide)' +
    `${domain.anisotropic ? ', or elements stretched along the strong direction of K' : ''}, or set acceptFlatElements: true (an option of solveAdaptive, a field of problem files) to run anyway`,
    { field: `domain.triangles[${flat.element}]`, expected: `mapped anisotropy of the mesh ≤ ${FLAT_ELEMENT_LIMIT}`, received: Number(flat.bulk.toPrecision(3)) },
  );
}
