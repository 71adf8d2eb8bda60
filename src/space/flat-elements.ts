/**
 * Initial elements too flat for the adaptive loop (docs/adaptivity.md §2.6).
 *
 * Newest-vertex bisection never improves a triangle's shape: the descendants of an initial element
 * fall into finitely many similarity classes, as flat as the element itself. What matters is the
 * shape the diffusion sees, the element mapped by K^{−1/2} (K = κI for a scalar κ), measured by the
 * mapped anisotropy A (./diffusion-tensor.ts: 1 equilateral, 3 right isosceles, 3/w² for the right
 * triangle with legs 1 and w under a scalar κ). On flat elements
 * - the point smoother of the V-cycles loses its grip (up to A = 8·16 more cycles make up for it,
 *   docs/method.md §4.4; beyond, PCG needs hundreds of iterations or does not converge), and
 * - the estimator under-reads: its indicators scale each candidate by its own norm, and on flat
 *   elements the hats have steep slopes across the thin direction, which a solution smooth across
 *   it never needs, so E sees a fraction of the error. Measured on the strip (0, 1) × (0, w) in
 *   one cell, held at 0 at x = 0 and 1, insulated along y, u0 ≡ 1, T = 0.5, against the slab
 *   series (Carslaw & Jaeger §3.3), with ⌈A/8⌉ cycles: err/E 1.08–1.91 (w = 1, A = 3), 1.55–2.94
 *   (w = 1/4, A = 48), 2.7–5.6 (w = 1/10, A = 300); with the single cycle of before, 9–12 and no
 *   convergence (w = 1/20, A = 1 200), 4–8 and no convergence (w = 1/50, A = 7 500); the same
 *   strip in 50 cells (A = 3): 1.15–1.16.
 *
 * The loop refuses by the flatness of the bulk of the mesh (MeshFlatness.bulk: the area
 * median over isotropic elements, the largest over anisotropic materials). A few slivers in a mesh
 * of fat elements did not hurt the estimator: on the unit square with two slivers of A ≈ 7 500 on
 * 1 % of the area, or thin triangles (A ≈ 200) on 10 % of it, err/E stayed 1.64–1.97 and
 * 1.15–1.91 (the V-cycles then run 2 cycles, innerCycles below).
 */
import type { SpatialDomain } from './domain';
import { cyclesForAnisotropy } from './diffusion-tensor';

/** Largest mapped anisotropy the adaptive loop accepts by default: where the inner cycles stop growing (8 · 16). */
export const FLAT_ELEMENT_LIMIT = 128;

/** How flat the initial mesh is, for the refusal and the messages (null in 1D). @internal */
export interface MeshFlatness {
  /**
   * How flat the bulk of the mesh is, as the estimator is concerned: over the isotropic initial
   * elements the area median of their mapped anisotropy, over anisotropic materials the largest
   * (as SpatialDomain.mappedAnisotropy).
   */
  bulk: number;
  /** Index of the flattest initial element. */
  element: number;
  /** Its mapped anisotropy (the largest over its bisection descendants). */
  anisotropy: number;
  /** Its vertex coordinates. */
  vertices: [number, number][];
  /** Number of initial elements with mapped anisotropy above FLAT_ELEMENT_LIMIT. */
  flatCount: number;
  /** Their share of the domain's area, in [0, 1]. */
  flatShare: number;
}

/** The flatness of the initial mesh of `domain`, in one pass over its elements (null in 1D). @internal */
export function meshFlatness(domain: SpatialDomain): MeshFlatness | null {
  const f = domain.forest;
  const a = f.initialMappedAnisotropy();
  if (a.length === 0) return null;
  let worst = 0;
  let flatCount = 0;
  let flatArea = 0;
  let total = 0;
  let isoArea = 0;
  let bulk = 1;
  const iso: number[] = [];
  for (let e = 0; e < a.length; e++) {
    const area = Math.abs(f.initialMeasure[e]!);
    total += area;
    if (a[e]! > FLAT_ELEMENT_LIMIT) {
      flatCount++;
      flatArea += area;
    }
    if (a[e]! > a[worst]!) worst = e;
    if (f.isAnisotropicElement(e)) bulk = Math.max(bulk, a[e]!);
    else {
      iso.push(e);
      isoArea += area;
    }
  }
  // over the isotropic elements, the smallest value such that those at or below it cover half their area
  iso.sort((p, q) => a[p]! - a[q]!);
  let acc = 0;
  for (const e of iso) {
    acc += Math.abs(f.initialMeasure[e]!);
    if (acc >= 0.5 * isoArea) {
      bulk = Math.max(bulk, a[e]!);
      break;
    }
  }
  const vertices: [number, number][] = [];
  for (let k = 0; k < 3; k++) {
    const v = f.eVert[3 * worst + k]!;
    vertices.push([f.vCoord[2 * v]!, f.vCoord[2 * v + 1]!]);
  }
  return { bulk, element: worst, anisotropy: a[worst]!, vertices, flatCount, flatShare: flatArea / total };
}

/**
 * V-cycles per application of the spatial inner solvers on `domain` (docs/adaptivity.md §2.6): ⌈A/8⌉
 * (1 … 16, cyclesForAnisotropy) for the flatness of the bulk of the mesh (MeshFlatness.bulk), and 2
 * where only a few elements are flatter than that. More cycles pay where the point smoother fails
 * everywhere (a flat bulk, an anisotropic K); where it fails on a few elements only, PCG absorbs the
 * few slow modes they make, and 16 cycles on every fibre cost far more than the iterations they
 * save. Measured on runs to about 10⁵ unknowns (u0 ≡ 1 held at 0, T = 0.5; one cycle / two / the
 * former ⌈A/8⌉ of the flattest element): the unit square with two slivers (A = 7 502) 17.7 / 18.9 /
 * 63.2 s with at most 216 / 28 / 15 PCG iterations per step; with thin triangles on 10 % of the area
 * (A = 203) 16.3 / 18.1 / 50.0 s with at most 11 / 11 / 10; an 8 × 8 grid with one vertex pulled
 * to 5 % of a cell from a row (A = 4 345) 12.4 / 14.8 / 49.2 s with at most 50 / 28 / 16. The error
 * per unknown was alike. @internal
 */
export function innerCycles(domain: SpatialDomain): number {
  const worst = cyclesForAnisotropy(domain.mappedAnisotropy);
  const flat = meshFlatness(domain);
  if (flat === null) return worst;
  const bulk = cyclesForAnisotropy(flat.bulk);
  return worst > bulk ? Math.max(bulk, 2) : bulk;
}
