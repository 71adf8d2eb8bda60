/**
 * The public type of gridded samples ({@link SpaceTimeSolution.sampleGrid}).
 *
 * At run time the object is an `ndarray` view (the `ndarray` package), but the
 * public type is this interface of our own, so TypeScript users need no type
 * package of a third party (and `skipLibCheck: false` consumers compile).
 * The view is structurally a subset of ndarray's, so it can be passed to code
 * written for ndarray after a cast.
 */

/**
 * A strided n-dimensional view over one `Float64Array` (row-major unless sliced or transposed).
 *
 * @example
 * ```ts
 * import { DoubleTree, HeatProblem, SpaceTimeSystem, intervalDomain, type GridView } from 'chronomesh';
 * const domain = intervalDomain(0, 1, 2);
 * const { solution } = new SpaceTimeSystem(new HeatProblem({ domain, T: 1, initial: () => 1 }), DoubleTree.sparseGrid(domain, 4)).solve();
 * const g: GridView = solution.sampleGrid([0.1, 0.5], [0.25, 0.5, 0.75]);
 * const atHalf = g.pick(1, null);                 // u(0.5, ·) at the three points
 * console.log(g.shape, atHalf.shape, atHalf.get(1) === g.get(1, 1)); // → [ 2, 3 ] [ 3 ] true
 * ```
 */
export interface GridView {
  /** The flat storage; element (i, j, …) is `data[offset + i·stride[0] + j·stride[1] + …]`. */
  readonly data: Float64Array;
  readonly shape: number[];
  readonly stride: number[];
  readonly offset: number;
  /** Number of dimensions. */
  readonly dimension: number;
  /** Number of elements, the product of `shape`. */
  readonly size: number;
  /** The element at the given indices (one per dimension). */
  get(...indices: number[]): number;
  /** Writes one element; returns the value written. */
  set(...indicesThenValue: number[]): number;
  /** The position in `data` of the element at the given indices. */
  index(...indices: number[]): number;
  /** A lower-dimensional view: fixes the dimensions given as numbers, keeps those given as null. */
  pick(...indices: (number | null)[]): GridView;
  /** The view restricted to indices ≥ the given ones (null: keep). */
  lo(...indices: (number | null)[]): GridView;
  /** The view restricted to indices < the given ones (null: keep). */
  hi(...indices: (number | null)[]): GridView;
  /** Every n-th element per dimension (negative: reversed). */
  step(...steps: (number | null)[]): GridView;
  /** The view with its dimensions permuted. */
  transpose(...axes: number[]): GridView;
}
