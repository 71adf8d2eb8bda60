/**
 * Tikhonov-regularised estimation for the linear-quadratic problems of this module:
 *   minimise  J_β(m) = J(u(m)) + β/2 ‖m − m_prior‖²,
 * whose minimiser solves the normal equations (H + β I) m = β m_prior − ∇J(0), H = ∇²J. Since J is
 * quadratic, CG on these equations (Hestenes & Stiefel 1952; common practice) needs one gradient
 * and then one Hessian–vector product (two PCG solves) per iteration — no outside optimiser.
 *
 * With readings weighted by w_k = 1/σ_k² (independent Gaussian noise) and β the precision of a
 * Gaussian prior, (H + β I)⁻¹ is the covariance of the estimate (the linear-Gaussian posterior;
 * e.g. Tarantola, Inverse Problem Theory, 2005, §3.2): {@link parameterCovariance}.
 */
import { checkOptions } from '../validation/checks';
import { Matrix, inverse } from 'ml-matrix';
import { InvalidArgumentError, NotConvergedError, SolverBreakdownError, describeValue } from '../errors';
import type { ReducedFunctional } from './reduced-functional';

/** Options of {@link estimateParameters}. */
export interface EstimateOptions {
  /** Regularisation weight β ≥ 0 (default 0; β > 0 is needed when the data do not determine m). */
  beta?: number;
  /** m_prior (default 0); also the starting point of CG. */
  prior?: Float64Array;
  /** Stop when ‖∇J_β‖ ≤ tolerance · ‖∇J_β(m_prior)‖ (default 1e-8). */
  tolerance?: number;
  /** CG iteration cap (default: 2 × number of parameters + 20). */
  maxIterations?: number;
  /** Accuracy of every PCG solve inside (default tolerance / 10). */
  accuracy?: number;
}

/** Result of {@link estimateParameters}. */
export interface EstimateResult {
  parameters: Float64Array;
  /** J(u(m)) at the estimate (the data misfit) and the regularised objective J_β. */
  misfit: number;
  objective: number;
  iterations: number;
  /** ‖residual of the normal equations‖ per CG iteration, starting with the initial one. */
  residualHistory: number[];
}

/**
 * Minimises J(u(m)) + β/2 ‖m − m_prior‖² by CG on the normal equations.
 *
 * @throws NotConvergedError if CG has not reached `tolerance` within `maxIterations`;
 * SolverBreakdownError if H + βI is not positive definite (data do not determine m and β = 0).
 * @example
 * ```ts
 * import { DoubleTree, HeatProblem, ReducedFunctional, SpaceTimeSystem, estimateParameters, intervalDomain, probeMisfit, sourceAmplitudes } from 'chronomesh';
 * const domain = intervalDomain(0, 1, 2);
 * const system = new SpaceTimeSystem(new HeatProblem({ domain, T: 1 }), DoubleTree.sparseGrid(domain, 4));
 * const params = sourceAmplitudes(system, [{ time: () => 1, space: (x) => x }]);
 * const truth = system.solve({ rightHandSide: system.rightHandSide({ source: [{ time: () => 2, space: (x) => x }] }) }).solution;
 * const data = [0.25, 0.5, 1].map((t) => Array.from(truth.evaluate(t, [0.3, 0.6])));
 * const J = new ReducedFunctional(system, params, probeMisfit(system, { times: [0.25, 0.5, 1], points: [[0.3], [0.6]], data }));
 * console.log(estimateParameters(J, { beta: 1e-12 }).parameters[0]); // ≈ 2
 * ```
 */
export function estimateParameters(J: ReducedFunctional, opts: EstimateOptions = {}): EstimateResult {
  checkOptions<EstimateOptions>(opts, 'options', ['beta', 'prior', 'tolerance', 'maxIterations', 'accuracy']);
  const n = J.size;
  const beta = opts.beta ?? 0;
  if (!(Number.isFinite(beta) && beta >= 0)) throw new InvalidArgumentError(`beta = ${beta} must be a finite number ≥ 0`, { field: 'beta', expected: '≥ 0', received: beta });
  const tol = opts.tolerance ?? 1e-8;
  if (!(tol > 0 && tol < 1)) throw new InvalidArgumentError(`tolerance = ${tol} must lie in (0, 1)`, { field: 'tolerance', expected: '(0, 1)', received: tol });
  const maxIt = opts.maxIterations ?? 2 * n + 20;
  if (!Number.isInteger(maxIt) || maxIt < 1) throw new InvalidArgumentError(`maxIterations = ${maxIt} must be an integer ≥ 1`, { field: 'maxIterations', received: maxIt });
  const accuracy = opts.accuracy ?? Math.max(1e-14, tol / 10);
  const prior = opts.prior ?? new Float64Array(n);
  if (!(prior instanceof Float64Array) || prior.length !== n) {
    throw new InvalidArgumentError(`prior must be a Float64Array of length ${n}`, { field: 'prior', received: describeValue(prior) });
  }
  const m = Float64Array.from(prior);
  // r = −∇J_β(m_prior) = −∇J(m_prior) (the regularisation term vanishes there).
  const r = J.gradient(m, { accuracy }).gradient.map((g) => -g);
  const p = Float64Array.from(r);
  let rr = dot(r, r);
  const r0 = Math.sqrt(rr);
  const history = [r0];
  let it = 0;
  while (Math.sqrt(rr) > tol * r0 && it < maxIt) {
    const q = J.hessianVector(p, { accuracy });
    for (let j = 0; j < n; j++) q[j]! += beta * p[j]!;
    const pq = dot(p, q);
    if (!(pq > 0)) {
      throw new SolverBreakdownError(`CG on the normal equations broke down at iteration ${it + 1} (pᵀ(H + βI)p = ${pq}): the data do not determine the parameters; use beta > 0`, {
        field: 'beta', expected: 'β > 0 or more informative data', received: beta,
      });
    }
    const alpha = rr / pq;
    for (let j = 0; j < n; j++) {
      m[j]! += alpha * p[j]!;
      r[j]! -= alpha * q[j]!;
    }
    const rrNew = dot(r, r);
    for (let j = 0; j < n; j++) p[j] = r[j]! + (rrNew / rr) * p[j]!;
    rr = rrNew;
    it++;
    history.push(Math.sqrt(rr));
  }
  if (Math.sqrt(rr) > tol * r0) {
    throw new NotConvergedError(`CG on the normal equations did not reach tolerance ${tol} in ${maxIt} iterations (relative residual ${(Math.sqrt(rr) / r0).toExponential(2)})`, it, Math.sqrt(rr), tol * r0, {
      field: 'maxIterations', expected: `relative residual ≤ ${tol}`, received: Math.sqrt(rr) / r0,
    });
  }
  const misfit = J.value(m, { accuracy });
  let reg = 0;
  for (let j = 0; j < n; j++) reg += (m[j]! - prior[j]!) ** 2;
  return { parameters: m, misfit, objective: misfit + 0.5 * beta * reg, iterations: it, residualHistory: history };
}

/** Result of {@link parameterCovariance}. */
export interface CovarianceResult {
  /** H + β I as assembled (row-major n × n) before symmetrisation, for inspection. */
  hessian: Float64Array;
  /** (H + β I)⁻¹ of the symmetrised Hessian (row-major n × n). */
  covariance: Float64Array;
  /** √diag(covariance). */
  standardDeviations: Float64Array;
}

/**
 * Assembles H + β I by n Hessian–vector products (2n solves; for few parameters) and inverts it.
 * With weights 1/σ² on the readings this is the covariance of the estimate.
 *
 * @example
 * ```ts
 * import { DoubleTree, HeatProblem, ReducedFunctional, SpaceTimeSystem, intervalDomain, parameterCovariance, probeMisfit, sourceAmplitudes } from 'chronomesh';
 * const domain = intervalDomain(0, 1, 2);
 * const system = new SpaceTimeSystem(new HeatProblem({ domain, T: 1 }), DoubleTree.sparseGrid(domain, 4));
 * const sigma = 0.01; // noise of the readings
 * const J = new ReducedFunctional(system, sourceAmplitudes(system, [{ time: () => 1, space: () => 1 }]),
 *   probeMisfit(system, { times: [0.5, 1], points: [[0.5]], data: [[0], [0]], weights: 1 / sigma ** 2 }));
 * console.log(parameterCovariance(J).standardDeviations[0]); // uncertainty of the amplitude
 * ```
 */
export function parameterCovariance(J: ReducedFunctional, opts: { beta?: number; accuracy?: number } = {}): CovarianceResult {
  checkOptions(opts, 'options', ['beta', 'accuracy']);
  const n = J.size;
  const beta = opts.beta ?? 0;
  if (!(Number.isFinite(beta) && beta >= 0)) throw new InvalidArgumentError(`beta = ${beta} must be a finite number ≥ 0`, { field: 'beta', expected: '≥ 0', received: beta });
  const accuracy = opts.accuracy ?? 1e-10;
  const H = new Float64Array(n * n);
  const e = new Float64Array(n);
  for (let j = 0; j < n; j++) {
    e.fill(0);
    e[j] = 1;
    const col = J.hessianVector(e, { accuracy });
    for (let i = 0; i < n; i++) H[i * n + j] = col[i]! + (i === j ? beta : 0);
  }
  const sym = Matrix.zeros(n, n);
  for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) sym.set(i, j, 0.5 * (H[i * n + j]! + H[j * n + i]!));
  const C = inverse(sym);
  const covariance = new Float64Array(n * n);
  const sd = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < n; j++) covariance[i * n + j] = C.get(i, j);
    const v = C.get(i, i);
    if (!(v > 0) || !Number.isFinite(v)) {
      throw new InvalidArgumentError(`the Hessian is singular or indefinite (variance of parameter ${i} is ${v}): the data do not determine the parameters; use beta > 0`, {
        field: 'beta', expected: 'β > 0 or more informative data', received: beta,
      });
    }
    sd[i] = Math.sqrt(v);
  }
  return { hessian: H, covariance, standardDeviations: sd };
}

function dot(a: Float64Array, b: Float64Array): number {
  let s = 0;
  for (let i = 0; i < a.length; i++) s += a[i]! * b[i]!;
  return s;
}
