/**
 * A continuous piecewise-linear field given by its values at the vertices of a simplicial mesh
 * (segments in 1D, triangles in 2D), independent of any SpatialDomain: the state of a body at one
 * time, saved from a run (`SpaceTimeSolution.state`) or measured on a triangulation of one's own,
 * to start another run from. Points are located with ./simplex-locator.ts.
 */
import { InvalidArgumentError, InvalidMeshError, describeValue } from '../errors';
import { checkNumberArray, checkOneOf } from '../validation/index';
import { SimplexLocator } from './simplex-locator';
import { checkNoHangingNodes } from './hanging-nodes';
import { checkNoOverlap, type MeshWords } from './mesh-overlap';

/** How the mesh checks name a NodalField's parts. */
const CELL_WORDS: MeshWords = { cell: (e) => `cell ${e}`, cellField: (e) => `cells[${3 * e}..${3 * e + 2}]`, vertex: 'point' };

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
 * The input is checked before anything is built: lengths, finite numbers, point indices in range,
 * cells of positive size, and cells that do not overlap (where they did, a value depended on which
 * of the overlapping cells the point was found in). In 2D the cells must also meet edge to edge: a
 * point inside another cell's edge (a hanging node) is refused, since the field would jump there.
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
    if (d === 1) this.checkSegmentsApart(extent);
    else this.checkTrianglesApart();
  }

  /** Segments must not overlap (they may touch): sorted by their left ends, each starts where the one before ends or later. */
  private checkSegmentsApart(extent: number): void {
    const m = this.cellCount, p = this.points, c = this.cells;
    const left = new Float64Array(m), right = new Float64Array(m);
    for (let e = 0; e < m; e++) {
      const a = p[c[2 * e]!]!, b = p[c[2 * e + 1]!]!;
      left[e] = Math.min(a, b);
      right[e] = Math.max(a, b);
    }
    const order = Array.from({ length: m }, (_, e) => e).sort((a, b) => left[a]! - left[b]! || a - b);
    const slack = 1e-12 * extent;
    for (let k = 1; k < m; k++) {
      const a = order[k - 1]!, b = order[k]!;
      if (left[b]! < right[a]! - slack) {
        throw new InvalidMeshError(`cells ${Math.min(a, b)} and ${Math.max(a, b)} overlap: [${left[a]}, ${right[a]}] and [${left[b]}, ${right[b]}] share more than an end point`, {
          field: 'cells', expected: 'segments that do not overlap', received: `cells ${Math.min(a, b)} and ${Math.max(a, b)}`,
        });
      }
    }
  }

  /**
   * Triangles must not overlap and must meet edge to edge. Checked, in this order:
   *  - an edge belongs to at most two triangles, and two triangles that share an edge lie on
   *    opposite sides of it (a folded or repeated triangle does not);
   *  - no point lies inside a boundary edge (a hanging node: the field would jump along that edge,
   *    and its value there would depend on the cell a point is found in);
   *  - the angles around each point add up to at most one turn, and no two boundary edges cross
   *    (./mesh-overlap.ts: with the checks above this rules out any overlap within one connected
   *    piece of the mesh, however slight);
   *  - no triangle's centroid lies inside another triangle (a piece of the mesh lying wholly
   *    inside another, whose boundaries therefore do not cross).
   */
  private checkTrianglesApart(): void {
    const m = this.cellCount, n = this.pointCount, c = this.cells;
    // Counter-clockwise copy of the cells for the checks of ./mesh-overlap.ts and ./hanging-nodes.ts;
    // swapping corners 1 and 2 of a clockwise cell moves its edge slots 1 and 2 alike.
    const ccw = Int32Array.from(c);
    const slotOf = new Int32Array(3 * m);
    for (let e = 0; e < m; e++) {
      const flip = this.measure(e) < 0;
      if (flip) {
        ccw[3 * e + 1] = c[3 * e + 2]!;
        ccw[3 * e + 2] = c[3 * e + 1]!;
      }
      for (let k = 0; k < 3; k++) slotOf[3 * e + k] = 3 * e + (flip && k > 0 ? 3 - k : k);
    }
    const neighbors = new Int32Array(3 * m).fill(-1);
    // Edges grouped by their lower point (counting sort): entry = 3·cell + corner opposite the edge.
    const start = new Int32Array(n + 1);
    for (let e = 0; e < m; e++) for (let k = 0; k < 3; k++) start[Math.min(c[3 * e + (k + 1) % 3]!, c[3 * e + (k + 2) % 3]!) + 1]!++;
    for (let v = 0; v < n; v++) start[v + 1]! += start[v]!;
    const fill = start.slice(0, n);
    const entry = new Int32Array(3 * m);
    for (let e = 0; e < m; e++) for (let k = 0; k < 3; k++) entry[fill[Math.min(c[3 * e + (k + 1) % 3]!, c[3 * e + (k + 2) % 3]!)]!++] = 3 * e + k;
    const upper = (q: number): number => {
      const e = (q / 3) | 0, k = q % 3;
      return Math.max(c[3 * e + (k + 1) % 3]!, c[3 * e + (k + 2) % 3]!);
    };
    for (let v = 0; v < n; v++) {
      for (let s = start[v]!; s < start[v + 1]!; s++) {
        const q = entry[s]!, w = upper(q);
        let shared = -1;
        for (let t = s + 1; t < start[v + 1]!; t++) {
          const r = entry[t]!;
          if (upper(r) !== w) continue;
          if (shared >= 0) {
            throw new InvalidMeshError(`cells ${(q / 3) | 0}, ${(shared / 3) | 0} and ${(r / 3) | 0} share the edge between points ${v} and ${w}: an edge of a mesh belongs to at most two cells`, {
              field: 'cells', expected: 'cells that do not overlap', received: `cells ${(q / 3) | 0}, ${(shared / 3) | 0}, ${(r / 3) | 0}`,
            });
          }
          shared = r;
          neighbors[slotOf[q]!] = (r / 3) | 0;
          neighbors[slotOf[r]!] = (q / 3) | 0;
          if (this.side(v, w, c[q]!) * this.side(v, w, c[r]!) > 0) {
            const a = (q / 3) | 0, b = (r / 3) | 0;
            throw new InvalidMeshError(`cells ${a} and ${b} lie on the same side of their common edge (points ${v} and ${w}), so they overlap (a folded or repeated cell)`, {
              field: 'cells', expected: 'cells on opposite sides of a shared edge', received: `cells ${a} and ${b}`,
            });
          }
        }
      }
    }
    const bEdges: number[] = [];
    for (let s = 0; s < 3 * m; s++) {
      if (neighbors[s]! >= 0) continue;
      const e = (s / 3) | 0, k = s % 3;
      bEdges.push(s, ccw[3 * e + ((k + 1) % 3)]!, ccw[3 * e + ((k + 2) % 3)]!);
    }
    checkNoHangingNodes(this.points, bEdges, CELL_WORDS);
    checkNoOverlap(this.points, ccw, neighbors, CELL_WORDS);
    const p = this.points;
    for (let e = 0; e < m; e++) {
      const i = c[3 * e]!, j = c[3 * e + 1]!, k = c[3 * e + 2]!;
      const x = (p[2 * i]! + p[2 * j]! + p[2 * k]!) / 3, y = (p[2 * i + 1]! + p[2 * j + 1]! + p[2 * k + 1]!) / 3;
      const f = this.locator.otherHolding(e, x, y, 1e-9);
      if (f >= 0) {
        throw new InvalidMeshError(`cells ${Math.min(e, f)} and ${Math.max(e, f)} overlap: the centroid (${x}, ${y}) of cell ${e} lies inside cell ${f}`, {
          field: 'cells', expected: 'cells that do not overlap', received: `cells ${Math.min(e, f)} and ${Math.max(e, f)}`,
        });
      }
    }
  }

  /** Sign of the area of the triangle (points a, b, c): on which side of the line a → b point c lies. */
  private side(a: number, b: number, cc: number): number {
    const p = this.points;
    return Math.sign((p[2 * b]! - p[2 * a]!) * (p[2 * cc + 1]! - p[2 * a + 1]!) - (p[2 * b + 1]! - p[2 * a + 1]!) * (p[2 * cc]! - p[2 * a]!));
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
