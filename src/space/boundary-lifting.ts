/**
 * Lifting of prescribed boundary values (./boundary): the space-time function
 *
 *   G(t, x) = Σ_d g_d(t) φ⁰_d(x),   g_d(t) = g(t, x_d),
 *
 * summed over the initial-mesh vertices d on value parts, with φ⁰_d the P1 hat of d on the
 * initial mesh. G is continuous, piecewise linear on the initial mesh in x and exact in t; it
 * equals g at the initial vertices of value parts and interpolates g linearly along each initial
 * boundary edge (exact for data affine along the initial edges). It is zero on the zero-value
 * part, so u = w + G with w vanishing on all held parts, and w solves the same heat equation with
 *   source        f − ∂t G + ∇·(κ∇G) − c G   (weakly: ℓ(v) − ⟨∂t G, v⟩ − a(G, v)),
 *   initial state u0 − G(0, ·),
 * i.e. the usual lifting of non-homogeneous Dirichlet data (common practice; with interpolated
 * data as in S. Bartels, C. Carstensen, G. Dolzmann, Numer. Math. 99 (2004), from memory).
 * G(0) ≠ u0 on the held part is allowed: the mismatch becomes incompatible initial data of w,
 * which the space-time residual and the adaptive loop see like any other.
 *
 * Because φ⁰_d is the hierarchical hat of the initial vertex d, G(t, ·) has the hierarchical
 * coefficients g_d(t) at the initial vertices d and 0 elsewhere on every leaf mesh, and the
 * initial vertices have local index = global id in every leaf mesh (./leaf-mesh order).
 */
import type { BisectionForest } from './forest';
import { hierarchicalToNodal } from './hierarchical';
import { InitialLocator } from './initial-locator';
import { heldValuesOf, type HeldValues } from './held-values';
import type { LeafMesh } from './leaf-mesh';

export class BoundaryLifting {
  /** Initial vertices carrying a prescribed value with data (sorted). */
  readonly vertices: Int32Array;
  private readonly held: HeldValues;
  private readonly forest: BisectionForest;
  private locator: InitialLocator | null = null;
  private readonly scratch: Float64Array;
  private readonly bary = new Float64Array(3);

  constructor(forest: BisectionForest) {
    this.forest = forest;
    this.held = heldValuesOf(forest);
    this.vertices = this.held.vertices;
    this.scratch = new Float64Array(this.vertices.length);
  }

  /** True when G ≡ 0 (no value part with non-zero data). */
  get isZero(): boolean {
    return this.vertices.length === 0;
  }

  /** g_d(t) for every lifting vertex, into `out` (length = vertices.length); checks finiteness. */
  values(t: number, out: Float64Array): Float64Array {
    return this.held.values(t, out);
  }

  /** values[i] += G(t, x_i) for the nodal vector of a leaf mesh (length vertexCount). */
  addNodal(mesh: LeafMesh, t: number, values: Float64Array): void {
    if (this.isZero) return;
    const g = this.values(t, this.scratch);
    const z = new Float64Array(mesh.vertexCount);
    for (let i = 0; i < this.vertices.length; i++) z[this.vertices[i]!] = g[i]!;
    hierarchicalToNodal(mesh, z);
    for (let i = 0; i < mesh.vertexCount; i++) values[i] = values[i]! + z[i]!;
  }

  /**
   * out[k] += G(t, p_k) at points (dim numbers each); points outside the initial mesh are skipped.
   */
  addAtPoints(t: number, points: ArrayLike<number>, out: Float64Array): void {
    if (this.isZero) return;
    const f = this.forest, d = f.dim, nv = f.nv;
    if (this.locator === null) this.locator = new InitialLocator(f);
    const g = this.values(t, this.scratch);
    // value of G at each initial vertex (0 off the lifting vertices)
    const at = new Float64Array(f.initialVertexCount);
    for (let i = 0; i < this.vertices.length; i++) at[this.vertices[i]!] = g[i]!;
    const n = points.length / d;
    const b = this.bary;
    for (let k = 0; k < n; k++) {
      const x = points[d * k]!, y = d === 2 ? points[d * k + 1]! : 0;
      const e = this.locator.find(x, y);
      if (e < 0) continue;
      if (d === 1) {
        const a = f.eVert[2 * e]!, c = f.eVert[2 * e + 1]!;
        const xa = f.vCoord[a]!, xc = f.vCoord[c]!;
        const s = (x - xa) / (xc - xa);
        out[k] = out[k]! + (1 - s) * at[a]! + s * at[c]!;
        continue;
      }
      const i0 = f.eVert[nv * e]!, i1 = f.eVert[nv * e + 1]!, i2 = f.eVert[nv * e + 2]!;
      const x0 = f.vCoord[2 * i0]!, y0 = f.vCoord[2 * i0 + 1]!;
      const x1 = f.vCoord[2 * i1]! - x0, y1 = f.vCoord[2 * i1 + 1]! - y0;
      const x2 = f.vCoord[2 * i2]! - x0, y2 = f.vCoord[2 * i2 + 1]! - y0;
      const det = x1 * y2 - x2 * y1;
      b[1] = ((x - x0) * y2 - (y - y0) * x2) / det;
      b[2] = (x1 * (y - y0) - y1 * (x - x0)) / det;
      b[0] = 1 - b[1]! - b[2]!;
      out[k] = out[k]! + b[0]! * at[i0]! + b[1]! * at[i1]! + b[2]! * at[i2]!;
    }
  }
}

const cache = new WeakMap<BisectionForest, BoundaryLifting>();

/** The lifting of a domain's forest (built once). */
export function liftingOf(forest: BisectionForest): BoundaryLifting {
  let l = cache.get(forest);
  if (l === undefined) {
    l = new BoundaryLifting(forest);
    cache.set(forest, l);
  }
  return l;
}
