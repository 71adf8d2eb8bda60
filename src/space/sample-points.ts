/**
 * A fixed set of quadrature points over the domain: the element rule of ./quadrature on 4
 * congruent sub-triangles (2 sub-intervals in 1D) of the initial elements, on a strided subset of
 * them when there would be more than asked for (weights scaled by the stride); and the same along
 * the natural boundary edges that carry data. Used to watch how data vary in time at many places at
 * once.
 */
import { naturalDataFactor } from './boundary';
import type { BisectionForest } from './forest';
import { INTERVAL_POINTS, INTERVAL_WEIGHTS, TRIANGLE_POINTS, TRIANGLE_WEIGHTS } from './quadrature';

/** Points (x, y; y = 0 in 1D) and weights (summing to about |Ω|), at most about `maxPoints`. @internal */
export function domainSamplePoints(f: BisectionForest, maxPoints: number): { x: Float64Array; y: Float64Array; w: Float64Array } {
  const ne0 = f.initialElementCount;
  const d = f.dim;
  const per = d === 2 ? 4 * TRIANGLE_WEIGHTS.length : 2 * INTERVAL_WEIGHTS.length;
  const stride = Math.max(1, Math.ceil((ne0 * per) / maxPoints));
  const x: number[] = [], y: number[] = [], w: number[] = [];
  for (let e = 0; e < ne0; e += stride) {
    if (d === 1) {
      const x0 = f.vCoord[f.eVert[2 * e]!]!, x1 = f.vCoord[f.eVert[2 * e + 1]!]!;
      const h = Math.abs(x1 - x0) / 2;
      for (let s = 0; s < 2; s++) {
        for (let q = 0; q < INTERVAL_WEIGHTS.length; q++) {
          const b = (s + INTERVAL_POINTS[2 * q + 1]!) / 2;
          x.push((1 - b) * x0 + b * x1); y.push(0); w.push(stride * h * INTERVAL_WEIGHTS[q]!);
        }
      }
      continue;
    }
    const a = f.eVert[3 * e]!, b = f.eVert[3 * e + 1]!, c = f.eVert[3 * e + 2]!;
    const ax = f.vCoord[2 * a]!, ay = f.vCoord[2 * a + 1]!, bx = f.vCoord[2 * b]!, by = f.vCoord[2 * b + 1]!, cx = f.vCoord[2 * c]!, cy = f.vCoord[2 * c + 1]!;
    const area = (0.5 * Math.abs((bx - ax) * (cy - ay) - (cx - ax) * (by - ay))) / 4;
    // The 2 × 2 regular subdivision: three corner triangles and the middle one (barycentric w.r.t. b, c).
    const subs = [[0, 0, 1, 0, 0, 1], [1, 0, 2, 0, 1, 1], [0, 1, 1, 1, 0, 2], [1, 0, 0, 1, 1, 1]];
    for (const [b0, c0, b1, c1, b2, c2] of subs) {
      for (let q = 0; q < TRIANGLE_WEIGHTS.length; q++) {
        const l0 = TRIANGLE_POINTS[3 * q]!, l1 = TRIANGLE_POINTS[3 * q + 1]!, l2 = TRIANGLE_POINTS[3 * q + 2]!;
        const pb = (l0 * b0! + l1 * b1! + l2 * b2!) / 2, pc = (l0 * c0! + l1 * c1! + l2 * c2!) / 2, pa = 1 - pb - pc;
        x.push(pa * ax + pb * bx + pc * cx); y.push(pa * ay + pb * by + pc * cy); w.push(stride * area * TRIANGLE_WEIGHTS[q]!);
      }
    }
  }
  return { x: Float64Array.from(x), y: Float64Array.from(y), w: Float64Array.from(w) };
}

/**
 * Points on the natural initial boundary edges with flux or ambient data: the 3-point rule on 2
 * halves of each edge (in 1D the end point), on a strided subset of the edges when there would be
 * more than `maxPoints`. Weights are length × rule weight × stride, times h on convection edges;
 * `part` is the boundary part whose data hold at each point. @internal
 */
export function boundarySamplePoints(f: BisectionForest, maxPoints: number): { x: Float64Array; y: Float64Array; w: Float64Array; part: Int32Array } {
  const tables = f.boundary;
  const d = f.dim;
  const edges: number[] = [];
  for (let b = 0; b < tables.edgeCount; b++) if (naturalDataFactor(tables, b) !== 0) edges.push(b);
  const per = d === 2 ? 2 * INTERVAL_WEIGHTS.length : 1;
  const stride = Math.max(1, Math.ceil((edges.length * per) / maxPoints));
  const x: number[] = [], y: number[] = [], w: number[] = [], part: number[] = [];
  for (let i = 0; i < edges.length; i += stride) {
    const b = edges[i]!;
    const c = stride * naturalDataFactor(tables, b);
    const i0 = tables.edgeVertices[2 * b]!, i1 = tables.edgeVertices[2 * b + 1]!;
    if (d === 1) {
      x.push(f.vCoord[i0]!); y.push(0); w.push(c); part.push(tables.edgePart[b]!);
      continue;
    }
    const x0 = f.vCoord[2 * i0]!, y0 = f.vCoord[2 * i0 + 1]!, x1 = f.vCoord[2 * i1]!, y1 = f.vCoord[2 * i1 + 1]!;
    const len = Math.hypot(x1 - x0, y1 - y0);
    for (let s = 0; s < 2; s++) {
      for (let q = 0; q < INTERVAL_WEIGHTS.length; q++) {
        const l1 = (s + INTERVAL_POINTS[2 * q + 1]!) / 2;
        x.push((1 - l1) * x0 + l1 * x1); y.push((1 - l1) * y0 + l1 * y1); w.push((c * len * INTERVAL_WEIGHTS[q]!) / 2); part.push(tables.edgePart[b]!);
      }
    }
  }
  return { x: Float64Array.from(x), y: Float64Array.from(y), w: Float64Array.from(w), part: Int32Array.from(part) };
}
