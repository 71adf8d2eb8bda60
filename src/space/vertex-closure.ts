/**
 * Closure of vertex sets under godparents and the validation of closed sets, over scratch arrays
 * shared by all operations of one {@link SpatialDomain} (docs/method.md §4.1).
 *
 * The scratch is mutable and shared: `mark` (bit 1 = in the current closure), the work list
 * `work` of marked vertices, the local index map `localIdx` (−1 outside a query), and the stacks
 * of the forest descents. Every operation marks, works and unmarks before it returns, so the
 * scratch is clean between calls (the point-location queries keep it marked between
 * `beginMeshQuery` and `endMeshQuery`). Single-threaded by construction.
 */
import { InvalidArgumentError, InvalidIndexSetError, describeValue } from '../errors';
import type { BisectionForest } from './forest';

/** @internal Scratch and closure operations of a SpatialDomain. */
export class VertexClosure {
  readonly forest: BisectionForest;
  readonly dim: 1 | 2;
  mark: Uint8Array;
  localIdx: Int32Array;
  work: Int32Array;
  stack: Int32Array;
  leafBuf: Int32Array;

  constructor(forest: BisectionForest) {
    this.forest = forest;
    this.dim = forest.dim;
    this.mark = new Uint8Array(0);
    this.localIdx = new Int32Array(0);
    this.work = new Int32Array(0);
    this.stack = new Int32Array(256);
    this.leafBuf = new Int32Array(256);
    this.syncScratch();
  }

  syncScratch(): void {
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

  /**
   * Marks (bit 1) the full closure of `ids` ∪ initial vertices in `this.mark`, appending the
   * marked vertices to `this.work`; returns their number. Caller must unmark.
   */
  markClosure(ids: ArrayLike<number>, field: string, start = 0): number {
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

  closeWorkList(from: number, n: number): number {
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

  unmark(n: number): void {
    const mark = this.mark, work = this.work;
    for (let k = 0; k < n; k++) mark[work[k]!] = 0;
  }

  freeSorted(n: number): Int32Array {
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
  markSet(set: Int32Array, field: string): number {
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

  pushStack(sp: number, e: number): number {
    if (sp === this.stack.length) {
      const s = new Int32Array(2 * sp);
      s.set(this.stack);
      this.stack = s;
    }
    this.stack[sp] = e;
    return sp + 1;
  }

  /** Descends the forest below the marked (bit 1) closure; collects leaf elements into leafBuf. */
  collectLeaves(): number {
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
  addMidpoints(mids: number[], n: number): number {
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
}
