/**
 * Point location in a simplicial mesh given by flat arrays: a uniform bucket grid over the cells'
 * bounding boxes (about one bucket per cell), then, among the cells of the point's bucket, the one
 * with the largest minimal barycentric coordinate. That choice is robust on shared edges and for
 * points a rounding error outside the mesh; a point whose best coordinate is below −1e-10 is
 * outside. The cost per query is the number of cells in one bucket: O(1) for meshes of bounded
 * grading, more where a strongly graded mesh puts many small cells in one bucket.
 */

/** @internal Uniform bucket grid over the cells of a mesh (`dim + 1` vertex indices per cell). */
export class SimplexLocator {
  private readonly dim: 1 | 2;
  private readonly coords: Float64Array;
  private readonly cells: Int32Array;
  private readonly x0: number;
  private readonly y0: number;
  private readonly nx: number;
  private readonly ny: number;
  private readonly hx: number;
  private readonly hy: number;
  private readonly start: Int32Array;
  private readonly items: Int32Array;
  private readonly scratch = new Float64Array(3);

  /** The arrays are kept, not copied: `coords` holds `dim` numbers per vertex, `cells` `dim + 1` indices per cell. */
  constructor(dim: 1 | 2, coords: Float64Array, cells: Int32Array, cellCount: number) {
    this.dim = dim;
    this.coords = coords;
    this.cells = cells;
    const nv = dim + 1;
    let x0 = Infinity, x1 = -Infinity, y0 = Infinity, y1 = -Infinity;
    for (let k = 0; k < cellCount * nv; k++) {
      const v = cells[k]!;
      const x = coords[v * dim]!, y = dim === 2 ? coords[v * dim + 1]! : 0;
      x0 = Math.min(x0, x); x1 = Math.max(x1, x);
      y0 = Math.min(y0, y); y1 = Math.max(y1, y);
    }
    const side = Math.max(1, Math.ceil(Math.sqrt(cellCount)));
    this.nx = dim === 1 ? Math.max(1, cellCount) : side;
    this.ny = dim === 1 ? 1 : side;
    const padX = 1e-9 * (x1 - x0 || 1), padY = 1e-9 * (y1 - y0 || 1);
    this.x0 = x0 - padX;
    this.y0 = y0 - padY;
    this.hx = (x1 - x0 + 2 * padX) / this.nx;
    this.hy = (y1 - y0 + 2 * padY) / this.ny;
    const buckets = this.nx * this.ny;
    const count = new Int32Array(buckets + 1);
    const box = new Int32Array(4);
    // Two passes over the cells (count, then fill), each visiting the buckets of the cell's box.
    for (let e = 0; e < cellCount; e++) {
      this.bucketBox(e, padX, padY, box);
      for (let j = box[2]!; j <= box[3]!; j++) for (let i = box[0]!; i <= box[1]!; i++) count[j * this.nx + i + 1]!++;
    }
    for (let q = 0; q < buckets; q++) count[q + 1] = count[q + 1]! + count[q]!;
    this.start = count.slice();
    this.items = new Int32Array(count[buckets]!);
    for (let e = 0; e < cellCount; e++) {
      this.bucketBox(e, padX, padY, box);
      for (let j = box[2]!; j <= box[3]!; j++) for (let i = box[0]!; i <= box[1]!; i++) this.items[count[j * this.nx + i]!++] = e;
    }
  }

  /** Bucket range [i0, i1] × [j0, j1] of cell e's bounding box, padded. */
  private bucketBox(e: number, padX: number, padY: number, out: Int32Array): void {
    const d = this.dim, nv = d + 1;
    let a = Infinity, b = -Infinity, c = Infinity, g = -Infinity;
    for (let k = 0; k < nv; k++) {
      const v = this.cells[e * nv + k]!;
      const x = this.coords[v * d]!, y = d === 2 ? this.coords[v * d + 1]! : 0;
      a = Math.min(a, x); b = Math.max(b, x); c = Math.min(c, y); g = Math.max(g, y);
    }
    out[0] = this.cellX(a - padX);
    out[1] = this.cellX(b + padX);
    out[2] = this.cellY(c - padY);
    out[3] = this.cellY(g + padY);
  }

  private cellX(x: number): number {
    return Math.min(this.nx - 1, Math.max(0, Math.floor((x - this.x0) / this.hx)));
  }
  private cellY(y: number): number {
    return Math.min(this.ny - 1, Math.max(0, Math.floor((y - this.y0) / this.hy)));
  }

  /** The cell containing (x, y) (y ignored in 1D), or −1 outside. */
  find(x: number, y: number): number {
    if (!(x >= this.x0 && x <= this.x0 + this.nx * this.hx && y >= this.y0 && y <= this.y0 + this.ny * this.hy)) return -1;
    const c = this.cellY(y) * this.nx + this.cellX(x);
    let best = -1, bestScore = -Infinity;
    for (let k = this.start[c]!; k < this.start[c + 1]!; k++) {
      const e = this.items[k]!;
      const s = this.score(e, x, y);
      if (s > bestScore) {
        bestScore = s;
        best = e;
      }
    }
    return bestScore >= -1e-10 ? best : -1;
  }

  /**
   * A cell other than `e` that holds (x, y) strictly inside (minimal barycentric coordinate above
   * `margin`), or −1. With (x, y) the centroid of e this finds a cell overlapping e; cells that
   * only touch e (shared edges or vertices) never hold its centroid.
   */
  otherHolding(e: number, x: number, y: number, margin: number): number {
    if (!(x >= this.x0 && x <= this.x0 + this.nx * this.hx && y >= this.y0 && y <= this.y0 + this.ny * this.hy)) return -1;
    const c = this.cellY(y) * this.nx + this.cellX(x);
    for (let k = this.start[c]!; k < this.start[c + 1]!; k++) {
      const f = this.items[k]!;
      if (f !== e && this.score(f, x, y) > margin) return f;
    }
    return -1;
  }

  /** Barycentric coordinates of (x, y) in cell e into `out` (2 in 1D, 3 in 2D). */
  barycentric(e: number, x: number, y: number, out: Float64Array): void {
    const p = this.coords, q = this.cells;
    if (this.dim === 1) {
      const a = p[q[2 * e]!]!, b = p[q[2 * e + 1]!]!;
      const s = (x - a) / (b - a);
      out[0] = 1 - s;
      out[1] = s;
      return;
    }
    const i = q[3 * e]!, j = q[3 * e + 1]!, k = q[3 * e + 2]!;
    const ax = p[2 * i]!, ay = p[2 * i + 1]!, bx = p[2 * j]!, by = p[2 * j + 1]!, cx = p[2 * k]!, cy = p[2 * k + 1]!;
    const det = (bx - ax) * (cy - ay) - (by - ay) * (cx - ax);
    const l0 = ((bx - x) * (cy - y) - (by - y) * (cx - x)) / det;
    const l1 = ((cx - x) * (ay - y) - (cy - y) * (ax - x)) / det;
    out[0] = l0;
    out[1] = l1;
    out[2] = 1 - l0 - l1;
  }

  /** Minimal barycentric coordinate of (x, y) in cell e (≥ 0 inside; orientation-free). */
  private score(e: number, x: number, y: number): number {
    const w = this.scratch;
    this.barycentric(e, x, y, w);
    return this.dim === 1 ? Math.min(w[0]!, w[1]!) : Math.min(w[0]!, w[1]!, w[2]!);
  }
}
