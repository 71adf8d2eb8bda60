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
  // Bucket grid over the curve's bounding box, cells about one mean segment long.
  let cx0 = Infinity, cx1 = -Infinity, cy0 = Infinity, cy1 = -Infinity, total = 0;
  for (let k = 0; k <= ns; k++) {
    cx0 = Math.min(cx0, P[2 * k]!);
    cx1 = Math.max(cx1, P[2 * k]!);
    cy0 = Math.min(cy0, P[2 * k + 1]!);
    cy1 = Math.max(cy1, P[2 * k + 1]!);
    if (k < ns) total += Math.hypot(P[2 * k + 2]! - P[2 * k]!, P[2 * k + 3]! - P[2 * k + 1]!);
  }
  const w = Math.max(cx1 - cx0, cy1 - cy0, total * 1e-9);
  const h = Math.max(total / ns, w / 64);
  const nx = Math.max(1, Math.min(64, Math.ceil((cx1 - cx0) / h) + 1)), ny = Math.max(1, Math.min(64, Math.ceil((cy1 - cy0) / h) + 1));
  const hx = Math.max((cx1 - cx0) / nx, Number.MIN_VALUE), hy = Math.max((cy1 - cy0) / ny, Number.MIN_VALUE);
  const cellX = (x: number) => Math.min(nx - 1, Math.max(0, Math.floor((x - cx0) / hx)));
  const cellY = (y: number) => Math.min(ny - 1, Math.max(0, Math.floor((y - cy0) / hy)));
  const cells: number[][] = Array.from({ length: nx * ny }, () => []);
  for (let k = 0; k < ns; k++) {
    const a = cellX(Math.min(P[2 * k]!, P[2 * k + 2]!)), b = cellX(Math.max(P[2 * k]!, P[2 * k + 2]!));
    const c = cellY(Math.min(P[2 * k + 1]!, P[2 * k + 3]!)), d = cellY(Math.max(P[2 * k + 1]!, P[2 * k + 3]!));
    for (let j = c; j <= d; j++) for (let i = a; i <= b; i++) cells[j * nx + i]!.push(k);
  }
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
        for (const k of cells[j * nx + i]!) {
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
