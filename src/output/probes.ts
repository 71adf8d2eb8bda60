/**
 * Quantities of interest: time series of u at probe points and of the
 * spatial integral ∫_Ω u(t, ·), as arrays and as CSV text.
 */
import { InvalidArgumentError, describeValue } from '../errors';
import { INTERVAL_POINTS, INTERVAL_WEIGHTS, TRIANGLE_POINTS, TRIANGLE_WEIGHTS } from '../space/quadrature';
import { SpaceTimeSolution } from '../spacetime/space-time-solution';
import { checkFunction, checkInstance, checkNumberArray } from '../validation/index';

/** ∫_Ω u(t, ·) dx, exact for the piecewise-linear slice (vertex rule per element). *
 * @example
 * ```ts
 * import { DoubleTree, HeatProblem, SpaceTimeSystem, intervalDomain, spatialIntegral } from 'chronomesh';
 * const domain = intervalDomain(0, 1, 2);
 * const { solution } = new SpaceTimeSystem(new HeatProblem({ domain, T: 1, initial: () => 1 }), DoubleTree.sparseGrid(domain, 4)).solve();
 * console.log(spatialIntegral(solution, 0.1)); // heat left in the rod at t = 0.1
 * ```
 */
export function spatialIntegral(solution: SpaceTimeSolution, t: number): number {
  return regionIntegral(solution, t, () => true);
}

/**
 * The predicate's answer at (x, y): a boolean, or a number read as its truth (1/0); anything else
 * (NaN, undefined, a string) is a mistake in the predicate, reported with the point instead of being
 * taken as "outside".
 */
function isInside(inside: (x: number, y: number) => boolean, x: number, y: number): boolean {
  const r = inside(x, y) as unknown;
  if (typeof r === 'boolean') return r;
  if (typeof r === 'number' && !Number.isNaN(r)) return r !== 0;
  throw new InvalidArgumentError(`inside(${x}, ${y}) returned ${describeValue(r)}; expected true or false`, { field: 'inside', expected: 'a boolean', received: describeValue(r) });
}

/**
 * ∫ over a region R ⊆ Ω of u(t, ·), with R given by a predicate on points. Each leaf element is
 * integrated with the degree-5 rule, the indicator of R taken at the quadrature points: exact
 * when R is a union of leaf elements, first-order accurate in h along a boundary of R that
 * cuts elements.
 *
 * @example
 * ```ts
 * import { DoubleTree, HeatProblem, SpaceTimeSystem, rectangleDomain, regionIntegral } from 'chronomesh';
 * const domain = rectangleDomain(0, 2, 0, 1, 2, 1);
 * const { solution } = new SpaceTimeSystem(new HeatProblem({ domain, T: 1, initial: () => 1 }), DoubleTree.sparseGrid(domain, 3)).solve();
 * console.log(regionIntegral(solution, 0.1, (x) => x < 1)); // heat in the left half at t = 0.1
 * ```
 */
export function regionIntegral(solution: SpaceTimeSolution, t: number, inside: (x: number, y: number) => boolean): number {
  checkInstance(solution, SpaceTimeSolution, 'solution', 'a SpaceTimeSolution');
  checkFunction(inside, 'inside', 'a predicate (x, y) => boolean');
  const { mesh, values } = solution.slice(t);
  const c = mesh.coords;
  const el = mesh.elements;
  let sum = 0;
  if (mesh.dim === 1) {
    for (let e = 0; e < mesh.elementCount; e++) {
      const i0 = el[2 * e]!, i1 = el[2 * e + 1]!;
      const len = Math.abs(c[i1]! - c[i0]!);
      for (let q = 0; q < INTERVAL_WEIGHTS.length; q++) {
        const l0 = INTERVAL_POINTS[2 * q]!, l1 = INTERVAL_POINTS[2 * q + 1]!;
        if (isInside(inside, l0 * c[i0]! + l1 * c[i1]!, 0)) sum += len * INTERVAL_WEIGHTS[q]! * (l0 * values[i0]! + l1 * values[i1]!);
      }
    }
    return sum;
  }
  for (let e = 0; e < mesh.elementCount; e++) {
    const i0 = el[3 * e]!, i1 = el[3 * e + 1]!, i2 = el[3 * e + 2]!;
    const area = 0.5 * Math.abs((c[2 * i1]! - c[2 * i0]!) * (c[2 * i2 + 1]! - c[2 * i0 + 1]!) - (c[2 * i2]! - c[2 * i0]!) * (c[2 * i1 + 1]! - c[2 * i0 + 1]!));
    for (let q = 0; q < TRIANGLE_WEIGHTS.length; q++) {
      const l0 = TRIANGLE_POINTS[3 * q]!, l1 = TRIANGLE_POINTS[3 * q + 1]!, l2 = TRIANGLE_POINTS[3 * q + 2]!;
      const x = l0 * c[2 * i0]! + l1 * c[2 * i1]! + l2 * c[2 * i2]!;
      const y = l0 * c[2 * i0 + 1]! + l1 * c[2 * i1 + 1]! + l2 * c[2 * i2 + 1]!;
      if (isInside(inside, x, y)) sum += area * TRIANGLE_WEIGHTS[q]! * (l0 * values[i0]! + l1 * values[i1]! + l2 * values[i2]!);
    }
  }
  return sum;
}

/**
 * CSV table with one row per time: `t`, the spatial integral, then u at each probe.
 *
 * @example
 * ```ts
 * import { DoubleTree, HeatProblem, SpaceTimeSystem, intervalDomain, probeTableCsv } from 'chronomesh';
 * const domain = intervalDomain(0, 1, 2);
 * const { solution } = new SpaceTimeSystem(new HeatProblem({ domain, T: 1, initial: () => 1 }), DoubleTree.sparseGrid(domain, 4)).solve();
 * console.log(probeTableCsv(solution, [0, 0.5, 1], [[0.5]]));
 * ```
 */
export function probeTableCsv(solution: SpaceTimeSolution, times: number[], probes: number[][]): string {
  checkInstance(solution, SpaceTimeSolution, 'solution', 'a SpaceTimeSolution');
  const d = solution.domain.dim;
  checkNumberArray(times, 'times', { maxLength: 1e6 });
  if (!Array.isArray(probes)) checkNumberArray(probes, 'probes');
  probes.forEach((p, i) => {
    checkNumberArray(p, `probes[${i}]`);
    if (p.length !== d) throw new InvalidArgumentError(`probes[${i}] has ${p.length} coordinates, expected ${d}`, { field: `probes[${i}]`, expected: `${d} coordinates`, received: p.length });
  });
  const flat = probes.flat();
  const header = ['t', 'integral', ...probes.map((p) => `u(${p.join(' ')})`)];
  const lines = [header.map(csvField).join(',')];
  for (const t of times) {
    const v = flat.length > 0 ? solution.evaluate(t, flat) : new Float64Array(0);
    lines.push([t, spatialIntegral(solution, t), ...Array.from(v)].map((x) => String(x)).join(','));
  }
  return lines.join('\n') + '\n';
}

function csvField(s: string): string {
  return /[",\n]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
}
