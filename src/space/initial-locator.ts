/**
 * Point location on the initial mesh: a uniform bucket grid over the initial
 * elements' bounding boxes, then the element with the largest minimal
 * barycentric coordinate. The forest descent below it lives in SpatialDomain.
 */
import type { BisectionForest } from './forest';

/** Uniform bucket grid over the initial elements' bounding boxes. */
export class InitialLocator {
  private readonly f: BisectionForest;
  private readonly x0: number;
  private readonly y0: number;
  private readonly nx: number;
  private readonly ny: number;
  private readonly hx: number;
  private readonly hy: number;
  private readonly start: Int32Array;
  private readonly items: Int32Array;

  constructor(f: BisectionForest) {
    this.f = f;
    const d = f.dim, nv = f.nv, ne = f.initialElementCount;
    let x0 = Infinity, x1 = -Infinity, y0 = Infinity, y1 = -Infinity;
    for (let v = 0; v < f.initialVertexCount; v++) {
      const x = f.vCoord[v * d]!, y = d === 2 ? f.vCoord[v * d + 1]! : 0;
      x0 = Math.min(x0, x); x1 = Math.max(x1, x);
      y0 = Math.min(y0, y); y1 = Math.max(y1, y);
    }
    const side = Math.max(1, Math.ceil(Math.sqrt(ne)));
    this.nx = d === 1 ? ne : side;
    this.ny = d === 1 ? 1 : side;
    const padX = 1e-9 * (x1 - x0 || 1), padY = 1e-9 * (y1 - y0 || 1);
    this.x0 = x0 - padX;
    this.y0 = y0 - padY;
    this.hx = (x1 - x0 + 2 * padX) / this.nx;
    this.hy = (y1 - y0 + 2 * padY) / this.ny;
    const cells = this.nx * this.ny;
    const count = new Int32Array(cells + 1);
    const range = (e: number): [number, number, number, number] => {
      let a = Infinity, b = -Infinity, c = Infinity, g = -Infinity;
      for (let k = 0; k < nv; k++) {
        const v = f.eVert[e * nv + k]!;
        const x = f.vCoord[v * d]!, y = d === 2 ? f.vCoord[v * d + 1]! : 0;
        a = Math.min(a, x); b = Math.max(b, x); c = Math.min(c, y); g = Math.max(g, y);
      }
      const i0 = this.cellX(a - padX), i1 = this.cellX(b + padX), j0 = this.cellY(c - padY), j1 = this.cellY(g + padY);
      return [i0, i1, j0, j1];
    };
    for (let e = 0; e < ne; e++) {
      const [i0, i1, j0, j1] = range(e);
      for (let j = j0; j <= j1; j++) for (let i = i0; i <= i1; i++) count[j * this.nx + i + 1]!++;
    }
    for (let c = 0; c < cells; c++) count[c + 1] = count[c + 1]! + count[c]!;
    this.start = count.slice();
    this.items = new Int32Array(count[cells]!);
    const fill = count;
    for (let e = 0; e < ne; e++) {
      const [i0, i1, j0, j1] = range(e);
      for (let j = j0; j <= j1; j++) for (let i = i0; i <= i1; i++) this.items[fill[j * this.nx + i]!++] = e;
    }
  }

  private cellX(x: number): number {
    return Math.min(this.nx - 1, Math.max(0, Math.floor((x - this.x0) / this.hx)));
  }
  private cellY(y: number): number {
    return Math.min(this.ny - 1, Math.max(0, Math.floor((y - this.y0) / this.hy)));
  }

  find(x: number, y: number): number {
    const f = this.f;
    const c = this.cellY(y) * this.nx + this.cellX(x);
    let best = -1, bestScore = -Infinity;
    for (let k = this.start[c]!; k < this.start[c + 1]!; k++) {
      const e = this.items[k]!;
      const s = containmentScore(f, e, x, y);
      if (s > bestScore) {
        bestScore = s;
        best = e;
      }
    }
    return bestScore >= -1e-10 ? best : -1;
  }
}

/** min barycentric coordinate of (x, y) in initial element e (≥ 0 inside). */
function containmentScore(f: BisectionForest, e: number, x: number, y: number): number {
  if (f.dim === 1) {
    const a = f.vCoord[f.eVert[2 * e]!]!, b = f.vCoord[f.eVert[2 * e + 1]!]!;
    return Math.min(x - a, b - x) / (b - a);
  }
  const p = f.eVert[3 * e]!, q = f.eVert[3 * e + 1]!, r = f.eVert[3 * e + 2]!;
  const ax = f.vCoord[2 * p]!, ay = f.vCoord[2 * p + 1]!;
  const bx = f.vCoord[2 * q]!, by = f.vCoord[2 * q + 1]!;
  const cx = f.vCoord[2 * r]!, cy = f.vCoord[2 * r + 1]!;
  const det = (bx - ax) * (cy - ay) - (by - ay) * (cx - ax);
  const l1 = ((bx - x) * (cy - y) - (by - y) * (cx - x)) / det;
  const l2 = ((cx - x) * (ay - y) - (cy - y) * (ax - x)) / det;
  return Math.min(l1, l2, 1 - l1 - l2);
}
