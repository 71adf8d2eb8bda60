/**
 * A discrete space-time function u = Σ_{(λ,ν)∈Λ} u_{λν} σ_λ ⊗ φ_ν
 * (DESIGN.md §8): point values and time slices.
 *
 * At time t only the O(levels) trial functions whose support contains t are
 * nonzero; since hierarchical hats do not depend on the set they are used in,
 * their fibre functions combine on the union of their fibres by adding
 * coefficients.
 */
import { InvalidArgumentError } from '../errors';
import { evaluateTemporal } from '../time/index';
import { evaluateAt, nodalValues, type SpatialDomain } from '../space/index';
import type { LeafMesh } from '../space/leaf-mesh';
import type { DoubleTree } from '../spacetime/double-tree';
import { unionSorted } from '../spacetime/fibre-pool';
import { positionsIn } from '../system/initial-trace';

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
    if (coefficients.length !== trialSet.size) {
      throw new InvalidArgumentError(`coefficients has length ${coefficients.length}, expected ${trialSet.size}`, { field: 'coefficients' });
    }
  }

  /** Hierarchical coefficients of u(t, ·) on the union of the active fibres. */
  spatialCoefficients(t: number): { set: Int32Array; coeffs: Float64Array } {
    if (!Number.isFinite(t) || t < 0 || t > this.T) {
      throw new InvalidArgumentError(`time t = ${t} is outside [0, ${this.T}]`, { field: 't', expected: `[0, ${this.T}]`, received: t });
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

  /** u(t, x) at the given points (`[x0, x1, …]` in 1D, `[x0, y0, x1, y1, …]` in 2D). */
  evaluate(t: number, points: ArrayLike<number>): Float64Array {
    const { set, coeffs } = this.spatialCoefficients(t);
    if (set.length === 0) return new Float64Array(points.length / this.domain.dim);
    return evaluateAt(this.domain, set, coeffs, points);
  }

  /** Nodal values of u(t, ·) on its leaf mesh. */
  slice(t: number): TimeSlice {
    const { set, coeffs } = this.spatialCoefficients(t);
    const { mesh, values } = nodalValues(this.domain, set, coeffs);
    return { t, mesh, values };
  }
}
