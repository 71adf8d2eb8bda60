/**
 * Temporal trees: finite downward-closed node sets of one basis (docs/method.md §3.1, §3.2),
 * stored level by level with exact integer indices in Float64.
 */
import { InvalidArgumentError, InvalidIndexSetError, describeValue } from '../errors';
import { MAX_TEMPORAL_LEVEL, checkKind, checkNode, nodesOnLevel, type TemporalBasisKind } from './levels';

/** Options of {@link TemporalTree.fromNodes}. */
export interface TreeFromNodesOptions {
  /** Add missing ancestors instead of rejecting a set that is not closed (default false). */
  close?: boolean;
}

/** Largest level accepted by {@link TemporalTree.full} (2^26 nodes). */
const MAX_FULL_LEVEL = 26;

/**
 * A temporal tree: a finite set of nodes of the trial basis Σ or the test basis Ψ that contains
 * the parents of each of its nodes. Nodes are sorted by (level, index); coefficient vectors hold
 * one entry per node (trial) or the entries 2·node + slot (test).
 *
 * @example
 * ```ts
 * import { TemporalTree } from 'chronomesh';
 * const t = TemporalTree.fromNodes('trial', [0, 0, 1, 2], [0, 1, 0, 1]);
 * console.log(t.size, t.find(2, 1)); // → 4 3
 * ```
 */
export class TemporalTree {
  readonly kind: TemporalBasisKind;
  /** Number of nodes. */
  readonly size: number;
  /** Number of basis functions: size (trial) or 2·size (test). */
  readonly functionCount: number;
  /** Level of each node. */
  readonly level: Uint8Array;
  /** Translation index of each node (exact integer). */
  readonly index: Float64Array;
  /** Nodes of level l are [levelStart[l], levelStart[l+1]); length maxLevel + 2. */
  readonly levelStart: Int32Array;
  /** Deepest level present; −1 for the empty tree. */
  readonly maxLevel: number;
  private key: string | undefined;

  private constructor(kind: TemporalBasisKind, level: Uint8Array, index: Float64Array, levelStart: Int32Array) {
    this.kind = kind;
    this.size = index.length;
    this.functionCount = kind === 'trial' ? this.size : 2 * this.size;
    this.level = level;
    this.index = index;
    this.levelStart = levelStart;
    this.maxLevel = levelStart.length - 2;
  }

  /**
   * Builds a tree from node lists (any order, duplicates allowed). Throws
   * InvalidIndexSetError naming a missing parent unless `opts.close` is set, in which case
   * missing ancestors are added.
   *
   * @example
   * ```ts
   * import { TemporalTree } from 'chronomesh';
   * const t = TemporalTree.fromNodes('test', [3], [2], { close: true }); // adds (2,1), (1,0), (0,0)
   * console.log(t.size); // → 4
   * ```
   */
  static fromNodes(kind: TemporalBasisKind, levels: ArrayLike<number>, indices: ArrayLike<number>, opts: TreeFromNodesOptions = {}): TemporalTree {
    checkKind(kind);
    if (levels == null || typeof levels.length !== 'number') {
      throw new InvalidArgumentError(`levels must be an array of numbers; received ${describeValue(levels)}`, { field: 'levels', received: levels });
    }
    if (indices == null || typeof indices.length !== 'number') {
      throw new InvalidArgumentError(`indices must be an array of numbers; received ${describeValue(indices)}`, { field: 'indices', received: indices });
    }
    if (levels.length !== indices.length) {
      throw new InvalidArgumentError(
        `levels and indices must have the same length; received ${levels.length} and ${indices.length}`,
        { field: 'indices', expected: `length ${levels.length}`, received: indices.length },
      );
    }
    const n = levels.length;
    const count = new Int32Array(MAX_TEMPORAL_LEVEL + 1);
    for (let i = 0; i < n; i++) {
      const l = levels[i]!;
      const k = indices[i]!;
      // fast path; the full check (and its message) only when something is off
      if (!(Number.isInteger(l) && l >= 0 && l <= MAX_TEMPORAL_LEVEL && Number.isInteger(k) && k >= 0 && k < nodesOnLevel(kind, l))) {
        checkNode(kind, l, k, `[${i}]`, 'indices', 'levels');
      }
      count[l]!++;
    }
    // Bucket by level, sort each bucket numerically, remove duplicates.
    const buckets: Float64Array[] = [];
    const fill = new Int32Array(MAX_TEMPORAL_LEVEL + 1);
    for (let l = 0; l <= MAX_TEMPORAL_LEVEL; l++) buckets.push(new Float64Array(count[l]!));
    for (let i = 0; i < n; i++) {
      const l = levels[i]!;
      buckets[l]![fill[l]!++] = indices[i]!;
    }
    for (let l = 0; l <= MAX_TEMPORAL_LEVEL; l++) buckets[l] = uniqueSorted(buckets[l]!.sort());
    let top = MAX_TEMPORAL_LEVEL;
    while (top >= 0 && buckets[top]!.length === 0) top--;
    if (opts.close) {
      for (let l = top; l >= 1; l--) buckets[l - 1] = mergeUnique(buckets[l - 1]!, parentsOfLevel(kind, l, buckets[l]!));
    } else {
      for (let l = top; l >= 1; l--) {
        const miss = firstMissingParent(kind, l, buckets[l]!, buckets[l - 1]!);
        if (miss >= 0) {
          const k = buckets[l]![miss]!;
          const pk = l === 1 ? missingLevel0Parent(kind, buckets[0]!) : Math.floor(k / 2);
          let pos = 0;
          while (pos < n && !(levels[pos] === l && indices[pos] === k)) pos++;
          throw new InvalidIndexSetError(
            `node (level ${l}, index ${k}) of ${kind} tree has missing parent (level ${l - 1}, index ${pk}) ` +
              `(input position ${pos}); add it or pass { close: true }`,
            { field: `indices[${pos}]`, expected: `parent (level ${l - 1}, index ${pk}) present`, received: k },
          );
        }
      }
    }
    return TemporalTree.fromBuckets(kind, buckets, top);
  }

  /**
   * All nodes of levels 0 … maxLevel (maxLevel ≤ 26; −1 gives the empty tree).
   *
   * @example
   * ```ts
   * import { TemporalTree } from 'chronomesh';
   * console.log(TemporalTree.full('trial', 3).size); // → 9
   * ```
   */
  static full(kind: TemporalBasisKind, maxLevel: number): TemporalTree {
    checkKind(kind);
    if (!Number.isInteger(maxLevel) || maxLevel < -1 || maxLevel > MAX_FULL_LEVEL) {
      throw new InvalidArgumentError(`maxLevel must be an integer in [-1, ${MAX_FULL_LEVEL}]; received ${describeValue(maxLevel)}`, {
        field: 'maxLevel',
        expected: `integer in [-1, ${MAX_FULL_LEVEL}]`,
        received: maxLevel,
      });
    }
    const buckets: Float64Array[] = [];
    for (let l = 0; l <= maxLevel; l++) {
      const b = new Float64Array(nodesOnLevel(kind, l));
      for (let k = 0; k < b.length; k++) b[k] = k;
      buckets.push(b);
    }
    return TemporalTree.fromBuckets(kind, buckets, maxLevel);
  }

  /**
   * The tree of the nodes at the given ascending positions of this tree, without checks: the nodes
   * must contain the parent of each of their nodes (as a temporal fibre of a double tree does).
   * Equal to `fromNodes` on their levels and indices, without its buckets and sorts (the positions
   * of a tree sorted by (level, index) are already in that order). @internal
   */
  subTreeAt(positions: Int32Array): TemporalTree {
    const n = positions.length;
    const level = new Uint8Array(n);
    const index = new Float64Array(n);
    for (let j = 0; j < n; j++) {
      const p = positions[j]!;
      level[j] = this.level[p]!;
      index[j] = this.index[p]!;
    }
    const top = n > 0 ? level[n - 1]! : -1;
    const levelStart = new Int32Array(top + 2);
    for (let j = 0; j < n; j++) levelStart[level[j]! + 1]!++;
    for (let l = 0; l <= top; l++) levelStart[l + 1] = levelStart[l + 1]! + levelStart[l]!;
    return new TemporalTree(this.kind, level, index, levelStart);
  }

  private static fromBuckets(kind: TemporalBasisKind, buckets: Float64Array[], top: number): TemporalTree {
    const levelStart = new Int32Array(top + 2);
    for (let l = 0; l <= top; l++) levelStart[l + 1] = levelStart[l]! + buckets[l]!.length;
    const size = levelStart[top + 1]!;
    const level = new Uint8Array(size);
    const index = new Float64Array(size);
    for (let l = 0; l <= top; l++) {
      index.set(buckets[l]!, levelStart[l]!);
      level.fill(l, levelStart[l]!, levelStart[l + 1]!);
    }
    return new TemporalTree(kind, level, index, levelStart);
  }

  /**
   * Position of node (level, index), or −1 (binary search; not meant for hot loops).
   *
   * @example
   * ```ts
   * import { TemporalTree } from 'chronomesh';
   * TemporalTree.full('test', 2).find(2, 1); // 3
   * ```
   */
  find(level: number, index: number): number {
    if (!(level >= 0 && level <= this.maxLevel)) return -1;
    let lo = this.levelStart[level]!;
    let hi = this.levelStart[level + 1]! - 1;
    const a = this.index;
    while (lo <= hi) {
      const mid = (lo + hi) >> 1;
      const v = a[mid]!;
      if (v === index) return mid;
      if (v < index) lo = mid + 1;
      else hi = mid - 1;
    }
    return -1;
  }

  /**
   * Canonical string of the node set (kind, then per level the index gaps in base 36);
   * equal strings ⇔ equal trees. Computed once and cached.
   *
   * @example
   * ```ts
   * import { TemporalTree } from 'chronomesh';
   * TemporalTree.full('trial', 1).shapeKey() === TemporalTree.fromNodes('trial', [1, 0, 0], [0, 1, 0]).shapeKey(); // true
   * ```
   */
  shapeKey(): string {
    if (this.key !== undefined) return this.key;
    const parts: string[] = [this.kind];
    for (let l = 0; l <= this.maxLevel; l++) {
      let prev = -1;
      const gaps: string[] = [];
      for (let p = this.levelStart[l]!; p < this.levelStart[l + 1]!; p++) {
        const v = this.index[p]!;
        gaps.push((v - prev).toString(36));
        prev = v;
      }
      parts.push(gaps.join(','));
    }
    this.key = parts.join('|');
    return this.key;
  }
}

function uniqueSorted(a: Float64Array): Float64Array {
  if (a.length < 2) return a;
  let m = 1;
  for (let i = 1; i < a.length; i++) if (a[i] !== a[m - 1]) a[m++] = a[i]!;
  return m === a.length ? a : a.slice(0, m);
}

function mergeUnique(a: Float64Array, b: Float64Array): Float64Array {
  const out = new Float64Array(a.length + b.length);
  let i = 0, j = 0, m = 0;
  while (i < a.length || j < b.length) {
    let v: number;
    if (j >= b.length || (i < a.length && a[i]! <= b[j]!)) v = a[i++]!;
    else v = b[j++]!;
    if (m === 0 || out[m - 1] !== v) out[m++] = v;
  }
  return out.slice(0, m);
}

/** Sorted unique parent indices (on level l − 1) of the sorted level-l indices ks. */
function parentsOfLevel(kind: TemporalBasisKind, l: number, ks: Float64Array): Float64Array {
  if (ks.length === 0) return ks;
  if (l === 1) return kind === 'trial' ? Float64Array.of(0, 1) : Float64Array.of(0);
  const out = new Float64Array(ks.length);
  let m = 0;
  for (let i = 0; i < ks.length; i++) {
    const p = Math.floor(ks[i]! / 2);
    if (m === 0 || out[m - 1] !== p) out[m++] = p;
  }
  return out.slice(0, m);
}

/** Position in ks of the first level-l node whose parent is not in the sorted parent list, or −1. */
function firstMissingParent(kind: TemporalBasisKind, l: number, ks: Float64Array, parents: Float64Array): number {
  if (ks.length === 0) return -1;
  if (l === 1) return missingLevel0Parent(kind, parents) >= 0 ? 0 : -1;
  let j = 0;
  for (let i = 0; i < ks.length; i++) {
    const p = Math.floor(ks[i]! / 2);
    while (j < parents.length && parents[j]! < p) j++;
    if (j >= parents.length || parents[j] !== p) return i;
  }
  return -1;
}

/** The first level-0 parent of the level-1 node that is absent from the level-0 list, or −1. */
function missingLevel0Parent(kind: TemporalBasisKind, level0: Float64Array): number {
  const need = kind === 'trial' ? 2 : 1;
  for (let k = 0; k < need; k++) {
    let found = false;
    for (let i = 0; i < level0.length; i++) if (level0[i] === k) found = true;
    if (!found) return k;
  }
  return -1;
}
