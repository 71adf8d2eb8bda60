/**
 * Test-side references for the multilevel preconditioner, written independently
 * of src/space/multigrid: dense P1 assembly via barycentric gradients (ml-matrix),
 * a matrix-free element-loop operator, dense preconditioner matrices, spectral
 * condition numbers and PCG with Lanczos eigenvalue estimates.
 */
import { CholeskyDecomposition, EigenvalueDecomposition, Matrix, inverse } from 'ml-matrix';
import type { LeafMesh } from '../../../src/space/leaf-mesh';
import { rng as uniform01 } from '../../helpers/random';

export function freeIndices(mesh: LeafMesh): number[] {
  const out: number[] = [];
  for (let i = 0; i < mesh.vertexCount; i++) if (mesh.isFree[i]) out.push(i);
  return out;
}

/**
 * Element stiffness (per unit κ; with the element's tensor K for an anisotropic mesh, then κ = 1
 * must be used by the caller: see kappaOf) and mass of element e, from barycentric gradients.
 */
function elementMatrices(mesh: LeafMesh, e: number): { v: number[]; S: number[][]; Ms: number[][] } {
  const d = mesh.dim;
  const v = Array.from(mesh.elements.subarray((d + 1) * e, (d + 1) * (e + 1)));
  if (d === 1) {
    const h = Math.abs(mesh.coords[v[1]!]! - mesh.coords[v[0]!]!);
    const g = [-1 / h, 1 / h];
    const S = g.map((gi) => g.map((gj) => gi * gj * h));
    // mass: exact integral of products of linear hats (Simpson's rule is exact for quadratics)
    const Ms = [0, 1].map((i) => [0, 1].map((j) => {
      const at = (t: number, k: number): number => (k === 0 ? 1 - t : t);
      return (h / 6) * (at(0, i) * at(0, j) + 4 * at(0.5, i) * at(0.5, j) + at(1, i) * at(1, j));
    }));
    return { v, S, Ms };
  }
  const X = v.map((i) => [mesh.coords[2 * i]!, mesh.coords[2 * i + 1]!]);
  // barycentric λ_i = a_i + g_i·x: solve [1 x y] [a; gx; gy] = e_i
  const V = new Matrix(X.map((p) => [1, p[0]!, p[1]!]));
  const C = inverse(V); // column i holds (a_i, g_i)
  const area = 0.5 * Math.abs((X[1]![0]! - X[0]![0]!) * (X[2]![1]! - X[0]![1]!) - (X[2]![0]! - X[0]![0]!) * (X[1]![1]! - X[0]![1]!));
  const t = mesh.kappaTensor;
  const m = mesh.elementMaterial[e]!;
  // ∫_T ∇λ_i·K∇λ_j = |T| g_iᵀ K g_j (K = I for the per-unit-κ isotropic stiffness)
  const [kxx, kxy, kyy] = t === undefined ? [1, 0, 1] : [t[3 * m]!, t[3 * m + 1]!, t[3 * m + 2]!];
  const S = [0, 1, 2].map((i) => [0, 1, 2].map((j) => area * (
    kxx * C.get(1, i) * C.get(1, j) + kxy * (C.get(1, i) * C.get(2, j) + C.get(2, i) * C.get(1, j)) + kyy * C.get(2, i) * C.get(2, j))));
  // mass by the edge-midpoint rule (exact for quadratics on triangles; common practice)
  const mids = [[0.5, 0.5, 0], [0, 0.5, 0.5], [0.5, 0, 0.5]];
  const Ms = [0, 1, 2].map((i) => [0, 1, 2].map((j) => (area / 3) * mids.reduce((s, m) => s + m[i]! * m[j]!, 0)));
  return { v, S, Ms };
}

/** The factor of the element stiffness: κ, or 1 where the tensor is already in it. */
function kappaOf(mesh: LeafMesh, mat: number): number {
  return mesh.kappaTensor === undefined ? mesh.kappa[mat]! : 1;
}

/** Dense K (κ-stiffness + c·mass) and M on the free vertices. */
export function denseMatrices(mesh: LeafMesh): { free: number[]; K: Matrix; M: Matrix } {
  const free = freeIndices(mesh);
  const pos = new Map<number, number>();
  free.forEach((v, i) => pos.set(v, i));
  const n = free.length;
  const K = Matrix.zeros(n, n);
  const M = Matrix.zeros(n, n);
  for (let e = 0; e < mesh.elementCount; e++) {
    const { v, S, Ms } = elementMatrices(mesh, e);
    const mat = mesh.elementMaterial[e]!;
    const kap = kappaOf(mesh, mat);
    const c = mesh.reaction[mat]!;
    v.forEach((vi, i) => v.forEach((vj, j) => {
      const p = pos.get(vi);
      const q = pos.get(vj);
      if (p === undefined || q === undefined) return;
      K.set(p, q, K.get(p, q) + kap * S[i]![j]! + c * Ms[i]![j]!);
      M.set(p, q, M.get(p, q) + Ms[i]![j]!);
    }));
  }
  return { free, K, M };
}

/** Matrix-free y = (K + αM) x on the free vertices (P1 closed forms), zero on Dirichlet vertices. */
export function makeOperator(mesh: LeafMesh): (alpha: number, x: Float64Array, y: Float64Array) => void {
  const d = mesh.dim;
  const nv = d + 1;
  const ne = mesh.elementCount;
  const loc = new Float64Array(ne * nv * nv * 2);
  for (let e = 0; e < ne; e++) {
    const { S, Ms } = elementMatrices(mesh, e);
    const mat = mesh.elementMaterial[e]!;
    for (let i = 0; i < nv; i++) for (let j = 0; j < nv; j++) {
      const o = ((e * nv + i) * nv + j) * 2;
      loc[o] = kappaOf(mesh, mat) * S[i]![j]! + mesh.reaction[mat]! * Ms[i]![j]!;
      loc[o + 1] = Ms[i]![j]!;
    }
  }
  return (alpha, x, y) => {
    y.fill(0);
    const el = mesh.elements;
    for (let e = 0; e < ne; e++) {
      for (let i = 0; i < nv; i++) {
        const vi = el[e * nv + i]!;
        if (!mesh.isFree[vi]) continue;
        let s = 0;
        for (let j = 0; j < nv; j++) {
          const vj = el[e * nv + j]!;
          if (!mesh.isFree[vj]) continue;
          const o = ((e * nv + i) * nv + j) * 2;
          s += (loc[o]! + alpha * loc[o + 1]!) * x[vj]!;
        }
        y[vi] = y[vi]! + s;
      }
    }
  };
}

/** Dense matrix of a linear map on the free vertices, by applying it to unit vectors. */
export function denseOfMap(mesh: LeafMesh, apply: (r: Float64Array, z: Float64Array) => void, idx = freeIndices(mesh)): Matrix {
  const n = idx.length;
  const out = Matrix.zeros(n, n);
  const r = new Float64Array(mesh.vertexCount);
  const z = new Float64Array(mesh.vertexCount);
  for (let j = 0; j < n; j++) {
    r.fill(0);
    r[idx[j]!] = 1;
    apply(r, z);
    for (let i = 0; i < n; i++) out.set(i, j, z[idx[i]!]!);
  }
  return out;
}

/** Extreme eigenvalues of V·K for SPD V and K: eigenvalues of Rᵀ V R with K = R Rᵀ. */
export function denseSpectrum(V: Matrix, K: Matrix): { min: number; max: number } {
  const R = new CholeskyDecomposition(K).lowerTriangularMatrix;
  const B = R.transpose().mmul(V).mmul(R);
  const Bs = B.add(B.transpose()).mul(0.5);
  const ev = new EigenvalueDecomposition(Bs, { assumeSymmetric: true }).realEigenvalues;
  return { min: Math.min(...ev), max: Math.max(...ev) };
}

/** Deterministic pseudo-random numbers in (−1, 1) (the shared mulberry32 helper, rescaled). */
export function rng(seed: number): () => number {
  const r = uniform01(seed);
  return () => 2 * r() - 1;
}

export function randomVector(mesh: LeafMesh, seed: number): Float64Array {
  const r = rng(seed);
  const v = new Float64Array(mesh.vertexCount);
  for (let i = 0; i < v.length; i++) v[i] = mesh.isFree[i] ? r() : 0;
  return v;
}

export function dot(a: Float64Array, b: Float64Array): number {
  let s = 0;
  for (let i = 0; i < a.length; i++) s += a[i]! * b[i]!;
  return s;
}

/**
 * Preconditioned CG on K x = b; Lanczos extreme-eigenvalue estimates of V·K from
 * the CG coefficients (the standard CG–Lanczos relation, e.g. Saad, Iterative
 * Methods for Sparse Linear Systems, 2nd ed., 2003, §6.7.3).
 */
export function pcg(
  applyK: (x: Float64Array, y: Float64Array) => void,
  applyV: (r: Float64Array, z: Float64Array) => void,
  b: Float64Array, opts: { maxIter: number; relTol: number },
): { iterations: number; lambdaMin: number; lambdaMax: number; relResidual: number } {
  const n = b.length;
  const x = new Float64Array(n);
  const r = Float64Array.from(b);
  const z = new Float64Array(n);
  const p = new Float64Array(n);
  const q = new Float64Array(n);
  applyV(r, z);
  p.set(z);
  let rz = dot(r, z);
  const r0 = Math.sqrt(rz);
  const alphas: number[] = [];
  const betas: number[] = [];
  let it = 0;
  let rel = 1;
  while (it < opts.maxIter) {
    applyK(p, q);
    const a = rz / dot(p, q);
    for (let i = 0; i < n; i++) { x[i] = x[i]! + a * p[i]!; r[i] = r[i]! - a * q[i]!; }
    applyV(r, z);
    const rzNew = dot(r, z);
    const beta = rzNew / rz;
    alphas.push(a);
    betas.push(beta);
    rz = rzNew;
    it++;
    rel = Math.sqrt(Math.max(rz, 0)) / r0;
    if (rel < opts.relTol) break;
    for (let i = 0; i < n; i++) p[i] = z[i]! + beta * p[i]!;
  }
  const k = alphas.length;
  const T = Matrix.zeros(k, k);
  for (let j = 0; j < k; j++) {
    T.set(j, j, 1 / alphas[j]! + (j > 0 ? betas[j - 1]! / alphas[j - 1]! : 0));
    if (j + 1 < k) {
      const off = Math.sqrt(betas[j]!) / alphas[j]!;
      T.set(j, j + 1, off);
      T.set(j + 1, j, off);
    }
  }
  const ev = new EigenvalueDecomposition(T, { assumeSymmetric: true }).realEigenvalues;
  return { iterations: it, lambdaMin: Math.min(...ev), lambdaMax: Math.max(...ev), relResidual: rel };
}
