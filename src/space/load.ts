/** Load vectors ∫ f φ in hierarchical coordinates (docs/method.md §4.2). */
import { InvalidArgumentError, describeValue } from '../errors';
import type { SpatialDomain } from './domain';
import { hierarchicalToNodalTransposed } from './hierarchical';
import type { LeafMesh } from './leaf-mesh';
import { localIndices } from './operator-plan';
import { INTERVAL_POINTS, INTERVAL_WEIGHTS, TRIANGLE_POINTS, TRIANGLE_WEIGHTS } from './quadrature';
import { nodalCurveLoad } from './curve-load';
import type { SourceCurve } from './source-curve';

/**
 * Nodal load ∫ f λ_j on every local vertex of `mesh`, added into `r` (length vertexCount), by the
 * degree-5 rules of ./quadrature on each leaf element.
 */
export function nodalLoad(mesh: LeafMesh, f: (x: number, y: number) => number, r: Float64Array): void {
  const el = mesh.elements, xy = mesh.coords;
  if (mesh.dim === 1) {
    const nq = INTERVAL_WEIGHTS.length;
    for (let e = 0; e < mesh.elementCount; e++) {
      const i0 = el[2 * e]!, i1 = el[2 * e + 1]!;
      const x0 = xy[i0]!, x1 = xy[i1]!, h = Math.abs(x1 - x0);
      let s0 = 0, s1 = 0;
      for (let q = 0; q < nq; q++) {
        const l0 = INTERVAL_POINTS[2 * q]!, l1 = INTERVAL_POINTS[2 * q + 1]!;
        const v = INTERVAL_WEIGHTS[q]! * f(l0 * x0 + l1 * x1, 0);
        s0 += v * l0;
        s1 += v * l1;
      }
      r[i0] = r[i0]! + h * s0;
      r[i1] = r[i1]! + h * s1;
    }
    return;
  }
  const nq = TRIANGLE_WEIGHTS.length;
  for (let e = 0; e < mesh.elementCount; e++) {
    const i0 = el[3 * e]!, i1 = el[3 * e + 1]!, i2 = el[3 * e + 2]!;
    const x0 = xy[2 * i0]!, y0 = xy[2 * i0 + 1]!, x1 = xy[2 * i1]!, y1 = xy[2 * i1 + 1]!, x2 = xy[2 * i2]!, y2 = xy[2 * i2 + 1]!;
    const area = 0.5 * Math.abs((x1 - x0) * (y2 - y0) - (x2 - x0) * (y1 - y0));
    let s0 = 0, s1 = 0, s2 = 0;
    for (let q = 0; q < nq; q++) {
      const l0 = TRIANGLE_POINTS[3 * q]!, l1 = TRIANGLE_POINTS[3 * q + 1]!, l2 = TRIANGLE_POINTS[3 * q + 2]!;
      const v = TRIANGLE_WEIGHTS[q]! * f(l0 * x0 + l1 * x1 + l2 * x2, l0 * y0 + l1 * y1 + l2 * y2);
      s0 += v * l0;
      s1 += v * l1;
      s2 += v * l2;
    }
    r[i0] = r[i0]! + area * s0;
    r[i1] = r[i1]! + area * s1;
    r[i2] = r[i2]! + area * s2;
  }
}

/**
 * Load vector in hierarchical coordinates: out[i] = ∫_Ω f φ_{set[i]} (quadrature exact for
 * f of degree 4; see ./quadrature for the rules). Non-finite values of f raise an error.
 *
 * @example
 * ```ts
 * import { rectangleDomain, loadVector } from 'chronomesh';
 * const dom = rectangleDomain(0, 1, 0, 1, 2, 2);
 * const set = dom.uniformSet(1);
 * const b = loadVector(dom, set, (x, y) => x * y);
 * ```
 */
export function loadVector(domain: SpatialDomain, set: Int32Array, f: (x: number, y: number) => number, out?: Float64Array): Float64Array {
  if (typeof f !== 'function') {
    throw new InvalidArgumentError(`f must be a function (x, y) => number, received ${describeValue(f)}`, { field: 'f', expected: 'function', received: describeValue(f) });
  }
  const mesh = domain.leafMesh(set);
  const res = out ?? new Float64Array(set.length);
  if (!(res instanceof Float64Array) || res.length < set.length) {
    throw new InvalidArgumentError(`out must be a Float64Array of length ≥ ${set.length}`, { field: 'out', expected: `length ≥ ${set.length}`, received: describeValue(out) });
  }
  hierarchicalLoad(domain, set, mesh, (r) => nodalLoad(mesh, f, r), res);
  for (let i = 0; i < set.length; i++) {
    const v = res[i]!;
    if (!Number.isFinite(v)) {
      throw new InvalidArgumentError(`f produced a non-finite value near vertex ${set[i]} (load entry ${i} is ${describeValue(v)})`, {
        field: 'f',
        expected: 'finite values on Ω',
        received: v,
      });
    }
  }
  return res;
}

/**
 * The nodal load that `addNodal` adds into a zeroed vector on `mesh` (the leaf mesh of `set`),
 * turned into hierarchical coordinates and read off at the entries of `set` into `res`.
 */
function hierarchicalLoad(domain: SpatialDomain, set: Int32Array, mesh: LeafMesh, addNodal: (r: Float64Array) => void, res: Float64Array): Float64Array {
  const r = new Float64Array(mesh.vertexCount);
  addNodal(r);
  hierarchicalToNodalTransposed(mesh, r);
  const loc = localIndices(domain, mesh, set);
  for (let i = 0; i < set.length; i++) res[i] = r[loc[i]!]!;
  return res;
}

/**
 * Load vector of a source curve in hierarchical coordinates: out[i] = ∫_Γ ρ φ_{set[i]} ds (2D) or
 * ρ(x₀) φ_{set[i]}(x₀) (1D), as loadVector does for sources spread over the domain (./curve-load.ts).
 */
export function curveLoadVector(domain: SpatialDomain, set: Int32Array, curve: SourceCurve): Float64Array {
  const mesh = domain.leafMesh(set);
  return hierarchicalLoad(domain, set, mesh, (r) => nodalCurveLoad(mesh, curve, r), new Float64Array(set.length));
}
