/**
 * Space-time error norms of a discrete solution against a known solution,
 * for verification studies: ‖u − u_δ‖_{L2(I; H¹₀)} (gradient part) and
 * ‖u − u_δ‖_{L2(I; L2)}.
 *
 * Time integrals use Gauss points on every interval between consecutive
 * breakpoints of the trial functions present (u_δ is linear in t there), so
 * the cost follows the temporal tree, not a uniform mesh. Space integrals use
 * the degree-5 triangle rule / 3-point Gauss rule on the leaf mesh of each slice.
 */
import { InvalidArgumentError } from '../errors';
import { checkCallbackResult, checkFunction, checkInstance, checkObject, checkOptions } from '../validation/index';
import { SpaceTimeSolution as SolutionClass } from './space-time-solution';
import { nodeSupport } from '../time/index';
import { TRIANGLE_POINTS, TRIANGLE_WEIGHTS, INTERVAL_POINTS, INTERVAL_WEIGHTS } from '../space/quadrature';
import { gaussLegendre01 } from '../numerics/gauss-legendre';
type SpaceTimeSolution = SolutionClass;

/** A known solution: value and spatial gradient (writes `dim` components into `grad`). */
export interface KnownSolution {
  value(t: number, x: number, y: number): number;
  gradient(t: number, x: number, y: number, grad: Float64Array): void;
}

/** Result of {@link spaceTimeErrors}. */
export interface SpaceTimeErrors {
  /** (∫_I ‖∇(u − u_δ)‖² dt)^{1/2} */
  gradientL2: number;
  /** (∫_I ‖u − u_δ‖² dt)^{1/2} */
  valueL2: number;
  /** Number of time slices evaluated. */
  slices: number;
}

/**
 * Errors of `solution` against `exact` over (0, T) × Ω.
 *
 * @example
 * ```ts
 * import { DoubleTree, HeatProblem, SpaceTimeSystem, intervalDomain, spaceTimeErrors } from 'chronomesh';
 * const domain = intervalDomain(0, 1, 2);
 * const u = (t: number, x: number) => Math.exp(-(Math.PI ** 2) * t) * Math.sin(Math.PI * x);
 * const sys = new SpaceTimeSystem(new HeatProblem({ domain, T: 1, initial: (x) => u(0, x) }), DoubleTree.sparseGrid(domain, 5));
 * const e = spaceTimeErrors(sys.solve().solution, {
 *   value: (t, x) => u(t, x),
 *   gradient: (t, x, _y, g) => { g[0] = Math.PI * Math.exp(-(Math.PI ** 2) * t) * Math.cos(Math.PI * x); },
 * });
 * console.log(e.gradientL2);
 * ```
 */
export function spaceTimeErrors(solution: SpaceTimeSolution, exact: KnownSolution, opts: { timePoints?: number } = {}): SpaceTimeErrors {
  checkInstance(solution, SolutionClass, 'solution', 'a SpaceTimeSolution');
  const ex = checkObject(exact, 'exact', 'a known solution { value(t, x, y), gradient(t, x, y, grad) }');
  checkFunction(ex.value, 'exact.value', 'a function (t, x, y) => number');
  checkFunction(ex.gradient, 'exact.gradient', 'a function (t, x, y, grad) => void writing the spatial gradient');
  const o = checkOptions<{ timePoints?: number }>(opts, 'opts', ['timePoints']);
  const nq = o.timePoints ?? 3;
  if (typeof nq !== 'number' || !Number.isInteger(nq) || nq < 1 || nq > 20) {
    throw new InvalidArgumentError(`opts.timePoints = ${String(nq)} must be an integer in [1, 20]`, { field: 'opts.timePoints', expected: 'an integer in [1, 20]', received: nq });
  }
  const T = solution.T;
  const breaks = temporalBreakpoints(solution);
  const { nodes, weights } = gaussLegendre01(nq);
  let g2 = 0;
  let v2 = 0;
  let slices = 0;
  for (let b = 0; b + 1 < breaks.length; b++) {
    const a = breaks[b]! * T;
    const h = (breaks[b + 1]! - breaks[b]!) * T;
    for (let q = 0; q < nq; q++) {
      const t = a + h * nodes[q]!;
      const e = sliceErrors(solution, exact, t);
      g2 += h * weights[q]! * e.g2;
      v2 += h * weights[q]! * e.v2;
      slices++;
    }
  }
  return { gradientL2: Math.sqrt(g2), valueL2: Math.sqrt(v2), slices };
}

/** Sorted distinct breakpoints (on (0,1)) of all trial functions of the solution's index set. */
function temporalBreakpoints(solution: SpaceTimeSolution): number[] {
  const tree = solution.trialSet.tree;
  const s = new Float64Array(2);
  const pts = new Set<number>([0, 1]);
  for (let i = 0; i < tree.size; i++) {
    const l = tree.level[i]!;
    nodeSupport('trial', l, tree.index[i]!, s);
    const scale = 2 ** -l;
    for (let j = s[0]!; j <= s[1]!; j++) pts.add(j * scale);
  }
  return [...pts].sort((p, q) => p - q);
}

/**
 * Gradient of the known solution into grad[0..dim) and its value into grad[2]; a non-finite
 * value or gradient component is reported with the point it was asked at.
 */
function exactAt(exact: KnownSolution, t: number, x: number, y: number, grad: Float64Array, dim: number): void {
  grad[0] = grad[1] = NaN;
  exact.gradient(t, x, y, grad);
  for (let k = 0; k < dim; k++) {
    if (!Number.isFinite(grad[k]!)) checkCallbackResult(grad[k], 'exact.gradient', [t, x, y]);
  }
  grad[2] = checkCallbackResult(exact.value(t, x, y), 'exact.value', [t, x, y]);
}

function sliceErrors(solution: SpaceTimeSolution, exact: KnownSolution, t: number): { g2: number; v2: number } {
  const { mesh, values } = solution.slice(t);
  const dim = mesh.dim;
  const grad = new Float64Array(3);
  let g2 = 0;
  let v2 = 0;
  const { elements, coords } = mesh;
  if (dim === 1) {
    for (let e = 0; e < mesh.elementCount; e++) {
      const i0 = elements[2 * e]!;
      const i1 = elements[2 * e + 1]!;
      const x0 = coords[i0]!;
      const x1 = coords[i1]!;
      const len = Math.abs(x1 - x0);
      const du = (values[i1]! - values[i0]!) / (x1 - x0);
      for (let q = 0; q < INTERVAL_WEIGHTS.length; q++) {
        const l0 = INTERVAL_POINTS[2 * q]!;
        const l1 = INTERVAL_POINTS[2 * q + 1]!;
        const x = l0 * x0 + l1 * x1;
        exactAt(exact, t, x, 0, grad, 1);
        const w = len * INTERVAL_WEIGHTS[q]!;
        g2 += w * (grad[0]! - du) ** 2;
        v2 += w * (grad[2]! - (l0 * values[i0]! + l1 * values[i1]!)) ** 2;
      }
    }
    return { g2, v2 };
  }
  for (let e = 0; e < mesh.elementCount; e++) {
    const i0 = elements[3 * e]!;
    const i1 = elements[3 * e + 1]!;
    const i2 = elements[3 * e + 2]!;
    const x0 = coords[2 * i0]!, y0 = coords[2 * i0 + 1]!;
    const x1 = coords[2 * i1]!, y1 = coords[2 * i1 + 1]!;
    const x2 = coords[2 * i2]!, y2 = coords[2 * i2 + 1]!;
    const det = (x1 - x0) * (y2 - y0) - (x2 - x0) * (y1 - y0);
    const area = 0.5 * Math.abs(det);
    const u0 = values[i0]!, u1 = values[i1]!, u2 = values[i2]!;
    // Gradient of the linear interpolant (common practice).
    const gx = ((u1 - u0) * (y2 - y0) - (u2 - u0) * (y1 - y0)) / det;
    const gy = ((u2 - u0) * (x1 - x0) - (u1 - u0) * (x2 - x0)) / det;
    for (let q = 0; q < TRIANGLE_WEIGHTS.length; q++) {
      const l0 = TRIANGLE_POINTS[3 * q]!, l1 = TRIANGLE_POINTS[3 * q + 1]!, l2 = TRIANGLE_POINTS[3 * q + 2]!;
      const x = l0 * x0 + l1 * x1 + l2 * x2;
      const y = l0 * y0 + l1 * y1 + l2 * y2;
      exactAt(exact, t, x, y, grad, 2);
      const w = area * TRIANGLE_WEIGHTS[q]!;
      g2 += w * ((grad[0]! - gx) ** 2 + (grad[1]! - gy) ** 2);
      v2 += w * (grad[2]! - (l0 * u0 + l1 * u1 + l2 * u2)) ** 2;
    }
  }
  return { g2, v2 };
}
