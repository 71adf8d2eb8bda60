/**
 * Conformity of an input triangulation along its boundary: no boundary vertex may lie inside
 * another boundary edge (a hanging node; an interior one would already show as an edge without a
 * matching neighbour, i.e. as a boundary edge).
 *
 * The boundary vertices are binned in a uniform grid whose cell is the median boundary-edge
 * length, and every edge only visits the cells along its own length (one row of cells at a time,
 * widened by one cell). For boundaries whose edge lengths are within a bounded ratio of each other
 * this is linear in the boundary size (plus one sort), instead of testing every vertex against
 * every edge.
 */
import { InvalidMeshError } from '../errors';
import { TRIANGULATION_WORDS, type MeshWords } from './mesh-overlap';

/** Relative tolerances of the test "v lies strictly inside edge [i, j]" (parameter and distance). */
const T_EPS = 1e-10;
const D_EPS = 1e-10;

/**
 * Throws InvalidMeshError if a boundary vertex lies strictly inside a boundary edge.
 * `bEdges` holds triples (slot 3e + k, i, j) of boundary edges.
 */
export function checkNoHangingNodes(coords: Float64Array, bEdges: ArrayLike<number>, words: MeshWords = TRIANGULATION_WORDS): void {
  const nb = bEdges.length / 3;
  if (nb === 0) return;
  const nv = coords.length / 2;
  // Boundary vertices and their bounding box.
  const onBoundary = new Uint8Array(nv);
  let count = 0;
  for (let q = 0; q < bEdges.length; q += 3) {
    for (const v of [bEdges[q + 1]!, bEdges[q + 2]!]) {
      if (!onBoundary[v]) { onBoundary[v] = 1; count++; }
    }
  }
  const verts = new Int32Array(count);
  let minX = Infinity, minY = Infinity, maxX = -Infinity, maxY = -Infinity;
  count = 0;
  for (let v = 0; v < nv; v++) {
    if (!onBoundary[v]) continue;
    verts[count++] = v;
    const x = coords[2 * v]!, y = coords[2 * v + 1]!;
    if (x < minX) minX = x;
    if (x > maxX) maxX = x;
    if (y < minY) minY = y;
    if (y > maxY) maxY = y;
  }
  // Cell size: the median boundary-edge length (never 0; the grid has at most ~nb² cells per axis pair but only occupied ones are stored).
  const lens = new Float64Array(nb);
  for (let q = 0; q < nb; q++) {
    const i = bEdges[3 * q + 1]!, j = bEdges[3 * q + 2]!;
    lens[q] = Math.hypot(coords[2 * j]! - coords[2 * i]!, coords[2 * j + 1]! - coords[2 * i + 1]!);
  }
  lens.sort();
  const span = Math.max(maxX - minX, maxY - minY);
  const h = Math.max(lens[nb >> 1]!, span / (4 * nb + 4), Number.MIN_VALUE);
  const nx = Math.floor((maxX - minX) / h) + 1;
  const cellX = (x: number): number => Math.min(nx - 1, Math.max(0, Math.floor((x - minX) / h)));
  const ny = Math.floor((maxY - minY) / h) + 1;
  const cellY = (y: number): number => Math.min(ny - 1, Math.max(0, Math.floor((y - minY) / h)));
  // Occupied cells, sorted by key cy·nx + cx (keys are exact doubles: nx·ny ≤ (4nb + 5)²).
  const key = new Float64Array(count);
  for (let k = 0; k < count; k++) {
    const v = verts[k]!;
    key[k] = cellY(coords[2 * v + 1]!) * nx + cellX(coords[2 * v]!);
  }
  const order = Array.from(verts.keys()).sort((a, b) => key[a]! - key[b]!);
  const sortedKey = Float64Array.from(order, (k) => key[k]!);
  const sortedVert = Int32Array.from(order, (k) => verts[k]!);
  const firstAt = (kk: number): number => {
    let lo = 0, hi = count;
    while (lo < hi) {
      const mid = (lo + hi) >> 1;
      if (sortedKey[mid]! < kk) lo = mid + 1;
      else hi = mid;
    }
    return lo;
  };
  for (let q = 0; q < bEdges.length; q += 3) {
    const i = bEdges[q + 1]!, j = bEdges[q + 2]!;
    const x0 = coords[2 * i]!, y0 = coords[2 * i + 1]!, dx = coords[2 * j]! - x0, dy = coords[2 * j + 1]! - y0;
    const l2 = dx * dx + dy * dy;
    const cy0 = cellY(Math.min(y0, y0 + dy)) - 1, cy1 = cellY(Math.max(y0, y0 + dy)) + 1;
    for (let cy = Math.max(0, cy0); cy <= Math.min(ny - 1, cy1); cy++) {
      // the part of the edge inside this row of cells (parameter range), widened by one cell
      let t0 = 0, t1 = 1;
      if (dy !== 0) {
        const ta = (minY + (cy - 1) * h - y0) / dy, tb = (minY + (cy + 2) * h - y0) / dy;
        t0 = Math.max(0, Math.min(ta, tb));
        t1 = Math.min(1, Math.max(ta, tb));
        if (t0 > t1) continue;
      }
      const xa = x0 + t0 * dx, xb = x0 + t1 * dx;
      const cx0 = Math.max(0, cellX(Math.min(xa, xb)) - 1), cx1 = Math.min(nx - 1, cellX(Math.max(xa, xb)) + 1);
      for (let p = firstAt(cy * nx + cx0); p < count && sortedKey[p]! <= cy * nx + cx1; p++) {
        const v = sortedVert[p]!;
        if (v === i || v === j) continue;
        const px = coords[2 * v]! - x0, py = coords[2 * v + 1]! - y0;
        const t = (px * dx + py * dy) / l2;
        const cr = px * dy - py * dx;
        if (t > T_EPS && t < 1 - T_EPS && Math.abs(cr) <= D_EPS * l2) {
          const e = (bEdges[q]! / 3) | 0;
          throw new InvalidMeshError(
            `the mesh is not conforming: ${words.vertex} ${v} lies inside edge [${i}, ${j}] of ${words.cell(e)} (hanging node)`,
            { field: words.cellField(e), expected: `no ${words.vertex} inside another triangle’s edge`, received: `${words.vertex} ${v} on edge [${i}, ${j}]` },
          );
        }
      }
    }
  }
}
