/**
 * Quantities of interest: time series of u at probe points and of the
 * spatial integral ∫_Ω u(t, ·), as arrays and as CSV text.
 */
import { InvalidArgumentError } from '../errors';
import type { SpaceTimeSolution } from './space-time-solution';

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
  const { mesh, values } = solution.slice(t);
  const k = mesh.dim + 1;
  let sum = 0;
  for (let e = 0; e < mesh.elementCount; e++) {
    let measure: number;
    const i0 = mesh.elements[k * e]!;
    const i1 = mesh.elements[k * e + 1]!;
    if (mesh.dim === 1) measure = Math.abs(mesh.coords[i1]! - mesh.coords[i0]!);
    else {
      const i2 = mesh.elements[k * e + 2]!;
      const c = mesh.coords;
      measure = 0.5 * Math.abs((c[2 * i1]! - c[2 * i0]!) * (c[2 * i2 + 1]! - c[2 * i0 + 1]!) - (c[2 * i2]! - c[2 * i0]!) * (c[2 * i1 + 1]! - c[2 * i0 + 1]!));
    }
    let s = 0;
    for (let j = 0; j < k; j++) s += values[mesh.elements[k * e + j]!]!;
    sum += (measure * s) / k;
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
  const d = solution.domain.dim;
  probes.forEach((p, i) => {
    if (p.length !== d) throw new InvalidArgumentError(`probes[${i}] has ${p.length} coordinates, expected ${d}`, { field: `probes[${i}]` });
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
