/**
 * The first adaptive set near concentrated sources that lie close to a held boundary
 * (docs/adaptivity.md §2.1).
 *
 * A source at distance d from a boundary held at a value heats a layer of width about d, which the
 * hats of an element much larger than d cannot represent, nor can the candidates one h-halving
 * finer: the estimator then sees only part of the error. Measured before this rule: a point source
 * at x₀ = 0.01 in the rod (0, 1) of two cells, err/E = 4.7 at the first step (1.0 at x₀ = 0.25);
 * a cable 0.05 from the held edge of the unit square cut into two triangles, E rose 2.3 times over
 * the first three steps. A run with a tolerance could stop at the first step with an error several
 * times the tolerance. So the elements that meet a source are bisected, from the initial mesh
 * down, while their diameter exceeds RESOLUTION · d, d the distance from the part of the source
 * inside the element to the held boundary (and diam(Ω)/512: a cable led in from a held edge is
 * refined toward that point, not forever); sources far from the held boundary, or without one,
 * add nothing.
 */
import type { VertexClosure } from './vertex-closure';
import { EdgeKind } from './boundary';
import { bisectWhere, sampleSpacing } from './data-resolution';
import { clipToTriangle, clipped } from './curve-load';
import { elementDiameter } from './diffusion-time';
import { pointSegmentDistance } from './geometry';
import type { SourceCurve } from './source-curve';

/** Largest diameter of an element meeting a source, in units of the source's distance to the held boundary. */
const RESOLUTION = 4;

/** The closed vertex set that resolves the sources near a held boundary (see the file comment). @internal */
export function curveResolvedSet(closure: VertexClosure, curves: readonly SourceCurve[]): Int32Array {
  const f = closure.forest;
  const created: number[] = [];
  const b = f.boundary;
  const d = f.dim;
  const held: number[] = [];
  for (let e = 0; e < b.edgeCount; e++) {
    const k = b.edgeKind[e]!;
    if (k === EdgeKind.ZeroValue || k === EdgeKind.Value) held.push(b.edgeVertices[2 * e]!, b.edgeVertices[2 * e + 1]!);
  }
  if (curves.length === 0 || held.length === 0) return closure.close(created);
  const floor = sampleSpacing(f) / 4; // diam(Ω)/512: a source on the held boundary does not refine forever
  // distance from the part of the sources inside element e to the held boundary (∞ if none meets e)
  const localDistance = (e: number): number => {
    // read afresh: the forest replaces its arrays when bisection grows it
    const xy = f.vCoord;
    const v = f.eVert;
    let m = Infinity;
    for (const c of curves) {
      const P = c.points;
      if (d === 1) {
        const a = xy[v[2 * e]!]!, z = xy[v[2 * e + 1]!]!, x = P[0]!;
        if (x < Math.min(a, z) || x > Math.max(a, z)) continue;
        for (let h = 0; h < held.length; h += 2) m = Math.min(m, Math.abs(x - xy[held[h]!]!));
        continue;
      }
      for (let s = 0; s + 1 < P.length / 2; s++) {
        if (!clipToTriangle(P, s, xy, v[3 * e]!, v[3 * e + 1]!, v[3 * e + 2]!)) continue;
        const ax = P[2 * s]!, ay = P[2 * s + 1]!, ux = P[2 * s + 2]! - ax, uy = P[2 * s + 3]! - ay;
        const x0 = ax + clipped[0]! * ux, y0 = ay + clipped[0]! * uy, x1 = ax + clipped[1]! * ux, y1 = ay + clipped[1]! * uy;
        for (let h = 0; h < held.length; h += 2) {
          const i = held[h]!, j = held[h + 1]!;
          m = Math.min(m, segmentDistance(x0, y0, x1, y1, xy[2 * i]!, xy[2 * i + 1]!, xy[2 * j]!, xy[2 * j + 1]!));
        }
      }
    }
    return m;
  };
  bisectWhere(closure, created, (e) => {
    const h = elementDiameter(f, e);
    return h > floor && h > RESOLUTION * localDistance(e);
  });
  return closure.close(created);
}

/** Distance between the segments AB and CD in the plane (0 if they cross). */
function segmentDistance(ax: number, ay: number, bx: number, by: number, cx: number, cy: number, dx: number, dy: number): number {
  const cross = (px: number, py: number, qx: number, qy: number, rx: number, ry: number) => (qx - px) * (ry - py) - (qy - py) * (rx - px);
  const d1 = cross(ax, ay, bx, by, cx, cy), d2 = cross(ax, ay, bx, by, dx, dy);
  const d3 = cross(cx, cy, dx, dy, ax, ay), d4 = cross(cx, cy, dx, dy, bx, by);
  if (d1 * d2 < 0 && d3 * d4 < 0) return 0;
  return Math.min(pointSegmentDistance(ax, ay, cx, cy, dx, dy), pointSegmentDistance(bx, by, cx, cy, dx, dy), pointSegmentDistance(cx, cy, ax, ay, bx, by), pointSegmentDistance(dx, dy, ax, ay, bx, by));
}

