/**
 * SpatialDomain: the validated initial mesh, coefficients, boundary and the one global
 * newest-vertex-bisection forest of a problem (docs/method.md §4.1).
 */
import { InvalidArgumentError, InvalidIndexSetError, describeValue } from '../errors';
import { BisectionForest } from './forest';
import type { InitialMesh } from './initial-mesh';
import type { LeafMesh } from './leaf-mesh';
import { segmentMeetsElement } from './geometry';
import { InitialLocator } from './initial-locator';
import { BYTES_PER_FOREST_VERTEX, checkFunction, checkMemory, memoryBudget } from '../validation/index';

/**
 * A spatial domain Ω with its lazily grown bisection forest. Build one with
 * {@link intervalDomain}, {@link triangulatedDomain}, {@link rectangleDomain}, {@link lShapeDomain}
 * or {@link squareWithHoleDomain}.
 *
 * Vertex sets passed to the methods are sorted `Int32Array`s of free vertex ids that are closed
 * under godparents (see {@link SpatialDomain.close}); the leaf mesh of such a set is the conforming
 * bisection mesh whose vertices are the set plus the Dirichlet vertices and initial vertices it needs.
 *
 * @example
 * ```ts
 * import { rectangleDomain } from 'chronomesh';
 * const dom = rectangleDomain(0, 1, 0, 1, 2, 2);
 * const set = dom.uniformSet(2);
 * console.log(set.length, dom.leafMesh(set).elementCount); // → 49 112 — Dirichlet midpoints only where needed
 * ```
 */
export class SpatialDomain {
  readonly dim: 1 | 2;
  /** Number of clockwise input triangles that were reoriented counter-clockwise. */
  readonly reorientedTriangles: number;
  /** @internal */
  readonly forest: BisectionForest;
  private mark: Uint8Array;
  private localIdx: Int32Array;
  private work: Int32Array;
  private stack: Int32Array;
  private leafBuf: Int32Array;
  private locator: InitialLocator | null = null;

  /** @internal Use the domain constructors instead. */
  constructor(init: InitialMesh) {
    this.dim = init.dim;
    this.reorientedTriangles = init.reoriented;
    this.forest = new BisectionForest(init);
    this.mark = new Uint8Array(0);
    this.localIdx = new Int32Array(0);
    this.work = new Int32Array(0);
    this.stack = new Int32Array(256);
    this.leafBuf = new Int32Array(256);
    this.syncScratch();
  }

  private syncScratch(): void {
    const cap = this.forest.vertexCapacity;
    if (this.mark.length < cap) {
      const m = new Uint8Array(cap);
      m.set(this.mark);
      this.mark = m;
      const l = new Int32Array(cap).fill(-1);
      l.set(this.localIdx);
      this.localIdx = l;
      const w = new Int32Array(cap);
      w.set(this.work);
      this.work = w;
    }
  }

  /** Vertices created so far (grows as the forest is refined). */
  get vertexCount(): number {
    return this.forest.vertexCount;
  }
  /** Number of initial vertices (ids 0 … initialVertexCount − 1). */
  get initialVertexCount(): number {
    return this.forest.initialVertexCount;
  }
  /** Number of initial elements. */
  get initialElementCount(): number {
    return this.forest.initialElementCount;
  }

  private checkVertex(v: number, field = 'v'): void {
    if (!Number.isInteger(v) || v < 0 || v >= this.forest.vertexCount) {
      throw new InvalidArgumentError(`${field} = ${describeValue(v)} is not a vertex id (valid: 0…${this.forest.vertexCount - 1})`, {
        field,
        expected: `integer in [0, ${this.forest.vertexCount - 1}]`,
        received: v,
      });
    }
  }

  /** False for vertices on the Dirichlet boundary (they carry no unknown). */
  isFree(v: number): boolean {
    this.checkVertex(v);
    return this.forest.vFree[v] === 1;
  }
  /** Generation of a vertex: 0 for initial vertices, else 1 + the generation of the elements bisected at it. */
  generation(v: number): number {
    this.checkVertex(v);
    return this.forest.vGen[v]!;
  }
  /** Spatial level ⌈generation / dim⌉ (h halves per level). */
  level(v: number): number {
    this.checkVertex(v);
    return Math.ceil(this.forest.vGen[v]! / this.dim);
  }
  /** Writes the 0–2 godparents of `v` into `out` and returns their number. */
  godparents(v: number, out: Int32Array): number {
    this.checkVertex(v);
    let k = 0;
    const g0 = this.forest.vGod0[v]!, g1 = this.forest.vGod1[v]!;
    if (g0 >= 0) out[k++] = g0;
    if (g1 >= 0) out[k++] = g1;
    return k;
  }
  /** Writes the interpolation parents (endpoints of the bisected edge) into `out`; returns 0 for initial vertices, else 2. */
  interpolationParents(v: number, out: Int32Array): number {
    this.checkVertex(v);
    const a = this.forest.vParentA[v]!;
    if (a < 0) return 0;
    out[0] = a;
    out[1] = this.forest.vParentB[v]!;
    return 2;
  }
  /** Coordinate `axis` (0 = x, 1 = y) of vertex `v`. */
  coordinate(v: number, axis: number): number {
    this.checkVertex(v);
    if (axis !== 0 && !(axis === 1 && this.dim === 2)) {
      throw new InvalidArgumentError(`axis must be 0${this.dim === 2 ? ' or 1' : ''}, received ${describeValue(axis)}`, {
        field: 'axis',
        expected: this.dim === 2 ? '0 or 1' : '0',
        received: axis,
      });
    }
    return this.forest.vCoord[v * this.dim + axis]!;
  }
  /** Vertices of initial element `e` (dim + 1 ids; counter-clockwise in 2D, refinement edge first). */
  initialElement(e: number, out: Int32Array): Int32Array {
    if (!Number.isInteger(e) || e < 0 || e >= this.forest.initialElementCount) {
      throw new InvalidArgumentError(`e = ${describeValue(e)} is not an initial element`, {
        field: 'e',
        expected: `integer in [0, ${this.forest.initialElementCount - 1}]`,
        received: e,
      });
    }
    const nv = this.forest.nv;
    for (let k = 0; k < nv; k++) out[k] = this.forest.eVert[e * nv + k]!;
    return out;
  }
  /** Sorted free initial vertices. */
  initialFreeVertices(): Int32Array {
    const f = this.forest;
    const out: number[] = [];
    for (let v = 0; v < f.initialVertexCount; v++) if (f.vFree[v]) out.push(v);
    return Int32Array.from(out);
  }

  // ---------------------------------------------------------------- closure

  /**
   * Marks (bit 1) the full closure of `ids` ∪ initial vertices in `this.mark`, appending the
   * marked vertices to `this.work`; returns their number. Caller must unmark.
   */
  private markClosure(ids: ArrayLike<number>, field: string, start = 0): number {
    this.syncScratch();
    const f = this.forest;
    const mark = this.mark;
    const work = this.work;
    let n = start;
    if (start === 0) {
      for (let v = 0; v < f.initialVertexCount; v++) {
        mark[v] = 1;
        work[n++] = v;
      }
    }
    const nvc = f.vertexCount;
    for (let i = 0; i < ids.length; i++) {
      const v = ids[i]!;
      if (!(v >= 0 && v < nvc && v === Math.floor(v))) {
        for (let k = 0; k < n; k++) mark[work[k]!] = 0;
        throw new InvalidArgumentError(`${field}[${i}] = ${describeValue(v)} is not a vertex id (valid: 0…${nvc - 1})`, {
          field: `${field}[${i}]`,
          expected: `integer in [0, ${nvc - 1}]`,
          received: v,
        });
      }
      if (!(mark[v]! & 1)) {
        mark[v] = mark[v]! | 1;
        work[n++] = v;
      }
    }
    return this.closeWorkList(start, n);
  }

  private closeWorkList(from: number, n: number): number {
    const f = this.forest;
    const mark = this.mark;
    const work = this.work;
    const g0 = f.vGod0, g1 = f.vGod1;
    for (let k = from; k < n; k++) {
      const v = work[k]!;
      const a = g0[v]!, b = g1[v]!;
      if (a >= 0 && !(mark[a]! & 1)) {
        mark[a] = mark[a]! | 1;
        work[n++] = a;
      }
      if (b >= 0 && !(mark[b]! & 1)) {
        mark[b] = mark[b]! | 1;
        work[n++] = b;
      }
    }
    return n;
  }

  private unmark(n: number): void {
    const mark = this.mark, work = this.work;
    for (let k = 0; k < n; k++) mark[work[k]!] = 0;
  }

  private freeSorted(n: number): Int32Array {
    const fr = this.forest.vFree, work = this.work;
    let c = 0;
    for (let k = 0; k < n; k++) if (fr[work[k]!]) c++;
    const out = new Int32Array(c);
    c = 0;
    for (let k = 0; k < n; k++) {
      const v = work[k]!;
      if (fr[v]) out[c++] = v;
    }
    return out.sort();
  }

  /**
   * Smallest closed free vertex set containing `ids`: adds godparents recursively (through
   * Dirichlet vertices too) and all free initial vertices, then drops Dirichlet vertices.
   */
  close(ids: ArrayLike<number>): Int32Array {
    const n = this.markClosure(ids, 'ids');
    const out = this.freeSorted(n);
    this.unmark(n);
    return out;
  }

  /** Validates that `set` is a sorted closed free set; returns the closure size (marks left set). */
  private markSet(set: Int32Array, field: string): number {
    if (!(set instanceof Int32Array)) {
      throw new InvalidArgumentError(`${field} must be an Int32Array of vertex ids, received ${describeValue(set)}`, {
        field,
        expected: 'Int32Array',
        received: describeValue(set),
      });
    }
    for (let i = 1; i < set.length; i++) {
      if (!(set[i]! > set[i - 1]!)) {
        throw new InvalidIndexSetError(`${field} must be strictly increasing, but ${field}[${i}] = ${set[i]} follows ${set[i - 1]}`, {
          field: `${field}[${i}]`,
          expected: 'strictly increasing vertex ids',
          received: set[i],
        });
      }
    }
    const n = this.markClosure(set, field);
    const fr = this.forest.vFree;
    for (let i = 0; i < set.length; i++) {
      if (!fr[set[i]!]) {
        this.unmark(n);
        throw new InvalidIndexSetError(`${field}[${i}] = ${set[i]} is a Dirichlet vertex (it carries no unknown)`, {
          field: `${field}[${i}]`,
          expected: 'free vertices only',
          received: set[i],
        });
      }
    }
    let free = 0;
    for (let k = 0; k < n; k++) if (fr[this.work[k]!]) free++;
    if (free !== set.length) {
      // Find the culprit: a free vertex of the closure that the set lacks.
      const inSet = new Set<number>(set);
      let msg = '';
      for (let k = 0; k < n && !msg; k++) {
        const v = this.work[k]!;
        if (fr[v] && !inSet.has(v)) msg = `${field} is not closed: free vertex ${v} (an initial vertex or a godparent of a member) is missing`;
      }
      this.unmark(n);
      throw new InvalidIndexSetError(msg, { field, expected: 'a closed set of free vertices (see SpatialDomain.close)', received: describeValue(set) });
    }
    return n;
  }

  /** @internal Validates that `set` is a sorted closed set of free vertex ids, naming `field`. */
  checkSet(set: Int32Array, field: string): void {
    this.unmark(this.markSet(set, field));
  }

  // ---------------------------------------------------------------- refinement

  private pushStack(sp: number, e: number): number {
    if (sp === this.stack.length) {
      const s = new Int32Array(2 * sp);
      s.set(this.stack);
      this.stack = s;
    }
    this.stack[sp] = e;
    return sp + 1;
  }

  /** All free vertices with level(v) ≤ `level` (creating them in the forest). */
  uniformSet(level: number): Int32Array {
    if (!Number.isInteger(level) || level < 0 || level > 60) {
      throw new InvalidArgumentError(`level must be an integer in [0, 60], received ${describeValue(level)}`, {
        field: 'level',
        expected: 'integer in [0, 60]',
        received: level,
      });
    }
    const f = this.forest;
    const maxGen = level * this.dim;
    // NVB halves element measure per generation: about initialElements · 2^maxGen leaves, half as many vertices in 2D.
    const vertices = f.initialVertexCount + (f.initialElementCount * 2 ** maxGen) / this.dim;
    checkMemory(vertices * BYTES_PER_FOREST_VERTEX, `the uniform set of level ${level} (about ${vertices.toExponential(1)} vertices)`, 'level', 'choose a lower level');
    const created: number[] = [];
    let sp = 0;
    for (let e = 0; e < f.initialElementCount; e++) sp = this.pushStack(sp, e);
    while (sp > 0) {
      const e = this.stack[--sp]!;
      if (f.eGen[e]! >= maxGen) continue;
      const m = f.bisect(e);
      if (f.vGen[m]! <= maxGen) created.push(m);
      const c = f.eChild[e]!;
      sp = this.pushStack(sp, c);
      sp = this.pushStack(sp, c + 1);
    }
    return this.close(created);
  }

  /** Descends the forest below the marked (bit 1) closure; collects leaf elements into leafBuf. */
  private collectLeaves(): number {
    const f = this.forest;
    const mark = this.mark;
    let sp = 0;
    let nl = 0;
    for (let e = f.initialElementCount - 1; e >= 0; e--) sp = this.pushStack(sp, e);
    while (sp > 0) {
      const e = this.stack[--sp]!;
      const m = f.eMid[e]!;
      if (m >= 0 && mark[m]! & 1) {
        const c = f.eChild[e]!;
        sp = this.pushStack(sp, c + 1);
        sp = this.pushStack(sp, c);
      } else {
        if (nl === this.leafBuf.length) {
          const b = new Int32Array(2 * nl);
          b.set(this.leafBuf);
          this.leafBuf = b;
        }
        this.leafBuf[nl++] = e;
      }
    }
    return nl;
  }

  /**
   * Adds freshly created bisection midpoints to the marked work list (after the forest grew)
   * and closes it; returns the new work-list length.
   */
  private addMidpoints(mids: number[], n: number): number {
    this.syncScratch();
    const start = n;
    for (const m of mids) {
      if (!(this.mark[m]! & 1)) {
        this.mark[m] = 1;
        this.work[n++] = m;
      }
    }
    return this.closeWorkList(start, n);
  }

  /**
   * Free vertices created by one bisection of every leaf element of the leaf mesh of `set`
   * (sorted; only ids not already in `set`). `set` ∪ result is closed.
   */
  refineAll(set: Int32Array): Int32Array {
    let n = this.markSet(set, 'set');
    const nl = this.collectLeaves();
    const leaves = this.leafBuf.slice(0, nl);
    const mids: number[] = [];
    for (let i = 0; i < nl; i++) mids.push(this.forest.bisect(leaves[i]!));
    const start = n;
    n = this.addMidpoints(mids, n);
    const fr = this.forest.vFree;
    const out: number[] = [];
    for (let k = start; k < n; k++) if (fr[this.work[k]!]) out.push(this.work[k]!);
    this.unmark(n);
    return Int32Array.from(out).sort();
  }

  /**
   * Free vertices of the *interior refinement* of the leaf mesh of `set` (sorted; only ids not
   * already in `set`; `set` ∪ result is closed). Every leaf element is bisected `generations` times
   * in a row (all its descendants down to that depth) — `generations = dim` halves the mesh size —
   * and, where that created no free vertex inside the leaf (all new midpoints on the Dirichlet
   * boundary), up to `extra` further generations until one appears. This is the spatial part of the
   * enlarged index set of the adaptive loop: one plain bisection of a leaf whose refinement edge lies
   * on the Dirichlet boundary adds only a Dirichlet midpoint, which carries no unknown, so without
   * the extra generations a coarse mesh can hide all spatial refinement from the estimator
   * (docs/adaptivity.md §2).
   */
  refineInterior(set: Int32Array, generations: number, extra = 4): Int32Array {
    if (!Number.isInteger(generations) || generations < 1 || generations > 8) {
      throw new InvalidArgumentError(`generations must be an integer in [1, 8], received ${describeValue(generations)}`, {
        field: 'generations',
        expected: 'integer in [1, 8]',
        received: generations,
      });
    }
    let n = this.markSet(set, 'set');
    const nl = this.collectLeaves();
    const leaves = this.leafBuf.slice(0, nl);
    const f = this.forest;
    const mids: number[] = [];
    // Per leaf: breadth-first over its descendants, one generation per round.
    let front: number[] = [];
    let next: number[] = [];
    for (let i = 0; i < nl; i++) {
      front.length = 0;
      front.push(leaves[i]!);
      let freeFound = false;
      for (let g = 0; g < generations + extra && front.length > 0; g++) {
        if (g >= generations && freeFound) break;
        next.length = 0;
        for (const e of front) {
          const m = f.bisect(e);
          mids.push(m);
          if (f.vFree[m]) freeFound = true;
          const c = f.eChild[e]!;
          next.push(c, c + 1);
        }
        const t = front;
        front = next;
        next = t;
      }
    }
    const start = n;
    n = this.addMidpoints(mids, n);
    const fr = f.vFree;
    const out: number[] = [];
    for (let k = start; k < n; k++) if (fr[this.work[k]!]) out.push(this.work[k]!);
    this.unmark(n);
    return Int32Array.from(out).sort();
  }

  /**
   * Closed set containing `set`, refined `generations` more times toward a target: every leaf
   * element meeting the target is bisected, `generations` times in a row. The target is a point
   * (`[x]` in 1D, `[x, y]` in 2D) or a segment (`[x0, y0, x1, y1]`, e.g. a boundary edge).
   */
  refineTowards(set: Int32Array, point: number[], generations: number): Int32Array {
    const d = this.dim;
    if (!Array.isArray(point) || (point.length !== d && point.length !== 2 * d) || point.some((p) => !Number.isFinite(p))) {
      throw new InvalidArgumentError(`point must be ${d} (a point) or ${2 * d} (a segment) finite numbers, received ${JSON.stringify(point)}`, {
        field: 'point',
        expected: `${d} or ${2 * d} finite numbers`,
        received: JSON.stringify(point),
      });
    }
    if (!Number.isInteger(generations) || generations < 0 || generations > 200) {
      throw new InvalidArgumentError(`generations must be an integer in [0, 200], received ${describeValue(generations)}`, {
        field: 'generations',
        expected: 'integer in [0, 200]',
        received: generations,
      });
    }
    const q = point.length === d ? [...point, ...point] : point;
    const f = this.forest;
    let n = this.markSet(set, 'set');
    const hits: number[] = [];
    for (let g = 0; g < generations; g++) {
      hits.length = 0;
      let sp = 0;
      for (let e = 0; e < f.initialElementCount; e++) if (segmentMeetsElement(f, e, q)) sp = this.pushStack(sp, e);
      while (sp > 0) {
        const e = this.stack[--sp]!;
        const m = f.eMid[e]!;
        if (m >= 0 && this.mark[m]! & 1) {
          const c = f.eChild[e]!;
          if (segmentMeetsElement(f, c, q)) sp = this.pushStack(sp, c);
          if (segmentMeetsElement(f, c + 1, q)) sp = this.pushStack(sp, c + 1);
        } else hits.push(e);
      }
      n = this.addMidpoints(hits.map((e) => f.bisect(e)), n);
    }
    const out = this.freeSorted(n);
    this.unmark(n);
    return out;
  }

  /**
   * Closed set of the bisection mesh that bisects every element whose diameter exceeds
   * `meshSize` at its centroid, down to at most `maxGeneration` element generations (then closed
   * for conformity). Handy for graded meshes, e.g. `meshSize = (x, y) => H * Math.hypot(x, y) ** (2 / 3)`.
   */
  adaptedSet(meshSize: (x: number, y: number) => number, maxGeneration: number): Int32Array {
    checkFunction(meshSize, 'meshSize', 'a function (x, y) => h');
    if (!Number.isInteger(maxGeneration) || maxGeneration < 0 || maxGeneration > 200) {
      throw new InvalidArgumentError(`maxGeneration must be an integer in [0, 200], received ${describeValue(maxGeneration)}`, {
        field: 'maxGeneration',
        expected: 'integer in [0, 200]',
        received: maxGeneration,
      });
    }
    const f = this.forest;
    const d = this.dim, nv = f.nv;
    const created: number[] = [];
    // The final size is unknown in advance: refuse once the forest would outgrow the memory budget.
    const maxVertices = memoryBudget() / BYTES_PER_FOREST_VERTEX;
    let sp = 0;
    for (let e = 0; e < f.initialElementCount; e++) sp = this.pushStack(sp, e);
    while (sp > 0) {
      const e = this.stack[--sp]!;
      if (f.eGen[e]! >= maxGeneration) continue;
      if (f.vertexCount >= maxVertices) {
        checkMemory(f.vertexCount * BYTES_PER_FOREST_VERTEX * 2, `adaptedSet with maxGeneration ${maxGeneration} (already ${f.vertexCount} vertices, still refining)`, 'meshSize', 'ask for a coarser meshSize or a lower maxGeneration');
      }
      let cx = 0, cy = 0, diam = 0;
      for (let k = 0; k < nv; k++) {
        const v = f.eVert[e * nv + k]!;
        cx += f.vCoord[v * d]! / nv;
        if (d === 2) cy += f.vCoord[v * d + 1]! / nv;
      }
      // The refinement edge is the longest edge of an NVB element up to a bounded factor; use it as diameter.
      const a = f.eVert[e * nv]!, b = f.eVert[e * nv + 1]!;
      for (let k = 0; k < d; k++) diam += (f.vCoord[a * d + k]! - f.vCoord[b * d + k]!) ** 2;
      diam = Math.sqrt(diam);
      const h: unknown = meshSize(cx, cy);
      if (typeof h !== 'number' || Number.isNaN(h) || h < 0) {
        throw new InvalidArgumentError(`meshSize(${cx}, ${cy}) returned ${describeValue(h)}; expected a number ≥ 0 (Infinity: no refinement)`, {
          field: 'meshSize',
          expected: 'a number ≥ 0',
          received: describeValue(h),
        });
      }
      if (!(diam > h)) continue;
      created.push(f.bisect(e));
      const c = f.eChild[e]!;
      sp = this.pushStack(sp, c);
      sp = this.pushStack(sp, c + 1);
    }
    return this.close(created);
  }

  // ---------------------------------------------------------------- leaf mesh

  /**
   * The leaf mesh of the closure of `set` in local numbering (order: generation, then id), with
   * `forestElement` giving the forest element of each leaf and `memberLocal` the local index of
   * each member of `set` (in the order of `set`).
   */
  leafMesh(set: Int32Array, field = 'set'): LeafMesh & { readonly forestElement: Int32Array; readonly memberLocal: Int32Array } {
    const n = this.markSet(set, field);
    const f = this.forest;
    const d = this.dim;
    // order (generation, id): bucket by generation, then sort each bucket
    let maxG = 0;
    for (let k = 0; k < n; k++) {
      const g = f.vGen[this.work[k]!]!;
      if (g > maxG) maxG = g;
    }
    const start = new Int32Array(maxG + 2);
    for (let k = 0; k < n; k++) start[f.vGen[this.work[k]!]! + 1]!++;
    for (let g = 0; g <= maxG; g++) start[g + 1] = start[g + 1]! + start[g]!;
    const globalId = new Int32Array(n);
    const fill = start.slice(0, maxG + 1);
    for (let k = 0; k < n; k++) {
      const v = this.work[k]!;
      globalId[fill[f.vGen[v]!]!++] = v;
    }
    for (let g = 0; g <= maxG; g++) globalId.subarray(start[g]!, start[g + 1]!).sort();
    const generation = new Int32Array(n);
    const coords = new Float64Array(n * d);
    const isFree = new Uint8Array(n);
    const local = this.localIdx;
    for (let i = 0; i < n; i++) {
      const v = globalId[i]!;
      generation[i] = f.vGen[v]!;
      local[v] = i;
      for (let k = 0; k < d; k++) coords[i * d + k] = f.vCoord[v * d + k]!;
      isFree[i] = f.vFree[v]!;
    }
    const parentA = new Int32Array(n);
    const parentB = new Int32Array(n);
    for (let i = 0; i < n; i++) {
      const v = globalId[i]!;
      const a = f.vParentA[v]!;
      parentA[i] = a >= 0 ? local[a]! : -1;
      parentB[i] = a >= 0 ? local[f.vParentB[v]!]! : -1;
    }
    const nl = this.collectLeaves();
    const nv = f.nv;
    const elements = new Int32Array(nl * nv);
    const elementMaterial = new Int32Array(nl);
    const forestElement = this.leafBuf.slice(0, nl);
    for (let i = 0; i < nl; i++) {
      const e = forestElement[i]!;
      for (let k = 0; k < nv; k++) elements[i * nv + k] = local[f.eVert[e * nv + k]!]!;
      elementMaterial[i] = f.eMat[e]!;
    }
    const memberLocal = new Int32Array(set.length);
    for (let i = 0; i < set.length; i++) memberLocal[i] = local[set[i]!]!;
    for (let i = 0; i < n; i++) local[globalId[i]!] = -1;
    this.unmark(n);
    return {
      dim: this.dim,
      vertexCount: n,
      globalId,
      coords,
      generation,
      parentA,
      parentB,
      isFree,
      elementCount: nl,
      elements,
      elementMaterial,
      kappa: f.kappa,
      reaction: f.reaction,
      forestElement,
      memberLocal,
    };
  }

  // ---------------------------------------------------------------- point location

  /**
   * Starts a point-location query on a leaf mesh: marks its vertices and fills the local index
   * map. Must be followed by {@link SpatialDomain.endMeshQuery} with the same mesh.
   * @internal
   */
  beginMeshQuery(mesh: LeafMesh): Int32Array {
    this.syncScratch();
    const g = mesh.globalId;
    for (let i = 0; i < g.length; i++) {
      this.mark[g[i]!] = 1;
      this.localIdx[g[i]!] = i;
    }
    return this.localIdx;
  }
  /** @internal */
  endMeshQuery(mesh: LeafMesh): void {
    const g = mesh.globalId;
    for (let i = 0; i < g.length; i++) {
      this.mark[g[i]!] = 0;
      this.localIdx[g[i]!] = -1;
    }
  }

  /**
   * Forest leaf element of the mesh opened by {@link SpatialDomain.beginMeshQuery} containing the
   * point, found by locating the initial element (bucket grid) and descending the forest.
   * Returns −1 outside the domain.
   * @internal
   */
  locateLeaf(x: number, y: number): number {
    if (this.locator === null) this.locator = new InitialLocator(this.forest);
    let e = this.locator.find(x, y);
    if (e < 0) return -1;
    const f = this.forest;
    const d = this.dim;
    const inMesh = this.mark;
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
