/**
 * The space-direction pass (I ⊗ C_x) between two double trees with the same
 * temporal projection (docs/method.md §5.2): for every temporal function, the
 * spatial operator from its input fibre to its output fibre, in hierarchical
 * coordinates. The per-function plans are resolved once at construction.
 */
import { InvalidArgumentError } from '../errors';
import { SpatialOperatorPlan } from '../space/index';
import { sharedLeafMesh, unionOfTwoSorted, type SharedLeafMesh } from '../space/operator-plan';
import { FibrePool } from './fibre-pool';
import type { DoubleTree } from './double-tree';
import type { SpatialPlanCache } from './spatial-plan-cache';

export class SpatialPassPlan {
  // Resolved plans (null for an empty fibre), or, for a one-shot pass, the fibre ids per function
  // and the plans built during the sweep (docs/adaptivity.md §3: the estimator keeps no plans).
  private readonly plans: (SpatialOperatorPlan | null)[] | null;
  private readonly inIds: Int32Array;
  private readonly outIds: Int32Array;
  // One-shot passes visit the functions grouped by the union of their two fibres, then by fibre
  // pair, so that each distinct leaf mesh and each distinct plan is built once (fibres repeat across
  // temporal nodes: a few dozen distinct ones serve hundreds of nodes, and many pairs share a union).
  private readonly order: Int32Array | null;
  private readonly unionOf: Int32Array | null;
  private readonly unions: Int32Array[];
  private readonly cache: SpatialPlanCache;
  private readonly inOff: Int32Array;
  private readonly outOff: Int32Array;
  readonly inSize: number;
  readonly outSize: number;

  /**
   * @param transient build each spatial plan when the sweep reaches it and drop it after use, so
   *   that at most one plan is alive (for passes applied once: the cost is the same, the memory is
   *   one plan instead of all of them); the sweep visits the functions grouped by fibre union,
   *   then by pair, so each distinct leaf mesh and each distinct plan is built once.
   */
  constructor(input: DoubleTree, output: DoubleTree, cache: SpatialPlanCache, transient = false) {
    if (input.tree.size !== output.tree.size || input.kind !== output.kind) {
      throw new InvalidArgumentError('spatial pass needs two double trees with the same temporal projection', { field: 'output' });
    }
    const nf = input.functionCount;
    this.cache = cache;
    this.inOff = input.functionOffset;
    this.outOff = output.functionOffset;
    this.inSize = input.size;
    this.outSize = output.size;
    this.inIds = new Int32Array(nf);
    this.outIds = new Int32Array(nf);
    this.plans = transient ? null : new Array<SpatialOperatorPlan | null>(nf);
    for (let f = 0; f < nf; f++) {
      const a = input.functionFibre[f]!;
      const b = output.functionFibre[f]!;
      const empty = input.pool.get(a).length === 0 || output.pool.get(b).length === 0;
      this.inIds[f] = empty ? -1 : a;
      this.outIds[f] = b;
      if (this.plans) this.plans[f] = empty ? null : cache.get(a, b);
    }
    this.unions = [];
    if (transient) {
      const grouping = groupByUnion(input.pool, this.inIds, this.outIds);
      this.order = grouping.order;
      this.unionOf = grouping.unionOf;
      this.unions = grouping.unions;
    } else {
      this.order = null;
      this.unionOf = null;
    }
  }

  /** Calls `visit` with the plan of every function that has one, in function order. */
  private sweep(visit: (p: SpatialOperatorPlan, f: number) => void): void {
    const { plans, inIds, outIds } = this;
    if (plans) {
      for (let f = 0; f < plans.length; f++) {
        const p = plans[f];
        if (p) visit(p, f);
      }
      return;
    }
    let last: SpatialOperatorPlan | null = null;
    let lastA = -1;
    let lastB = -1;
    let mesh: SharedLeafMesh | null = null;
    let lastU = -1;
    const order = this.order!;
    const unionOf = this.unionOf!;
    const pool = this.cache.pool;
    for (let q = 0; q < order.length; q++) {
      const f = order[q]!;
      const a = inIds[f]!;
      const b = outIds[f]!;
      const u = unionOf[f]!;
      if (u !== lastU) {
        mesh = sharedLeafMesh(this.cache.domain, this.unions[u]!);
        lastU = u;
      }
      if (a !== lastA || b !== lastB) {
        last = new SpatialOperatorPlan(this.cache.domain, pool.get(a), pool.get(b), mesh!);
        lastA = a;
        lastB = b;
      }
      visit(last!, f);
    }
  }

  /** y = (I ⊗ (wm·M + wa·A)) x (overwrites y). */
  apply(x: Float64Array, y: Float64Array, massWeight: number, stiffWeight: number): void {
    y.fill(0, 0, this.outSize);
    const { inOff, outOff } = this;
    this.sweep((p, f) => p.apply(x, inOff[f]!, y, outOff[f]!, massWeight, stiffWeight));
  }

  /** yM = (I ⊗ M) x and yA = (I ⊗ A) x (overwrite). */
  applySplit(x: Float64Array, yM: Float64Array, yA: Float64Array): void {
    yM.fill(0, 0, this.outSize);
    yA.fill(0, 0, this.outSize);
    const { inOff, outOff } = this;
    this.sweep((p, f) => p.applySplit(x, inOff[f]!, yM, outOff[f]!, yA, outOff[f]!));
  }

  /** y (+)= (I ⊗ M) xM + (I ⊗ A) xA (overwrites y unless `accumulate`). */
  applySum(xM: Float64Array, xA: Float64Array, y: Float64Array, accumulate = false): void {
    if (!accumulate) y.fill(0, 0, this.outSize);
    const { inOff, outOff } = this;
    this.sweep((p, f) => p.applySum(xM, inOff[f]!, xA, inOff[f]!, y, outOff[f]!, accumulate));
  }
}

/**
 * For the functions with a plan (a[f] ≥ 0): the union of their two fibres as an index into
 * `unions` (equal unions share one index), and the functions sorted by (union, a, b, f).
 */
function groupByUnion(pool: FibrePool, a: Int32Array, b: Int32Array): { order: Int32Array; unionOf: Int32Array; unions: Int32Array[] } {
  const unionOf = new Int32Array(a.length).fill(-1);
  const local = new FibrePool(); // unions interned only for this pass
  const byPair = new Map<number, number>();
  const idx: number[] = [];
  for (let f = 0; f < a.length; f++) {
    if (a[f]! < 0) continue;
    const key = a[f]! * 0x200000 + b[f]!;
    let u = byPair.get(key);
    if (u === undefined) {
      u = local.intern(unionOfTwoSorted(pool.get(a[f]!), pool.get(b[f]!)));
      byPair.set(key, u);
    }
    unionOf[f] = u;
    idx.push(f);
  }
  idx.sort((p, q) => unionOf[p]! - unionOf[q]! || a[p]! - a[q]! || b[p]! - b[q]! || p - q);
  return { order: Int32Array.from(idx), unionOf, unions: local.fibres };
}
