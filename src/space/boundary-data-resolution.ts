/**
 * A spatial vertex set on which the boundary-load quadrature resolves the flux and ambient data
 * (docs/adaptivity.md §2.1), the boundary counterpart of ./data-resolution.ts.
 *
 * The loads ∫_Γ q φ ds and ∫_Γ h u_∞ φ ds are computed with the 3-point Gauss rule on each boundary
 * segment of a fibre's leaf mesh (./boundary-load.ts). A flux or ambient value with features much
 * shorter than an initial boundary edge (a heated strip, a jet hitting a wall) falls between those
 * points: its load is about zero, and so are the residual and E (a flux spot of width 0.003 on the
 * 2 × 2 unit square gave u ≡ 0 and E = 0).
 *
 * For every element with a natural boundary edge that carries data, starting from the initial
 * mesh, the edge's own rule is compared with the same rule on 2^m equal sub-segments no longer
 * than the data resolution's sample spacing: if the two nodal loads differ by more than
 * DATA_TOLERANCE of ∫_Γ |data| over all natural edges, the element is bisected and its children
 * are checked in turn (newest-vertex bisection halves the boundary edge within two generations).
 * The data are sampled at the given times. In 1D the boundary is a point and nothing is refined.
 */
import { InvalidArgumentError, describeValue } from '../errors';
import { EdgeKind, naturalDataFactor, naturalEdgeIndex, type BoundaryTables } from './boundary';
import { DATA_TOLERANCE, bisectWhere, sampleSpacing } from './data-resolution';
import { sameValues } from '../numerics/same-values';
import { INTERVAL_POINTS, INTERVAL_WEIGHTS } from './quadrature';
import type { VertexClosure } from './vertex-closure';

/** See the file comment: the closed set that resolves the natural boundary data at `times`. @internal */
export function boundaryDataResolvedSet(closure: VertexClosure, times: readonly number[]): Int32Array {
  const f = closure.forest;
  const tables = f.boundary;
  const created: number[] = [];
  const natural = tables.parts.some((p) => p.kind !== 'value' && p.data !== null);
  if (f.dim === 1 || !natural) return closure.close(created);
  const delta = sampleSpacing(f);
  const coarse = new Float64Array(2), fine = new Float64Array(2);
  let previous: Float64Array | null = null;
  for (const t of times) {
    // The fine rule on every natural initial edge: ∫_Γ |data| (the scale) and the values sampled,
    // whose repetition from the previous time (data constant in time) skips the time.
    const values: number[] = [];
    let scale = 0;
    for (let b = 0; b < tables.edgeCount; b++) {
      const i0 = tables.edgeVertices[2 * b]!, i1 = tables.edgeVertices[2 * b + 1]!;
      scale += edgeLoads(tables, b, t, f.vCoord, i0, i1, delta, fine, values);
    }
    const print = Float64Array.from(values);
    if (previous !== null && sameValues(print, previous)) continue;
    previous = print;
    if (!(scale > 0)) continue;
    bisectWhere(closure, created, (e) => {
      for (let k = 0; k < 3; k++) {
        const b = naturalEdgeIndex(f.eNb[3 * e + k]!);
        if (b < 0) continue;
        // edge k of an element is the one opposite its vertex k
        const i0 = f.eVert[3 * e + ((k + 1) % 3)]!, i1 = f.eVert[3 * e + ((k + 2) % 3)]!;
        edgeLoads(tables, b, t, f.vCoord, i0, i1, Infinity, coarse, null);
        edgeLoads(tables, b, t, f.vCoord, i0, i1, delta, fine, null);
        if (Math.abs(coarse[0]! - fine[0]!) + Math.abs(coarse[1]! - fine[1]!) > DATA_TOLERANCE * scale) return true;
      }
      return false;
    });
  }
  return closure.close(created);
}

/**
 * The two nodal loads ∫ c·data(t) λ_j ds on the segment (i0, i1) of natural initial edge b (c = h on
 * convection edges, 1 on flux edges; 0 without data) by the 3-point rule on 2^m equal sub-segments
 * no longer than `spacing` (m = 0 for spacing = ∞, else 3 ≤ m ≤ 14) into out; returns ∫ |c·data|
 * by the same rule. Pushes the values to `values` when given.
 */
function edgeLoads(tables: BoundaryTables, b: number, t: number, xy: Float64Array, i0: number, i1: number, spacing: number, out: Float64Array, values: number[] | null): number {
  out[0] = 0;
  out[1] = 0;
  const c = naturalDataFactor(tables, b);
  if (c === 0) return 0;
  const p = tables.edgePart[b]!;
  const data = tables.parts[p]!.data!;
  const field = tables.edgeKind[b] === EdgeKind.Convection ? `boundary[${p}].ambient` : `boundary[${p}].flux`;
  const x0 = xy[2 * i0]!, y0 = xy[2 * i0 + 1]!, x1 = xy[2 * i1]!, y1 = xy[2 * i1 + 1]!;
  const len = Math.hypot(x1 - x0, y1 - y0);
  const m = spacing === Infinity ? 0 : Math.min(14, Math.max(3, Math.ceil(Math.log2(len / spacing))));
  const n = 2 ** m;
  let total = 0;
  for (let s = 0; s < n; s++) {
    for (let q = 0; q < INTERVAL_WEIGHTS.length; q++) {
      const l1 = (s + INTERVAL_POINTS[2 * q + 1]!) / n; // barycentric coordinate of (x1, y1)
      const x = (1 - l1) * x0 + l1 * x1, y = (1 - l1) * y0 + l1 * y1;
      const v = data(t, x, y);
      if (!Number.isFinite(v)) {
        throw new InvalidArgumentError(`${field}(${t}, ${x}, ${y}) returned ${describeValue(v)}; expected a finite number`, { field, expected: 'a finite number', received: String(v) });
      }
      values?.push(v);
      const w = (c * len * INTERVAL_WEIGHTS[q]! * v) / n;
      out[0] = out[0]! + w * (1 - l1);
      out[1] = out[1]! + w * l1;
      total += Math.abs(w);
    }
  }
  return total;
}
