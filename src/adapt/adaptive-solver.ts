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
import { memoryBudget } from '../validation/index';
import { DoubleTree } from '../spacetime/double-tree';
import { FibrePool } from '../spacetime/fibre-pool';
import { SpatialPlanCache } from '../spacetime/spatial-plan-cache';
import { SpaceTimeSolution } from '../spacetime/space-time-solution';
import type { HeatProblem } from '../system/heat-problem';
import { FibreInverseCache } from '../system/fibre-inverse';
import { checkDiffusionScale } from '../system/diffusion-scale';
import { systemNorm } from '../system/system-norm';
import { SpaceTimeSystem, type SpatialCaches } from '../system/space-time-system';
import type { PcgResult } from '../system/pcg';
import { validateAdaptiveOptions, type AdaptiveOptions, type AdaptiveProgress, type AdaptiveResult, type AdaptiveStep } from './adaptive-options';
import { dorflerMark } from './dorfler';
import { spatialCandidates } from './candidate-kinds';
import { enlargeDoubleTree } from './enlargement';
import { embeddingMap, prolongCoefficients } from './embedding';
import { estimateResidual } from './estimator';
import { refineDoubleTree } from './refine';
import { decodeCheckpoint, encodeCheckpoint } from './checkpoint';
import { DEEPEST_SET_LEVEL, defaultInitialSet } from './initial-set';
import { adaptiveStepBytes } from './step-memory';

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
/**
 * E at or below this fraction of the solution's norm ‖u_δ‖_S is rounding, not discretization
 * error: the run stops with 'rounding'. Measured on a solution that lies in the discrete space
 * (u = t(½ − |x − ½|) on (0, 1) with its point source at ½, tests/adapt/rounding-stop.test.ts):
 * E/‖u_δ‖_S was 1.1·10⁻¹⁶ at the first step, and the loop, refining the noise, raised it by about
 * √2 per spatial generation (1.6·10⁻¹³ after 40 steps, 20 generations; true error 6.7·10⁻⁸ after
 * 200 steps). A genuine discretization error this small relative to the solution would need
 * far more unknowns than any memory holds (10¹⁰ in 1D at the rate 1).
 */
const ROUNDING_LEVEL = 1e-10;
const RISE_CHECKS = 2;
/** A second check is made only if the first lowered E by more than 1 %. */
const RISE_MOVED = 0.99;
class Interrupted {
  constructor(readonly reason: 'aborted' | 'time') {}
}

interface Validated {
  theta: number;
  tol: number;
  relTol: number;
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
    relTol: o.relativeTolerance ?? 0,
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
  /** The concentrated sources as points (1D) and segments (2D), where the candidates go deeper. */
  private readonly along: number[][];

  constructor(private readonly problem: HeatProblem, private readonly opts: AdaptiveOptions) {
    this.v = validate(opts, problem);
    checkDiffusionScale(problem);
    this.along = sourceSegments(problem);
    // Samples the held values along the initial edges now: bad data fail before any work, and the
    // result reports the data error (docs/error-norms.md §8).
    problem.heldDataError();
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
    return { solution: this.best.solution, set: this.best.set, history: this.history, stopReason: this.stopReason, heldDataError: this.problem.heldDataError().estimate };
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
    const bigSet = enlargeDoubleTree(domain, set, this.opts.enlargement, this.along);
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
    const solutionNorm = systemNorm(uSolved, b);
    const solution = new SpaceTimeSolution(domain, set, uSolved, problem.T);
    const stats = spatialStats(set, domain);
    const record: AdaptiveStep = {
      step: this.stepNo,
      unknowns: set.size,
      estimate: ind.estimate,
      solutionNorm,
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
    if (ind.estimate <= v.tol + v.relTol * solutionNorm) stop = 'tolerance';
    else if (ind.estimate <= ROUNDING_LEVEL * solutionNorm) stop = 'rounding';
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

/** Points (1D) and segments [x0, y0, x1, y1] (2D) of the problem's curve sources. */
function sourceSegments(problem: HeatProblem): number[][] {
  const out: number[][] = [];
  for (const { curve } of problem.curveSources ?? []) {
    const p = curve.points;
    if (curve.dim === 1) out.push([p[0]!]);
    else for (let k = 0; k + 3 < p.length; k += 2) out.push([p[k]!, p[k + 1]!, p[k + 2]!, p[k + 3]!]);
  }
  return out;
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
