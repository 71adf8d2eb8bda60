/**
 * Point location in the leaf mesh of a closed set: the initial element from a bucket grid, then a
 * descent of the bisection forest through the elements bisected in the mesh.
 */
import { InitialLocator } from './initial-locator';
import type { LeafMesh } from './leaf-mesh';
import type { VertexClosure } from './vertex-closure';

/** @internal Point-location queries over the scratch of a VertexClosure. */
export class LeafLocator {
  private readonly closure: VertexClosure;
  private locator: InitialLocator | null = null;

  constructor(closure: VertexClosure) {
    this.closure = closure;
  }

  /**
   * Starts a point-location query on a leaf mesh: marks its vertices and fills the local index
   * map. Must be followed by {@link SpatialDomain.endMeshQuery} with the same mesh.
   * @internal
   */
  beginMeshQuery(mesh: LeafMesh): Int32Array {
    this.closure.syncScratch();
    const g = mesh.globalId;
    for (let i = 0; i < g.length; i++) {
      this.closure.mark[g[i]!] = 1;
      this.closure.localIdx[g[i]!] = i;
    }
    return this.closure.localIdx;
  }

  /** @internal */
  endMeshQuery(mesh: LeafMesh): void {
    const g = mesh.globalId;
    for (let i = 0; i < g.length; i++) {
      this.closure.mark[g[i]!] = 0;
      this.closure.localIdx[g[i]!] = -1;
    }
  }

  /**
   * Forest leaf element of the mesh opened by {@link SpatialDomain.beginMeshQuery} containing the
   * point, found by locating the initial element (bucket grid) and descending the forest.
   * Returns −1 outside the domain.
   * @internal
   */
  locateLeaf(x: number, y: number): number {
    if (this.locator === null) this.locator = new InitialLocator(this.closure.forest);
    let e = this.locator.find(x, y);
    if (e < 0) return -1;
    const f = this.closure.forest;
    const d = this.closure.dim;
    const inMesh = this.closure.mark;
    for (;;) {
      const m = f.eMid[e]!;
      if (m < 0 || !inMesh[m]) return e;
      const c = f.eChild[e]!;
      if (d === 1) {
        e = x <= f.vCoord[m]! ? c : c + 1;
      } else {
        const cv = f.eVert[3 * e + 2]!;
        const cx = f.vCoord[2 * cv]!, cy = f.vCoord[2 * cv + 1]!;
        const mx = f.vCoord[2 * m]! - cx, my = f.vCoord[2 * m + 1]! - cy;
        // child (c, a, m) lies on a's side of the line c → m: cross(m − c, p − c) ≤ 0
        e = mx * (y - cy) - my * (x - cx) <= 0 ? c : c + 1;
      }
    }
  }
}
