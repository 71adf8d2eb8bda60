/**
 * The initial-trace term G = (g gᵀ) ⊗ M_x with g_λ = σ_λ(0) (docs/method.md §6),
 * and its use in the right-hand side, g ⊗ ℓ_0.
 *
 * Only σ_{0,0} and the k = 0 wavelet of each level are nonzero at t = 0.
 * Hierarchical hats do not depend on the set they are used in, so all traced
 * blocks embed into the union U of their fibres by placing coefficients:
 *   (G x)_λ = g_λ · restrict_λ( M_U · Σ_λ' g_λ' embed_λ'(x_λ') ),
 * one spatial mass application on U plus gathers — linear cost.
 */
import { traceVector } from '../time/index';
import type { SpatialOperatorPlan } from '../space/index';
import type { DoubleTree } from '../spacetime/double-tree';
import { positionsIn, unionSorted } from '../spacetime/fibre-pool';
import type { SpatialPlanCache } from '../spacetime/spatial-plan-cache';
import { checkNotAliased, type LinearOperator } from '../numerics/linear-operator';

/**
 * G = (g gᵀ) ⊗ M_x on a trial double tree, applied with one spatial mass product.
 *
 * @example
 * ```ts
 * import { DoubleTree, HeatProblem, SpaceTimeSystem, intervalDomain } from 'chronomesh';
 * const domain = intervalDomain(0, 1, 2);
 * const system = new SpaceTimeSystem(new HeatProblem({ domain, T: 1 }), DoubleTree.sparseGrid(domain, 3));
 * const n = system.size;
 * const out = new Float64Array(n);
 * system.G.apply(new Float64Array(n).fill(1), out);
 * ```
 */
export class InitialTraceOperator implements LinearOperator {
  readonly inSize: number;
  readonly outSize: number;
  /** Union of the fibres of the traced temporal functions (sorted vertex ids). */
  readonly traceFibre: Int32Array;
  private readonly traced: Int32Array; // temporal functions with g ≠ 0
  private readonly g: Float64Array; // their trace values
  private readonly maps: Int32Array[]; // position in traceFibre of each fibre entry
  private readonly offsets: Int32Array;
  private readonly mass: SpatialOperatorPlan | null;
  private readonly v: Float64Array;
  private readonly w: Float64Array;

  constructor(trialSet: DoubleTree, plans: SpatialPlanCache, T: number) {
    this.inSize = this.outSize = trialSet.size;
    this.offsets = trialSet.functionOffset;
    const trace = traceVector(trialSet.tree, 0, T);
    const traced: number[] = [];
    for (let f = 0; f < trace.length; f++) if (trace[f] !== 0 && trialSet.pool.get(trialSet.functionFibre[f]!).length > 0) traced.push(f);
    this.traced = Int32Array.from(traced);
    this.g = Float64Array.from(traced, (f) => trace[f]!);
    const fibres = traced.map((f) => trialSet.pool.get(trialSet.functionFibre[f]!));
    this.traceFibre = unionSorted(fibres);
    this.maps = fibres.map((fib) => positionsIn(fib, this.traceFibre));
    const id = trialSet.pool.intern(this.traceFibre);
    this.mass = this.traceFibre.length > 0 ? plans.get(id, id) : null;
    this.v = new Float64Array(this.traceFibre.length);
    this.w = new Float64Array(this.traceFibre.length);
  }

  /** y = G x (overwrites y). */
  apply(x: Float64Array, y: Float64Array): void {
    checkNotAliased(x, y, 'G');
    y.fill(0, 0, this.outSize);
    this.applyAdd(x, y);
  }

  /** y += scale · G x (scale defaults to 1). */
  applyAdd(x: Float64Array, y: Float64Array, scale = 1): void {
    if (this.mass === null) return;
    const { traced, g, maps, offsets, v, w } = this;
    v.fill(0);
    for (let t = 0; t < traced.length; t++) {
      const o = offsets[traced[t]!]!;
      const map = maps[t]!;
      const gt = g[t]!;
      for (let p = 0; p < map.length; p++) v[map[p]!]! += gt * x[o + p]!;
    }
    this.mass.apply(v, 0, w, 0, 1, 0);
    this.addTraced(w, y, scale);
  }

  /** y_λ += scale · g_λ · restrict_λ(u) for a vector u on {@link traceFibre} (used for g ⊗ ℓ_0). */
  addTraced(u: Float64Array, y: Float64Array, scale: number): void {
    const { traced, g, maps, offsets } = this;
    for (let t = 0; t < traced.length; t++) {
      const o = offsets[traced[t]!]!;
      const map = maps[t]!;
      const gt = scale * g[t]!;
      for (let p = 0; p < map.length; p++) y[o + p]! += gt * u[map[p]!]!;
    }
  }
}
