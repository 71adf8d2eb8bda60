/**
 * The space-direction pass (I ⊗ C_x) between two double trees with the same
 * temporal projection (docs/method.md §5.2): for every temporal function, the
 * spatial operator from its input fibre to its output fibre, in hierarchical
 * coordinates. The per-function plans are resolved once at construction.
 */
import { InvalidArgumentError } from '../errors';
import type { SpatialOperatorPlan } from '../space/index';
import type { DoubleTree } from './double-tree';
import type { SpatialPlanCache } from './spatial-plan-cache';

export class SpatialPassPlan {
  private readonly plans: (SpatialOperatorPlan | null)[];
  private readonly inOff: Int32Array;
  private readonly outOff: Int32Array;
  readonly inSize: number;
  readonly outSize: number;

  constructor(input: DoubleTree, output: DoubleTree, cache: SpatialPlanCache) {
    if (input.tree.size !== output.tree.size || input.kind !== output.kind) {
      throw new InvalidArgumentError('spatial pass needs two double trees with the same temporal projection', { field: 'output' });
    }
    const nf = input.functionCount;
    this.plans = new Array(nf);
    this.inOff = input.functionOffset;
    this.outOff = output.functionOffset;
    this.inSize = input.size;
    this.outSize = output.size;
    for (let f = 0; f < nf; f++) {
      const a = input.functionFibre[f]!;
      const b = output.functionFibre[f]!;
      const empty = input.pool.get(a).length === 0 || output.pool.get(b).length === 0;
      this.plans[f] = empty ? null : cache.get(a, b);
    }
  }

  /** y = (I ⊗ (wm·M + wa·A)) x (overwrites y). */
  apply(x: Float64Array, y: Float64Array, massWeight: number, stiffWeight: number): void {
    y.fill(0, 0, this.outSize);
    const { plans, inOff, outOff } = this;
    for (let f = 0; f < plans.length; f++) {
      const p = plans[f];
      if (p) p.apply(x, inOff[f]!, y, outOff[f]!, massWeight, stiffWeight);
    }
  }

  /** yM = (I ⊗ M) x and yA = (I ⊗ A) x (overwrite). */
  applySplit(x: Float64Array, yM: Float64Array, yA: Float64Array): void {
    yM.fill(0, 0, this.outSize);
    yA.fill(0, 0, this.outSize);
    const { plans, inOff, outOff } = this;
    for (let f = 0; f < plans.length; f++) {
      const p = plans[f];
      if (p) p.applySplit(x, inOff[f]!, yM, outOff[f]!, yA, outOff[f]!);
    }
  }

  /** y = (I ⊗ M) xM + (I ⊗ A) xA (overwrites y). */
  applySum(xM: Float64Array, xA: Float64Array, y: Float64Array): void {
    y.fill(0, 0, this.outSize);
    const { plans, inOff, outOff } = this;
    for (let f = 0; f < plans.length; f++) {
      const p = plans[f];
      if (p) p.applySum(xM, inOff[f]!, xA, inOff[f]!, y, outOff[f]!);
    }
  }
}
