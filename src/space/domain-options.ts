/** Options shared by all spatial domain constructors (docs/method.md §1, §4.1). */
import type { BoundaryPart } from './boundary';

/**
 * A coefficient given as one constant, one value per initial element, or a function sampled at
 * the centroids of the initial elements.
 *
 * @example
 * ```ts
 * import { rectangleDomain } from 'chronomesh';
 * const layered = rectangleDomain(0, 2, 0, 1, 2, 1, { kappa: (x) => (x < 1 ? 1 : 10) });
 * ```
 */
export type Coefficient = number | ArrayLike<number> | ((x: number, y: number) => number);

/**
 * A symmetric positive definite 2 × 2 diffusion tensor K = [[xx, xy], [xy, yy]] per initial
 * element: one tensor for all, one per initial element, or a function sampled at the centroids.
 * Each must have xx > 0 and xx·yy − xy² > 0.
 *
 * @example
 * ```ts
 * import { rectangleDomain } from 'chronomesh';
 * // fibres at 30° to the x axis conduct 20 times better along than across
 * const c = Math.cos(Math.PI / 6), s = Math.sin(Math.PI / 6), along = 2, across = 0.1;
 * const dom = rectangleDomain(0, 1, 0, 1, 2, 2, {
 *   diffusionTensor: { xx: along * c * c + across * s * s, xy: (along - across) * c * s, yy: along * s * s + across * c * c },
 * });
 * console.log(dom.anisotropic); // → true
 * ```
 */
export type TensorCoefficient = DiffusionTensor | ArrayLike<DiffusionTensor> | ((x: number, y: number) => DiffusionTensor);

/**
 * Entries of a symmetric diffusion tensor K = [[xx, xy], [xy, yy]].
 *
 * @example
 * ```ts
 * import type { DiffusionTensor } from 'chronomesh';
 * const orthotropic: DiffusionTensor = { xx: 5, xy: 0, yy: 0.5 }; // five times κ = 1 along x, half across
 * console.log(orthotropic.xx / orthotropic.yy); // → 10
 * ```
 */
export interface DiffusionTensor {
  readonly xx: number;
  readonly xy: number;
  readonly yy: number;
}

/**
 * Coefficients and boundary description of a spatial domain.
 *
 * κ and c are constant on each element of the initial mesh (sampled at its centroid when a
 * function is given), so material interfaces must lie on initial-mesh edges.
 *
 * @example
 * ```ts
 * import { lShapeDomain } from 'chronomesh';
 * // insulated top edge y = 1, Dirichlet elsewhere, with a reaction term
 * const dom = lShapeDomain(2, { kappa: 0.5, reaction: 1, insulated: (_mx, my) => my > 0.999 });
 * ```
 */
export interface DomainOptions {
  /** Diffusion coefficient κ > 0 (default 1). */
  kappa?: Coefficient;
  /**
   * Anisotropic diffusion (d = 2 only, instead of `kappa`): the equation becomes
   * ∂t u − ∇·(K∇u) + c u = f, and flux and convection parts prescribe the conormal flux n·K∇u.
   * Constant on each initial element like κ. The multigrid inner solvers lose efficiency as the
   * ratio of K's eigenvalues grows (docs/method.md §4.4 gives measured PCG iterations).
   */
  diffusionTensor?: TensorCoefficient;
  /** Reaction coefficient c ≥ 0 (default 0). */
  reaction?: Coefficient;
  /**
   * Insulated (zero-flux) part of the boundary; all other boundary is Dirichlet u = 0.
   * Either a predicate on the midpoint of each boundary edge (in 1D on the endpoint, with y = 0),
   * or a list of boundary edges `[i, j]` by initial vertex index (in 1D: `[i]` with i = 0 or `cells`).
   */
  insulated?: ((mx: number, my: number) => boolean) | number[][];
  /**
   * Boundary parts with prescribed value, flux or convection (see {@link BoundaryPart}), applied in
   * order after `insulated`; a later part overrides an earlier one on the edges both select.
   */
  boundary?: BoundaryPart[];
}
