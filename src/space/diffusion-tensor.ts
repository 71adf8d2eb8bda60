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
 * strength of the anisotropy, reported to users (the V-cycles go by {@link mappedAnisotropy},
 * which also depends on the element shapes).
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
 * Anisotropy of the triangle (0, 0), (x1, y1), (x2, y2) as a V-cycle sees it under the tensor
 * (xx, xy, yy): the stiffness with K on a triangle T is the isotropic stiffness on the mapped
 * triangle K^{−1/2}T, so what matters is the shape of the mapped triangle. Its *metric* M′ — the
 * symmetric matrix in which all three edges have length 1, so that M′ = I for an equilateral
 * triangle — is K^{1/2} M K^{1/2} with M the metric of T, and the anisotropy returned is the
 * condition number of M′, i.e. the ratio of the eigenvalues of M K (common practice in anisotropic
 * mesh adaptation). An equilateral mapped triangle gives 1, a right isosceles one 3.
 */
export function mappedAnisotropy(x1: number, y1: number, x2: number, y2: number, xx: number, xy: number, yy: number): number {
  // M from eᵀ M e = 1 for the edges e = p1, p2 − p1, −p2: m11 ex² + 2 m12 ex ey + m22 ey² = 1 (Cramer)
  const ex = [x1, x2 - x1, -x2], ey = [y1, y2 - y1, -y2];
  const row = (k: number): [number, number, number] => [ex[k]! * ex[k]!, 2 * ex[k]! * ey[k]!, ey[k]! * ey[k]!];
  const A = [row(0), row(1), row(2)];
  const det3 = (m: number[][]): number =>
    m[0]![0]! * (m[1]![1]! * m[2]![2]! - m[1]![2]! * m[2]![1]!) - m[0]![1]! * (m[1]![0]! * m[2]![2]! - m[1]![2]! * m[2]![0]!) + m[0]![2]! * (m[1]![0]! * m[2]![1]! - m[1]![1]! * m[2]![0]!);
  const D = det3(A);
  const [m11, m12, m22] = [0, 1, 2].map((k) => det3(A.map((r) => r.map((v, j) => (j === k ? 1 : v)))) / D) as [number, number, number];
  // eigenvalues of M K (similar to the SPD K^{1/2} M K^{1/2}) from its trace and determinant
  const tr = m11 * xx + 2 * m12 * xy + m22 * yy;
  const det = (m11 * m22 - m12 * m12) * (xx * yy - xy * xy);
  const disc = Math.sqrt(Math.max(0, 0.25 * tr * tr - det));
  return (0.5 * tr + disc) / Math.max(0.5 * tr - disc, 1e-300);
}

/**
 * V-cycles per application of the spatial inner solvers for a mapped anisotropy A of the mesh's
 * element classes ({@link mappedAnisotropy}, over every shape bisection produces): ⌈A/8⌉, between
 * 1 and 16, applied to the bulk of the mesh (innerCycles in ./flat-elements). A V-cycle with
 * point Gauss–Seidel smoothing works on the stiffness as
 * on the mapped elements, and it slows down as they flatten (common practice); PCG on the
 * space-time system then needs more iterations, while with exact inner solves the count does not
 * depend on the anisotropy (docs/method.md §4.4). Measured (sparse grid of level 4 on the unit
 * square, u0 ≡ 1, PCG iterations to 10⁻⁸ with 1 / 4 / 16 cycles): A = 3 (2 × 20 cells,
 * K = diag(1, 0.01)): 31 / 20 / 20; A = 30 (2 × 2, diag(1, 0.1)): 162 / 37 / 20; A = 120 (4 × 2,
 * diag(1, 0.1)): 972 / 162 / 37; A = 300 (2 × 2, diag(1, 0.01)): 892 / 196 / 55; A = 2026 (2 × 20,
 * eigenvalues 1 and 0.01 at 30°): 2298 / 388 / 79. Among 1, 2, 4, 8 and 16 cycles the time per
 * solve was least near A/8 cycles where that is below 16. A scalar κ counts the element shapes as they are
 * (K = I): right isosceles elements take one cycle, flat ones more (docs/adaptivity.md §2.6).
 */
export function cyclesForAnisotropy(A: number): number {
  return Math.min(16, Math.max(1, Math.ceil(A / 8)));
}

/**
 * Whether [[xx, xy], [xy, yy]] is positive definite: xx > 0 and xx·yy − xy² > 0, the latter relative
 * to λ_max², which also keeps out a tensor whose determinant is lost to rounding (an eigenvalue ratio
 * beyond ≈ 10¹²).
 */
export function positiveDefinite(xx: number, xy: number, yy: number): boolean {
  return xx > 0 && xx * yy - xy * xy > 1e-12 * largestEigenvalue(xx, xy, yy) ** 2;
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
  if (!positiveDefinite(xx, xy, yy)) {
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
