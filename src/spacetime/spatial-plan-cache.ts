/**
 * Cache of spatial operator plans per (input fibre, output fibre) pair of one
 * fibre pool, so that identical spatial applications share one plan.
 */
import { SpatialOperatorPlan, type SpatialDomain } from '../space/index';
import { EpochMap } from './epoch-map';
import type { FibrePool } from './fibre-pool';

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

  constructor(domain: SpatialDomain, pool: FibrePool) {
    this.domain = domain;
    this.pool = pool;
  }

  /** The plan from fibre `inId` to fibre `outId` (built on first use). */
  get(inId: number, outId: number): SpatialOperatorPlan {
    return this.plans.getOrMake(inId * 0x200000 + outId, () => new SpatialOperatorPlan(this.domain, this.pool.get(inId), this.pool.get(outId)));
  }

  /**
   * Starts a new epoch and releases the plans not requested during the last `keep` epochs (an
   * adaptive run calls this once per step, so plans of fibres that no longer occur are freed).
   */
  advanceEpoch(keep = 1): void {
    this.plans.advance(keep);
  }

  /** Releases the plans not requested during the current epoch. */
  prune(): void {
    this.plans.prune();
  }

  /** Releases every plan. */
  clear(): void {
    this.plans.clear();
  }

  get size(): number {
    return this.plans.size;
  }
}
