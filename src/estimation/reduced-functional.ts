/**
 * The reduced functional m ↦ J(u(m)) with u(m) = S⁻¹ (b₀ + (∂b/∂m) m), its gradient by one
 * adjoint solve and Hessian–vector products by two solves (discretize-then-optimize: these are
 * the exact derivatives of the computed J). Since S is symmetric, the adjoint equation is
 * S p = ∇_u J with the same operator and preconditioner, and ∇_m J = (∂b/∂m)ᵀ p.
 */
import { checkOptions } from '../validation/checks';
import { InvalidArgumentError, NotConvergedError, describeValue } from '../errors';
import { SpaceTimeSolution } from '../spacetime/space-time-solution';
import { pcg, type PcgResult } from '../system/pcg';
import type { SpaceTimeSystem } from '../system/space-time-system';
import type { LeastSquaresFunctional } from './functionals';
import type { ParameterMap } from './parameters';

/** Options of {@link ReducedFunctional}. */
export interface ReducedFunctionalOptions {
  /** Fixed part b₀ of the right-hand side (default: `system.rightHandSide()`, the system's own data). */
  baseRightHandSide?: Float64Array;
  /** Default requested relative accuracy of values and gradients (default 1e-8). */
  accuracy?: number;
  /** PCG iteration cap per solve (default 1000). */
  maxIterations?: number;
}

/** Per-call options: requested relative accuracy of the result. */
export interface AccuracyOption {
  /**
   * Requested relative accuracy ε. Every PCG solve stops when its preconditioned residual has
   * dropped by ε / 10 — the factor 10 covers √cond(K_X S) (about 2.6 for the condition numbers
   * below 7 of docs/method.md §6), so the solution error in the S-norm is below ε relative.
   */
  accuracy?: number;
}

/** Result of {@link ReducedFunctional.gradient}. */
export interface GradientResult {
  value: number;
  gradient: Float64Array;
  /** Coefficients of the state u(m) and of the adjoint p = S⁻¹ ∇_u J. */
  state: Float64Array;
  adjoint: Float64Array;
  forwardIterations: number;
  adjointIterations: number;
}

/**
 * J(m) = J(u(m)) for a functional, a parameter map and a system.
 *
 * @example
 * ```ts
 * import { DoubleTree, HeatProblem, ReducedFunctional, SpaceTimeSystem, intervalDomain, probeMisfit, sourceAmplitudes } from 'chronomesh';
 * const domain = intervalDomain(0, 1, 2);
 * const system = new SpaceTimeSystem(new HeatProblem({ domain, T: 1 }), DoubleTree.sparseGrid(domain, 4));
 * const params = sourceAmplitudes(system, [{ time: () => 1, space: () => 1 }]);
 * const J = new ReducedFunctional(system, params, probeMisfit(system, { times: [0.5], points: [[0.5]], data: [[0.1]] }));
 * const { value, gradient } = J.gradient(Float64Array.of(1));
 * console.log(value, gradient[0]); // dJ/dm by one adjoint solve
 * ```
 */
export class ReducedFunctional {
  readonly baseRightHandSide: Float64Array;
  readonly accuracy: number;
  readonly maxIterations: number;

  constructor(
    readonly system: SpaceTimeSystem,
    readonly parameters: ParameterMap,
    readonly functional: LeastSquaresFunctional,
    opts: ReducedFunctionalOptions = {},
  ) {
    checkOptions<ReducedFunctionalOptions>(opts, 'options', ['baseRightHandSide', 'accuracy', 'maxIterations']);
    const n = system.size;
    if (!parameters || typeof parameters.addTo !== 'function' || parameters.systemSize !== n) {
      throw new InvalidArgumentError(`parameters must be a parameter map of this system (${n} unknowns)`, { field: 'parameters', received: describeValue(parameters?.systemSize) });
    }
    if (!functional || functional.trialSet !== system.trialSet) {
      throw new InvalidArgumentError('functional must be built on the same system (same trial index set)', { field: 'functional' });
    }
    const b0 = opts.baseRightHandSide ?? system.rightHandSide();
    if (!(b0 instanceof Float64Array) || b0.length !== n) {
      throw new InvalidArgumentError(`baseRightHandSide must be a Float64Array of length ${n}`, { field: 'baseRightHandSide', received: describeValue(b0) });
    }
    this.baseRightHandSide = b0;
    this.accuracy = checkAccuracy(opts.accuracy ?? 1e-8, 'accuracy');
    const maxIt = opts.maxIterations ?? 1000;
    if (!Number.isInteger(maxIt) || maxIt < 1) throw new InvalidArgumentError(`maxIterations = ${maxIt} must be an integer ≥ 1`, { field: 'maxIterations', received: maxIt });
    this.maxIterations = maxIt;
  }

  /** Number of parameters. */
  get size(): number {
    return this.parameters.size;
  }

  /**
   * Solves S x = rhs with K_X, relative tolerance `relTol`; throws {@link NotConvergedError} naming
   * the solve (`field`) if the iteration cap is reached first.
   */
  solveWith(rhs: Float64Array, relTol: number, field: string): PcgResult {
    const r = pcg(this.system.S, rhs, { preconditioner: this.system.KX, relTol, maxIterations: this.maxIterations });
    if (!r.converged) {
      const last = r.residualHistory[r.residualHistory.length - 1]!;
      const first = r.residualHistory[0]!;
      const reached = last / (first || 1);
      throw new NotConvergedError(
        `${field} PCG solve stopped after ${r.iterations} iterations at relative residual ${reached.toExponential(2)}, above the tolerance ${relTol.toExponential(2)}; raise maxIterations or request less accuracy`,
        r.iterations, last, relTol * first, { field, expected: `relative residual ≤ ${relTol}`, received: reached },
      );
    }
    return r;
  }

  private relTol(opts: AccuracyOption): number {
    checkOptions<AccuracyOption>(opts, 'options', ['accuracy']);
    return checkAccuracy(opts.accuracy ?? this.accuracy, 'accuracy') / 10;
  }

  private checkM(m: Float64Array, field = 'm'): void {
    if (!(m instanceof Float64Array) || m.length !== this.size) {
      throw new InvalidArgumentError(`${field} must be a Float64Array of length ${this.size} (one entry per parameter)`, { field, expected: `Float64Array(${this.size})`, received: describeValue(m) });
    }
    for (let j = 0; j < m.length; j++) {
      if (!Number.isFinite(m[j]!)) throw new InvalidArgumentError(`${field}[${j}] = ${m[j]} is not finite`, { field: `${field}[${j}]`, received: m[j] });
    }
  }

  /** b(m) = b₀ + (∂b/∂m) m. */
  rightHandSide(m: Float64Array): Float64Array {
    this.checkM(m);
    const b = Float64Array.from(this.baseRightHandSide);
    this.parameters.addTo(m, b);
    return b;
  }

  /** The state u(m) as a solution object (for evaluation and export). */
  state(m: Float64Array, opts: AccuracyOption = {}): SpaceTimeSolution {
    const r = this.solveWith(this.rightHandSide(m), this.relTol(opts), 'forward');
    const { domain, T } = this.system.problem;
    return new SpaceTimeSolution(domain, this.system.trialSet, r.solution, T);
  }

  /** J(m) (one forward solve). */
  value(m: Float64Array, opts: AccuracyOption = {}): number {
    return this.functional.value(this.state(m, opts).coefficients);
  }

  /** J(m) and ∇_m J = (∂b/∂m)ᵀ S⁻¹ ∇_u J (one forward and one adjoint solve). */
  gradient(m: Float64Array, opts: AccuracyOption = {}): GradientResult {
    const tol = this.relTol(opts);
    const fwd = this.solveWith(this.rightHandSide(m), tol, 'forward');
    const u = fwd.solution;
    const value = this.functional.value(u);
    const adj = this.solveWith(this.functional.gradient(u), tol, 'adjoint');
    const gradient = new Float64Array(this.size);
    this.parameters.transpose(adj.solution, gradient);
    return { value, gradient, state: u, adjoint: adj.solution, forwardIterations: fwd.iterations, adjointIterations: adj.iterations };
  }

  /**
   * ∇²_m J δ = (∂b/∂m)ᵀ S⁻¹ (Eᵀ W E) S⁻¹ (∂b/∂m) δ (two solves; J is quadratic in m, so this is
   * independent of m).
   */
  hessianVector(delta: Float64Array, opts: AccuracyOption = {}): Float64Array {
    this.checkM(delta, 'delta');
    const tol = this.relTol(opts);
    const bd = new Float64Array(this.system.size);
    this.parameters.addTo(delta, bd);
    const du = this.solveWith(bd, tol, 'forward (Hessian)').solution;
    const dp = this.solveWith(this.functional.hessianApply(du), tol, 'adjoint (Hessian)').solution;
    const out = new Float64Array(this.size);
    this.parameters.transpose(dp, out);
    return out;
  }

  /**
   * Sensitivities ∂(E u)_k / ∂m_j of every evaluated quantity (row k of the functional, e.g. each
   * probe reading) to every parameter: one forward solve per parameter. Returns rows × parameters,
   * row-major.
   */
  sensitivities(opts: AccuracyOption = {}): Float64Array {
    const tol = this.relTol(opts);
    const n = this.size;
    const rows = this.functional.rowCount;
    const out = new Float64Array(rows * n);
    const e = new Float64Array(n);
    for (let j = 0; j < n; j++) {
      e.fill(0);
      e[j] = 1;
      const bj = new Float64Array(this.system.size);
      this.parameters.addTo(e, bj);
      const col = this.functional.evaluate(this.solveWith(bj, tol, `sensitivity ${j}`).solution);
      for (let k = 0; k < rows; k++) out[k * n + j] = col[k]!;
    }
    return out;
  }
}

function checkAccuracy(a: number, field: string): number {
  if (!(Number.isFinite(a) && a > 0 && a < 1)) throw new InvalidArgumentError(`${field} = ${a} must lie in (0, 1)`, { field, expected: '(0, 1)', received: a });
  return a;
}
