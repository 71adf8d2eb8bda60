/** Options shared by all spatial domain constructors (DESIGN.md §1, §4.1). */

/** A coefficient given as one constant, one value per initial element, or a function sampled at element centroids. */
export type Coefficient = number | ArrayLike<number> | ((x: number, y: number) => number);

/**
 * Coefficients and boundary description of a spatial domain.
 *
 * κ and c are constant on each element of the initial mesh (sampled at its centroid when a
 * function is given), so material interfaces must lie on initial-mesh edges.
 */
export interface DomainOptions {
  /** Diffusion coefficient κ > 0 (default 1). */
  kappa?: Coefficient;
  /** Reaction coefficient c ≥ 0 (default 0). */
  reaction?: Coefficient;
  /**
   * Insulated (zero-flux) part of the boundary; all other boundary is Dirichlet u = 0.
   * Either a predicate on the midpoint of each boundary edge (in 1D on the endpoint, with y = 0),
   * or a list of boundary edges `[i, j]` by initial vertex index (in 1D: `[i]` with i = 0 or `cells`).
   */
  insulated?: ((mx: number, my: number) => boolean) | number[][];
}
