/**
 * Independent dense reference for the spatial operators (docs/method.md §4.2).
 *
 * Nodal P1 matrices are assembled element by element on the leaf mesh of the union with the
 * textbook closed forms — 2D stiffness by the cotangent formula K_ij = −(κ/2) cot θ_k (i ≠ j),
 * K_ii = −Σ_{j≠i} K_ij, mass |T|/12 (1 + δ_ij); 1D κ/h [1 −1; −1 1] and h/6 [2 1; 1 2]
 * (Braess, Finite Elements, ch. II (from memory); the cotangent form is common practice).
 * The hierarchical transform is formed explicitly by evaluating every hierarchical hat as a
 * piecewise-linear function on the elements where it was created (initial elements for initial
 * vertices; the children of the one or two triangles bisected at v, spanned by its interpolation
 * parents and godparents, otherwise) at the coordinates of every leaf-mesh vertex. No transform
 * kernel and no element-record code of src/space is used.
 *
 * With a diffusion tensor K (anisotropic domains) the stiffness is ∫_T ∇λ_i·K∇λ_j = |T| ∇λ_iᵀK∇λ_j
 * with the barycentric gradients read off the inverse of the element's Jacobian
 * J = [p1 − p0, p2 − p0] (∇λ_1, ∇λ_2 are the rows of J⁻¹, ∇λ_0 = −∇λ_1 − ∇λ_2; common practice),
 * the inverse taken by ml-matrix.
 */
import { Matrix, inverse } from 'ml-matrix';
import type { SpatialDomain } from '../../src/space/index';

function union(a: Int32Array, b: Int32Array): Int32Array {
  return Int32Array.from(new Set([...a, ...b])).sort();
}

type Tri = [number, number, number, number, number, number]; // x0 y0 x1 y1 x2 y2

/** Barycentric coordinate of vertex 0 of `t` at (x, y), or −Infinity if outside (tolerance 1e-12). */
function bary0(t: Tri, x: number, y: number): number {
  const [x0, y0, x1, y1, x2, y2] = t;
  const det = (x1 - x0) * (y2 - y0) - (x2 - x0) * (y1 - y0);
  const l1 = ((x - x0) * (y2 - y0) - (y - y0) * (x2 - x0)) / det;
  const l2 = ((x1 - x0) * (y - y0) - (y1 - y0) * (x - x0)) / det;
  const l0 = 1 - l1 - l2;
  const tol = 1e-12;
  if (l0 < -tol || l1 < -tol || l2 < -tol) return -Infinity;
  return Math.max(0, l0);
}

/** The hierarchical hat of vertex v as a function of (x, y). */
export function hierarchicalHat(domain: SpatialDomain, v: number): (x: number, y: number) => number {
  const c = (w: number, k: number) => domain.coordinate(w, k);
  const buf = new Int32Array(3);
  const par = new Int32Array(2);
  const god = new Int32Array(2);
  if (domain.dim === 1) {
    const pieces: [number, number, number][] = []; // [left, peak, right]
    if (domain.interpolationParents(v, par) === 0) {
      for (let e = 0; e < domain.initialElementCount; e++) {
        const [a, b] = domain.initialElement(e, buf);
        if (a === v || b === v) pieces.push([c(a!, 0), c(v, 0), c(b!, 0)]);
      }
    } else pieces.push([c(par[0]!, 0), c(v, 0), c(par[1]!, 0)]);
    return (x) => {
      let best = 0;
      for (const [l, p, r] of pieces) {
        const lo = Math.min(l, r), hi = Math.max(l, r);
        if (x < lo - 1e-14 || x > hi + 1e-14) continue;
        const val = p === l ? (r - x) / (r - l) : p === r ? (x - l) / (r - l) : x <= p ? (x - lo) / (p - lo) : (hi - x) / (hi - p);
        best = Math.max(best, Math.min(1, Math.max(0, val)));
      }
      return best;
    };
  }
  const tris: Tri[] = [];
  const tri = (p: number, q: number, r: number): Tri => [c(p, 0), c(p, 1), c(q, 0), c(q, 1), c(r, 0), c(r, 1)];
  if (domain.interpolationParents(v, par) === 0) {
    for (let e = 0; e < domain.initialElementCount; e++) {
      const t = domain.initialElement(e, buf);
      const k = t.indexOf(v);
      if (k >= 0) tris.push(tri(v, t[(k + 1) % 3]!, t[(k + 2) % 3]!));
    }
  } else {
    const ng = domain.godparents(v, god);
    for (let g = 0; g < ng; g++) {
      tris.push(tri(v, par[0]!, god[g]!));
      tris.push(tri(v, par[1]!, god[g]!));
    }
  }
  return (x, y) => {
    let best = 0;
    for (const t of tris) best = Math.max(best, bary0(t, x, y));
    return best;
  };
}

/** Nodal (mesh) mass and stiffness-plus-reaction matrices of the leaf mesh of `set`. */
export function denseNodalMatrices(domain: SpatialDomain, set: Int32Array): { M: number[][]; A: number[][]; globalId: Int32Array } {
  const mesh = domain.leafMesh(set);
  const n = mesh.vertexCount;
  const M = Array.from({ length: n }, () => new Array<number>(n).fill(0));
  const A = Array.from({ length: n }, () => new Array<number>(n).fill(0));
  const xy = mesh.coords;
  for (let e = 0; e < mesh.elementCount; e++) {
    const kap = mesh.kappa[mesh.elementMaterial[e]!]!;
    const rea = mesh.reaction[mesh.elementMaterial[e]!]!;
    if (mesh.dim === 1) {
      const i = mesh.elements[2 * e]!, j = mesh.elements[2 * e + 1]!;
      const h = Math.abs(xy[j]! - xy[i]!);
      const loc = [i, j];
      for (let p = 0; p < 2; p++) {
        for (let q = 0; q < 2; q++) {
          const mass = (h / 6) * (p === q ? 2 : 1);
          M[loc[p]!]![loc[q]!]! += mass;
          A[loc[p]!]![loc[q]!]! += (kap / h) * (p === q ? 1 : -1) + rea * mass;
        }
      }
      continue;
    }
    const loc = [mesh.elements[3 * e]!, mesh.elements[3 * e + 1]!, mesh.elements[3 * e + 2]!];
    const P = loc.map((i) => [xy[2 * i]!, xy[2 * i + 1]!] as [number, number]);
    const area = 0.5 * Math.abs((P[1]![0] - P[0]![0]) * (P[2]![1] - P[0]![1]) - (P[2]![0] - P[0]![0]) * (P[1]![1] - P[0]![1]));
    const K = [[0, 0, 0], [0, 0, 0], [0, 0, 0]];
    const tensor = mesh.kappaTensor;
    if (tensor !== undefined) {
      const m = mesh.elementMaterial[e]!;
      const Kt = new Matrix([[tensor[3 * m]!, tensor[3 * m + 1]!], [tensor[3 * m + 1]!, tensor[3 * m + 2]!]]);
      const Jinv = inverse(new Matrix([[P[1]![0] - P[0]![0], P[2]![0] - P[0]![0]], [P[1]![1] - P[0]![1], P[2]![1] - P[0]![1]]]));
      const g1 = Jinv.getRow(0), g2 = Jinv.getRow(1);
      const G = new Matrix([[-g1[0]! - g2[0]!, -g1[1]! - g2[1]!], g1, g2]); // rows ∇λ_0, ∇λ_1, ∇λ_2
      const S = G.mmul(Kt).mmul(G.transpose()).mul(area);
      for (let p = 0; p < 3; p++) for (let q = 0; q < 3; q++) K[p]![q] = S.get(p, q);
    }
    for (let k = 0; tensor === undefined && k < 3; k++) {
      // angle at vertex k, opposite edge (k+1, k+2)
      const i = (k + 1) % 3, j = (k + 2) % 3;
      const ux = P[i]![0] - P[k]![0], uy = P[i]![1] - P[k]![1], vx = P[j]![0] - P[k]![0], vy = P[j]![1] - P[k]![1];
      const cot = (ux * vx + uy * vy) / Math.abs(ux * vy - uy * vx);
      K[i]![j] = K[j]![i] = -0.5 * kap * cot;
    }
    for (let i = 0; tensor === undefined && i < 3; i++) K[i]![i] = -(K[i]![(i + 1) % 3]! + K[i]![(i + 2) % 3]!);
    for (let p = 0; p < 3; p++) {
      for (let q = 0; q < 3; q++) {
        const mass = (area / 12) * (p === q ? 2 : 1);
        M[loc[p]!]![loc[q]!]! += mass;
        A[loc[p]!]![loc[q]!]! += K[p]![q]! + rea * mass;
      }
    }
  }
  addConvectionReference(domain, mesh.coords, mesh.elements, mesh.elementCount, A);
  return { M, A, globalId: mesh.globalId };
}

/**
 * Transfer coefficient h on each initial boundary edge, re-derived from the user's parts
 * (`domain.boundaryParts`, applied in order, later parts override): initial boundary edges are
 * the initial-element edges used once (2D) or the two extreme vertices (1D).
 */
export function initialTransfer(domain: SpatialDomain): { a: number; b: number; h: number }[] {
  const parts = domain.boundaryParts;
  const xy = (v: number): [number, number] => [domain.coordinate(v, 0), domain.dim === 2 ? domain.coordinate(v, 1) : 0];
  const edges: [number, number][] = [];
  if (domain.dim === 1) {
    let lo = 0, hi = 0;
    for (let v = 0; v < domain.initialVertexCount; v++) {
      if (domain.coordinate(v, 0) < domain.coordinate(lo, 0)) lo = v;
      if (domain.coordinate(v, 0) > domain.coordinate(hi, 0)) hi = v;
    }
    edges.push([lo, lo], [hi, hi]);
  } else {
    const count = new Map<string, [number, number, number]>();
    const buf = new Int32Array(3);
    for (let e = 0; e < domain.initialElementCount; e++) {
      const t = Array.from(domain.initialElement(e, buf));
      for (let k = 0; k < 3; k++) {
        const a = t[k]!, b = t[(k + 1) % 3]!;
        const key = `${Math.min(a, b)},${Math.max(a, b)}`;
        const c = count.get(key);
        count.set(key, c ? [a, b, c[2] + 1] : [a, b, 1]);
      }
    }
    for (const [a, b, c] of count.values()) if (c === 1) edges.push([a, b]);
  }
  return edges.map(([a, b]) => {
    const [ax, ay] = xy(a), [bx, by] = xy(b);
    const mx = 0.5 * (ax + bx), my = 0.5 * (ay + by);
    let h = 0;
    for (const p of parts) {
      const sel = typeof p.where === 'function'
        ? p.where(mx, my)
        : p.where.some((it) => (domain.dim === 1 ? it[0] === a : (it[0] === a && it[1] === b) || (it[0] === b && it[1] === a)));
      if (!sel) continue;
      h = p.kind === 'convection' ? (typeof p.transferCoefficient === 'function' ? p.transferCoefficient(mx, my) : p.transferCoefficient) : 0;
    }
    return { a, b, h };
  });
}

/**
 * A += h ∫_Γ λ_i λ_j ds on the leaf mesh: boundary segments are leaf-element edges used by one
 * element; each is matched to the initial boundary edge that contains it (collinearity test), and
 * contributes the 1D P1 mass h|s|/6 [2 1; 1 2] (common practice); in 1D the term is h u v at the
 * boundary point.
 */
function addConvectionReference(domain: SpatialDomain, xy: Float64Array, elements: Int32Array, ne: number, A: number[][]): void {
  const init = initialTransfer(domain).filter((e) => e.h > 0);
  if (init.length === 0) return;
  if (domain.dim === 1) {
    const n = xy.length;
    for (const e of init) {
      const x = domain.coordinate(e.a, 0);
      for (let i = 0; i < n; i++) if (xy[i] === x) A[i]![i]! += e.h;
    }
    return;
  }
  const count = new Map<string, [number, number, number]>();
  for (let e = 0; e < ne; e++) {
    for (let k = 0; k < 3; k++) {
      const a = elements[3 * e + k]!, b = elements[3 * e + ((k + 1) % 3)]!;
      const key = `${Math.min(a, b)},${Math.max(a, b)}`;
      const c = count.get(key);
      count.set(key, c ? [a, b, c[2] + 1] : [a, b, 1]);
    }
  }
  for (const [a, b, c] of count.values()) {
    if (c !== 1) continue;
    const ax = xy[2 * a]!, ay = xy[2 * a + 1]!, bx = xy[2 * b]!, by = xy[2 * b + 1]!;
    const mx = 0.5 * (ax + bx), my = 0.5 * (ay + by);
    for (const e of init) {
      const px = domain.coordinate(e.a, 0), py = domain.coordinate(e.a, 1), qx = domain.coordinate(e.b, 0), qy = domain.coordinate(e.b, 1);
      const L2 = (qx - px) ** 2 + (qy - py) ** 2;
      const cross = (qx - px) * (my - py) - (qy - py) * (mx - px);
      const along = ((mx - px) * (qx - px) + (my - py) * (qy - py)) / L2;
      if (Math.abs(cross) > 1e-12 * L2 || along <= 0 || along >= 1) continue;
      const w = (e.h * Math.hypot(bx - ax, by - ay)) / 6;
      A[a]![a]! += 2 * w;
      A[b]![b]! += 2 * w;
      A[a]![b]! += w;
      A[b]![a]! += w;
      break;
    }
  }
}

/** Explicit hierarchical transform: T[w][j] = hat of set[j] at leaf-mesh vertex w. */
export function denseTransform(domain: SpatialDomain, globalId: Int32Array, set: Int32Array): number[][] {
  const hats = Array.from(set, (v) => hierarchicalHat(domain, v));
  return Array.from(globalId, (w) => {
    const x = domain.coordinate(w, 0), y = domain.dim === 2 ? domain.coordinate(w, 1) : 0;
    return hats.map((h) => h(x, y));
  });
}

/**
 * Dense hierarchical mass M and stiffness-plus-reaction A between two closed free sets:
 * rows in `outSet` order, columns in `inSet` order.
 */
export function denseSpatialMatrices(domain: SpatialDomain, inSet: Int32Array, outSet: Int32Array): { M: number[][]; A: number[][] } {
  const u = union(inSet, outSet);
  const { M, A, globalId } = denseNodalMatrices(domain, u);
  const Tin = denseTransform(domain, globalId, inSet);
  const Tout = denseTransform(domain, globalId, outSet);
  const n = globalId.length;
  const form = (X: number[][]): number[][] => {
    // Tout^T X Tin
    const XT = Array.from({ length: n }, (_, r) => Array.from({ length: inSet.length }, (_, j) => {
      let s = 0;
      const row = X[r]!;
      for (let k = 0; k < n; k++) if (row[k] !== 0) s += row[k]! * Tin[k]![j]!;
      return s;
    }));
    return Array.from({ length: outSet.length }, (_, i) => Array.from({ length: inSet.length }, (_, j) => {
      let s = 0;
      for (let k = 0; k < n; k++) if (Tout[k]![i] !== 0) s += Tout[k]![i]! * XT[k]![j]!;
      return s;
    }));
  };
  return { M: form(M), A: form(A) };
}
