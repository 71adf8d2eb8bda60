/** Extreme eigenvalues of SPD operators for the Riesz tests: dense (ml-matrix) and Lanczos. */
import { EigenvalueDecomposition, Matrix } from 'ml-matrix';

/** All eigenvalues of a symmetric dense matrix, ascending (ml-matrix symmetric EVD). */
export function denseEigenvalues(A: number[][]): number[] {
  const evd = new EigenvalueDecomposition(new Matrix(A), { assumeSymmetric: true });
  return [...evd.realEigenvalues].sort((a, b) => a - b);
}

/**
 * Extreme eigenvalues [λmin, λmax] of an SPD operator from a Krylov space of dimension `steps`:
 * Lanczos vectors with full (twice repeated) Gram–Schmidt reorthogonalisation, then the
 * Rayleigh–Ritz values of the projected matrix QᵀAQ, formed explicitly so that the Ritz values
 * stay inside [λmin, λmax] even when the Krylov space is nearly exhausted (Golub & Van Loan,
 * Matrix Computations, §10.1 — common practice). Ritz values come from ml-matrix.
 */
export function lanczosExtremes(apply: (x: Float64Array, y: Float64Array) => void, n: number, steps: number, seed = 1): [number, number] {
  const m = Math.min(steps, n);
  const Q: Float64Array[] = [];
  const AQ: Float64Array[] = [];
  let q = new Float64Array(n);
  let s = seed;
  for (let i = 0; i < n; i++) {
    s = (s * 16807) % 2147483647;
    q[i] = s / 2147483647 - 0.5;
  }
  const dot = (u: Float64Array, v: Float64Array) => {
    let d = 0;
    for (let i = 0; i < n; i++) d += u[i]! * v[i]!;
    return d;
  };
  let r = Math.sqrt(dot(q, q));
  for (let i = 0; i < n; i++) q[i]! /= r;
  for (let j = 0; j < m; j++) {
    Q.push(q);
    const aq = new Float64Array(n);
    apply(q, aq);
    AQ.push(aq);
    const w = Float64Array.from(aq);
    const scale = Math.sqrt(dot(w, w));
    for (let pass = 0; pass < 2; pass++) {
      for (const u of Q) {
        const d = dot(w, u);
        for (let i = 0; i < n; i++) w[i]! -= d * u[i]!;
      }
    }
    r = Math.sqrt(dot(w, w));
    if (r < 1e-10 * scale) break; // invariant subspace found
    q = Float64Array.from(w, (v) => v / r);
  }
  const k = Q.length;
  const H = Array.from({ length: k }, (_, i) => Array.from({ length: k }, (_, j) => 0.5 * (dot(Q[i]!, AQ[j]!) + dot(Q[j]!, AQ[i]!))));
  const ev = denseEigenvalues(H);
  return [ev[0]!, ev[k - 1]!];
}
