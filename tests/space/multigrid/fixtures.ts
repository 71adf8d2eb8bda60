/**
 * TEST-ONLY builders of leaf meshes by bisection (independent of src/space's
 * forest): d = 1 interval bisection and d = 2 newest-vertex bisection of a unit
 * square split into 2 or 4 triangles, uniform or graded. The produced meshes
 * obey the LeafMesh contract (local order by generation, parents = endpoints
 * of the bisected edge). `leafMeshUpTo(cap)` gives the leaf mesh of the vertex
 * set of generation ≤ cap (used to check the Galerkin hierarchy).
 */
import type { LeafMesh } from '../../../src/space/leaf-mesh';

interface Cell {
  /** d = 1: [a, b]; d = 2: [a, b, c] with refinement edge (a, b) and newest vertex c (counter-clockwise). */
  v: number[];
  gen: number;
  material: number;
  children: [number, number] | null;
  mid: number;
}

export interface FixtureOptions {
  /** Diffusion per initial element (default all 1). */
  kappa?: number[];
  /** Reaction per initial element (default all 0). */
  reaction?: number[];
  /** Diffusion tensors (xx, xy, yy per initial element; 2D), replacing κ in the stiffness. */
  kappaTensor?: number[];
}

export class BisectionFixture {
  readonly dim: 1 | 2;
  readonly x: number[] = [];
  readonly y: number[] = [];
  readonly gen: number[] = [];
  readonly pa: number[] = [];
  readonly pb: number[] = [];
  readonly cells: Cell[] = [];
  readonly roots: number[] = [];
  private readonly edgeMid = new Map<number, number>();
  private readonly edgeCells = new Map<number, number[]>();
  kappa: number[];
  reaction: number[];
  kappaTensor: number[] | undefined;
  /** Vertex is on the Dirichlet boundary (decided by `dirichlet` predicate). */
  dirichlet: (x: number, y: number) => boolean;

  private constructor(dim: 1 | 2, dirichlet: (x: number, y: number) => boolean) {
    this.dim = dim;
    this.kappa = [];
    this.reaction = [];
    this.dirichlet = dirichlet;
  }

  /** d = 1 initial mesh on the given sorted nodes. Dirichlet at the ends as requested. */
  static interval(nodes: number[], ends: { left: boolean; right: boolean }, opts: FixtureOptions = {}): BisectionFixture {
    const lo = nodes[0]!;
    const hi = nodes[nodes.length - 1]!;
    const f = new BisectionFixture(1, (x) => (ends.left && x === lo) || (ends.right && x === hi));
    for (const p of nodes) f.addVertex(p, 0, 0, -1, -1);
    for (let i = 0; i + 1 < nodes.length; i++) f.addRoot([i, i + 1], i);
    f.setMaterials(nodes.length - 1, opts);
    return f;
  }

  /**
   * d = 2 unit square [0,1]² split into 2 triangles (diagonal (0,0)–(1,1)) or 4 (criss-cross);
   * `dirichlet` decides which boundary points are Dirichlet (default: the whole boundary).
   */
  static square(pieces: 2 | 4, opts: FixtureOptions & { dirichlet?: (x: number, y: number) => boolean } = {}): BisectionFixture {
    const onBoundary = (x: number, y: number): boolean => x === 0 || y === 0 || x === 1 || y === 1;
    const f = new BisectionFixture(2, opts.dirichlet ?? onBoundary);
    f.addVertex(0, 0, 0, -1, -1);
    f.addVertex(1, 0, 0, -1, -1);
    f.addVertex(1, 1, 0, -1, -1);
    f.addVertex(0, 1, 0, -1, -1);
    if (pieces === 2) {
      f.addRoot([2, 0, 1], 0);
      f.addRoot([0, 2, 3], 1);
    } else {
      f.addVertex(0.5, 0.5, 0, -1, -1);
      for (let i = 0; i < 4; i++) f.addRoot([i, (i + 1) % 4, 4], i);
    }
    f.setMaterials(pieces, opts);
    return f;
  }

  private setMaterials(count: number, opts: FixtureOptions): void {
    this.kappa = opts.kappa ?? new Array<number>(count).fill(1);
    this.kappaTensor = opts.kappaTensor;
    this.reaction = opts.reaction ?? new Array<number>(count).fill(0);
  }

  get vertexCount(): number {
    return this.gen.length;
  }

  private addVertex(x: number, y: number, g: number, a: number, b: number): number {
    this.x.push(x);
    this.y.push(y);
    this.gen.push(g);
    this.pa.push(a);
    this.pb.push(b);
    return this.gen.length - 1;
  }

  private addRoot(v: number[], material: number): void {
    this.roots.push(this.addCell(v, 0, material));
  }

  private addCell(v: number[], gen: number, material: number): number {
    const id = this.cells.length;
    this.cells.push({ v, gen, material, children: null, mid: -1 });
    if (this.dim === 2) for (let i = 0; i < 3; i++) this.edgeList(v[i]!, v[(i + 1) % 3]!).push(id);
    return id;
  }

  private static key(a: number, b: number): number {
    return a < b ? a * 4194304 + b : b * 4194304 + a;
  }

  private edgeList(a: number, b: number): number[] {
    const k = BisectionFixture.key(a, b);
    let l = this.edgeCells.get(k);
    if (!l) { l = []; this.edgeCells.set(k, l); }
    return l;
  }

  private bisect(id: number): void {
    const c = this.cells[id]!;
    if (c.children) return;
    const a = c.v[0]!;
    const b = c.v[1]!;
    const k = BisectionFixture.key(a, b);
    let m = this.edgeMid.get(k) ?? -1;
    if (m < 0) {
      m = this.addVertex(0.5 * (this.x[a]! + this.x[b]!), 0.5 * (this.y[a]! + this.y[b]!), c.gen + 1, a, b);
      this.edgeMid.set(k, m);
    } else if (this.gen[m] !== c.gen + 1) {
      throw new Error(`fixture: vertex ${m} bisects elements of generations ${this.gen[m]! - 1} and ${c.gen}`);
    }
    c.mid = m;
    if (this.dim === 1) {
      c.children = [this.addCell([a, m], c.gen + 1, c.material), this.addCell([m, b], c.gen + 1, c.material)];
      return;
    }
    const cc = c.v[2]!;
    for (let i = 0; i < 3; i++) {
      const l = this.edgeList(c.v[i]!, c.v[(i + 1) % 3]!);
      l.splice(l.indexOf(id), 1);
    }
    c.children = [this.addCell([cc, a, m], c.gen + 1, c.material), this.addCell([b, cc, m], c.gen + 1, c.material)];
  }

  private hanging(id: number): boolean {
    const v = this.cells[id]!.v;
    for (let i = 0; i < 3; i++) if (this.edgeMid.has(BisectionFixture.key(v[i]!, v[(i + 1) % 3]!))) return true;
    return false;
  }

  /** Bisects the given leaf cells and (d = 2) restores conformity by further bisections. */
  refine(marked: number[]): void {
    const work = marked.slice();
    while (work.length > 0) {
      const id = work.pop()!;
      const c = this.cells[id]!;
      if (c.children) continue;
      const a = c.v[0]!;
      const b = c.v[1]!;
      const neighbours = this.dim === 2 ? this.edgeList(a, b).slice() : [];
      this.bisect(id);
      if (this.dim === 1) continue;
      for (const t of neighbours) if (t !== id && !this.cells[t]!.children) work.push(t);
      for (const ch of c.children!) if (this.hanging(ch)) work.push(ch);
    }
  }

  leaves(): number[] {
    const out: number[] = [];
    const stack = this.roots.slice().reverse();
    while (stack.length > 0) {
      const id = stack.pop()!;
      const c = this.cells[id]!;
      if (c.children) stack.push(c.children[1], c.children[0]);
      else out.push(id);
    }
    return out;
  }

  uniform(rounds: number): this {
    for (let r = 0; r < rounds; r++) this.refine(this.leaves());
    return this;
  }

  /** `rounds` times: bisect every leaf that satisfies `touch` (then close). */
  gradeWhere(rounds: number, touch: (cell: number[]) => boolean): this {
    for (let r = 0; r < rounds; r++) this.refine(this.leaves().filter((id) => touch(this.cells[id]!.v)));
    return this;
  }

  /** Graded toward the point p: bisect the leaves containing p, `rounds` times. */
  gradeTowardPoint(rounds: number, px: number, py = 0): this {
    return this.gradeWhere(rounds, (v) => this.contains(v, px, py));
  }

  /** d = 2: graded toward the edge y = 0: bisect leaves with a vertex on y = 0, `rounds` times. */
  gradeTowardBottomEdge(rounds: number): this {
    return this.gradeWhere(rounds, (v) => v.some((i) => this.y[i] === 0));
  }

  private contains(v: number[], px: number, py: number): boolean {
    // tolerances relative to the cell size: graded cells get as small as 2^-60
    if (this.dim === 1) {
      const lo = Math.min(this.x[v[0]!]!, this.x[v[1]!]!);
      const hi = Math.max(this.x[v[0]!]!, this.x[v[1]!]!);
      const eps = 1e-12 * (hi - lo);
      return px >= lo - eps && px <= hi + eps;
    }
    const orient = (i: number, j: number): number =>
      (this.x[j]! - this.x[i]!) * (py - this.y[i]!) - (this.y[j]! - this.y[i]!) * (px - this.x[i]!);
    const [a, b, c] = [v[0]!, v[1]!, v[2]!];
    const eps = -1e-12 * Math.abs((this.x[b]! - this.x[a]!) * (this.y[c]! - this.y[a]!) - (this.y[b]! - this.y[a]!) * (this.x[c]! - this.x[a]!));
    return orient(a, b) >= eps && orient(b, c) >= eps && orient(c, a) >= eps;
  }

  /** Leaf mesh of the vertices of generation ≤ cap (default: all). */
  leafMesh(cap = Infinity): LeafMesh {
    const n0 = this.vertexCount;
    const ids: number[] = [];
    for (let i = 0; i < n0; i++) if (this.gen[i]! <= cap) ids.push(i);
    ids.sort((p, q) => this.gen[p]! - this.gen[q]! || p - q);
    const local = new Int32Array(n0).fill(-1);
    ids.forEach((id, i) => (local[id] = i));
    const n = ids.length;
    const d = this.dim;
    const coords = new Float64Array(d * n);
    const generation = new Int32Array(n);
    const parentA = new Int32Array(n);
    const parentB = new Int32Array(n);
    const isFree = new Uint8Array(n);
    const globalId = new Int32Array(n);
    for (let i = 0; i < n; i++) {
      const id = ids[i]!;
      globalId[i] = id;
      coords[d * i] = this.x[id]!;
      if (d === 2) coords[d * i + 1] = this.y[id]!;
      generation[i] = this.gen[id]!;
      parentA[i] = this.pa[id]! >= 0 ? local[this.pa[id]!]! : -1;
      parentB[i] = this.pb[id]! >= 0 ? local[this.pb[id]!]! : -1;
      isFree[i] = this.dirichlet(this.x[id]!, this.y[id]!) ? 0 : 1;
    }
    const elems: number[] = [];
    const mats: number[] = [];
    const stack = this.roots.slice().reverse();
    while (stack.length > 0) {
      const id = stack.pop()!;
      const c = this.cells[id]!;
      if (c.children && this.gen[c.mid]! <= cap) stack.push(c.children[1], c.children[0]);
      else {
        for (const v of c.v) elems.push(local[v]!);
        mats.push(c.material);
      }
    }
    return {
      dim: d, vertexCount: n, globalId, coords, generation, parentA, parentB, isFree,
      elementCount: mats.length, elements: Int32Array.from(elems), elementMaterial: Int32Array.from(mats),
      kappa: Float64Array.from(this.kappa), reaction: Float64Array.from(this.reaction),
      ...(this.kappaTensor !== undefined ? { kappaTensor: Float64Array.from(this.kappaTensor) } : {}),
    };
  }
}
