/**
 * A continuous piecewise-linear field given by its values at the vertices of a simplicial mesh
 * (segments in 1D, triangles in 2D), independent of any SpatialDomain: the state of a body at one
 * time, saved from a run (`SpaceTimeSolution.state`) or measured on a triangulation of one's own,
 * to start another run from. Points are located with ./simplex-locator.ts.
 */
import { InvalidArgumentError, InvalidMeshError, describeValue } from '../errors';
import { checkNumberArray, checkOneOf } from '../validation/index';
import { SimplexLocator } from './simplex-locator';

/** The arrays of a {@link NodalField}: flat, `dim` coordinates per point and `dim + 1` point indices per cell. */
export interface NodalFieldData {
  dim: 1 | 2;
  /** Coordinates: x0, x1, … in 1D; x0, y0, x1, y1, … in 2D. */
  points: ArrayLike<number>;
  /** Point indices (from 0): two per segment in 1D, three per triangle in 2D, either orientation. */
  cells: ArrayLike<number>;
  /** One value per point. */
  values: ArrayLike<number>;
}

/** Relative size below which a cell counts as degenerate (against the mesh's extent to the power dim). */
const DEGENERATE = 1e-14;

/**
 * A continuous piecewise-linear field on a conforming simplicial mesh: `valueAt(x, y)` interpolates
 * linearly in the cell containing the point (O(1) per point on meshes of bounded grading), and a
 * point outside the mesh is an error naming it. Use it as the initial state of a run that continues
 * another one, or to bring a measured field into a problem.
 *
 * The input is checked before anything is built: lengths, finite numbers, point indices in range
 * and cells of positive size; that the cells do not overlap is not checked.
 *
 * @example
 * ```ts
 * import { HeatProblem, NodalField, rectangleDomain, solveAdaptive } from 'chronomesh';
 * // the state u = x + y on two triangles of the unit square
 * const field = new NodalField({ dim: 2, points: [0, 0, 1, 0, 1, 1, 0, 1], cells: [0, 1, 2, 0, 2, 3], values: [0, 1, 2, 1] });
 * console.log(field.valueAt(0.25, 0.5)); // → 0.75
 * const next = new HeatProblem({ domain: rectangleDomain(0, 1, 0, 1, 2, 2), T: 0.1, initial: field });
 * console.log(solveAdaptive(next, { maxUnknowns: 500 }).history.length > 0); // → true
 * ```
 */
export class NodalField {
  readonly dim: 1 | 2;
  readonly points: Float64Array;
  readonly cells: Int32Array;
  readonly values: Float64Array;
  private readonly locator: SimplexLocator;
  private readonly weights = new Float64Array(3);

  constructor(data: NodalFieldData) {
    if (data === null || typeof data !== 'object') {
      throw new InvalidArgumentError(`a NodalField needs { dim, points, cells, values }, found ${describeValue(data)}`, { field: 'data', expected: '{ dim, points, cells, values }', received: describeValue(data) });
    }
    const d = checkOneOf(data.dim, 'dim', [1, 2] as const);
    const nv = d + 1;
    checkNumberArray(data.points, 'points', { minLength: d * nv });
    if (data.points.length % d !== 0) {
      throw new InvalidArgumentError(`points holds ${data.points.length} numbers, not a multiple of ${d} (${d === 1 ? 'x' : 'x, y'} per point)`, { field: 'points', expected: `length divisible by ${d}`, received: data.points.length });
    }
    const n = data.points.length / d;
    checkNumberArray(data.cells, 'cells', { minLength: nv });
    if (data.cells.length % nv !== 0) {
      throw new InvalidArgumentError(`cells holds ${data.cells.length} indices, not a multiple of ${nv} (${nv} point indices per ${d === 1 ? 'segment' : 'triangle'})`, { field: 'cells', expected: `length divisible by ${nv}`, received: data.cells.length });
    }
    checkNumberArray(data.values, 'values', { length: n });
    for (let k = 0; k < data.cells.length; k++) {
      const v = data.cells[k]!;
      if (!Number.isInteger(v) || v < 0 || v >= n) {
        const where = `cells[${k}] (cell ${Math.floor(k / nv)}, corner ${k % nv})`;
        throw new InvalidArgumentError(`${where} = ${describeValue(v)} is not a point index in [0, ${n - 1}]`, { field: `cells[${k}]`, expected: `an integer in [0, ${n - 1}]`, received: v });
      }
    }
    this.dim = d;
    this.points = Float64Array.from(data.points);
    this.cells = Int32Array.from(data.cells);
    this.values = Float64Array.from(data.values);
    const m = this.cells.length / nv;
    let extent = 0;
    for (let j = 0; j < d; j++) {
      let lo = Infinity, hi = -Infinity;
      for (let i = 0; i < n; i++) {
        lo = Math.min(lo, this.points[d * i + j]!);
        hi = Math.max(hi, this.points[d * i + j]!);
      }
      extent = Math.max(extent, hi - lo);
    }
    const small = DEGENERATE * extent ** d;
    for (let e = 0; e < m; e++) {
      if (!(Math.abs(this.measure(e)) > small)) {
        throw new InvalidMeshError(`cell ${e} has zero ${d === 1 ? 'length' : 'area'} (its points coincide or are collinear)`, { field: `cells[${nv * e}..${nv * e + d}]`, expected: 'a cell of positive size', received: Array.from(this.cells.subarray(nv * e, nv * e + nv)).join(', ') });
      }
    }
    this.locator = new SimplexLocator(d, this.points, this.cells, m);
  }

  /** Number of points (vertices). */
  get pointCount(): number {
    return this.values.length;
  }

  /** Number of cells (segments or triangles). */
  get cellCount(): number {
    return this.cells.length / (this.dim + 1);
  }

  /** Whether (x, y) (y ignored in 1D) lies in the closed mesh, up to a relative rounding tolerance. */
  contains(x: number, y = 0): boolean {
    return this.locator.find(x, y) >= 0;
  }

  /** The field at (x, y) (y ignored in 1D); a point outside the mesh raises an InvalidArgumentError naming it. */
  valueAt(x: number, y = 0): number {
    const e = this.locator.find(x, y);
    if (e < 0) {
      const p = this.dim === 1 ? `x = ${x}` : `(${x}, ${y})`;
      throw new InvalidArgumentError(`the point ${p} lies outside the field's mesh`, { field: 'point', expected: 'a point of the mesh', received: this.dim === 1 ? x : `${x}, ${y}` });
    }
    const w = this.weights;
    this.locator.barycentric(e, x, y, w);
    const nv = this.dim + 1, c = this.cells, v = this.values;
    let s = 0;
    for (let k = 0; k < nv; k++) s += w[k]! * v[c[nv * e + k]!]!;
    return s;
  }

  /** Signed length (1D) or area (2D) of cell e. */
  private measure(e: number): number {
    const p = this.points, c = this.cells;
    if (this.dim === 1) return p[c[2 * e + 1]!]! - p[c[2 * e]!]!;
    const i = c[3 * e]!, j = c[3 * e + 1]!, k = c[3 * e + 2]!;
    return 0.5 * ((p[2 * j]! - p[2 * i]!) * (p[2 * k + 1]! - p[2 * i + 1]!) - (p[2 * j + 1]! - p[2 * i + 1]!) * (p[2 * k]! - p[2 * i]!));
  }
}
