/**
 * Preconditioned conjugate gradients for SPD systems (common practice; e.g.
 * Saad, Iterative Methods for Sparse Linear Systems, 2nd ed., Alg. 9.1).
 */
import { InvalidArgumentError, SolverBreakdownError } from '../errors';
import type { LinearOperator } from '../numerics/linear-operator';
import { validatePcgArguments } from './pcg-options';

/** Options of {@link pcg}. */
export interface PcgOptions {
  /** Preconditioner K ≈ S⁻¹ (identity if omitted). */
  preconditioner?: LinearOperator;
  /** Stop when √(rᵀKr) ≤ relTol · √(r₀ᵀKr₀) (default 1e-8)… */
  relTol?: number;
  /** …or when √(rᵀKr) ≤ absTol (default 0). */
  absTol?: number;
  /** Iteration cap (default 1000). */
  maxIterations?: number;
  /** Initial guess (default zero); not modified. */
  initialGuess?: Float64Array;
  /** Estimate the extreme eigenvalues of K·S from the CG coefficients (Lanczos). */
  estimateSpectrum?: boolean;
  /**
   * Stop as soon as the estimated algebraic error in the S-energy norm, ‖x − x_k‖_S, is at most
   * this value (default 0: off). The estimate is the Hestenes–Stiefel sum
   * ‖x − x_k‖²_S ≈ Σ_{j=k}^{k+d−1} α_j r_jᵀK r_j over the next d = `energyDelay` iterations
   * (Strakoš & Tichý, ETNA 13, 2002; common practice), a lower bound that is tight once the
   * convergence is steady. It does not depend on how K is scaled, unlike √(rᵀKr). The iterate
   * returned is x_{k+d}, whose error is smaller still (CG decreases the energy error monotonically).
   */
  energyTol?: number;
  /** Delay d of the energy-error estimate (default 4). */
  energyDelay?: number;
  /** Checked once per iteration: when aborted, PCG returns its current iterate with `stopReason: 'aborted'`. */
  signal?: AbortSignal;
  /** Called after every iteration (progress reports; keep it cheap). */
  onIteration?: (info: PcgProgress) => void;
}

/** Progress of a running PCG solve, passed to {@link PcgOptions.onIteration}. */
export interface PcgProgress {
  iteration: number;
  /** √(rᵀKr) of the current iterate. */
  residual: number;
  /** Latest delayed estimate of the S-energy error (NaN until d iterations are done). */
  energyError: number;
}

/** Result of {@link pcg}. */
export interface PcgResult {
  solution: Float64Array;
  iterations: number;
  converged: boolean;
  /** √(rᵀKr) after each iteration, starting with the initial residual. */
  residualHistory: number[];
  /** Extreme Ritz values of K·S (only with `estimateSpectrum`). */
  spectrum?: { min: number; max: number; condition: number };
  /** Why the iteration ended. */
  stopReason: 'residual' | 'energy' | 'iterations' | 'aborted';
  /**
   * Estimated S-energy norm of the algebraic error of the returned iterate (an upper estimate: the
   * delayed Hestenes–Stiefel value of the iterate d steps earlier); NaN when fewer than d
   * iterations were made.
   */
  energyError: number;
}

/**
 * Solves S x = b by preconditioned CG.
 *
 * @throws SolverBreakdownError when pᵀSp ≤ 0 (S not positive definite) or rᵀKr < 0.
 * @example
 * ```ts
 * import { pcg } from 'chronomesh';
 * const S = { inSize: 2, outSize: 2, apply: (x: Float64Array, y: Float64Array) => { y[0] = 2 * x[0]!; y[1] = 3 * x[1]!; } };
 * const r = pcg(S, Float64Array.of(2, 3));
 * console.log(r.solution, r.iterations); // → Float64Array(2) [ 1, 1 ] 2
 * ```
 */
export function pcg(S: LinearOperator, b: Float64Array, opts: PcgOptions = {}): PcgResult {
  // S square, b finite of length n, options known and in range, initial guess and K of size n.
  opts = validatePcgArguments(S, b, opts);
  const n = S.inSize;
  const K = opts.preconditioner;
  const relTol = opts.relTol ?? 1e-8;
  const absTol = opts.absTol ?? 0;
  const maxIt = opts.maxIterations ?? 1000;
  const x = opts.initialGuess ? Float64Array.from(opts.initialGuess) : new Float64Array(n);
  const r = new Float64Array(n);
  const z = new Float64Array(n);
  const p = new Float64Array(n);
  const q = new Float64Array(n);
  if (opts.initialGuess) {
    S.apply(x, q);
    for (let i = 0; i < n; i++) r[i] = b[i]! - q[i]!;
  } else r.set(b);
  const precondition = () => (K ? K.apply(r, z) : z.set(r));
  precondition();
  let rz = dot(r, z);
  if (!(rz >= 0)) throw new SolverBreakdownError(`preconditioned residual norm² is ${rz}: the preconditioner is not positive definite`);
  const history = [Math.sqrt(rz)];
  const target = Math.max(absTol, relTol * Math.sqrt(rz));
  const energyTol = opts.energyTol ?? 0;
  const delay = opts.energyDelay ?? 4;
  if (!(energyTol >= 0) || !Number.isInteger(delay) || delay < 1) {
    throw new InvalidArgumentError(`energyTol must be ≥ 0 and energyDelay an integer ≥ 1 (received ${energyTol}, ${delay})`, { field: 'energyTol' });
  }
  p.set(z);
  const alphas: number[] = [];
  const betas: number[] = [];
  const terms: number[] = []; // α_j r_jᵀ K r_j, the Hestenes–Stiefel terms
  let energyError = NaN;
  let it = 0;
  let stopReason: PcgResult['stopReason'] = 'iterations';
  let converged = Math.sqrt(rz) <= target;
  if (converged) stopReason = 'residual';
  while (!converged && it < maxIt) {
    if (opts.signal?.aborted) {
      stopReason = 'aborted';
      break;
    }
    S.apply(p, q);
    const pq = dot(p, q);
    if (!(pq > 0)) throw new SolverBreakdownError(`CG breakdown at iteration ${it + 1}: pᵀSp = ${pq} is not positive (the operator is not SPD or the input contains NaN)`);
    const alpha = rz / pq;
    terms.push(alpha * rz);
    for (let i = 0; i < n; i++) {
      x[i]! += alpha * p[i]!;
      r[i]! -= alpha * q[i]!;
    }
    precondition();
    const rzNew = dot(r, z);
    if (!(rzNew >= 0)) throw new SolverBreakdownError(`CG breakdown at iteration ${it + 1}: rᵀKr = ${rzNew} (preconditioner not positive definite)`);
    const beta = rzNew / rz;
    alphas.push(alpha);
    betas.push(beta);
    for (let i = 0; i < n; i++) p[i] = z[i]! + beta * p[i]!;
    rz = rzNew;
    it++;
    history.push(Math.sqrt(rz));
    if (it >= delay) {
      let e2 = 0;
      for (let j = it - delay; j < it; j++) e2 += terms[j]!;
      energyError = Math.sqrt(e2);
    }
    opts.onIteration?.({ iteration: it, residual: Math.sqrt(rz), energyError });
    if (Math.sqrt(rz) <= target) {
      converged = true;
      stopReason = 'residual';
    } else if (energyTol > 0 && energyError <= energyTol) {
      converged = true;
      stopReason = 'energy';
    }
  }
  const result: PcgResult = { solution: x, iterations: it, converged, residualHistory: history, stopReason, energyError };
  if (opts.estimateSpectrum && alphas.length > 0) result.spectrum = lanczosExtremes(alphas, betas);
  return result;
}

function dot(a: Float64Array, b: Float64Array): number {
  let s = 0;
  for (let i = 0; i < a.length; i++) s += a[i]! * b[i]!;
  return s;
}

/**
 * Extreme eigenvalues of the Lanczos tridiagonal matrix built from the CG
 * coefficients (common practice; Golub & Van Loan, Matrix Computations, §10.2):
 * T_jj = 1/α_j + β_{j−1}/α_{j−1}, T_{j,j+1} = √β_j / α_j. Eigenvalues by bisection (Sturm sequences).
 */
export function lanczosExtremes(alphas: number[], betas: number[]): { min: number; max: number; condition: number } {
  const m = alphas.length;
  const d = new Float64Array(m);
  const e = new Float64Array(m);
  for (let j = 0; j < m; j++) {
    d[j] = 1 / alphas[j]! + (j > 0 ? betas[j - 1]! / alphas[j - 1]! : 0);
    if (j < m - 1) e[j] = Math.sqrt(betas[j]!) / alphas[j]!;
  }
  let lo = Infinity;
  let hi = -Infinity;
  for (let j = 0; j < m; j++) {
    const rad = (j > 0 ? Math.abs(e[j - 1]!) : 0) + (j < m - 1 ? Math.abs(e[j]!) : 0);
    lo = Math.min(lo, d[j]! - rad);
    hi = Math.max(hi, d[j]! + rad);
  }
  const countBelow = (x: number): number => {
    let c = 0;
    let q = 1;
    for (let j = 0; j < m; j++) {
      q = d[j]! - x - (j > 0 ? (e[j - 1]! * e[j - 1]!) / q : 0);
      if (q === 0) q = -1e-300;
      if (q < 0) c++;
    }
    return c;
  };
  const kth = (k: number): number => {
    let a = lo;
    let b = hi;
    for (let it = 0; it < 200 && b - a > 1e-14 * Math.max(1, Math.abs(b)); it++) {
      const mid = 0.5 * (a + b);
      if (countBelow(mid) > k) b = mid;
      else a = mid;
    }
    return 0.5 * (a + b);
  };
  const min = kth(0);
  const max = kth(m - 1);
  return { min, max, condition: max / min };
}
