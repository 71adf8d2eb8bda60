/**
 * Diagonals of the hierarchical stiffness and mass matrices, per vertex of the bisection forest.
 *
 * The hierarchical basis function of a vertex does not depend on the vertex set it is used in: it
 * is the nodal hat of the vertex on the mesh in which the vertex was created (initial vertices: the
 * initial mesh). Its support is the elements of that mesh around the vertex — for a vertex m made
 * by bisection, the two (1D, or 2D on the boundary) or four children that have m as their newest
 * vertex. So a(φ̂_m, φ̂_m) and (φ̂_m, φ̂_m) are sums of element integrals of one barycentric
 * coordinate (P1 formulas, common practice: on a triangle T with the vertex opposite edge e,
 * ∫_T |∇λ|² = |e|² / (4|T|) and ∫_T λ² = |T|/6; on an interval of length h, 1/h and h/3), weighted
 * by κ and c of the element's material, plus h ∫ λ² on its convective boundary edges (./boundary).
 * They are accumulated once per forest element, as the forest
 * grows, so a lookup costs O(1) per vertex and nothing is rebuilt per set.
 */
import { convectionDiagonal } from './boundary-segments';
import { gradProduct } from './diffusion-tensor';
import type { SpatialDomain } from './domain';

interface State {
  A: Float64Array;
  M: Float64Array;
  /** Forest elements already accounted for. */
  done: number;
}

const states = new WeakMap<SpatialDomain, State>();

function grow(a: Float64Array, n: number): Float64Array {
  if (a.length >= n) return a;
  const b = new Float64Array(Math.max(n, 2 * a.length));
  b.set(a);
  return b;
}

/** Adds the contribution of forest element e at its vertex `k` (local index) to A and M. */
function addElement(s: State, domain: SpatialDomain, e: number, k: number): void {
  const f = domain.forest;
  const nv = f.nv;
  const mat = f.eMat[e]!;
  const kappa = f.kappa[mat]!;
  const c = f.reaction[mat]!;
  const v = f.eVert[e * nv + k]!;
  if (f.dim === 1) {
    const h = Math.abs(f.vCoord[f.eVert[e * 2 + 1]!]! - f.vCoord[f.eVert[e * 2]!]!);
    s.A[v]! += kappa / h + (c * h) / 3 + convectionDiagonal(f, e, k);
    s.M[v]! += h / 3;
    return;
  }
  const p0 = f.eVert[e * 3]!, p1 = f.eVert[e * 3 + 1]!, p2 = f.eVert[e * 3 + 2]!;
  const x0 = f.vCoord[2 * p0]!, y0 = f.vCoord[2 * p0 + 1]!;
  const x1 = f.vCoord[2 * p1]!, y1 = f.vCoord[2 * p1 + 1]!;
  const x2 = f.vCoord[2 * p2]!, y2 = f.vCoord[2 * p2 + 1]!;
  const area = 0.5 * Math.abs((x1 - x0) * (y2 - y0) - (x2 - x0) * (y1 - y0));
  // Edge opposite local vertex k.
  const [ax, ay, bx, by] = k === 0 ? [x1, y1, x2, y2] : k === 1 ? [x2, y2, x0, y0] : [x0, y0, x1, y1];
  // ∇λ = (ay − by, bx − ax) / (2|T|) for the vertex opposite the edge (a, b), so with a tensor
  // ∫_T ∇λ·K∇λ = gᵀKg / (4|T|) for g = (ay − by, bx − ax); with K = κI, κ|e|²/(4|T|)
  const stiff = f.kappaTensor === null
    ? kappa * ((bx - ax) ** 2 + (by - ay) ** 2)
    : gradProduct(f.kappaTensor, mat, ay - by, bx - ax, ay - by, bx - ax);
  s.A[v]! += stiff / (4 * area) + (c * area) / 6 + convectionDiagonal(f, e, k);
  s.M[v]! += area / 6;
}

/**
 * Diagonals (A, M) of the hierarchical stiffness (κ and reaction) and mass matrices for every
 * vertex of the domain's forest so far, indexed by vertex id (valid until the forest grows again;
 * call again after refining). Incremental: only elements created since the last call are visited.
 * @internal
 */
export function hierarchicalDiagonals(domain: SpatialDomain): { A: Float64Array; M: Float64Array } {
  const f = domain.forest;
  let s = states.get(domain);
  if (s === undefined) {
    s = { A: new Float64Array(f.vertexCount), M: new Float64Array(f.vertexCount), done: 0 };
    states.set(domain, s);
  }
  if (s.done < f.elementCount) {
    s.A = grow(s.A, f.vertexCount);
    s.M = grow(s.M, f.vertexCount);
    const nv = f.nv;
    let e = s.done;
    // Initial elements: the hat of every vertex on the initial mesh.
    for (; e < f.initialElementCount; e++) for (let k = 0; k < nv; k++) addElement(s, domain, e, k);
    // Children come in pairs; both have the midpoint of their parent as newest vertex (the last
    // vertex in 2D; in 1D the shared end: children are (a, m) and (m, b)).
    for (; e < f.elementCount; e += 2) {
      if (f.dim === 1) {
        addElement(s, domain, e, 1);
        addElement(s, domain, e + 1, 0);
      } else {
        addElement(s, domain, e, 2);
        addElement(s, domain, e + 1, 2);
      }
    }
    s.done = f.elementCount;
  }
  return { A: s.A, M: s.M };
}
