/**
 * A discrete space-time function u = Σ_{(λ,ν)∈Λ} u_{λν} σ_λ ⊗ φ_ν
 * (docs/method.md §8): point values and time slices.
 *
 * At time t only the trial functions whose support contains t are nonzero
 * (a few per level); since hierarchical hats do not depend on the set they are
 * used in, their fibre functions combine on the union of their fibres by
 * adding coefficients. Finding those functions scans every temporal node of
 * the set (O(#nodes) per time; a descent from the roots would be O(levels)).
 *
 * With prescribed boundary values the coefficients are those of w = u − G, G the lifting of
 * the values (src/space/boundary-lifting.ts); evaluation, grids and slices return u = w + G.
 */
import { ndarray } from '../vendor/ndarray';
import type { GridView } from './grid-view';
import { InvalidArgumentError, describeValue } from '../errors';
import { evaluateTemporal } from '../time/index';
import { NodalField, SpatialDomain, evaluateAt, nodalValues } from '../space/index';
import { checkSetOnDomain } from '../spacetime/set-checks';
import type { LeafMesh } from '../space/leaf-mesh';
import { liftingOf } from '../space/boundary-lifting';
import type { DoubleTree } from './double-tree';
import { positionsIn, unionSorted } from './fibre-pool';
import { PointSeriesOperator, checkSeriesInput } from './point-series';
import { checkFloat64Array, checkInstance, checkMemory, checkNumber, checkNumberArray, checkOptions } from '../validation/index';

/** Nodal values of u(t, ·) on the leaf mesh of the union of the fibres active at t. */
export interface TimeSlice {
  t: number;
  mesh: LeafMesh;
  values: Float64Array;
}

/**
 * A discrete space-time function on a trial double tree: point values and time slices.
 *
 * @example
 * ```ts
 * import { DoubleTree, HeatProblem, SpaceTimeSystem, intervalDomain } from 'chronomesh';
 * const domain = intervalDomain(0, 1, 2);
 * const { solution } = new SpaceTimeSystem(new HeatProblem({ domain, T: 1, initial: () => 1 }), DoubleTree.sparseGrid(domain, 5)).solve();
 * console.log(solution.evaluate(0.1, [0.25, 0.5]), solution.slice(0.1).values.length);
 * ```
 */
export class SpaceTimeSolution {
  constructor(
    readonly domain: SpatialDomain,
    readonly trialSet: DoubleTree,
    readonly coefficients: Float64Array,
    readonly T: number,
  ) {
    checkInstance(domain, SpatialDomain, 'domain', 'a SpatialDomain');
    checkSetOnDomain(trialSet, domain, 'trialSet');
    checkFloat64Array(coefficients, 'coefficients', { length: trialSet.size, finite: true });
    checkNumber(T, 'T', { min: 0, minOpen: true });
  }

  /** Hierarchical coefficients of u(t, ·) on the union of the active fibres. */
  spatialCoefficients(t: number): { set: Int32Array; coeffs: Float64Array } {
    if (typeof t !== 'number' || !Number.isFinite(t) || t < 0 || t > this.T) {
      throw new InvalidArgumentError(`time t = ${describeValue(t)} is outside [0, ${this.T}]`, { field: 't', expected: `[0, ${this.T}]`, received: t });
    }
    const { tree } = this.trialSet;
    const active: number[] = [];
    const values: number[] = [];
    for (let i = 0; i < tree.size; i++) {
      const v = evaluateTemporal('trial', tree.level[i]!, tree.index[i]!, 0, t, this.T).value;
      if (v !== 0 && this.trialSet.fibre(i).length > 0) {
        active.push(i);
        values.push(v);
      }
    }
    const set = unionSorted(active.map((i) => this.trialSet.fibre(i)));
    const coeffs = new Float64Array(set.length);
    active.forEach((i, a) => {
      const map = positionsIn(this.trialSet.fibre(i), set);
      const o = this.trialSet.functionOffset[i]!;
      const s = values[a]!;
      for (let p = 0; p < map.length; p++) coeffs[map[p]!]! += s * this.coefficients[o + p]!;
    });
    return { set, coeffs };
  }

  /**
   * u(t, x) at the given points (`[x0, x1, …]` in 1D, `[x0, y0, x1, y1, …]` in 2D). Each call
   * builds u(t, ·) on its leaf mesh (time linear in the set's size), so pass all points of one
   * time in one call; for many calls at one time, such as an initial state sampled point by point,
   * use {@link SpaceTimeSolution.state} once and its `valueAt`; for many times at fixed points
   * (sensor histories), {@link SpaceTimeSolution.sampleAtPoints}.
   */
  evaluate(t: number, points: ArrayLike<number>): Float64Array {
    const { set, coeffs } = this.spatialCoefficients(t);
    const out = evaluateAt(this.domain, set, coeffs, points);
    liftingOf(this.domain.forest).addAtPoints(t, points, out);
    return out;
  }

  /**
   * u on a tensor grid of times and coordinates, as a {@link GridView} (an
   * ndarray view at run time) over one Float64Array: shape [times, xs] in 1D and [times, xs, ys] in 2D, so
   * `grid.get(k, i, j)` = u(times[k], xs[i], ys[j]). Points outside Ω get
   * `outside` (default NaN), so a bounding-box grid of a non-convex domain works.
   *
   * @example
   * ```ts
   * import { DoubleTree, HeatProblem, SpaceTimeSystem, lShapeDomain } from 'chronomesh';
   * const domain = lShapeDomain(1);
   * const { solution } = new SpaceTimeSystem(new HeatProblem({ domain, T: 1, initial: () => 1 }), DoubleTree.sparseGrid(domain, 3)).solve();
   * const g = solution.sampleGrid([0.01, 0.1], [-0.5, 0.5], [-0.5, 0.5]);
   * console.log(g.shape, g.get(1, 0, 1) > 0, g.get(1, 1, 0)); // → [ 2, 2, 2 ] true NaN — (0.5, -0.5) is outside the L
   * ```
   */
  sampleGrid(times: ArrayLike<number>, xs: ArrayLike<number>, ys?: ArrayLike<number>, opts: { outside?: number } = {}): GridView {
    const d = this.domain.dim;
    if (d === 2 && ys === undefined) throw new InvalidArgumentError('a 2D solution needs both xs and ys', { field: 'ys' });
    if (d === 1 && ys !== undefined) throw new InvalidArgumentError('a 1D solution takes no ys', { field: 'ys' });
    checkNumberArray(times, 'times');
    checkNumberArray(xs, 'xs');
    if (ys !== undefined) checkNumberArray(ys, 'ys');
    const o = checkOptions<{ outside?: number }>(opts, 'opts', ['outside']);
    if (o.outside !== undefined && typeof o.outside !== 'number') checkNumber(o.outside, 'opts.outside');
    const nx = xs.length;
    const ny = ys ? ys.length : 1;
    const cells = times.length * nx * ny;
    checkMemory(8 * (cells + nx * ny * d), `sampleGrid of ${times.length} × ${nx}${d === 2 ? ` × ${ny}` : ''} values`, times.length >= nx && times.length >= ny ? 'times' : nx >= ny ? 'xs' : 'ys', 'sample fewer points');
    for (let k = 0; k < times.length; k++) {
      const t = times[k]!;
      if (t < 0 || t > this.T) throw new InvalidArgumentError(`times[${k}] = ${t} is outside [0, ${this.T}]`, { field: `times[${k}]`, expected: `[0, ${this.T}]`, received: t });
    }
    const pts = new Float64Array(nx * ny * d);
    for (let i = 0; i < nx; i++) {
      for (let j = 0; j < ny; j++) {
        const p = i * ny + j;
        pts[d * p] = xs[i]!;
        if (d === 2) pts[d * p + 1] = ys![j]!;
      }
    }
    const data = new Float64Array(times.length * nx * ny);
    const outside = opts.outside ?? NaN;
    for (let k = 0; k < times.length; k++) {
      const { set, coeffs } = this.spatialCoefficients(times[k]!);
      const view = data.subarray(k * nx * ny, (k + 1) * nx * ny);
      evaluateAt(this.domain, set, coeffs, pts, view, { outside });
      liftingOf(this.domain.forest).addAtPoints(times[k]!, pts, view);
    }
    return ndarray(data, d === 1 ? [times.length, nx] : [times.length, nx, ny]);
  }

  /**
   * u at scattered points for many times (sensor histories), as a {@link GridView} of shape
   * [times, points]: `view.get(k, p)` = u(times[k], point p). `points` is flat as in
   * {@link SpaceTimeSolution.evaluate}. The spatial work is done once for all times (the value of
   * every temporal function at every point), so each time costs O(levels · points) where
   * `evaluate` and `sampleGrid` build u(t, ·) on a leaf mesh per time. Points outside Ω get
   * `opts.outside` (default NaN); times outside [0, T] and non-finite coordinates are typed errors
   * naming the entry.
   *
   * @example
   * ```ts
   * import { HeatProblem, rectangleDomain, solveAdaptive } from 'chronomesh';
   * const domain = rectangleDomain(0, 1, 0, 1, 2, 2);
   * const { solution } = solveAdaptive(new HeatProblem({ domain, T: 0.5, initial: () => 1 }), { maxUnknowns: 3000 });
   * const times = Array.from({ length: 101 }, (_, k) => k * 0.005);
   * const h = solution.sampleAtPoints(times, [0.5, 0.5, 0.1, 0.1]); // two sensors
   * console.log(h.shape, h.get(100, 0) < h.get(10, 0)); // → [ 101, 2 ] true — the centre cools
   * ```
   */
  sampleAtPoints(times: ArrayLike<number>, points: ArrayLike<number>, opts: { outside?: number } = {}): GridView {
    checkNumberArray(times, 'times');
    checkNumberArray(points, 'points', { finite: false });
    checkSeriesInput(this.domain, this.T, times, points);
    const o = checkOptions<{ outside?: number }>(opts, 'opts', ['outside']);
    if (o.outside !== undefined && typeof o.outside !== 'number') checkNumber(o.outside, 'opts.outside');
    const np = points.length / this.domain.dim;
    // the output here; the operator checks its own work array (per temporal function and point)
    checkMemory(8 * times.length * np, `sampleAtPoints of ${times.length} times × ${np} points`, 'times', 'sample fewer times or points per call');
    const E = new PointSeriesOperator(this.domain, this.trialSet, this.T, times, points);
    const data = new Float64Array(E.rowCount);
    E.apply(this.coefficients, data);
    const lifting = liftingOf(this.domain.forest);
    const outside = opts.outside ?? NaN;
    for (let k = 0; k < times.length; k++) {
      const row = data.subarray(k * np, (k + 1) * np);
      lifting.addAtPoints(times[k]!, points, row);
      for (let p = 0; p < np; p++) if (!E.inside[p]) row[p] = outside;
    }
    return ndarray(data, [times.length, np]);
  }

  /** Nodal values of u(t, ·) on its leaf mesh. */
  slice(t: number): TimeSlice {
    const { set, coeffs } = this.spatialCoefficients(t);
    const { mesh, values } = nodalValues(this.domain, set, coeffs);
    liftingOf(this.domain.forest).addNodal(mesh, t, values);
    return { t, mesh, values };
  }

  /**
   * u(t, ·) as a {@link NodalField} on its leaf mesh, detached from this solution: the state to
   * start a run that continues this one (its initial state), evaluated in O(1) per point.
   *
   * @example
   * ```ts
   * import { HeatProblem, solveAdaptive, rectangleDomain } from 'chronomesh';
   * const domain = rectangleDomain(0, 1, 0, 1, 2, 2);
   * const first = solveAdaptive(new HeatProblem({ domain, T: 0.05, initial: () => 1 }), { maxUnknowns: 800 });
   * const end = first.solution.state(0.05);
   * const second = solveAdaptive(new HeatProblem({ domain, T: 0.05, initial: end }), { maxUnknowns: 800 });
   * console.log(end.valueAt(0.5, 0.5) > second.solution.evaluate(0.05, [0.5, 0.5])[0]!); // → true — it keeps cooling
   * ```
   */
  state(t: number): NodalField {
    const { mesh, values } = this.slice(t);
    return new NodalField({ dim: mesh.dim, points: mesh.coords, cells: mesh.elements, values });
  }
}
