/**
 * Fibres built as unions over temporally overlapping nodes (docs/method.md §5.1, §5.2).
 *
 * For every node q of `target` this computes
 *   F(q) = ∪ { source.fibre(p) : p ∈ source.tree, |p| = |q| + shift, |supp p ∩ supp q| > 0 },
 * which gives the test index set Λ_Y (shift 0, source Λ), the time-first
 * intermediate set Θ (shift 0, target π_t(Λ_out), source Λ_in) and the
 * space-first intermediate set Σ (shift 1, target π_t(Λ_in), source Λ_out).
 *
 * Within one level, supports are intervals whose ends are non-decreasing in
 * the translation index, so one two-pointer sweep per level finds all
 * overlapping pairs; each source node meets a bounded number of targets, so
 * the work is linear in the sizes of the two sets.
 */
import { nodeSupport, type TemporalTree } from '../time/index';
import type { DoubleTree } from './double-tree';
import { unionSorted } from './fibre-pool';

/** Exact support ends of every node of `tree` at the scale 2^-(level + shift). */
export function supportsAtScale(tree: TemporalTree, shift: number): { lo: Float64Array; hi: Float64Array } {
  const lo = new Float64Array(tree.size);
  const hi = new Float64Array(tree.size);
  const s = new Float64Array(2);
  const f = 2 ** shift;
  for (let i = 0; i < tree.size; i++) {
    nodeSupport(tree.kind, tree.level[i]!, tree.index[i]!, s);
    lo[i] = s[0]! * f;
    hi[i] = s[1]! * f;
  }
  return { lo, hi };
}

/**
 * Calls `visit(q, p)` for every target node q and source-tree node p with
 * |p| = |q| + shift whose supports overlap in a set of positive length.
 */
export function forEachOverlap(target: TemporalTree, sourceTree: TemporalTree, shift: 0 | 1, visit: (q: number, p: number) => void): void {
  const t = supportsAtScale(target, shift);
  const s = supportsAtScale(sourceTree, 0);
  for (let l = 0; l <= target.maxLevel; l++) {
    const ls = l + shift;
    if (ls > sourceTree.maxLevel) break;
    const pEnd = sourceTree.levelStart[ls + 1]!;
    let start = sourceTree.levelStart[ls]!;
    for (let q = target.levelStart[l]!; q < target.levelStart[l + 1]!; q++) {
      const lo = t.lo[q]!;
      const hi = t.hi[q]!;
      while (start < pEnd && s.hi[start]! <= lo) start++;
      for (let p = start; p < pEnd && s.lo[p]! < hi; p++) visit(q, p);
    }
  }
}

/** The union fibres F(q) described in the module comment, one per node of `target`. */
export function overlapUnionFibres(target: TemporalTree, source: DoubleTree, shift: 0 | 1): Int32Array[] {
  const parts: Int32Array[][] = Array.from({ length: target.size }, () => []);
  forEachOverlap(target, source.tree, shift, (q, p) => {
    const f = source.fibre(p);
    if (f.length > 0) parts[q]!.push(f);
  });
  return parts.map(unionSorted);
}
