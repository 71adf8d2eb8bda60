/**
 * Geometric validity of a user triangulation: no two triangles overlap.
 *
 * The combinatorial checks before this one (consistent orientation across every shared edge,
 * every edge in at most two triangles, no hanging nodes, connected) leave two ways for
 * counter-clockwise triangles to overlap:
 *  1. locally, around one vertex: the triangles around an interior vertex close up after a
 *     total angle of 2πk, and k ≥ 2 means they wind around it k times (a fan of 720°); at a
 *     boundary vertex the angles must add up to at most 2π;
 *  2. globally, a part of the mesh folded over another part far away in the mesh: then the
 *     boundary curve crosses itself (a locally one-to-one map of a connected surface whose
 *     boundary curves are simple and disjoint covers the plane at most once; common practice
 *     in mesh validation, e.g. the degree argument for locally injective maps).
 * Check 1 is a sum of angles per vertex; check 2 tests boundary-edge pairs that share a cell of
 * a uniform bucket grid (cell size ≈ mean boundary edge length), so both run in near-linear time.
 */
import { InvalidMeshError } from '../errors';

const TWO_PI = 2 * Math.PI;

/**
 * How the errors name a mesh's parts: a domain's triangulation says `triangles[e]` and "vertex v",
 * a NodalField says "cell e" (field `cells[3e..3e+2]`) and "point v". @internal
 */
export interface MeshWords {
  /** The cell e in a message. */
  cell(e: number): string;
  /** The input field holding cell e. */
  cellField(e: number): string;
  /** The word for a vertex. */
  vertex: string;
}

/** The words of a domain's triangulation (`triangles[e]`, "vertex v"). @internal */
export const TRIANGULATION_WORDS: MeshWords = { cell: (e) => `triangles[${e}]`, cellField: (e) => `triangles[${e}]`, vertex: 'vertex' };

/**
 * Throws {@link InvalidMeshError} naming the vertex or the triangles involved when the
 * counter-clockwise triangles `elements` overlap. `neighbors[3e + k] < 0` marks the edge of
 * triangle e opposite its vertex k as a boundary edge.
 */
export function checkNoOverlap(coords: Float64Array, elements: Int32Array, neighbors: Int32Array, words: MeshWords = TRIANGULATION_WORDS): void {
  const nv = coords.length / 2;
  const ne = elements.length / 3;
  const angle = new Float64Array(nv);
  const onBoundary = new Uint8Array(nv);
  const firstTri = new Int32Array(nv).fill(-1);
  for (let e = 0; e < ne; e++) {
    for (let k = 0; k < 3; k++) {
      const a = elements[3 * e + k]!, b = elements[3 * e + ((k + 1) % 3)]!, c = elements[3 * e + ((k + 2) % 3)]!;
      const ux = coords[2 * b]! - coords[2 * a]!, uy = coords[2 * b + 1]! - coords[2 * a + 1]!;
      const vx = coords[2 * c]! - coords[2 * a]!, vy = coords[2 * c + 1]! - coords[2 * a + 1]!;
      angle[a]! += Math.atan2(Math.abs(ux * vy - uy * vx), ux * vx + uy * vy);
      if (firstTri[a]! < 0) firstTri[a] = e;
      if (neighbors[3 * e + k]! < 0) onBoundary[b] = onBoundary[c] = 1;
    }
  }
  for (let v = 0; v < nv; v++) {
    const sum = angle[v]!;
    const limit = onBoundary[v] ? TWO_PI * (1 + 1e-9) : 3 * Math.PI;
    if (sum > limit) {
      const turns = sum / TWO_PI;
      throw new InvalidMeshError(
        `triangles overlap around ${onBoundary[v] ? 'boundary ' : ''}${words.vertex} ${v}: their angles there add up to ${(sum * 180 / Math.PI).toFixed(1)}° ` +
          `(${turns.toFixed(2)} turns; at most ${onBoundary[v] ? `360° at a boundary ${words.vertex}` : `one turn, 360°, around an interior ${words.vertex}`})`,
        { field: words.cellField(firstTri[v]!), expected: `triangles around each ${words.vertex} covering at most one turn`, received: `${(sum * 180 / Math.PI).toFixed(1)}° at ${words.vertex} ${v}` },
      );
    }
  }
  checkBoundaryCrossings(coords, elements, neighbors, words);
}

/** Boundary edges (as vertex pairs) that properly cross each other, found with a bucket grid. */
function checkBoundaryCrossings(coords: Float64Array, elements: Int32Array, neighbors: Int32Array, words: MeshWords): void {
  const ne = elements.length / 3;
  let nb = 0;
  for (let s = 0; s < 3 * ne; s++) if (neighbors[s]! < 0) nb++;
  if (nb < 4) return;
  const ea = new Int32Array(nb), eb = new Int32Array(nb), owner = new Int32Array(nb);
  let x0 = Infinity, x1 = -Infinity, y0 = Infinity, y1 = -Infinity, len = 0;
  nb = 0;
  for (let s = 0; s < 3 * ne; s++) {
    if (neighbors[s]! >= 0) continue;
    const e = (s / 3) | 0, k = s % 3;
    const a = elements[3 * e + ((k + 1) % 3)]!, b = elements[3 * e + ((k + 2) % 3)]!;
    ea[nb] = a;
    eb[nb] = b;
    owner[nb] = e;
    nb++;
    for (const v of [a, b]) {
      const x = coords[2 * v]!, y = coords[2 * v + 1]!;
      if (x < x0) x0 = x;
      if (x > x1) x1 = x;
      if (y < y0) y0 = y;
      if (y > y1) y1 = y;
    }
    len += Math.hypot(coords[2 * b]! - coords[2 * a]!, coords[2 * b + 1]! - coords[2 * a + 1]!);
  }
  // Cells about one mean edge long, at most ~4·nb of them.
  const h0 = len / nb;
  const w = Math.max(x1 - x0, 1e-300), hgt = Math.max(y1 - y0, 1e-300);
  const h = Math.max(h0, Math.sqrt((w * hgt) / (4 * nb)));
  const nx = Math.max(1, Math.min(4 * nb, Math.ceil(w / h)));
  const ny = Math.max(1, Math.min(4 * nb, Math.ceil(hgt / h)));
  const cx = (x: number) => Math.min(nx - 1, Math.max(0, Math.floor(((x - x0) / w) * nx)));
  const cy = (y: number) => Math.min(ny - 1, Math.max(0, Math.floor(((y - y0) / hgt) * ny)));
  // Counting sort of (cell, edge) incidences over each edge's bounding box.
  const count = new Int32Array(nx * ny + 1);
  const forBox = (i: number, f: (cell: number) => void) => {
    const a = ea[i]!, b = eb[i]!;
    const ia = cx(coords[2 * a]!), ib = cx(coords[2 * b]!), ja = cy(coords[2 * a + 1]!), jb = cy(coords[2 * b + 1]!);
    for (let j = Math.min(ja, jb); j <= Math.max(ja, jb); j++) for (let q = Math.min(ia, ib); q <= Math.max(ia, ib); q++) f(j * nx + q);
  };
  for (let i = 0; i < nb; i++) forBox(i, (c) => count[c + 1]!++);
  for (let c = 0; c < nx * ny; c++) count[c + 1] = count[c + 1]! + count[c]!;
  const items = new Int32Array(count[nx * ny]!);
  const fill = count.slice(0, nx * ny);
  for (let i = 0; i < nb; i++) forBox(i, (c) => void (items[fill[c]!++] = i));
  const scale = Math.max(w, hgt) ** 2;
  const orient = (p: number, q: number, r: number): number => {
    const o = (coords[2 * q]! - coords[2 * p]!) * (coords[2 * r + 1]! - coords[2 * p + 1]!) - (coords[2 * q + 1]! - coords[2 * p + 1]!) * (coords[2 * r]! - coords[2 * p]!);
    return Math.abs(o) <= 1e-14 * scale ? 0 : Math.sign(o);
  };
  for (let c = 0; c < nx * ny; c++) {
    for (let p = count[c]!; p < count[c + 1]!; p++) {
      const i = items[p]!;
      const a = ea[i]!, b = eb[i]!;
      for (let r = p + 1; r < count[c + 1]!; r++) {
        const j = items[r]!;
        const u = ea[j]!, v = eb[j]!;
        if (u === a || u === b || v === a || v === b) continue;
        if (orient(a, b, u) * orient(a, b, v) < 0 && orient(u, v, a) * orient(u, v, b) < 0) {
          throw new InvalidMeshError(
            `triangles overlap: boundary edge [${a}, ${b}] of ${words.cell(owner[i]!)} crosses boundary edge [${u}, ${v}] of ${words.cell(owner[j]!)} ` +
              '(part of the mesh is folded over another part)',
            { field: words.cellField(Math.max(owner[i]!, owner[j]!)), expected: 'non-overlapping triangles (boundary curves that do not cross)', received: `edges [${a}, ${b}] and [${u}, ${v}] cross` },
          );
        }
      }
    }
  }
}
