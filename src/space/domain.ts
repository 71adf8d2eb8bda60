/**
 * SpatialDomain: the validated initial mesh, coefficients, boundary and the one global
 * newest-vertex-bisection forest of a problem (docs/method.md §4.1), with its vertex queries. The
 * operations live in their own files: closure and validation of vertex sets (./vertex-closure.ts),
 * refinement strategies (./refinement.ts), leaf-mesh extraction (./leaf-mesh-extraction.ts) and
 * point location (./point-location.ts); they share the scratch of one VertexClosure.
 */
import { anisotropyRatio } from './diffusion-tensor';
import { InvalidArgumentError, describeValue } from '../errors';
import { BisectionForest } from './forest';
import type { InitialMesh } from './initial-mesh';
import type { LeafMesh } from './leaf-mesh';
import { extractLeafMesh } from './leaf-mesh-extraction';
import { LeafLocator } from './point-location';
import { adaptedSet, refineAll, refineInterior, refineTowards, uniformSet } from './refinement';
import { VertexClosure } from './vertex-closure';
import type { BoundaryPart } from './boundary';

/**
 * A spatial domain Ω with its lazily grown bisection forest. Build one with
 * {@link intervalDomain}, {@link triangulatedDomain}, {@link rectangleDomain}, {@link lShapeDomain}
 * or {@link squareWithHoleDomain}.
 *
 * Vertex sets passed to the methods are sorted `Int32Array`s of free vertex ids that are closed
 * under godparents (see {@link SpatialDomain.close}); the leaf mesh of such a set is the conforming
 * bisection mesh whose vertices are the set plus the Dirichlet vertices and initial vertices it needs.
 *
 * @example
 * ```ts
 * import { rectangleDomain } from 'chronomesh';
 * const dom = rectangleDomain(0, 1, 0, 1, 2, 2);
 * const set = dom.uniformSet(2);
 * console.log(set.length, dom.leafMesh(set).elementCount); // → 49 112 — Dirichlet midpoints only where needed
 * ```
 */
export class SpatialDomain {
  readonly dim: 1 | 2;
  /** Number of clockwise input triangles that were reoriented counter-clockwise. */
  readonly reorientedTriangles: number;
  /** @internal */
  readonly forest: BisectionForest;
  private readonly closure: VertexClosure;
  private readonly locator: LeafLocator;

  /** @internal Use the domain constructors instead. */
  constructor(init: InitialMesh) {
    this.dim = init.dim;
    this.reorientedTriangles = init.reoriented;
    this.forest = new BisectionForest(init);
    this.closure = new VertexClosure(this.forest);
    this.locator = new LeafLocator(this.closure);
  }

  /** The boundary parts this domain was built with (value, flux, convection; see {@link BoundaryPart}). */
  get boundaryParts(): readonly BoundaryPart[] {
    return this.forest.boundary.parts.map((p) => p.spec);
  }

  /** Whether the domain was given a diffusion tensor (`diffusionTensor`) instead of a scalar κ. */
  get anisotropic(): boolean {
    return this.forest.kappaTensor !== null;
  }

  /**
   * Largest ratio of the eigenvalues of the diffusion tensors (1 for a scalar κ). How many V-cycles
   * the spatial inner solvers run depends on it through {@link SpatialDomain.mappedAnisotropy}, which
   * also counts the element shapes (docs/method.md §4.4).
   */
  get anisotropyRatio(): number {
    return (this.anisotropy ??= anisotropyRatio(this.forest.kappaTensor));
  }
  private anisotropy: number | undefined;

  /**
   * How flat the elements look to the spatial V-cycles: the largest condition number of the metric
   * of an element mapped by K^{−1/2} (K = I for a scalar κ), over all element shapes bisection
   * produces (1 for an equilateral mapped element, 3 for a right isosceles one, 3/w² for the right
   * triangle with legs 1 and w). The inner solvers run ⌈A/8⌉ V-cycles, at most 16 (docs/method.md
   * §4.4); `solveAdaptive` refuses meshes whose bulk is flatter than A = 128 unless told
   * (docs/adaptivity.md §2.6). A mesh whose elements are
   * stretched along the strong direction of K by about √r has a small A; on the rectangle
   * generator's right triangles A is about three times the eigenvalue ratio r.
   *
   * @example
   * ```ts
   * import { rectangleDomain } from 'chronomesh';
   * const K = { xx: 1, xy: 0, yy: 0.01 }; // ratio 100
   * console.log(rectangleDomain(0, 1, 0, 1, 2, 2, { diffusionTensor: K }).mappedAnisotropy.toFixed(0)); // → 300
   * console.log(rectangleDomain(0, 1, 0, 1, 2, 20, { diffusionTensor: K }).mappedAnisotropy.toFixed(0)); // → 3
   * ```
   */
  get mappedAnisotropy(): number {
    return (this.mapped ??= this.forest.mappedAnisotropy());
  }
  private mapped: number | undefined;


  /** Vertices created so far (grows as the forest is refined). */
  get vertexCount(): number {
    return this.forest.vertexCount;
  }
  /** Number of initial vertices (ids 0 … initialVertexCount − 1). */
  get initialVertexCount(): number {
    return this.forest.initialVertexCount;
  }
  /** Number of initial elements. */
  get initialElementCount(): number {
    return this.forest.initialElementCount;
  }

  private checkVertex(v: number, field = 'v'): void {
    if (!Number.isInteger(v) || v < 0 || v >= this.forest.vertexCount) {
      throw new InvalidArgumentError(`${field} = ${describeValue(v)} is not a vertex id (valid: 0…${this.forest.vertexCount - 1})`, {
        field,
        expected: `integer in [0, ${this.forest.vertexCount - 1}]`,
        received: v,
      });
    }
  }

  /** False for vertices on the Dirichlet boundary (they carry no unknown). */
  isFree(v: number): boolean {
    this.checkVertex(v);
    return this.forest.vFree[v] === 1;
  }
  /** Generation of a vertex: 0 for initial vertices, else 1 + the generation of the elements bisected at it. */
  generation(v: number): number {
    this.checkVertex(v);
    return this.forest.vGen[v]!;
  }
  /** Spatial level ⌈generation / dim⌉ (h halves per level). */
  level(v: number): number {
    this.checkVertex(v);
    return Math.ceil(this.forest.vGen[v]! / this.dim);
  }
  /** Writes the 0–2 godparents of `v` into `out` and returns their number. */
  godparents(v: number, out: Int32Array): number {
    this.checkVertex(v);
    let k = 0;
    const g0 = this.forest.vGod0[v]!, g1 = this.forest.vGod1[v]!;
    if (g0 >= 0) out[k++] = g0;
    if (g1 >= 0) out[k++] = g1;
    return k;
  }
  /** Writes the interpolation parents (endpoints of the bisected edge) into `out`; returns 0 for initial vertices, else 2. */
  interpolationParents(v: number, out: Int32Array): number {
    this.checkVertex(v);
    const a = this.forest.vParentA[v]!;
    if (a < 0) return 0;
    out[0] = a;
    out[1] = this.forest.vParentB[v]!;
    return 2;
  }
  /** Coordinate `axis` (0 = x, 1 = y) of vertex `v`. */
  coordinate(v: number, axis: number): number {
    this.checkVertex(v);
    if (axis !== 0 && !(axis === 1 && this.dim === 2)) {
      throw new InvalidArgumentError(`axis must be 0${this.dim === 2 ? ' or 1' : ''}, received ${describeValue(axis)}`, {
        field: 'axis',
        expected: this.dim === 2 ? '0 or 1' : '0',
        received: axis,
      });
    }
    return this.forest.vCoord[v * this.dim + axis]!;
  }
  /** Vertices of initial element `e` (dim + 1 ids; counter-clockwise in 2D, refinement edge first). */
  initialElement(e: number, out: Int32Array): Int32Array {
    if (!Number.isInteger(e) || e < 0 || e >= this.forest.initialElementCount) {
      throw new InvalidArgumentError(`e = ${describeValue(e)} is not an initial element`, {
        field: 'e',
        expected: `integer in [0, ${this.forest.initialElementCount - 1}]`,
        received: e,
      });
    }
    const nv = this.forest.nv;
    for (let k = 0; k < nv; k++) out[k] = this.forest.eVert[e * nv + k]!;
    return out;
  }
  /** Sorted free initial vertices. */
  initialFreeVertices(): Int32Array {
    const f = this.forest;
    const out: number[] = [];
    for (let v = 0; v < f.initialVertexCount; v++) if (f.vFree[v]) out.push(v);
    return Int32Array.from(out);
  }

  // ---------------------------------------------------------------- closure

  /**
   * Smallest closed free vertex set containing `ids`: adds godparents recursively (through
   * Dirichlet vertices too) and all free initial vertices, then drops Dirichlet vertices.
   */
  close(ids: ArrayLike<number>): Int32Array {
    return this.closure.close(ids);
  }

  /** @internal Validates that `set` is a sorted closed set of free vertex ids, naming `field`. */
  checkSet(set: Int32Array, field: string): void {
    this.closure.unmark(this.closure.markSet(set, field));
  }

  // ---------------------------------------------------------------- refinement

  /** All free vertices with level(v) ≤ `level` (creating them in the forest). */
  uniformSet(level: number): Int32Array {
    return uniformSet(this.closure, level);
  }

  /**
   * Free vertices created by one bisection of every leaf element of the leaf mesh of `set`
   * (sorted; only ids not already in `set`). `set` ∪ result is closed.
   */
  refineAll(set: Int32Array): Int32Array {
    return refineAll(this.closure, set);
  }

  /**
   * Free vertices of the *interior refinement* of the leaf mesh of `set` (sorted; only ids not
   * already in `set`; `set` ∪ result is closed). Every leaf element is bisected `generations` times
   * in a row (all its descendants down to that depth) — `generations = dim` halves the mesh size —
   * and, where that created no free vertex inside the leaf (all new midpoints on the Dirichlet
   * boundary), up to `extra` further generations until one appears. This is the spatial part of the
   * enlarged index set of the adaptive loop: one plain bisection of a leaf whose refinement edge lies
   * on the Dirichlet boundary adds only a Dirichlet midpoint, which carries no unknown, so without
   * the extra generations a coarse mesh can hide all spatial refinement from the estimator
   * (docs/adaptivity.md §2).
   */
  refineInterior(set: Int32Array, generations: number, extra = 4): Int32Array {
    return refineInterior(this.closure, set, generations, extra);
  }

  /**
   * Closed set containing `set`, refined `generations` more times toward a target: every leaf
   * element meeting the target is bisected, `generations` times in a row. The target is a point
   * (`[x]` in 1D, `[x, y]` in 2D) or a segment (`[x0, y0, x1, y1]`, e.g. a boundary edge).
   */
  refineTowards(set: Int32Array, point: number[], generations: number): Int32Array {
    return refineTowards(this.closure, set, point, generations);
  }

  /**
   * Closed set of the bisection mesh that bisects every element whose diameter exceeds
   * `meshSize` at its centroid, down to at most `maxGeneration` element generations (then closed
   * for conformity). Handy for graded meshes, e.g. `meshSize = (x, y) => H * Math.hypot(x, y) ** (2 / 3)`.
   */
  adaptedSet(meshSize: (x: number, y: number) => number, maxGeneration: number): Int32Array {
    return adaptedSet(this.closure, meshSize, maxGeneration);
  }

  /**
   * The vertex-closure machinery of this domain, for the free functions that refine its forest
   * where data need it (./data-resolution.ts, ./boundary-data-resolution.ts): kept out of the class
   * so that a bundle without the adaptive loop does not carry them. @internal
   */
  vertexClosure(): VertexClosure {
    return this.closure;
  }

  // ---------------------------------------------------------------- leaf mesh

  /**
   * The leaf mesh of the closure of `set` in local numbering (order: generation, then id), with
   * `forestElement` giving the forest element of each leaf and `memberLocal` the local index of
   * each member of `set` (in the order of `set`).
   */
  leafMesh(set: Int32Array, field = 'set'): LeafMesh & { readonly forestElement: Int32Array; readonly memberLocal: Int32Array } {
    return extractLeafMesh(this.closure, set, field);
  }

  // ---------------------------------------------------------------- point location

  /**
   * Starts a point-location query on a leaf mesh: marks its vertices and fills the local index
   * map. Must be followed by {@link SpatialDomain.endMeshQuery} with the same mesh.
   * @internal
   */
  beginMeshQuery(mesh: LeafMesh): Int32Array {
    return this.locator.beginMeshQuery(mesh);
  }
  /** @internal */
  endMeshQuery(mesh: LeafMesh): void {
    this.locator.endMeshQuery(mesh);
  }

  /**
   * Forest leaf element of the mesh opened by {@link SpatialDomain.beginMeshQuery} containing the
   * point, found by locating the initial element (bucket grid) and descending the forest.
   * Returns −1 outside the domain.
   * @internal
   */
  locateLeaf(x: number, y: number): number {
    return this.locator.locateLeaf(x, y);
  }
}
