/**
 * Anisotropic diffusion tensors K = [[xx, xy], [xy, yy]], constant per initial element
 * (docs/method.md §4.4): sampling, validation and the quantities the rest of the library needs.
 *
 * Every place that needs one number for the strength of diffusion (diffusion times, the reach of
 * a layer in the error quadrature, the held-data error) uses the largest eigenvalue of K, the
 * strongest direction: that keeps those bounds on the safe side. The stiffness matrices use K
 * itself.
 */
import { InvalidArgumentError, InvalidMeshError, describeValue } from '../errors';
import type { DiffusionTensor, TensorCoefficient } from './domain-options';

/**
 * Largest eigenvalue of the symmetric matrix [[xx, xy], [xy, yy]]: (xx + yy)/2 + √(((xx − yy)/2)² + xy²)
 * (closed form, common practice).
 */
export function largestEigenvalue(xx: number, xy: number, yy: number): number {
  return 0.5 * (xx + yy) + Math.hypot(0.5 * (xx - yy), xy);
}

/**
 * Largest ratio of the eigenvalues of the tensors (xx, xy, yy per element), 1 for none: the
 * anisotropy the spatial V-cycles see.
 */
export function anisotropyRatio(entries: Float64Array | null): number {
  if (entries === null) return 1;
  let worst = 1;
  for (let e = 0; 3 * e < entries.length; e++) {
    const xx = entries[3 * e]!, xy = entries[3 * e + 1]!, yy = entries[3 * e + 2]!;
    const hi = largestEigenvalue(xx, xy, yy);
    const lo = (xx * yy - xy * xy) / hi; // the product of the eigenvalues is the determinant
    worst = Math.max(worst, hi / lo);
  }
  return worst;
}

/**
 * V-cycles per application of the spatial inner solvers for an anisotropy ratio r. A V-cycle with
 * point Gauss–Seidel smoothing contracts like 1 − c/r on anisotropic stiffness (it is the isotropic
 * cycle on elements stretched by √r; common practice), and PCG on the space-time system then
 * needs about r times more iterations; with exact inner solves the count does not depend on r
 * (docs/method.md §4.4). Measured on the unit square, sparse grid of level 5, u0 ≡ 1 (PCG
 * iterations to 10⁻⁸ for 1 / 2 / 4 / 8 cycles): r = 3: 56 / 29 / 22 / 21; r = 10: 207 / 86 / 41 / 24;
 * r = 30: 771 / 307 / 129 / 58; r = 100: 2555 / 1100 / 475 / 203; the time per solve was least at
 * 2–4 cycles for r = 3, 4 for r = 10, 8 (of those tried) for r = 30 and 100. Hence r/2.5 cycles;
 * one for isotropic domains (r < 1.5), at most 16 (the bench's `aniso.` rows give the cost).
 */
export function cyclesForAnisotropy(r: number): number {
  return r < 1.5 ? 1 : Math.min(16, Math.max(2, Math.round(r / 2.5)));
}

/** Sampled tensors: `entries` (xx, xy, yy per element) and `scale` (largest eigenvalue per element). */
export interface SampledTensors {
  entries: Float64Array;
  scale: Float64Array;
}

function refuse(field: string, message: string, received: unknown): never {
  throw new InvalidMeshError(`${field} ${message}`, { field, expected: '{ xx, xy, yy } with xx > 0 and xx·yy − xy² > 0, all finite', received: describeValue(received) });
}

/** Checks one tensor (finite, symmetric positive definite) and writes it at entries[3e…]. */
function put(t: unknown, e: number, field: string, out: Float64Array): void {
  if (t === null || typeof t !== 'object') refuse(field, `must be an object { xx, xy, yy }, received ${describeValue(t)}`, t);
  const k = t as Partial<Record<'xx' | 'xy' | 'yy', unknown>>;
  for (const name of ['xx', 'xy', 'yy'] as const) {
    const v = k[name];
    if (typeof v !== 'number' || !Number.isFinite(v)) refuse(`${field}.${name}`, `must be a finite number, received ${describeValue(v)}`, v);
  }
  for (const name of Object.keys(k)) {
    if (name !== 'xx' && name !== 'xy' && name !== 'yy') refuse(field, `has an unknown entry '${name}' (the entries are xx, xy, yy)`, t);
  }
  const xx = k.xx as number, xy = k.xy as number, yy = k.yy as number;
  // Positive definite: xx > 0 and det > 0; the relative bound keeps a tensor whose determinant is
  // lost to rounding (an eigenvalue ratio beyond ≈ 10¹²) out as well.
  const det = xx * yy - xy * xy;
  if (!(xx > 0) || !(det > 1e-12 * largestEigenvalue(xx, xy, yy) ** 2)) {
    refuse(field, `must be symmetric positive definite (xx > 0 and xx·yy − xy² > 0), received xx = ${xx}, xy = ${xy}, yy = ${yy} on initial element ${e}`, t);
  }
  out[3 * e] = xx;
  out[3 * e + 1] = xy;
  out[3 * e + 2] = yy;
}

/** Samples a tensor coefficient per initial element (centroids for functions) and validates it. */
export function sampleDiffusionTensor(value: TensorCoefficient, centroids: Float64Array): SampledTensors {
  const ne = centroids.length / 2;
  const entries = new Float64Array(3 * ne);
  if (typeof value === 'function') {
    for (let e = 0; e < ne; e++) {
      const x = centroids[2 * e]!, y = centroids[2 * e + 1]!;
      put(value(x, y), e, `diffusionTensor(${x}, ${y}) at the centroid of initial element ${e}`, entries);
    }
  } else if (value !== null && typeof value === 'object' && typeof (value as ArrayLike<DiffusionTensor>).length === 'number') {
    const list = value as ArrayLike<DiffusionTensor>;
    if (list.length !== ne) {
      throw new InvalidArgumentError(`diffusionTensor must have one tensor per initial element (${ne}), received ${list.length}`, {
        field: 'diffusionTensor', expected: `${ne} tensors`, received: list.length,
      });
    }
    for (let e = 0; e < ne; e++) put(list[e], e, `diffusionTensor[${e}]`, entries);
  } else {
    put(value, 0, 'diffusionTensor', entries);
    for (let e = 1; e < ne; e++) entries.copyWithin(3 * e, 0, 3);
  }
  const scale = new Float64Array(ne);
  for (let e = 0; e < ne; e++) scale[e] = largestEigenvalue(entries[3 * e]!, entries[3 * e + 1]!, entries[3 * e + 2]!);
  return { entries, scale };
}

/**
 * g_iᵀ K g_j for g_i = (bi, ci), g_j = (bj, cj) and K the tensor at tensor[3m…]; with a null
 * `tensor` (isotropic domain) the plain g_i·g_j, which the caller scales by κ.
 */
export function gradProduct(tensor: Float64Array | null, m: number, bi: number, ci: number, bj: number, cj: number): number {
  if (tensor === null) return bi * bj + ci * cj;
  const xx = tensor[3 * m]!, xy = tensor[3 * m + 1]!, yy = tensor[3 * m + 2]!;
  return xx * bi * bj + xy * (bi * cj + ci * bj) + yy * ci * cj;
}
