/**
 * Cache of spatial operator plans per (input fibre, output fibre) pair of one
 * fibre pool, so that identical spatial applications share one plan.
 */
import { SpatialOperatorPlan, type SpatialDomain } from '../space/index';
import { sharedLeafMesh, unionOfTwoSorted, type SharedLeafMesh } from '../space/operator-plan';
import { EpochMap } from './epoch-map';
import { FibrePool } from './fibre-pool';

/**
 * Spatial operator plans per (input fibre, output fibre) pair, built on first use.
 *
 * @example
 * ```ts
 * import { DoubleTree, SpatialPlanCache, intervalDomain } from 'chronomesh';
 * const domain = intervalDomain(0, 1, 2);
 * const set = DoubleTree.sparseGrid(domain, 3);
 * const cache = new SpatialPlanCache(domain, set.pool);
 * const id = set.nodeFibre[0]!;
 * console.log(cache.get(id, id) === cache.get(id, id)); // → true — built once
 * ```
 */
export class SpatialPlanCache {
  readonly domain: SpatialDomain;
  readonly pool: FibrePool;
  private readonly plans = new EpochMap<SpatialOperatorPlan>();
  // Leaf meshes (with element tables and scratch) by the content of the union they resolve: plans
  // whose fibre pairs have the same union share one (in an adaptive step about 4 plans per mesh,
  // docs/adaptivity.md §5). The unions are interned in a pool of their own, rebuilt whenever plans
  // are released, so that it holds exactly the meshes of the cached plans.
  private unions = new FibrePool();
  private meshes: SharedLeafMesh[] = [];

  constructor(domain: SpatialDomain, pool: FibrePool) {
    this.domain = domain;
    this.pool = pool;
  }

  /** The plan from fibre `inId` to fibre `outId` (built on first use). */
  get(inId: number, outId: number): SpatialOperatorPlan {
    return this.plans.getOrMake(inId * 0x200000 + outId, () => {
      const a = this.pool.get(inId);
      const b = this.pool.get(outId);
      return new SpatialOperatorPlan(this.domain, a, b, this.meshFor(unionOfTwoSorted(a, b)));
    });
  }

  /**
   * The leaf mesh of fibre `id` as the plans share it (built on first use), for other work on the
   * same fibre, such as its V-cycle hierarchy (../system/fibre-inverse.ts). The cache keeps it only
   * while a cached plan uses it. @internal
   */
  meshOf(id: number): SharedLeafMesh {
    return this.meshFor(this.pool.get(id));
  }

  /** The shared leaf mesh of `union` (built and validated on first use: the union must be closed). */
  private meshFor(union: Int32Array): SharedLeafMesh {
    const id = this.unions.intern(union);
    return (this.meshes[id] ??= sharedLeafMesh(this.domain, this.unions.get(id)));
  }

  /** Keeps the meshes of the plans still cached, drops the others. */
  private syncMeshes(): void {
    this.unions = new FibrePool();
    this.meshes = [];
    for (const p of this.plans.values()) this.meshes[this.unions.intern(p.shared.union)] ??= p.shared;
  }

  /**
   * Starts a new epoch and releases the plans not requested during the last `keep` epochs (an
   * adaptive run calls this once per step, so plans of fibres that no longer occur are freed).
   */
  advanceEpoch(keep = 1): void {
    this.plans.advance(keep);
    this.syncMeshes();
  }

  /** Releases the plans not requested during the current epoch. */
  prune(): void {
    this.plans.prune();
    this.syncMeshes();
  }

  /** Releases every plan. */
  clear(): void {
    this.plans.clear();
    this.syncMeshes();
  }

  get size(): number {
    return this.plans.size;
  }
}
