/** Point evaluation and nodal values of finite element functions given in hierarchical coordinates. */
import { checkFloat64Array, checkInt32Array, checkNumber, checkNumberArray } from '../validation/index';
import { InvalidArgumentError, describeValue } from '../errors';
import type { SpatialDomain } from './domain';
import { hierarchicalToNodal } from './hierarchical';
import type { LeafMesh } from './leaf-mesh';
import { localIndices } from './operator-plan';

function checkCoeffs(set: Int32Array, coeffs: Float64Array): void {
  checkInt32Array(set, 'set');
  checkFloat64Array(coeffs, 'coeffs', { finite: true });
  if (!(coeffs instanceof Float64Array) || coeffs.length < set.length) {
    throw new InvalidArgumentError(`coeffs must be a Float64Array with one value per vertex of the set (${set.length})`, {
      field: 'coeffs',
      expected: `Float64Array of length ≥ ${set.length}`,
      received: describeValue(coeffs),
    });
  }
}

/**
 * Nodal values on the leaf mesh of `set` (local vertex order of `mesh`; zero on Dirichlet vertices)
 * of the finite element function with hierarchical coefficients `coeffs`.
 *
 * @example
 * ```ts
 * import { rectangleDomain, nodalValues } from 'chronomesh';
 * const dom = rectangleDomain(0, 1, 0, 1, 2, 2);
 * const set = dom.uniformSet(1);
 * const { mesh, values } = nodalValues(dom, set, new Float64Array(set.length).fill(1));
 * console.log(values.length === mesh.vertexCount); // → true
 * ```
 */
export function nodalValues(domain: SpatialDomain, set: Int32Array, coeffs: Float64Array): { mesh: LeafMesh; values: Float64Array } {
  checkCoeffs(set, coeffs);
  const mesh = domain.leafMesh(set);
  const values = new Float64Array(mesh.vertexCount);
  const loc = localIndices(domain, mesh, set);
  for (let i = 0; i < set.length; i++) values[loc[i]!] = coeffs[i]!;
  hierarchicalToNodal(mesh, values);
  return { mesh, values };
}

/**
 * Values at `points` (flat: x0, x1, … in 1D; x0, y0, x1, y1, … in 2D) of the finite element function
 * with hierarchical coefficients `coeffs` on `set`. Each point is located by a bucket search over
 * the initial elements and a descent of the bisection forest (O(depth) per point). Points outside
 * Ω (beyond a relative tolerance of 1e-10) raise an InvalidArgumentError naming the point, unless
 * `opts.outside` is given: then they get that value (e.g. NaN for sampling a bounding-box grid).
 *
 * @example
 * ```ts
 * import { intervalDomain, evaluateAt } from 'chronomesh';
 * const dom = intervalDomain(0, 1, 2);
 * const set = dom.uniformSet(0);
 * console.log(evaluateAt(dom, set, Float64Array.of(1), [0.25])[0]); // → 0.5
 * ```
 */
export function evaluateAt(
  domain: SpatialDomain,
  set: Int32Array,
  coeffs: Float64Array,
  points: ArrayLike<number>,
  out?: Float64Array,
  opts: { outside?: number } = {},
): Float64Array {
  const d = domain.dim;
  checkNumberArray(points, 'points', { finite: false });
  if (opts.outside !== undefined && typeof opts.outside !== 'number') checkNumber(opts.outside, 'opts.outside');
  if (points.length % d !== 0) {
    throw new InvalidArgumentError(`points must be a flat array of ${d === 1 ? 'x' : 'x, y'} values (x0, y0, x1, y1, …); found ${points.length} numbers, an odd count`, {
      field: 'points',
      expected: `length divisible by ${d}`,
      received: describeValue(points),
    });
  }
  const np = points.length / d;
  const res = out ?? new Float64Array(np);
  if (!(res instanceof Float64Array) || res.length < np) {
    throw new InvalidArgumentError(`out must be a Float64Array of length ≥ ${np}`, { field: 'out', expected: `length ≥ ${np}`, received: describeValue(out) });
  }
  const { mesh, values } = nodalValues(domain, set, coeffs);
  const local = domain.beginMeshQuery(mesh);
  const baryVertex = new Int32Array(3);
  const baryWeight = new Float64Array(3);
  try {
    for (let p = 0; p < np; p++) {
      const x = points[p * d]!, y = d === 2 ? points[p * d + 1]! : 0;
      const e = Number.isFinite(x) && Number.isFinite(y) ? domain.locateLeaf(x, y) : -1;
      if (e < 0 && opts.outside !== undefined) {
        res[p] = opts.outside;
        continue;
      }
      if (e < 0) {
        throw new InvalidArgumentError(`points[${p}] = (${d === 1 ? x : `${x}, ${y}`}) lies outside the domain`, {
          field: `points[${p}]`,
          expected: 'a point of the closed domain',
          received: d === 1 ? x : `${x}, ${y}`,
        });
      }
      const nv = leafBarycentric(domain, e, x, y, baryVertex, baryWeight);
      let v = 0;
      for (let k = 0; k < nv; k++) v += baryWeight[k]! * values[local[baryVertex[k]!]!]!;
      res[p] = v;
    }
  } finally {
    domain.endMeshQuery(mesh);
  }
  return res;
}

/**
 * The forest vertices of leaf element e and the barycentric coordinates of (x, y) in it (y ignored
 * in 1D, where the coordinate is clamped to the element) into `vertex` and `weight`; returns their
 * number, dim + 1. @internal
 */
export function leafBarycentric(domain: SpatialDomain, e: number, x: number, y: number, vertex: Int32Array, weight: Float64Array): number {
  const f = domain.forest;
  const c = f.vCoord;
  if (domain.dim === 1) {
    const a = f.eVert[2 * e]!, b = f.eVert[2 * e + 1]!;
    const t = Math.min(1, Math.max(0, (x - c[a]!) / (c[b]! - c[a]!)));
    vertex[0] = a;
    vertex[1] = b;
    weight[0] = 1 - t;
    weight[1] = t;
    return 2;
  }
  const a = f.eVert[3 * e]!, b = f.eVert[3 * e + 1]!, g = f.eVert[3 * e + 2]!;
  const ax = c[2 * a]!, ay = c[2 * a + 1]!, bx = c[2 * b]!, by = c[2 * b + 1]!, gx = c[2 * g]!, gy = c[2 * g + 1]!;
  const det = (bx - ax) * (gy - ay) - (by - ay) * (gx - ax);
  const l1 = ((x - ax) * (gy - ay) - (y - ay) * (gx - ax)) / det;
  const l2 = ((bx - ax) * (y - ay) - (by - ay) * (x - ax)) / det;
  vertex[0] = a;
  vertex[1] = b;
  vertex[2] = g;
  weight[0] = 1 - l1 - l2;
  weight[1] = l1;
  weight[2] = l2;
  return 3;
}
