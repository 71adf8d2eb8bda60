/**
 * The assembled-nothing space-time system of one problem on one trial index
 * set Λ (docs/method.md §6): test set Λ_Y, operators B, Bᵀ, K_Y, G, the Schur
 * complement S, the preconditioner K_X and the right-hand side b.
 */
import { InvalidArgumentError, NotConvergedError } from '../errors';
export type { SystemSolveOptions } from './pcg-options';
import { DoubleTree } from '../spacetime/double-tree';
import { SpatialPlanCache } from '../spacetime/spatial-plan-cache';
import { TensorOperatorPlan } from '../spacetime/tensor-apply';
import { WorkVectors } from '../numerics/work-vectors';
import { testIndexSet } from '../spacetime/test-index-set';
import { SpaceTimeSolution } from '../spacetime/space-time-solution';
import { FibreInverseCache, type InnerSolver } from './fibre-inverse';
import { HeatProblem, type HeatProblemSpec } from './heat-problem';
import { InitialTraceOperator } from './initial-trace';
import { pcg, type PcgResult } from './pcg';
import { validateSolveOptions, type SystemSolveOptions } from './pcg-options';
import { validateSystemOptions } from './system-options';
import { checkDiffusionScale } from './diffusion-scale';
import { checkSetOnDomain } from '../spacetime/set-checks';
import { BYTES_PER_SYSTEM_UNKNOWN, checkInstance, checkMemory } from '../validation/index';
import { initialLoadWithLifting, sourceLoadWithBoundary } from './boundary-data-load';
import { SchurOperator } from './schur-operator';
import { TestInnerProductInverse } from './test-inner-product-inverse';
import { TrialPreconditioner } from './trial-preconditioner';
import { diffusionContrast, NOTABLE_BIOT, NOTABLE_CONTRAST, stiffestTransfer } from '../space/coefficient-contrast';
import type { SpatialDomain } from '../space/domain';

/** Options of {@link SpaceTimeSystem}. */
export interface SpaceTimeSystemOptions {
  /** Spatial inverses inside K_Y and K_X: V-cycles (default, 1 cycle) or exact dense solves (small problems). */
  inner?: InnerSolver;
  /** Separate choice for K_X (defaults to `inner`). */
  preconditionerInner?: InnerSolver;
  /**
   * Spatial plan and fibre-inverse caches to draw from instead of fresh ones (they must belong to
   * the trial set's fibre pool and use the same inner solver). Systems that share them build the
   * leaf meshes, spatial operator plans and V-cycle hierarchies of common fibres once. The adaptive
   * loop shares them within a step (the system and, if PCG resumes, its rebuild) and empties them
   * before each estimate (docs/adaptivity.md §5).
   */
  caches?: SpatialCaches;
}

/** Spatial plans and fibre inverses shared by the systems of one fibre pool (see {@link SpaceTimeSystemOptions.caches}). */
export interface SpatialCaches {
  plans: SpatialPlanCache;
  inverses: FibreInverseCache;
}


/**
 * The space-time system S u = b on a trial double tree Λ.
 *
 * @example
 * ```ts
 * import { DoubleTree, HeatProblem, SpaceTimeSystem, intervalDomain } from 'chronomesh';
 * const domain = intervalDomain(0, 1, 2);
 * const problem = new HeatProblem({ domain, T: 1, initial: () => 1 });
 * const system = new SpaceTimeSystem(problem, DoubleTree.sparseGrid(domain, 4));
 * const { solution, pcg } = system.solve({ relTol: 1e-6 });
 * console.log(pcg.iterations, solution.evaluate(0.1, [0.5])[0]);
 * ```
 */
export class SpaceTimeSystem {
  readonly problem: HeatProblem;
  readonly trialSet: DoubleTree;
  readonly testSet: DoubleTree;
  readonly plans: SpatialPlanCache;
  readonly B: TensorOperatorPlan;
  readonly Bt: TensorOperatorPlan;
  readonly KY: TestInnerProductInverse;
  readonly G: InitialTraceOperator;
  readonly S: SchurOperator;
  private readonly inverses: FibreInverseCache;
  private readonly pInverses: FibreInverseCache;
  private kx: TrialPreconditioner | null = null;

  constructor(problem: HeatProblem, trialSet: DoubleTree, opts: SpaceTimeSystemOptions = {}) {
    checkInstance(problem, HeatProblem, 'problem', 'a HeatProblem');
    checkSetOnDomain(trialSet, problem.domain, 'trialSet'); // a trial DoubleTree of this problem's domain, not empty
    checkDiffusionScale(problem); // diffusion that double precision can still see next to ∂t
    opts = validateSystemOptions(opts);
    // 800 B per unknown is a lower bound of what a system with its solve needs: refuse what surely does not fit.
    checkMemory(trialSet.size * BYTES_PER_SYSTEM_UNKNOWN, `the space-time system on ${trialSet.size} unknowns`, 'trialSet', 'choose a smaller index set');
    const T = problem.T;
    this.problem = problem;
    this.trialSet = trialSet;
    this.testSet = testIndexSet(trialSet);
    const inner = opts.inner ?? opts.caches?.inverses.solver ?? { kind: 'multigrid' };
    if (opts.caches) {
      if (opts.caches.plans.pool !== trialSet.pool || opts.caches.inverses.pool !== trialSet.pool) {
        throw new InvalidArgumentError('caches belong to another fibre pool than trialSet', { field: 'caches' });
      }
      if (opts.inner && opts.inner !== opts.caches.inverses.solver) {
        throw new InvalidArgumentError('caches were built for another inner solver than opts.inner', { field: 'caches' });
      }
    }
    this.plans = opts.caches?.plans ?? new SpatialPlanCache(problem.domain, trialSet.pool);
    const inverses = opts.caches?.inverses ?? new FibreInverseCache(problem.domain, trialSet.pool, this.plans, inner);
    this.inverses = inverses;
    const pInner = opts.preconditionerInner ?? inner;
    this.pInverses = pInner === inner ? inverses : new FibreInverseCache(problem.domain, trialSet.pool, this.plans, pInner);
    // B and Bᵀ run one after the other (S = Bᵀ K_Y B + G, the right-hand side): one set of scratch.
    const work = new WorkVectors();
    this.B = new TensorOperatorPlan('derivIn', 'mass', trialSet, this.testSet, this.plans, T).useWorkVectors(work);
    this.Bt = new TensorOperatorPlan('derivOut', 'mass', this.testSet, trialSet, this.plans, T).useWorkVectors(work);
    this.KY = new TestInnerProductInverse(this.testSet, inverses);
    this.G = new InitialTraceOperator(trialSet, this.plans, T);
    this.S = new SchurOperator(this.B, this.Bt, this.KY, this.G);
  }

  /** The preconditioner K_X, built on first use (an estimator-only system never needs it). */
  get KX(): TrialPreconditioner {
    if (this.kx === null) this.kx = new TrialPreconditioner(this.trialSet, this.pInverses, this.plans, this.problem.T);
    return this.kx;
  }

  /** Diagonals of the hierarchical spatial A and M on a fibre of the pool (fibre order). */
  fibreDiagonals(fibreId: number): { A: Float64Array; M: Float64Array } {
    return this.inverses.get(fibreId).diagonals();
  }

  /** Number of unknowns (#Λ). */
  get size(): number {
    return this.trialSet.size;
  }

  /**
   * b = Bᵀ K_Y ℓ_f + g ⊗ ℓ_0 for the system's own data, or for other data on the same domain and
   * interval (many right-hand sides with one operator: control, estimation, uncertainty studies).
   */
  rightHandSide(data?: Pick<HeatProblemSpec, 'initial' | 'source' | 'curveSources'>): Float64Array {
    const problem = data ? new HeatProblem({ domain: this.problem.domain, T: this.problem.T, ...data }) : this.problem;
    const lf = data ? this.dataSourceLoad(problem) : this.ownSourceLoad();
    const v = new Float64Array(this.testSet.size);
    this.KY.apply(lf, v);
    const b = new Float64Array(this.trialSet.size);
    this.Bt.apply(v, b);
    this.G.addTraced(data ? this.dataInitialLoad(problem) : this.ownInitialLoad(), b, 1);
    return b;
  }

  private lf: Float64Array | null = null;
  private l0: Float64Array | null = null;
  private ownSourceLoad(): Float64Array {
    return (this.lf ??= this.dataSourceLoad(this.problem));
  }
  private ownInitialLoad(): Float64Array {
    return (this.l0 ??= this.dataInitialLoad(this.problem));
  }
  /** ℓ_f plus the boundary data (flux, convection, lifting of held values: ./boundary-data-load). */
  private dataSourceLoad(problem: HeatProblem): Float64Array {
    return sourceLoadWithBoundary(problem, this.testSet, this.plans);
  }
  /** ℓ_0 minus the lifting's initial trace ∫ G(0) φ. */
  private dataInitialLoad(problem: HeatProblem): Float64Array {
    return initialLoadWithLifting(problem, this.G.traceFibre, this.plans);
  }

  /**
   * The residual b − S x of the system's own data in one pass,
   * Bᵀ K_Y (ℓ_f − B x) + γ0ᵀ(u0 − γ0 x): one application of B, K_Y and Bᵀ (the cost of one S),
   * instead of forming b and S x separately. Writes into `out` (length #Λ) and returns it.
   */
  residual(x: Float64Array, out: Float64Array = new Float64Array(this.trialSet.size)): Float64Array {
    const ny = this.testSet.size;
    const w = new Float64Array(ny);
    this.B.apply(x, w);
    const lf = this.ownSourceLoad();
    for (let i = 0; i < ny; i++) w[i] = lf[i]! - w[i]!;
    const v = new Float64Array(ny);
    this.KY.apply(w, v);
    this.Bt.apply(v, out);
    this.G.addTraced(this.ownInitialLoad(), out, 1);
    this.G.applyAdd(x, out, -1);
    return out;
  }

  /** Solves S u = b by PCG with K_X (defaults: relTol 1e-8, max 500 iterations). */
  solve(opts: SystemSolveOptions = {}): { solution: SpaceTimeSolution; pcg: PcgResult; warning?: string } {
    opts = validateSolveOptions(opts, this.size);
    const { allowUnconverged, rightHandSide, ...pcgOpts } = opts;
    const b = rightHandSide ?? this.rightHandSide();
    const result = pcg(this.S, b, { maxIterations: 500, ...pcgOpts, preconditioner: this.KX });
    const solution = new SpaceTimeSolution(this.problem.domain, this.trialSet, result.solution, this.problem.T);
    if (result.stopReason !== 'iterations') return { solution, pcg: result };
    // Never silently wrong: an iterate cut off at the iteration cap is refused unless asked for.
    const reached = result.residualHistory[result.residualHistory.length - 1]!;
    const target = Math.max(opts.absTol ?? 0, (opts.relTol ?? 1e-8) * result.residualHistory[0]!);
    // With an energy tolerance that estimate is the criterion (relTol is then only a floor), so say it.
    const estimated = Number.isFinite(result.energyError) ? result.energyError.toExponential(2) : 'not yet available (fewer iterations than its delay)';
    const energy = (opts.energyTol ?? 0) > 0 ? `, estimated S-energy error ${estimated} against energyTol ${opts.energyTol!.toExponential(2)}` : '';
    const msg = `PCG stopped unconverged after ${result.iterations} iterations (maxIterations) on #Λ = ${this.size}: ` +
      `preconditioned residual ${reached.toExponential(2)}, requested ${target.toExponential(2)}${energy}`;
    if (!allowUnconverged) throw new NotConvergedError(`${msg}${contrastHint(this.problem.domain)}; raise maxIterations or relTol, or pass allowUnconverged: true to get the iterate`, result.iterations, reached, target, { field: 'maxIterations', received: result.iterations });
    return { solution, pcg: result, warning: `UNCONVERGED: ${msg}${contrastHint(this.problem.domain)}` };
  }
}

/**
 * The likely causes of slow PCG convergence that the mesh and data show (docs/method.md §6.2): a
 * diffusivity that jumps by orders of magnitude across an interface of the initial mesh, a
 * convection edge with a large Biot number; '' where there is neither.
 */
function contrastHint(domain: SpatialDomain): string {
  const place = (p: [number, number]): string => domain.dim === 1 ? `x = ${Number(p[0].toPrecision(6))}` : `(${Number(p[0].toPrecision(6))}, ${Number(p[1].toPrecision(6))})`;
  let hint = '';
  const c = diffusionContrast(domain);
  if (c !== null && c.ratio >= NOTABLE_CONTRAST) {
    hint += `; the diffusivity jumps by a factor ${Number(c.ratio.toPrecision(3))} at ${place(c.at)} (${Number(c.kappa[0].toPrecision(3))} in initial element ${c.elements[0]} against ` +
      `${Number(c.kappa[1].toPrecision(3))} in ${c.elements[1]}), and the preconditioner loses robustness at such interfaces beyond a contrast of about 100 (docs/method.md §6.2)`;
  }
  const r = stiffestTransfer(domain);
  if (r !== null && r.biot >= NOTABLE_BIOT) {
    hint += `; the convection edge at ${place(r.at)} has a Biot number hL/κ of ${Number(r.biot.toPrecision(3))} (h = ${Number(r.h.toPrecision(3))}), which stiffens the system ` +
      "there and slows the solver (docs/method.md §6.2): a surface meant to follow the ambient is better held at it (kind 'value')";
  }
  return hint;
}
