/**
 * Node geometry of both temporal bases (docs/method.md §3.1, §3.2): exact dyadic
 * supports, parents and children. Supports are integer numerators on the
 * level grid 2^{-level}; nothing is accumulated in floating point.
 */
import { POW2, MAX_TEMPORAL_LEVEL, checkKind, checkNode, type TemporalBasisKind } from './levels';

/** Unchecked kernel of {@link nodeSupport}. */
export function supportOf(kind: TemporalBasisKind, level: number, index: number, out: Float64Array): void {
  if (level === 0) {
    out[0] = 0;
    out[1] = 1;
  } else if (kind === 'trial') {
    // supp σ_{l,k} = [s_{l−1,k−1}, s_{l−1,k+2}] ∩ [0,1] in level-l numerators.
    const lo = 2 * index - 2;
    const hi = 2 * index + 4;
    const n = POW2[level]!;
    out[0] = lo < 0 ? 0 : lo;
    out[1] = hi > n ? n : hi;
  } else {
    // supp ψ_{l,k} = I_{l−1,k} = [2k, 2k+2] in level-l numerators.
    out[0] = 2 * index;
    out[1] = 2 * index + 2;
  }
}

/**
 * Exact dyadic support of a temporal node on the reference interval (0, 1):
 * writes `[lo, hi]` into `out` so that the support is `[lo·2^-level, hi·2^-level]`.
 * Both functions of a test node share the support.
 *
 * @example
 * ```ts
 * import { nodeSupport } from 'chronomesh';
 * const s = new Float64Array(2);
 * nodeSupport('trial', 3, 1, s); // s = [0, 6]: support [0, 6/8]
 * ```
 */
export function nodeSupport(kind: TemporalBasisKind, level: number, index: number, out: Float64Array): void {
  checkKind(kind);
  checkNode(kind, level, index);
  supportOf(kind, level, index, out);
}

/**
 * Parents of a node, written as pairs `(level, index)` into `out`
 * (length ≥ 4); returns their number (0, 1 or 2). The trial level-1 node has both
 * level-0 functions as parents (the tree is a DAG at the root).
 *
 * @example
 * ```ts
 * import { nodeParents } from 'chronomesh';
 * const p = new Float64Array(4);
 * nodeParents('trial', 5, 3, p); // 1; p = [4, 1, …]
 * ```
 */
export function nodeParents(kind: TemporalBasisKind, level: number, index: number, out: Float64Array): number {
  checkKind(kind);
  checkNode(kind, level, index);
  if (level === 0) return 0;
  if (level === 1) {
    out[0] = 0;
    out[1] = 0;
    if (kind === 'test') return 1;
    out[2] = 0;
    out[3] = 1;
    return 2;
  }
  out[0] = level - 1;
  out[1] = Math.floor(index / 2);
  return 1;
}

/**
 * Children of a node, written as pairs `(level, index)` into `out`
 * (length ≥ 4); returns their number (0 at {@link MAX_TEMPORAL_LEVEL}).
 *
 * @example
 * ```ts
 * import { nodeChildren } from 'chronomesh';
 * const c = new Float64Array(4);
 * nodeChildren('test', 2, 1, c); // 2; c = [3, 2, 3, 3]
 * ```
 */
export function nodeChildren(kind: TemporalBasisKind, level: number, index: number, out: Float64Array): number {
  checkKind(kind);
  checkNode(kind, level, index);
  if (level === MAX_TEMPORAL_LEVEL) return 0;
  if (level === 0) {
    out[0] = 1;
    out[1] = 0;
    return 1;
  }
  out[0] = level + 1;
  out[1] = 2 * index;
  out[2] = level + 1;
  out[3] = 2 * index + 1;
  return 2;
}
