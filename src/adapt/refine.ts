/**
 * Refinement step of the adaptive loop (docs/method.md §7): Λ ← closure(Λ ∪ M)
 * for marked pairs M of the enlarged set.
 */
import { InvalidArgumentError } from '../errors';
import { SpatialDomain } from '../space/index';
import { checkSetOnDomain } from '../spacetime/set-checks';
import { checkInstance, checkInt32Array } from '../validation/index';
import { DoubleTree } from '../spacetime/double-tree';

/** closure(Λ ∪ {pairs of Λ̲ at the given coefficient positions}). *
 * @example
 * ```ts
 * import { DoubleTree, dorflerMark, enlargeDoubleTree, intervalDomain, refineDoubleTree } from 'chronomesh';
 * const domain = intervalDomain(0, 1, 2);
 * const set = DoubleTree.sparseGrid(domain, 2);
 * const big = enlargeDoubleTree(domain, set);
 * const eta2 = new Float64Array(big.size).map((_, i) => 1 / (1 + i)); // stand-in indicators
 * const next = refineDoubleTree(domain, set, big, dorflerMark(eta2, 0.5));
 * console.log(set.size, next.size);
 * ```
 */
export function refineDoubleTree(domain: SpatialDomain, set: DoubleTree, enlarged: DoubleTree, marked: Int32Array): DoubleTree {
  checkInstance(domain, SpatialDomain, 'domain', 'a SpatialDomain');
  checkSetOnDomain(set, domain, 'set');
  checkSetOnDomain(enlarged, domain, 'enlarged');
  checkInt32Array(marked, 'marked');
  for (let i = 0; i < marked.length; i++) {
    const m = marked[i]!;
    if (m < 0 || m >= enlarged.size || (i > 0 && !(m > marked[i - 1]!))) {
      throw new InvalidArgumentError(`marked[${i}] = ${m} must be a position in enlarged (0…${enlarged.size - 1}), strictly increasing`, {
        field: `marked[${i}]`, expected: `sorted positions in [0, ${enlarged.size - 1}]`, received: m,
      });
    }
  }
  const levels: number[] = [];
  const indices: number[] = [];
  const sets: Int32Array[] = [];
  for (let i = 0; i < set.tree.size; i++) {
    if (set.fibre(i).length === 0) continue;
    levels.push(set.tree.level[i]!);
    indices.push(set.tree.index[i]!);
    sets.push(set.fibre(i));
  }
  // Marked positions are sorted, and coefficients are stored node by node, so one sweep groups them.
  let m = 0;
  for (let f = 0; f < enlarged.functionCount && m < marked.length; f++) {
    const o = enlarged.functionOffset[f]!;
    const e = enlarged.functionOffset[f + 1]!;
    const fib = enlarged.pool.get(enlarged.functionFibre[f]!);
    const vs: number[] = [];
    while (m < marked.length && marked[m]! < e) vs.push(fib[marked[m++]! - o]!);
    if (vs.length === 0) continue;
    levels.push(enlarged.tree.level[f]!);
    indices.push(enlarged.tree.index[f]!);
    sets.push(Int32Array.from(vs));
  }
  return DoubleTree.fromNodeSets(domain, levels, indices, sets, { close: true, pool: set.pool });
}
