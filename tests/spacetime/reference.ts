/**
 * Dense space-time references built only from the independent dense
 * references of the temporal and spatial modules (quadrature of basis
 * functions, textbook element matrices) — no fast kernel is involved.
 */
import { Matrix } from 'ml-matrix';
import { rng } from '../helpers/random';
import type { TemporalForm } from '../../src/time/index';
import type { SpatialDomain } from '../../src/space/index';
import type { DoubleTree } from '../../src/spacetime/double-tree';
import { unionSorted } from '../../src/spacetime/fibre-pool';
import { denseTemporalMatrix } from '../time/reference';
import { denseSpatialMatrices } from '../space/reference';

/** One row/column label per coefficient: its temporal function and vertex. */
export interface CoefficientLabel {
  fn: number;
  vertex: number;
}

export function labels(dt: DoubleTree): CoefficientLabel[] {
  const out: CoefficientLabel[] = new Array(dt.size);
  for (let f = 0; f < dt.functionCount; f++) {
    const fib = dt.pool.get(dt.functionFibre[f]!);
    const o = dt.functionOffset[f]!;
    for (let p = 0; p < fib.length; p++) out[o + p] = { fn: f, vertex: fib[p]! };
  }
  return out;
}

export function temporalNodes(dt: DoubleTree): { level: number; index: number }[] {
  return Array.from({ length: dt.tree.size }, (_, i) => ({ level: dt.tree.level[i]!, index: dt.tree.index[i]! }));
}

/** All vertices of the given double trees (sorted), and the dense spatial M and A on them. */
export function denseSpatialOnUnion(domain: SpatialDomain, sets: DoubleTree[]): { vertices: Int32Array; pos: Map<number, number>; M: number[][]; A: number[][] } {
  const fibres: Int32Array[] = [];
  for (const s of sets) for (let i = 0; i < s.tree.size; i++) fibres.push(s.fibre(i));
  const vertices = unionSorted(fibres);
  const { M, A } = denseSpatialMatrices(domain, vertices, vertices);
  const pos = new Map<number, number>();
  vertices.forEach((v, i) => pos.set(v, i));
  return { vertices, pos, M, A };
}

/** Dense matrix of C_M ⊗ M_x + C_A ⊗ A_x from `input` to `output`. */
export function denseTensorOperator(
  domain: SpatialDomain,
  massForm: TemporalForm,
  stiffForm: TemporalForm,
  input: DoubleTree,
  output: DoubleTree,
  T: number,
): Matrix {
  const inNodes = temporalNodes(input);
  const outNodes = temporalNodes(output);
  const CM = denseTemporalMatrix(massForm, output.kind, outNodes, input.kind, inNodes, T);
  const CA = denseTemporalMatrix(stiffForm, output.kind, outNodes, input.kind, inNodes, T);
  const sp = denseSpatialOnUnion(domain, [input, output]);
  const li = labels(input);
  const lo = labels(output);
  const D = new Matrix(output.size, input.size);
  for (let r = 0; r < lo.length; r++) {
    const a = lo[r]!;
    const va = sp.pos.get(a.vertex)!;
    for (let c = 0; c < li.length; c++) {
      const b = li[c]!;
      const vb = sp.pos.get(b.vertex)!;
      D.set(r, c, CM[a.fn]![b.fn]! * sp.M[va]![vb]! + CA[a.fn]![b.fn]! * sp.A[va]![vb]!);
    }
  }
  return D;
}

/** Dense block-diagonal matrix with blocks f(M_fibre, A_fibre, function index) on each temporal function. */
export function denseBlockDiagonal(
  domain: SpatialDomain,
  dt: DoubleTree,
  block: (M: Matrix, A: Matrix, fn: number) => Matrix,
): Matrix {
  const sp = denseSpatialOnUnion(domain, [dt]);
  const out = new Matrix(dt.size, dt.size);
  for (let f = 0; f < dt.functionCount; f++) {
    const fib = dt.pool.get(dt.functionFibre[f]!);
    const n = fib.length;
    if (n === 0) continue;
    const idx = Array.from(fib, (v) => sp.pos.get(v)!);
    const M = new Matrix(n, n);
    const A = new Matrix(n, n);
    for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) {
      M.set(i, j, sp.M[idx[i]!]![idx[j]!]!);
      A.set(i, j, sp.A[idx[i]!]![idx[j]!]!);
    }
    const Bk = block(M, A, f);
    const o = dt.functionOffset[f]!;
    for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) out.set(o + i, o + j, Bk.get(i, j));
  }
  return out;
}

/** Dense G = (g gᵀ) ⊗ M_x with g the vector of trial-function values at t = 0. */
export function denseInitialTrace(domain: SpatialDomain, trial: DoubleTree, g: Float64Array): Matrix {
  const sp = denseSpatialOnUnion(domain, [trial]);
  const l = labels(trial);
  const G = new Matrix(trial.size, trial.size);
  for (let r = 0; r < l.length; r++) for (let c = 0; c < l.length; c++) {
    const gr = g[l[r]!.fn]!;
    const gc = g[l[c]!.fn]!;
    if (gr === 0 || gc === 0) continue;
    G.set(r, c, gr * gc * sp.M[sp.pos.get(l[r]!.vertex)!]![sp.pos.get(l[c]!.vertex)!]!);
  }
  return G;
}

export function relativeError(a: ArrayLike<number>, b: ArrayLike<number>): number {
  let num = 0;
  let den = 0;
  for (let i = 0; i < a.length; i++) {
    num += (a[i]! - b[i]!) ** 2;
    den += b[i]! ** 2;
  }
  return Math.sqrt(num) / Math.max(Math.sqrt(den), 1e-300);
}

/** Seeded random numbers for test inputs (shared helper). */
export const seededRandom = rng;

export function randomVector(n: number, rand: () => number): Float64Array {
  return Float64Array.from({ length: n }, () => 2 * rand() - 1);
}

export function matVec(A: Matrix, x: Float64Array): Float64Array {
  const y = new Float64Array(A.rows);
  for (let i = 0; i < A.rows; i++) {
    let s = 0;
    for (let j = 0; j < A.columns; j++) s += A.get(i, j) * x[j]!;
    y[i] = s;
  }
  return y;
}
