/**
 * The curve of a concentrated source (docs/method.md §6.1), checked when the problem is made: one
 * point in 1D, a polyline in 2D, inside the closed domain. Kept apart from the loads
 * (./curve-load.ts), so that a problem's constructor carries only these checks.
 *
 * Inside the domain, exactly: every point where a segment meets a boundary edge (crossing it,
 * touching it or running along it) splits the segment; between two such points the segment is
 * either inside or outside, which its midpoint decides (point location in the initial mesh). A
 * segment that runs along a boundary edge held at a value is refused too: the held value fixes u
 * there, and the source would vanish without a trace. Along an insulated or flux edge it acts as
 * heat put in through that edge.
 */
import { InvalidArgumentError, describeValue } from '../errors';
import type { SpatialDomain } from './domain';
import { EdgeKind } from './boundary';
import { InitialLocator } from './initial-locator';
import { INTERVAL_POINTS, INTERVAL_WEIGHTS } from './quadrature';

/** A checked source curve: `dim` coordinates per point (one point in 1D, a polyline in 2D). */
export interface SourceCurve {
  readonly dim: 1 | 2;
  readonly points: Float64Array;
  /** Density ρ along the curve (per unit length in 2D; a factor in 1D); null for 1. */
  readonly density: ((x: number, y: number) => number) | null;
  /** The field named in errors, e.g. `curveSources[0]`. */
  readonly field: string;
}

/** Relative tolerance of the geometric tests. */
const EPS = 1e-12;

/**
 * Checks `curve` (an array of points, `[x]` in 1D and `[x, y]` in 2D) against `domain` before any
 * work: finite coordinates, one point in 1D and at least two distinct consecutive points in 2D, and
 * the whole curve inside the closed domain. Errors name `${field}.curve[k]`.
 */
export function checkSourceCurve(domain: SpatialDomain, curve: unknown, density: unknown, field: string): SourceCurve {
  const d = domain.dim;
  const where = `${field}.curve`;
  if (!Array.isArray(curve)) {
    throw new InvalidArgumentError(`${where} must be an array of points (${d === 1 ? '[[x]]: one point in 1D' : '[[x, y], …]: a polyline in 2D'}), found ${describeValue(curve)}`, { field: where, expected: 'an array of points', received: describeValue(curve) });
  }
  if (d === 1 && curve.length !== 1) {
    throw new InvalidArgumentError(`${where} has ${curve.length} points; in 1D a concentrated source sits at one point, [[x]]`, { field: where, expected: 'one point', received: curve.length });
  }
  if (d === 2 && curve.length < 2) {
    throw new InvalidArgumentError(`${where} has ${curve.length} point${curve.length === 1 ? '' : 's'}; in 2D a source curve is a polyline of at least two points (a point source is not in H⁻¹ in 2D: spread it over a small disc instead)`, { field: where, expected: 'at least two points', received: curve.length });
  }
  const points = new Float64Array(d * curve.length);
  curve.forEach((p: unknown, k: number) => {
    const ok = p !== null && typeof p === 'object' && typeof (p as ArrayLike<number>).length === 'number' && (p as ArrayLike<number>).length === d;
    if (!ok) throw new InvalidArgumentError(`${where}[${k}] must be a point of ${d} coordinate${d === 1 ? '' : 's'}, found ${describeValue(p)}`, { field: `${where}[${k}]`, expected: `${d} numbers`, received: describeValue(p) });
    for (let j = 0; j < d; j++) {
      const v = (p as ArrayLike<number>)[j];
      if (typeof v !== 'number' || !Number.isFinite(v)) throw new InvalidArgumentError(`${where}[${k}] has coordinate ${describeValue(v)}; expected finite numbers`, { field: `${where}[${k}]`, expected: 'finite numbers', received: describeValue(v) });
      points[d * k + j] = v;
    }
  });
  if (density !== undefined && typeof density !== 'function') {
    throw new InvalidArgumentError(`${field}.density must be a function (x, y) => number, found ${describeValue(density)}`, { field: `${field}.density`, expected: 'a function', received: describeValue(density) });
  }
  const f = domain.forest;
  const xy = f.vCoord;
  const n0 = f.initialVertexCount;
  let lo0 = Infinity, hi0 = -Infinity, lo1 = Infinity, hi1 = -Infinity;
  for (let v = 0; v < n0; v++) {
    lo0 = Math.min(lo0, xy[d * v]!);
    hi0 = Math.max(hi0, xy[d * v]!);
    if (d === 2) {
      lo1 = Math.min(lo1, xy[2 * v + 1]!);
      hi1 = Math.max(hi1, xy[2 * v + 1]!);
    }
  }
  if (d === 1) {
    const x = points[0]!, tol = EPS * (hi0 - lo0);
    if (x < lo0 - tol || x > hi0 + tol) throw new InvalidArgumentError(`${where}[0] = [${x}] lies outside the domain`, { field: `${where}[0]`, expected: 'a point of the closed domain', received: x });
    return { dim: 1, points, density: (density as SourceCurve['density']) ?? null, field };
  }
  const ext = Math.max(hi0 - lo0, hi1 - lo1);
  for (let k = 0; k + 1 < curve.length; k++) {
    const len = Math.hypot(points[2 * k + 2]! - points[2 * k]!, points[2 * k + 3]! - points[2 * k + 1]!);
    if (!(len > EPS * ext)) {
      throw new InvalidArgumentError(`${where}[${k}] and ${where}[${k + 1}] coincide: every segment of a source curve needs a positive length`, { field: `${where}[${k + 1}]`, expected: 'a point distinct from the one before', received: `(${points[2 * k + 2]}, ${points[2 * k + 3]})` });
    }
  }
  const locator = new InitialLocator(f);
  const b = f.boundary;
  const cuts: number[] = [];
  for (let k = 0; k + 1 < curve.length; k++) {
    const ax = points[2 * k]!, ay = points[2 * k + 1]!, ux = points[2 * k + 2]! - ax, uy = points[2 * k + 3]! - ay;
    const len2 = ux * ux + uy * uy;
    cuts.length = 0;
    cuts.push(0, 1);
    for (let e = 0; e < b.edgeCount; e++) {
      const i = b.edgeVertices[2 * e]!, j = b.edgeVertices[2 * e + 1]!;
      const cx = xy[2 * i]!, cy = xy[2 * i + 1]!, vx = xy[2 * j]! - cx, vy = xy[2 * j + 1]! - cy;
      const den = ux * vy - uy * vx;
      const wx = cx - ax, wy = cy - ay;
      if (Math.abs(den) > EPS * Math.sqrt(len2 * (vx * vx + vy * vy))) {
        // lines cross at a + s u = c + r v
        const s = (wx * vy - wy * vx) / den, r = (wx * uy - wy * ux) / den;
        if (s > 0 && s < 1 && r >= -EPS && r <= 1 + EPS) cuts.push(s);
      } else {
        // parallel: the ends of the edge project onto the segment (overlap ends, if collinear)
        const s0 = (wx * ux + wy * uy) / len2, s1 = ((wx + vx) * ux + (wy + vy) * uy) / len2;
        for (const s of [s0, s1]) if (s > 0 && s < 1) cuts.push(s);
        // on the same line, along an edge held at a value: the held value fixes u there, and the
        // source would be lost without a trace
        const collinear = Math.abs(wx * uy - wy * ux) <= EPS * ext * Math.sqrt(len2);
        const kind = b.edgeKind[e]!;
        const overlap = Math.min(1, Math.max(s0, s1)) - Math.max(0, Math.min(s0, s1));
        if (collinear && (kind === EdgeKind.ZeroValue || kind === EdgeKind.Value) && overlap > 1e-9) {
          throw new InvalidArgumentError(
            `segment ${k} of ${where} runs along a boundary edge held at a value (from (${cx}, ${cy}) to (${cx + vx}, ${cy + vy})): the held value fixes u there, so that part of the source would have no effect; move the curve inside, or make that part of the boundary insulated or a flux`,
            { field: `${where}[${k + 1}]`, expected: 'a curve off the held boundary', received: `${(100 * overlap).toFixed(1)} % of segment ${k} on a held edge` },
          );
        }
      }
    }
    cuts.sort((p, q) => p - q);
    let outside = 0;
    for (let c = 0; c + 1 < cuts.length; c++) {
      const m = 0.5 * (cuts[c]! + cuts[c + 1]!);
      if (cuts[c + 1]! - cuts[c]! > EPS && locator.find(ax + m * ux, ay + m * uy) < 0) outside += cuts[c + 1]! - cuts[c]!;
    }
    if (outside > 1e-9) {
      const pct = 100 * outside;
      throw new InvalidArgumentError(
        `segment ${k} of ${where}, from (${ax}, ${ay}) to (${points[2 * k + 2]}, ${points[2 * k + 3]}), leaves the domain (${pct >= 0.1 ? pct.toFixed(1) : pct.toPrecision(2)} % of it lies outside)`,
        { field: `${where}[${k + 1}]`, expected: 'a curve inside the closed domain', received: `${(100 * (1 - outside)).toFixed(1)} % inside` },
      );
    }
  }
  return { dim: 2, points, density: (density as SourceCurve['density']) ?? null, field };
}

/** ∫_Γ |ρ| ds (2D, 3-point Gauss–Legendre per segment) or |ρ(x₀)| (1D): the size of the source. */
export function curveWeight(curve: SourceCurve): number {
  const P = curve.points, rho = curve.density;
  if (curve.dim === 1) return rho ? Math.abs(rho(P[0]!, 0)) : 1;
  let s = 0;
  for (let k = 0; k + 1 < P.length / 2; k++) {
    const ax = P[2 * k]!, ay = P[2 * k + 1]!, ux = P[2 * k + 2]! - ax, uy = P[2 * k + 3]! - ay;
    let w = 0;
    for (let q = 0; q < INTERVAL_WEIGHTS.length; q++) {
      const t = INTERVAL_POINTS[2 * q + 1]!;
      w += INTERVAL_WEIGHTS[q]! * (rho ? Math.abs(rho(ax + t * ux, ay + t * uy)) : 1);
    }
    s += w * Math.hypot(ux, uy);
  }
  return s;
}
