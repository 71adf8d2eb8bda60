/**
 * Boundary segments of a leaf mesh on the flux and convection parts (./boundary): the leaf-element
 * edges whose forest edge code names a natural initial boundary edge. Linear in the number of leaf
 * elements; absent (undefined) when the domain has no natural part.
 */
import { EdgeKind, naturalEdgeIndex } from './boundary';
import type { BisectionForest } from './forest';

/** Natural boundary segments of a leaf mesh in local numbering. */
export interface BoundarySegments {
  readonly count: number;
  /** Two local vertex indices per segment (1D: the boundary vertex twice). */
  readonly vertices: Int32Array;
  /** Initial boundary-edge index of each segment (indexes the domain's boundary tables). */
  readonly edge: Int32Array;
  /** Heat-transfer coefficient h per initial boundary edge (shared table; index with `edge`). */
  readonly transfer: Float64Array;
}

/** True when the forest's boundary has a flux or convection edge. */
export function hasNaturalEdges(forest: BisectionForest): boolean {
  const k = forest.boundary.edgeKind;
  for (let b = 0; b < k.length; b++) if (k[b] === EdgeKind.Flux || k[b] === EdgeKind.Convection) return true;
  return false;
}

/**
 * Segments of the leaf elements `leaves` (forest ids) whose edge lies on a natural part; `local` maps
 * forest vertex ids to local indices.
 */
export function leafBoundarySegments(forest: BisectionForest, leaves: Int32Array, local: Int32Array): BoundarySegments | undefined {
  if (!hasNaturalEdges(forest)) return undefined;
  const tb = forest.boundary;
  if (forest.dim === 1) {
    const verts: number[] = [];
    const edge: number[] = [];
    for (let b = 0; b < tb.edgeCount; b++) {
      const k = tb.edgeKind[b]!;
      if (k !== EdgeKind.Flux && k !== EdgeKind.Convection) continue;
      const v = local[tb.edgeVertices[2 * b]!]!;
      verts.push(v, v);
      edge.push(b);
    }
    return { count: edge.length, vertices: Int32Array.from(verts), edge: Int32Array.from(edge), transfer: tb.transfer };
  }
  const nb = forest.eNb, ev = forest.eVert;
  let count = 0;
  for (let i = 0; i < leaves.length; i++) {
    const e = leaves[i]!;
    for (let k = 0; k < 3; k++) if (naturalEdgeIndex(nb[3 * e + k]!) >= 0) count++;
  }
  const vertices = new Int32Array(2 * count);
  const edge = new Int32Array(count);
  let s = 0;
  for (let i = 0; i < leaves.length; i++) {
    const e = leaves[i]!;
    for (let k = 0; k < 3; k++) {
      const b = naturalEdgeIndex(nb[3 * e + k]!);
      if (b < 0) continue;
      // edge opposite vertex k
      vertices[2 * s] = local[ev[3 * e + ((k + 1) % 3)]!]!;
      vertices[2 * s + 1] = local[ev[3 * e + ((k + 2) % 3)]!]!;
      edge[s++] = b;
    }
  }
  return { count, vertices, edge, transfer: tb.transfer };
}

/**
 * Convection segments with their weights for the boundary mass h ∫_Γ u v: the P1 edge mass matrix
 * is h|s|/6 [2 1; 1 2] (common practice); `weight` holds h|s|/6 per segment (in 1D the point term
 * h u v is written as the same formula with both ends at the boundary vertex and weight h/6).
 * Segment lengths come from vertex coordinates.
 */
export interface RobinSegments {
  readonly count: number;
  readonly vertices: Int32Array;
  readonly weight: Float64Array;
}

const NO_ROBIN: RobinSegments = { count: 0, vertices: new Int32Array(0), weight: new Float64Array(0) };

export function robinSegments(mesh: { readonly dim: 1 | 2; readonly coords: Float64Array; readonly boundarySegments?: BoundarySegments | undefined }): RobinSegments {
  const bs = mesh.boundarySegments;
  if (!bs) return NO_ROBIN;
  const h = bs.transfer;
  let n = 0;
  for (let s = 0; s < bs.count; s++) if (h[bs.edge[s]!]! > 0) n++;
  const vertices = new Int32Array(2 * n);
  const weight = new Float64Array(n);
  const xy = mesh.coords;
  let k = 0;
  for (let s = 0; s < bs.count; s++) {
    const hs = h[bs.edge[s]!]!;
    if (!(hs > 0)) continue;
    const a = bs.vertices[2 * s]!, b = bs.vertices[2 * s + 1]!;
    const len = mesh.dim === 1 ? 1 : Math.hypot(xy[2 * b]! - xy[2 * a]!, xy[2 * b + 1]! - xy[2 * a + 1]!);
    vertices[2 * k] = a;
    vertices[2 * k + 1] = b;
    weight[k++] = (hs * len) / 6;
  }
  return { count: n, vertices, weight };
}

/** r += w · R u with R the convection boundary mass (nodal vectors of the leaf mesh). */
export function applyRobinNodal(rs: RobinSegments, u: Float64Array, r: Float64Array, w: number): void {
  const sv = rs.vertices, sw = rs.weight;
  for (let s = 0; s < rs.count; s++) {
    const a = sv[2 * s]!, b = sv[2 * s + 1]!;
    const c = w * sw[s]!;
    const ua = u[a]!, ub = u[b]!;
    r[a] = r[a]! + c * (2 * ua + ub);
    r[b] = r[b]! + c * (ua + 2 * ub);
  }
}

/**
 * h ∫_Γ λ_k² over the convective boundary edges of forest element e that contain its local vertex k
 * (∫ λ² = |s|/3 on an edge s; in 1D h at a boundary end): the convection part of the diagonal of the
 * hierarchical stiffness, element by element (see ./hierarchical-diagonals). 0 if none.
 */
export function convectionDiagonal(forest: BisectionForest, e: number, k: number): number {
  const tb = forest.boundary;
  if (!tb.hasConvection) return 0;
  if (forest.dim === 1) {
    if (e >= forest.initialElementCount) return 0; // bisection vertices are interior
    const v = forest.eVert[2 * e + k]!;
    let s = 0;
    for (let b = 0; b < tb.edgeCount; b++) if (tb.edgeVertices[2 * b] === v && tb.edgeKind[b] === EdgeKind.Convection) s += tb.transfer[b]!;
    return s;
  }
  let s = 0;
  for (const j of [(k + 1) % 3, (k + 2) % 3]) {
    // edge opposite local vertex j contains vertex k
    const b = naturalEdgeIndex(forest.eNb[3 * e + j]!);
    if (b < 0) continue;
    const h = tb.transfer[b]!;
    if (!(h > 0)) continue;
    const p = forest.eVert[3 * e + ((j + 1) % 3)]!, q = forest.eVert[3 * e + ((j + 2) % 3)]!;
    const len = Math.hypot(forest.vCoord[2 * q]! - forest.vCoord[2 * p]!, forest.vCoord[2 * q + 1]! - forest.vCoord[2 * p + 1]!);
    s += (h * len) / 3;
  }
  return s;
}
