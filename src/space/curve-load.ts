/**
 * Loads of sources concentrated on a curve (2D: a polyline, heat released per unit length, such as a
 * heating cable or a pipe seen from above) or at a point (1D: a heater at one point of a rod):
 *
 *   ℓ(φ) = ∫_Γ ρ φ ds   (2D),    ℓ(φ) = ρ(x₀) φ(x₀)   (1D),
 *
 * with ρ the density along Γ (default 1). Both lie in H⁻¹ (the trace of an H¹ function on a curve is
 * in L²(Γ), and point values are continuous in 1D), so the method's theory covers them; a point
 * source in 2D is not in H⁻¹ and is not offered (docs/method.md §6.1).
 *
 * Each segment is clipped against every leaf element it meets (Cyrus–Beck clipping against the
 * three edge half-planes; common practice) and ρ λ_k is integrated on each piece by the 3-point
 * Gauss–Legendre rule: exact for ρ of degree ≤ 4 along the piece. A piece that runs along an edge
 * shared by two elements is clipped by both; the pieces of a segment are swept in order of their
 * start, and the part of a piece already covered is skipped, so each part of Γ counts once. The
 * curves are checked when the problem is made (./source-curve.ts).
 */
import { InvalidArgumentError, describeValue } from '../errors';
import type { LeafMesh } from './leaf-mesh';
import { INTERVAL_POINTS, INTERVAL_WEIGHTS } from './quadrature';
import type { SourceCurve } from './source-curve';

/** Relative tolerance of the geometric tests (against the segment's or the mesh's size). */
const EPS = 1e-12;

/**
 * Nodal load ∫_Γ ρ λ_j ds (2D) or ρ(x₀) λ_j(x₀) (1D) on every local vertex of `mesh`, added into `r`.
 * Non-finite densities raise an error naming the point.
 */
export function nodalCurveLoad(mesh: LeafMesh, curve: SourceCurve, r: Float64Array): void {
  const el = mesh.elements, xy = mesh.coords;
  const rho = curve.density;
  if (mesh.dim === 1) {
    const x = curve.points[0]!;
    const e = locatePoint(mesh, x);
    if (e < 0) return; // checked against the domain when the problem was made
    const i0 = el[2 * e]!, i1 = el[2 * e + 1]!;
    const l1 = (x - xy[i0]!) / (xy[i1]! - xy[i0]!);
    const v = rho ? finiteDensity(rho(x, 0), curve, x, 0) : 1;
    r[i0] = r[i0]! + v * (1 - l1);
    r[i1] = r[i1]! + v * l1;
    return;
  }
  const P = curve.points;
  const nq = INTERVAL_WEIGHTS.length;
  forEachPiece(mesh, curve, (seg, e, s0, s1) => {
    const ax = P[2 * seg]!, ay = P[2 * seg + 1]!, dx = P[2 * seg + 2]! - ax, dy = P[2 * seg + 3]! - ay;
    const len = (s1 - s0) * Math.hypot(dx, dy);
    const i0 = el[3 * e]!, i1 = el[3 * e + 1]!, i2 = el[3 * e + 2]!;
    const x0 = xy[2 * i0]!, y0 = xy[2 * i0 + 1]!;
    const ux = xy[2 * i1]! - x0, uy = xy[2 * i1 + 1]! - y0, vx = xy[2 * i2]! - x0, vy = xy[2 * i2 + 1]! - y0;
    const det = ux * vy - uy * vx;
    let r0 = 0, r1 = 0, r2 = 0;
    for (let q = 0; q < nq; q++) {
      const s = s0 + (s1 - s0) * INTERVAL_POINTS[2 * q + 1]!;
      const x = ax + s * dx, y = ay + s * dy;
      // barycentric coordinates in e (Cramer's rule)
      const px = x - x0, py = y - y0;
      const l1 = (px * vy - py * vx) / det, l2 = (ux * py - uy * px) / det;
      const w = INTERVAL_WEIGHTS[q]! * (rho ? finiteDensity(rho(x, y), curve, x, y) : 1);
      r0 += w * (1 - l1 - l2);
      r1 += w * l1;
      r2 += w * l2;
    }
    r[i0] = r[i0]! + len * r0;
    r[i1] = r[i1]! + len * r1;
    r[i2] = r[i2]! + len * r2;
  });
}

function finiteDensity(v: number, curve: SourceCurve, x: number, y: number): number {
  if (typeof v !== 'number' || !Number.isFinite(v)) {
    const at = curve.dim === 1 ? `${x}` : `${x}, ${y}`;
    throw new InvalidArgumentError(`${curve.field}.density(${at}) returned ${describeValue(v)}; expected a finite number`, { field: `${curve.field}.density`, expected: 'a finite number', received: describeValue(v) });
  }
  return v;
}

/** First 1D leaf element containing x (closed, up to rounding), or −1. */
function locatePoint(mesh: LeafMesh, x: number): number {
  const el = mesh.elements, xy = mesh.coords;
  let lo = Infinity, hi = -Infinity;
  for (let i = 0; i < mesh.vertexCount; i++) {
    lo = Math.min(lo, xy[i]!);
    hi = Math.max(hi, xy[i]!);
  }
  const tol = EPS * (hi - lo);
  for (let e = 0; e < mesh.elementCount; e++) {
    const a = xy[el[2 * e]!]!, b = xy[el[2 * e + 1]!]!;
    if (x >= Math.min(a, b) - tol && x <= Math.max(a, b) + tol) return e;
  }
  return -1;
}

/** The segments of a curve binned in a uniform grid over its bounding box (at most 64 × 64 cells, compressed rows). */
interface SegmentGrid {
  readonly x0: number; readonly y0: number; readonly x1: number; readonly y1: number;
  readonly nx: number; readonly ny: number; readonly hx: number; readonly hy: number;
  /** Segments of cell c: items[start[c] … start[c + 1]). */
  readonly start: Int32Array;
  readonly items: Int32Array;
  /** Largest side of the bounding box (the scale of the tolerances). */
  readonly w: number;
}

// A curve's grid does not depend on the mesh: made once per curve, for every fibre's load.
const grids = new WeakMap<SourceCurve, SegmentGrid>();

/**
 * The grid of {@link SegmentGrid}: a segment is put in every cell of its bounding box whose centre
 * lies within half a cell diagonal of the segment's line (so in the cells it passes through, and a
 * few neighbours), not in every cell of its box: a long diagonal segment would fill the grid.
 */
function segmentGrid(curve: SourceCurve): SegmentGrid {
  const cached = grids.get(curve);
  if (cached) return cached;
  const P = curve.points;
  const ns = P.length / 2 - 1;
  let x0 = Infinity, x1 = -Infinity, y0 = Infinity, y1 = -Infinity, total = 0;
  for (let k = 0; k <= ns; k++) {
    x0 = Math.min(x0, P[2 * k]!);
    x1 = Math.max(x1, P[2 * k]!);
    y0 = Math.min(y0, P[2 * k + 1]!);
    y1 = Math.max(y1, P[2 * k + 1]!);
    if (k < ns) total += Math.hypot(P[2 * k + 2]! - P[2 * k]!, P[2 * k + 3]! - P[2 * k + 1]!);
  }
  const w = Math.max(x1 - x0, y1 - y0, total * 1e-9);
  const h = w / 64;
  const nx = Math.max(1, Math.min(64, Math.ceil((x1 - x0) / h))), ny = Math.max(1, Math.min(64, Math.ceil((y1 - y0) / h)));
  const hx = Math.max((x1 - x0) / nx, Number.MIN_VALUE), hy = Math.max((y1 - y0) / ny, Number.MIN_VALUE);
  const cellX = (x: number) => Math.min(nx - 1, Math.max(0, Math.floor((x - x0) / hx)));
  const cellY = (y: number) => Math.min(ny - 1, Math.max(0, Math.floor((y - y0) / hy)));
  const reach = 0.5 * Math.hypot(hx, hy) * (1 + 1e-9) + EPS * w;
  // two passes: count, then fill (compressed rows)
  const start = new Int32Array(nx * ny + 1);
  let items = new Int32Array(0);
  for (let pass = 0; pass < 2; pass++) {
    for (let k = 0; k < ns; k++) {
      const ax = P[2 * k]!, ay = P[2 * k + 1]!, bx = P[2 * k + 2]!, by = P[2 * k + 3]!;
      const len = Math.hypot(bx - ax, by - ay);
      for (let j = cellY(Math.min(ay, by)); j <= cellY(Math.max(ay, by)); j++) {
        for (let i = cellX(Math.min(ax, bx)); i <= cellX(Math.max(ax, bx)); i++) {
          const mx = x0 + (i + 0.5) * hx, my = y0 + (j + 0.5) * hy;
          if (Math.abs((bx - ax) * (my - ay) - (by - ay) * (mx - ax)) > reach * len) continue;
          const c = j * nx + i;
          if (pass === 0) start[c + 1]!++;
          else items[start[c]!++] = k;
        }
      }
    }
    if (pass === 0) {
      for (let c = 0; c < nx * ny; c++) start[c + 1]! += start[c]!;
      items = new Int32Array(start[nx * ny]!);
    } else {
      // the fill advanced every start by its count: shift back
      for (let c = nx * ny; c > 0; c--) start[c] = start[c - 1]!;
      start[0] = 0;
    }
  }
  const grid: SegmentGrid = { x0, y0, x1, y1, nx, ny, hx, hy, start, items, w };
  grids.set(curve, grid);
  return grid;
}

/**
 * Calls `piece(segment, element, s0, s1)` for the parts [s0, s1] (parameters along the segment,
 * 0 at its first point) of every segment of a 2D curve inside the leaf elements of `mesh`, each part
 * of the curve once (see the module comment). Elements are found through a bucket grid of the
 * segments, so the cost is about (elements near the curve) + (pieces), not elements × segments.
 */
function forEachPiece(mesh: LeafMesh, curve: SourceCurve, piece: (seg: number, e: number, s0: number, s1: number) => void): void {
  const P = curve.points;
  const ns = P.length / 2 - 1;
  const el = mesh.elements, xy = mesh.coords;
  const { x0: cx0, y0: cy0, x1: cx1, y1: cy1, nx, ny, hx, hy, start, items, w } = segmentGrid(curve);
  const cellX = (x: number) => Math.min(nx - 1, Math.max(0, Math.floor((x - cx0) / hx)));
  const cellY = (y: number) => Math.min(ny - 1, Math.max(0, Math.floor((y - cy0) / hy)));
  const tol = EPS * w;
  // Pieces found, as (segment, s0, s1, element), then swept per segment in order of s0.
  const pSeg: number[] = [], pS0: number[] = [], pS1: number[] = [], pEl: number[] = [];
  const stamp = new Int32Array(ns).fill(-1);
  for (let e = 0; e < mesh.elementCount; e++) {
    const i0 = el[3 * e]!, i1 = el[3 * e + 1]!, i2 = el[3 * e + 2]!;
    const ex0 = Math.min(xy[2 * i0]!, xy[2 * i1]!, xy[2 * i2]!), ex1 = Math.max(xy[2 * i0]!, xy[2 * i1]!, xy[2 * i2]!);
    const ey0 = Math.min(xy[2 * i0 + 1]!, xy[2 * i1 + 1]!, xy[2 * i2 + 1]!), ey1 = Math.max(xy[2 * i0 + 1]!, xy[2 * i1 + 1]!, xy[2 * i2 + 1]!);
    if (ex1 < cx0 - tol || ex0 > cx1 + tol || ey1 < cy0 - tol || ey0 > cy1 + tol) continue;
    for (let j = cellY(ey0 - tol); j <= cellY(ey1 + tol); j++) {
      for (let i = cellX(ex0 - tol); i <= cellX(ex1 + tol); i++) {
        const cell = j * nx + i;
        for (let q = start[cell]!; q < start[cell + 1]!; q++) {
          const k = items[q]!;
          if (stamp[k] === e) continue;
          stamp[k] = e;
          if (clipToTriangle(P, k, xy, i0, i1, i2)) {
            pSeg.push(k);
            pS0.push(clipped[0]!);
            pS1.push(clipped[1]!);
            pEl.push(e);
          }
        }
      }
    }
  }
  const order = Array.from(pSeg.keys()).sort((a, b) => pSeg[a]! - pSeg[b]! || pS0[a]! - pS0[b]!);
  let seg = -1, covered = 0;
  for (const q of order) {
    if (pSeg[q] !== seg) {
      seg = pSeg[q]!;
      covered = 0;
    }
    const s0 = Math.max(pS0[q]!, covered), s1 = pS1[q]!;
    if (s1 - s0 <= 1e-12) continue;
    piece(seg, pEl[q]!, s0, s1);
    covered = s1;
  }
}

/** The range of the last successful clipToTriangle (module scratch: loads are built synchronously). @internal */
export const clipped = new Float64Array(2);

/**
 * Whether segment k of P meets the closed triangle (i0, i1, i2) in a piece of positive length; its
 * parameter range [s0, s1] ⊆ [0, 1] is then in `clipped` (Cyrus–Beck: the intersection of the three
 * edges' half-planes, either orientation). @internal
 */
export function clipToTriangle(P: Float64Array, k: number, xy: Float64Array, i0: number, i1: number, i2: number): boolean {
  const ax = P[2 * k]!, ay = P[2 * k + 1]!, bx = P[2 * k + 2]!, by = P[2 * k + 3]!;
  const orient = Math.sign((xy[2 * i1]! - xy[2 * i0]!) * (xy[2 * i2 + 1]! - xy[2 * i0 + 1]!) - (xy[2 * i1 + 1]! - xy[2 * i0 + 1]!) * (xy[2 * i2]! - xy[2 * i0]!));
  let s0 = 0, s1 = 1;
  for (let m = 0; m < 3; m++) {
    const p = m === 0 ? i0 : m === 1 ? i1 : i2, q = m === 0 ? i1 : m === 1 ? i2 : i0;
    const ex = xy[2 * q]! - xy[2 * p]!, ey = xy[2 * q + 1]! - xy[2 * p + 1]!;
    // f(s) = orient · cross(edge, X(s) − p) ≥ 0 inside; a tolerance relative to the edge and the segment
    const f0 = orient * (ex * (ay - xy[2 * p + 1]!) - ey * (ax - xy[2 * p]!));
    const f1 = orient * (ex * (by - xy[2 * p + 1]!) - ey * (bx - xy[2 * p]!));
    const tol = EPS * Math.hypot(ex, ey) * (Math.hypot(ex, ey) + Math.hypot(bx - ax, by - ay));
    if (f0 < -tol && f1 < -tol) return false;
    if (f0 >= -tol && f1 >= -tol) continue;
    // exactly one end is outside: the segment enters the half-plane (first end outside) or leaves it
    const s = f0 / (f0 - f1);
    if (f0 < -tol) s0 = Math.max(s0, s);
    else s1 = Math.min(s1, s);
    if (s0 >= s1) return false;
  }
  clipped[0] = s0;
  clipped[1] = s1;
  return s1 - s0 > 1e-12;
}
