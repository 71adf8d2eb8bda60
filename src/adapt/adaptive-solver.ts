/**
 * The adaptive loop SOLVE → ESTIMATE → MARK → REFINE (docs/adaptivity.md), with nested iteration:
 *   - each step's set in a fibre pool of its own, with one pair of spatial caches (operator plans
 *     with their leaf meshes, V-cycle hierarchies) for it, shared by the system's B, Bᵀ,
 *     preconditioner and right-hand side within the step and released before the estimate (keeping
 *     them for the next step saved no time and held ≈ 1.2 KB per unknown through the estimate,
 *     docs/adaptivity.md §5);
 *   - each PCG starts from the previous solution (zero on new indices) and stops on an estimate of
 *     its algebraic error in the S-energy norm, compared with a fraction of the estimator E; when the
 *     fresh E shows the solve was not accurate enough, PCG resumes before E is reported, so no step
 *     reports an estimator for an unsolved system;
 *   - the estimator costs one application of B, K_Y and Bᵀ on Λ̲ (no preconditioner on Λ̲).
 */
import { InvalidArgumentError, RunInterruptedError, SolverBreakdownError } from '../errors';
import { BYTES_PER_SYSTEM_UNKNOWN, memoryBudget } from '../validation/index';
import { DoubleTree } from '../spacetime/double-tree';
import { shortestDiffusionTime } from '../space/diffusion-time';
import { FibrePool } from '../spacetime/fibre-pool';
import { MAX_TEMPORAL_LEVEL } from '../time/index';
import { SpatialPlanCache } from '../spacetime/spatial-plan-cache';
import { SpaceTimeSolution } from '../spacetime/space-time-solution';
import type { HeatProblem } from '../system/heat-problem';
import { FibreInverseCache, type InnerSolver } from '../system/fibre-inverse';
import { SpaceTimeSystem, type SpatialCaches } from '../system/space-time-system';
import type { PcgResult } from '../system/pcg';
import { validateAdaptiveOptions } from './adaptive-options';
import { dorflerMark } from './dorfler';
import { spatialCandidates } from './candidate-kinds';
import { enlargeDoubleTree, type EnlargementOptions } from './enlargement';
import { embeddingMap, prolongCoefficients } from './embedding';
import { estimateResidual } from './estimator';
import { refineDoubleTree } from './refine';
import { decodeCheckpoint, encodeCheckpoint, type AdaptiveCheckpointInfo } from './checkpoint';

/**
 * Delay d of the S-energy error estimate in the nested solves (docs/adaptivity.md §4). With the
 * block-diagonal preconditioners PCG gains a factor 2–3 per iteration, so two terms of the
 * Hestenes–Stiefel sum already hold most of ‖u − u_k‖²_S, and the iterate returned is d iterations
 * more accurate than the one estimated. d = 4 (the PCG default) spent two more iterations per step
 * on accuracy nobody asked for: 7–8 iterations per step instead of 5–6 on the d = 2 reference run.
 */
const NESTED_ENERGY_DELAY = 2;
/**
 * The first solve of a step aims at this fraction of solverFraction·E_prev, because the E it is
 * checked against is the new one, typically 0.8–0.95 E_prev. Aiming at E_prev itself made PCG
 * resume and the estimate run twice whenever E fell by more than the algebraic error's margin
 * (3 of 26 steps on the d = 2 reference run; the estimate is the dearest part of a step, and one
 * more PCG iteration costs an eighth of it).
 */
const EXPECTED_REDUCTION = 0.75;
/**
 * A rise of E from one step to the next is first checked against the solve (docs/adaptivity.md
 * §4): PCG resumes to this factor below the algebraic error reached and E is computed again, at
 * most RISE_CHECKS times per step. The indicators weigh the residual of the algebraic error far
 * more than its S-energy norm: on u0 ≡ 1, (0, 1), T = 0.5/1024 at 2.2·10⁵ unknowns an algebraic
 * error of 0.05 E (S-energy, against a solve to 10⁻¹²) doubled E, while E of the exact discrete
 * solution kept falling. A rise that survives the tighter solve is reported as it is (genuine rises,
 * as while a run first resolves an initial layer, cost one check each).
 */
const RISE_TIGHTENING = 10;
const RISE_CHECKS = 2;
/** A second check is made only if the first lowered E by more than 1 %. */
const RISE_MOVED = 0.99;
/**
 * Deepest temporal level a set of the loop may hold; its enlarged set reaches one level more
 * (docs/adaptivity.md §6). With κT/L² = 10¹⁴ E rose by 30 % on the first set at level 51, and the
 * rise survived the rise check (it is not the solve's); at MAX_TEMPORAL_LEVEL the enlarged set
 * would have no finer temporal candidates. Up to level 50 both that run and u0 ≡ 1 on (0, 1),
 * T = 0.5, showed no rise that survived the check (err/E 1.02–1.07 on level 50; the rises of E
 * measured there before the checks were the algebraic error's).
 */
const DEEPEST_SET_LEVEL = MAX_TEMPORAL_LEVEL - 2;

/**
 * Peak bytes per unknown of the enlarged set Λ̲ while the estimator works on it (Λ̲ with its test
 * set and the vectors of B, K_Y and Bᵀ). Measured once: the 2D L-shape run with u0 ≡ 1 up to
 * #Λ = 88,608, #Λ̲ = 444,742 grew the resident set by 356 MB, i.e. ≈ 680 B per Λ̲ unknown after
 * 800 B per Λ unknown for the system (Node 20, machine shared with other work, rough); rounded up.
 */
export const BYTES_PER_ENLARGED_UNKNOWN = 1000;

/**
 * The same for d = 2, measured after the compact V-cycle hierarchies and shared scratch
 * (docs/adaptivity.md §5): the whole process's peak, less 80 MB for Node itself, was 301 B per Λ̲
 * unknown on the unit-square reference run at #Λ = 1.07·10⁶ (#Λ̲ = 5.28·10⁶) and 317 B on the
 * L-shaped domain (u0 ≡ 1, T = 1) at #Λ = 3.6·10⁵; rounded up to 400 (with the 800 B per Λ
 * unknown of the system term, the estimate is 1.8× the reference run's peak). In d = 1 the
 * measured 790–825 B per Λ̲ unknown (204 379 unknowns, #Λ̲ ≈ 2.9 #Λ) keep the old figure.
 */
export const BYTES_PER_ENLARGED_UNKNOWN_2D = 400;

/**
 * Estimated peak memory in bytes of an adaptive step on `unknowns` = #Λ whose enlarged set has
 * `enlargedUnknowns` = #Λ̲, in space dimension `dim`: the system on Λ with its solve (800 B per
 * unknown, the figure the space-time system's own check uses) and the estimator on Λ̲ (1000 B per
 * unknown in d = 1, 400 B in d = 2; both measured with margin). `solveAdaptive` stops with reason
 * `'memory'` before a step whose estimate exceeds the memory budget.
 *
 * @example
 * ```ts
 * import { adaptiveStepBytes } from 'chronomesh';
 * console.log(adaptiveStepBytes(1e5, 5e5) / 1024 ** 3 < 2); // → true — a 1e5-unknown step with #Λ̲ = 5e5 fits in 2 GiB
 * console.log(adaptiveStepBytes(1e6, 5e6, 2) / 1024 ** 3 < 3); // → true — d = 2, 1e6 unknowns: under 3 GiB
 * ```
 */
export function adaptiveStepBytes(unknowns: number, enlargedUnknowns: number, dim: 1 | 2 = 1): number {
  const perEnlarged = dim === 2 ? BYTES_PER_ENLARGED_UNKNOWN_2D : BYTES_PER_ENLARGED_UNKNOWN;
  return unknowns * BYTES_PER_SYSTEM_UNKNOWN + enlargedUnknowns * perEnlarged;
}

/** One pass of the adaptive loop, as recorded in the history. */
export interface AdaptiveStep {
  step: number;
  /** #Λ of the solve in this step. */
  unknowns: number;
  /** Estimator E of this step's solution. */
  estimate: number;
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
  /** Stop when E ≤ tolerance (default 0: run until another limit). */
  tolerance?: number;
  /** Stop before a step whose Λ would exceed this many unknowns (default 2e5). */
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
   * estimator sees the initial layer over long horizons; docs/adaptivity.md §2).
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
}

/** Result of {@link solveAdaptive}. */
export interface AdaptiveResult {
  solution: SpaceTimeSolution;
  set: DoubleTree;
  history: AdaptiveStep[];
  /**
   * Why the loop stopped: `'tolerance'` (E ≤ tolerance), `'unknowns'` (the next set would exceed
   * maxUnknowns), `'steps'` (maxSteps), `'time'` (maxSeconds; the step in progress is discarded),
   * `'callback'` (onStep returned false), `'aborted'` (the signal fired; the step in progress is
   * discarded) or `'memory'` (the next step's estimated memory — the system on Λ and the estimator
   * on Λ̲, see {@link adaptiveStepBytes}, with #Λ̲ extrapolated from this step's ratio #Λ̲/#Λ —
   * would exceed the memory budget, see {@link setMemoryBudget}; the last completed step is returned)
   * or `'resolution'` (the next set would go below temporal level 50, i.e. need time scales under
   * T·2⁻⁵⁰: on a set at level 51 the estimate was measured to rise while the true error fell, and
   * at MAX_TEMPORAL_LEVEL = 52 it would have no finer temporal candidates; the last completed
   * step, whose estimate is trustworthy, is returned — docs/adaptivity.md §6).
   */
  stopReason: 'tolerance' | 'unknowns' | 'steps' | 'time' | 'callback' | 'aborted' | 'memory' | 'resolution';
}

class Interrupted {
  constructor(readonly reason: 'aborted' | 'time') {}
}

interface Validated {
  theta: number;
  tol: number;
  maxUnknowns: number;
  maxSteps: number;
  maxSeconds: number;
  fraction: number;
}

function validate(opts: AdaptiveOptions, problem: HeatProblem): Validated {
  const o = validateAdaptiveOptions(opts, problem);
  return {
    theta: o.theta ?? defaultBulk(problem.domain.dim),
    tol: o.tolerance ?? 0,
    maxUnknowns: o.maxUnknowns ?? 2e5,
    maxSteps: o.maxSteps ?? 40,
    maxSeconds: o.maxSeconds ?? Infinity,
    fraction: o.solverFraction ?? 0.1,
  };
}

/**
 * The default Dörfler parameter θ for a spatial dimension: 0.5 in 1D, 0.7 in 2D. Measured on
 * u0 ≡ 1, T = 0.5 (docs/adaptivity.md §7): in 2D θ = 0.7 reached E = 0.0254 in 69 CPU-s against
 * 92 CPU-s for θ = 0.5 (and 0.6 in between); in 1D θ = 0.7 was about 45 % slower than 0.5.
 *
 * @example
 * ```ts
 * import { defaultBulk } from 'chronomesh';
 * console.log(defaultBulk(2)); // → 0.7
 * ```
 */
export function defaultBulk(dim: number): number {
  return dim === 1 ? 0.5 : 0.7;
}

/** The smallest sparse grid with at least one unknown (level 1 unless the mesh is very coarse). */
function defaultInitialSet(problem: HeatProblem): DoubleTree {
  for (let L = 1; ; L++) {
    const set = DoubleTree.sparseGrid(problem.domain, L);
    if (set.size > 0 || L >= 8) return gradedTowardsStart(problem, set);
  }
}

/**
 * `set` with its leftmost temporal node repeated on every level down to the shortest diffusion
 * time τ of the initial mesh (level ⌈log2(T/τ)⌉, at most DEEPEST_SET_LEVEL), with the fibre of
 * the deepest leftmost node that has one (docs/adaptivity.md §2). Without it a horizon of many
 * diffusion times leaves the layer of data that start off the boundary values far below the set's
 * levels, and the estimator, whose candidates reach one level deeper, cannot see it: u0 ≡ 1 on (0, 1) in 2 cells with κT = 10⁴
 * gave E = 6.8·10⁻³ for a true error of 0.71 at the first step, and the run needed 13 steps of
 * growing E to reach the layer. A set already that deep, or T of a few diffusion times, is
 * returned as it is.
 */
function gradedTowardsStart(problem: HeatProblem, set: DoubleTree): DoubleTree {
  const { tree } = set;
  const deepest = Math.min(DEEPEST_SET_LEVEL, Math.ceil(Math.log2(problem.T / shortestDiffusionTime(problem.domain))));
  if (!(deepest > tree.maxLevel)) return set;
  const levels: number[] = [];
  const indices: number[] = [];
  const sets: Int32Array[] = [];
  for (let i = 0; i < tree.size; i++) {
    levels.push(tree.level[i]!);
    indices.push(tree.index[i]!);
    sets.push(set.fibre(i));
  }
  // The deepest non-empty leftmost fibre (on the coarsest meshes the finest levels of a sparse
  // grid may have none, and a node without unknowns gets no temporal candidates).
  let leftmost = set.fibre(tree.find(tree.maxLevel, 0));
  for (let l = tree.maxLevel - 1; l >= 0 && leftmost.length === 0; l--) leftmost = set.fibre(tree.find(l, 0));
  for (let l = tree.maxLevel + 1; l <= deepest; l++) {
    levels.push(l);
    indices.push(0);
    sets.push(leftmost);
  }
  return DoubleTree.fromNodeSets(problem.domain, levels, indices, sets, { close: true, pool: set.pool });
}

function spatialStats(set: DoubleTree, domain: HeatProblem['domain']): { vertices: number; maxGeneration: number } {
  const seen = new Set<number>();
  let maxGeneration = 0;
  for (const f of set.pool.fibres.length > 0 ? uniqueFibres(set) : []) {
    for (let p = 0; p < f.length; p++) {
      const v = f[p]!;
      if (!seen.has(v)) {
        seen.add(v);
        const g = domain.generation(v);
        if (g > maxGeneration) maxGeneration = g;
      }
    }
  }
  return { vertices: seen.size, maxGeneration };
}

function uniqueFibres(set: DoubleTree): Int32Array[] {
  const ids = new Set<number>();
  for (let i = 0; i < set.tree.size; i++) ids.add(set.nodeFibre[i]!);
  return [...ids].map((id) => set.pool.get(id));
}

/**
 * One adaptive run, advanced step by step (what {@link solveAdaptive} and {@link solveAdaptiveAsync} drive).
 * @internal
 */
class AdaptiveRun {
  private readonly v: Validated;
  private caches!: SpatialCaches;
  private readonly start = performance.now();
  private set!: DoubleTree;
  private u!: Float64Array;
  private lastEstimate = Infinity;
  private stepNo = 0;
  readonly history: AdaptiveStep[] = [];
  private best: { solution: SpaceTimeSolution; set: DoubleTree } | null = null;
  stopReason: AdaptiveResult['stopReason'] | null = null;

  constructor(private readonly problem: HeatProblem, private readonly opts: AdaptiveOptions) {
    this.v = validate(opts, problem);
    if (opts.resume !== undefined) {
      const saved = decodeCheckpoint(opts.resume, problem, 'opts.resume');
      this.history.push(...saved.history);
      this.stepNo = saved.history.length;
      this.lastEstimate = saved.history[saved.history.length - 1]!.estimate;
      this.best = { solution: saved.solution, set: saved.solution.trialSet };
      if (saved.next) {
        this.set = saved.next;
        // The prolongation the interrupted run made after the saved step.
        this.u = prolongCoefficients(embeddingMap(saved.solution.trialSet, saved.next), saved.solution.coefficients, saved.next.size);
      } else {
        this.set = saved.solution.trialSet;
        this.u = saved.solution.coefficients;
        this.stopReason = saved.stopReason ?? 'tolerance';
      }
    } else {
      this.set = opts.initialSet ?? defaultInitialSet(problem);
      this.u = new Float64Array(this.set.size);
    }
    if (this.set.size === 0) throw new InvalidArgumentError('the initial index set has no unknowns (the mesh has no free vertex at the sparse-grid levels tried)', { field: 'initialSet' });
    this.newCaches();
  }

  /** Spatial caches for the fibre pool of the current set. */
  private newCaches(): void {
    const plans = new SpatialPlanCache(this.problem.domain, this.set.pool);
    this.caches = { plans, inverses: new FibreInverseCache(this.problem.domain, this.set.pool, plans, this.opts.inner ?? { kind: 'multigrid' }) };
  }

  private elapsed(): number {
    return (performance.now() - this.start) / 1000;
  }

  private checkpoint(phase: AdaptiveProgress['phase'], iteration = 0): void {
    if (this.opts.signal?.aborted) throw new Interrupted('aborted');
    // The first step always completes, so that a run has a result to return.
    if (this.best !== null && this.elapsed() > this.v.maxSeconds) throw new Interrupted('time');
    this.opts.onProgress?.({ step: this.stepNo, phase, unknowns: this.set.size, iteration, elapsed: this.elapsed() });
  }

  /** Performs one step; returns false once the run has stopped. */
  advance(): boolean {
    if (this.stopReason) return false;
    try {
      this.stepOnce();
    } catch (e) {
      if (!(e instanceof Interrupted)) throw e;
      if (this.best === null) throw new RunInterruptedError(`the adaptive run was ${e.reason === 'aborted' ? 'aborted' : 'out of time (maxSeconds)'} before its first step completed: there is no result to return`, { field: e.reason === 'aborted' ? 'signal' : 'maxSeconds' });
      this.stopReason = e.reason;
    }
    return this.stopReason === null;
  }

  result(): AdaptiveResult {
    if (this.best === null || this.stopReason === null) throw new InvalidArgumentError('the run has not finished', { field: 'run' });
    return { solution: this.best.solution, set: this.best.set, history: this.history, stopReason: this.stopReason };
  }

  private stepOnce(): void {
    const { problem, v, caches } = this;
    const domain = problem.domain;
    const set = this.set;
    const t0 = performance.now();
    this.checkpoint('setup');
    // The system on Λ lives only while PCG runs: it is dropped before the estimate (whose own
    // structures on Λ̲ are several times larger) and rebuilt if PCG must resume.
    let system: SpaceTimeSystem | null = new SpaceTimeSystem(problem, set, { caches });
    // Releases the system and its spatial plans and fibre inverses before an estimate: kept for the
    // next step they would hold ≈ 1.2 KB per unknown through the estimate (the step's peak), and
    // measured over whole runs the reuse saved no CPU time (docs/adaptivity.md §5).
    const release = (): void => {
      system = null;
      caches.plans.clear();
      caches.inverses.clear();
    };
    const b = system.rightHandSide();
    const t1 = performance.now();
    // SOLVE: nested iteration from the previous solution, stopped on the S-energy error estimate.
    let iterations = 0;
    let solved: PcgResult | null = null;
    const solveTo = (energyTol: number): void => {
      this.checkpoint('solve');
      system ??= new SpaceTimeSystem(problem, set, { caches });
      const r = system.solve({
        rightHandSide: b,
        initialGuess: solved ? solved.solution : this.u,
        relTol: energyTol > 0 ? 1e-14 : 1e-6,
        energyTol,
        energyDelay: NESTED_ENERGY_DELAY,
        maxIterations: 500,
        ...(this.opts.signal ? { signal: this.opts.signal } : {}),
        onIteration: (p) => this.checkpoint('solve', iterations + p.iteration),
      });
      iterations += r.pcg.iterations;
      if (r.pcg.stopReason === 'aborted') throw new Interrupted('aborted');
      if (!r.pcg.converged) throw new SolverBreakdownError(`PCG did not reach the requested accuracy (S-energy error ${r.pcg.energyError.toExponential(2)} > ${energyTol.toExponential(2)}) in 500 iterations at step ${this.stepNo} (#Λ = ${set.size})`, { field: 'solverFraction' });
      solved = r.pcg;
    };
    solveTo(Number.isFinite(this.lastEstimate) ? EXPECTED_REDUCTION * v.fraction * this.lastEstimate : 0);
    let t2 = performance.now();
    release();
    // ESTIMATE on the enlarged set Λ̲.
    this.checkpoint('estimate');
    const bigSet = enlargeDoubleTree(domain, set, this.opts.enlargement);
    const inner = this.opts.inner ?? { kind: 'multigrid' as const };
    let ind = estimateResidual(problem, set, solved!.solution, bigSet, inner);
    let estimateSeconds = (performance.now() - t2) / 1000;
    // Resumes PCG to `energyTol` and estimates again (the seconds go to solve and estimate).
    const resolveAndEstimate = (energyTol: number): void => {
      const ts = performance.now();
      solveTo(energyTol);
      release();
      t2 += performance.now() - ts;
      const te = performance.now();
      ind = estimateResidual(problem, set, solved!.solution, bigSet, inner);
      estimateSeconds += (performance.now() - te) / 1000;
    };
    // The solve must be accurate relative to the E it is reported with; resume PCG otherwise.
    for (let round = 0; round < 4 && !(solved!.energyError <= v.fraction * ind.estimate); round++) resolveAndEstimate(v.fraction * ind.estimate);
    // A rise of E may be the algebraic error seen through the indicators, which weigh it far more
    // than its S-energy norm: solve tighter and estimate again before believing it.
    let riseChecks = 0;
    let before = Infinity; // E before the last check: a check that barely moved E shows the rise is genuine
    while (riseChecks < RISE_CHECKS && ind.estimate > this.lastEstimate && ind.estimate < RISE_MOVED * before && solved!.energyError > 0) {
      riseChecks++;
      before = ind.estimate;
      resolveAndEstimate(solved!.energyError / RISE_TIGHTENING);
    }
    const t3 = performance.now();
    const uSolved = solved!.solution;
    const solution = new SpaceTimeSolution(domain, set, uSolved, problem.T);
    const stats = spatialStats(set, domain);
    const record: AdaptiveStep = {
      step: this.stepNo,
      unknowns: set.size,
      estimate: ind.estimate,
      pcgIterations: iterations,
      algebraicError: solved!.energyError,
      riseChecks,
      maxTimeLevel: set.tree.maxLevel,
      maxSpaceGeneration: stats.maxGeneration,
      spatialVertices: stats.vertices,
      enlargedUnknowns: bigSet.size,
      marked: 0,
      seconds: 0,
      timings: { setup: (t1 - t0) / 1000, solve: (t2 - t1) / 1000, estimate: estimateSeconds, refine: 0 },
    };
    // MARK and REFINE (or stop).
    let stop: AdaptiveResult['stopReason'] | null = null;
    if (ind.estimate <= v.tol) stop = 'tolerance';
    else if (this.stepNo + 1 >= v.maxSteps) stop = 'steps';
    else if (this.elapsed() >= v.maxSeconds) stop = 'time';
    let next: DoubleTree | null = null;
    // With checkpoints the next set is built after the last step too, so a finished run can be
    // continued; it is computed after everything this step reports, so the results are the same.
    if (!stop || (this.opts.checkpoint && ind.estimate > 0)) {
      if (!stop) this.checkpoint('refine');
      const marked = this.opts.markSeparately ? markSeparately(ind.eta2, spatialCandidates(set, bigSet), v.theta) : dorflerMark(ind.eta2, v.theta);
      if (!stop) record.marked = marked.length;
      next = refineDoubleTree(domain, set, bigSet, marked);
      if (!stop && next.size > v.maxUnknowns) stop = 'unknowns';
      // Beyond DEEPEST_SET_LEVEL the estimate is no longer trustworthy, and at MAX_TEMPORAL_LEVEL
      // it would be blind below T·2^-52 (docs/adaptivity.md §6).
      else if (!stop && next.tree.maxLevel > DEEPEST_SET_LEVEL) stop = 'resolution';
      // The next step would hold the system on next and the estimator on its enlarged set, whose
      // size is extrapolated with this step's ratio #Λ̲/#Λ.
      else if (!stop && adaptiveStepBytes(next.size, (next.size * bigSet.size) / set.size, domain.dim) > memoryBudget()) stop = 'memory';
    }
    const t4 = performance.now();
    record.timings.refine = (t4 - t3) / 1000;
    record.seconds = (t4 - t0) / 1000;
    this.lastEstimate = ind.estimate;
    this.history.push(record);
    this.best = { solution, set };
    if (this.opts.onStep && this.opts.onStep(record, solution) === false) stop = 'callback';
    if (!stop && this.opts.signal?.aborted) stop = 'aborted';
    if (this.opts.checkpoint) {
      const bytes = encodeCheckpoint(problem, { solution, next, history: this.history, stopReason: stop });
      this.opts.checkpoint(bytes, { step: this.stepNo, unknowns: set.size, estimate: ind.estimate, bytes: bytes.length });
    }
    this.stepNo++;
    if (stop || !next) {
      this.stopReason = stop ?? 'steps';
      return;
    }
    // Prolong u to the refined set (it lies between Λ and Λ̲).
    this.u = prolongCoefficients(embeddingMap(set, next), uSolved, next.size);
    // The run's pool has interned the fibres of this step's enlarged, test and intermediate sets
    // too (at 3.9e5 unknowns only 4 % of its bytes belonged to the current set); the next set gets
    // a pool of its own with its fibres only, in the same order, so u stays valid.
    this.set = inOwnPool(next);
    this.newCaches();
  }
}

/** The same set in a new fibre pool that holds its fibres only (the fibre arrays are shared, not copied). */
function inOwnPool(set: DoubleTree): DoubleTree {
  const pool = new FibrePool();
  const ids = new Int32Array(set.nodeFibre.length);
  for (let i = 0; i < ids.length; i++) ids[i] = pool.intern(set.pool.get(set.nodeFibre[i]!));
  return new DoubleTree(set.kind, set.tree, ids, pool);
}

/** Dörfler marking within each class of candidates (kind[i] = 1 spatial, 0 temporal). */
function markSeparately(eta2: Float64Array, kind: Uint8Array, theta: number): Int32Array {
  const a = new Float64Array(eta2.length);
  const b = new Float64Array(eta2.length);
  for (let i = 0; i < eta2.length; i++) (kind[i] ? a : b)[i] = eta2[i]!;
  const ma = dorflerMark(a, theta);
  const mb = dorflerMark(b, theta);
  const out = new Int32Array(ma.length + mb.length);
  out.set(ma);
  out.set(mb, ma.length);
  return out.sort();
}

/**
 * Solves `problem` adaptively (SOLVE → ESTIMATE → MARK → REFINE) until a tolerance, budget or
 * callback stops it; see {@link AdaptiveOptions} and {@link AdaptiveResult} for the stop reasons.
 *
 * @example
 * ```ts
 * import { HeatProblem, intervalDomain, solveAdaptive } from 'chronomesh';
 * const domain = intervalDomain(0, 1, 2);
 * const problem = new HeatProblem({ domain, T: 1, initial: () => 1 });
 * const { history, solution, stopReason } = solveAdaptive(problem, { maxUnknowns: 2000 });
 * console.log(stopReason, history.map((h) => [h.unknowns, h.estimate]), solution.evaluate(0.01, [0.5]));
 * ```
 */
export function solveAdaptive(problem: HeatProblem, opts: AdaptiveOptions = {}): AdaptiveResult {
  const run = new AdaptiveRun(problem, opts);
  while (run.advance());
  return run.result();
}

/**
 * {@link solveAdaptive} that yields to the event loop between steps, so that timers, I/O and an
 * `AbortSignal` fired by them (e.g. `AbortSignal.timeout(ms)`) take effect during a long run.
 *
 * @example
 * ```ts
 * import { HeatProblem, intervalDomain, solveAdaptiveAsync } from 'chronomesh';
 * const domain = intervalDomain(0, 1, 2);
 * const problem = new HeatProblem({ domain, T: 1, initial: () => 1 });
 * solveAdaptiveAsync(problem, { maxUnknowns: 1e7, signal: AbortSignal.timeout(2000) })
 *   .then((result) => console.log(result.stopReason, result.history.length)); // 'aborted' after about two seconds
 * ```
 */
export async function solveAdaptiveAsync(problem: HeatProblem, opts: AdaptiveOptions = {}): Promise<AdaptiveResult> {
  const run = new AdaptiveRun(problem, opts);
  while (run.advance()) await new Promise<void>((resolve) => setTimeout(resolve, 0));
  return run.result();
}
