/** Small geometric predicates on forest elements. */
import type { BisectionForest } from './forest';

/**
 * True if the segment q = [x0, y0, x1, y1] (a point when both ends coincide; in 1D q = [x0, x1])
 * meets forest element e, with a relative tolerance of 1e-10 of the element size.
 * In 2D the segment is clipped against the three edge half-planes (Cyrus–Beck clipping).
 */
export function segmentMeetsElement(f: BisectionForest, e: number, q: ArrayLike<number>): boolean {
  const c = f.vCoord;
  if (f.dim === 1) {
    const a = c[f.eVert[2 * e]!]!, b = c[f.eVert[2 * e + 1]!]!;
    const tol = 1e-10 * (b - a);
    const lo = Math.min(q[0]!, q[1]!), hi = Math.max(q[0]!, q[1]!);
    return hi >= a - tol && lo <= b + tol;
  }
  const v0 = f.eVert[3 * e]!, v1 = f.eVert[3 * e + 1]!, v2 = f.eVert[3 * e + 2]!;
  const xs = [c[2 * v0]!, c[2 * v1]!, c[2 * v2]!];
  const ys = [c[2 * v0 + 1]!, c[2 * v1 + 1]!, c[2 * v2 + 1]!];
  const size = Math.max(Math.abs(xs[0]! - xs[1]!), Math.abs(ys[0]! - ys[1]!));
  let t0 = 0, t1 = 1;
  const px = q[0]!, py = q[1]!, dx = q[2]! - px, dy = q[3]! - py;
  for (let k = 0; k < 3; k++) {
    const ax = xs[k]!, ay = ys[k]!, bx = xs[(k + 1) % 3]!, by = ys[(k + 1) % 3]!;
    const ex = bx - ax, ey = by - ay;
    const len = Math.hypot(ex, ey);
    // signed distance of p + t d to the edge line (positive inside for CCW), plus tolerance
    const f0 = (ex * (py - ay) - ey * (px - ax)) / len + 1e-10 * size;
    const fd = (ex * dy - ey * dx) / len;
    if (fd === 0) {
      if (f0 < 0) return false;
    } else {
      const t = -f0 / fd;
      if (fd > 0) t0 = Math.max(t0, t);
      else t1 = Math.min(t1, t);
      if (t0 > t1) return false;
    }
  }
  return true;
}

/** Distance from the point P to the segment QR (a point when Q = R). @internal */
export function pointSegmentDistance(px: number, py: number, qx: number, qy: number, rx: number, ry: number): number {
  const ux = rx - qx, uy = ry - qy;
  const l2 = ux * ux + uy * uy;
  const t = l2 > 0 ? Math.max(0, Math.min(1, ((px - qx) * ux + (py - qy) * uy) / l2)) : 0;
  return Math.hypot(px - qx - t * ux, py - qy - t * uy);
}
