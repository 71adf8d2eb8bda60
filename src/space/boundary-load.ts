/**
 * Boundary loads of the flux and convection parts (./boundary):
 *   ℓ_Γ(t; v) = ∫_{Γ_F} q(t) v ds + ∫_{Γ_C} h u_∞(t) v ds,
 * on the natural boundary segments of a leaf mesh, by the 3-point Gauss–Legendre rule on each
 * segment (exact for data of degree 4 along the segment; ./quadrature); in 1D the boundary is a
 * point and the load is the data value there.
 */
import { InvalidArgumentError, describeValue } from '../errors';
import { EdgeKind, naturalDataFactor, type BoundaryTables } from './boundary';
import type { LeafMesh } from './leaf-mesh';
import { INTERVAL_POINTS, INTERVAL_WEIGHTS } from './quadrature';

/** r += scale · (nodal ℓ_Γ(t; λ_j)) for every local vertex j of `mesh`. Returns false if nothing was added. */
export function addNodalBoundaryLoad(mesh: LeafMesh, tables: BoundaryTables, t: number, scale: number, r: Float64Array): boolean {
  const bs = mesh.boundarySegments;
  if (!bs || bs.count === 0) return false;
  const xy = mesh.coords;
  let any = false;
  for (let s = 0; s < bs.count; s++) {
    const b = bs.edge[s]!;
    const h = naturalDataFactor(tables, b);
    if (h === 0) continue;
    const p = tables.edgePart[b]!;
    const f = tables.parts[p]!.data!;
    const field = tables.edgeKind[b] === EdgeKind.Convection ? `boundary[${p}].ambient` : `boundary[${p}].flux`;
    const i0 = bs.vertices[2 * s]!, i1 = bs.vertices[2 * s + 1]!;
    any = true;
    if (mesh.dim === 1) {
      const v = checked(f(t, xy[i0]!, 0), field, t, xy[i0]!, 0);
      r[i0] = r[i0]! + scale * h * v;
      continue;
    }
    const x0 = xy[2 * i0]!, y0 = xy[2 * i0 + 1]!, x1 = xy[2 * i1]!, y1 = xy[2 * i1 + 1]!;
    const len = Math.hypot(x1 - x0, y1 - y0);
    let s0 = 0, s1 = 0;
    for (let q = 0; q < INTERVAL_WEIGHTS.length; q++) {
      const l0 = INTERVAL_POINTS[2 * q]!, l1 = INTERVAL_POINTS[2 * q + 1]!;
      const x = l0 * x0 + l1 * x1, y = l0 * y0 + l1 * y1;
      const v = INTERVAL_WEIGHTS[q]! * checked(f(t, x, y), field, t, x, y);
      s0 += v * l0;
      s1 += v * l1;
    }
    const c = scale * h * len;
    r[i0] = r[i0]! + c * s0;
    r[i1] = r[i1]! + c * s1;
  }
  return any;
}

function checked(v: number, field: string, t: number, x: number, y: number): number {
  if (typeof v !== 'number' || !Number.isFinite(v)) {
    throw new InvalidArgumentError(`${field}(${t}, ${x}, ${y}) returned ${describeValue(v)}; expected a finite number`, { field, expected: 'finite number', received: String(v) });
  }
  return v;
}
