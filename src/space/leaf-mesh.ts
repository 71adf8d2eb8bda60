import type { BoundarySegments } from './boundary-segments';

/**
 * The leaf mesh of a closed vertex set (docs/method.md §4.1–4.2) in local numbering.
 *
 * This is the data structure shared by the spatial operators, loads and the
 * multilevel preconditioner. Local vertex order is by (generation, global id):
 * initial vertices come first and every vertex comes after its interpolation
 * parents, so the hierarchical transform is one forward sweep.
 */
export interface LeafMesh {
  readonly dim: 1 | 2;
  /** Number of local vertices (all vertices of the leaf mesh, free and Dirichlet). */
  readonly vertexCount: number;
  /** Global (forest) vertex id of each local vertex. */
  readonly globalId: Int32Array;
  /** Coordinates, `dim` numbers per local vertex. */
  readonly coords: Float64Array;
  /** Generation of each local vertex (0 for initial vertices). */
  readonly generation: Int32Array;
  /** Local index of interpolation parent a (−1 for initial vertices). */
  readonly parentA: Int32Array;
  /** Local index of interpolation parent b (−1 for initial vertices). */
  readonly parentB: Int32Array;
  /** 1 if the vertex carries an unknown, 0 if it lies on the Dirichlet boundary. */
  readonly isFree: Uint8Array;
  readonly elementCount: number;
  /** `dim + 1` local vertex indices per leaf element (counter-clockwise in 2D). */
  readonly elements: Int32Array;
  /** Initial (coarse) element each leaf element descends from; indexes `kappa` and `reaction`. */
  readonly elementMaterial: Int32Array;
  /** Diffusion coefficient κ per initial element (for an anisotropic one, the largest eigenvalue of its tensor). */
  readonly kappa: Float64Array;
  /**
   * Diffusion tensors K (xx, xy, yy per initial element, 2D) of an anisotropic domain; when present,
   * the stiffness uses K instead of κ.
   */
  readonly kappaTensor?: Float64Array;
  /** Reaction coefficient c per initial element. */
  readonly reaction: Float64Array;
  /** @internal Leaf-element edges on flux / convection parts of the boundary (absent if the domain has none). */
  readonly boundarySegments?: BoundarySegments;
}
