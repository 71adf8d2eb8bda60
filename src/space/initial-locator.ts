/**
 * Point location on the initial mesh (./simplex-locator.ts over the initial elements). The forest
 * descent below it lives in SpatialDomain.
 */
import type { BisectionForest } from './forest';
import { SimplexLocator } from './simplex-locator';

/** Bucket grid over the initial elements; their coordinates and vertices are copied, so the forest may grow. */
export class InitialLocator {
  private readonly grid: SimplexLocator;

  constructor(f: BisectionForest) {
    const d = f.dim, ne = f.initialElementCount;
    this.grid = new SimplexLocator(d, f.vCoord.slice(0, d * f.initialVertexCount), f.eVert.slice(0, (d + 1) * ne), ne);
  }

  /** The initial element containing (x, y), or −1 outside. */
  find(x: number, y: number): number {
    return this.grid.find(x, y);
  }
}
