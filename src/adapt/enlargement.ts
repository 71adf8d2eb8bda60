/**
 * The enlarged index set Λ̲ of DESIGN.md §7: for every (λ, ν) ∈ Λ add
 * (child(λ), ν) for the temporal children of λ, and (λ, ν′) for the vertices
 * ν′ of one bisection of every leaf element of the fibre mesh of λ; then close.
 */
import { nodeChildren } from '../time/index';
import type { SpatialDomain } from '../space/index';
import { DoubleTree } from '../spacetime/double-tree';
import { unionSorted } from '../spacetime/fibre-pool';

/** Λ̲ ⊇ Λ, sharing Λ's fibre pool. Grows the domain's bisection forest. *
 * @example
 * ```ts
 * import { DoubleTree, enlargeDoubleTree, rectangleDomain } from 'chronomesh';
 * const domain = rectangleDomain(0, 1, 0, 1, 2, 2);
 * const set = DoubleTree.sparseGrid(domain, 2);
 * console.log(set.size, enlargeDoubleTree(domain, set).size);
 * ```
 */
export function enlargeDoubleTree(domain: SpatialDomain, set: DoubleTree): DoubleTree {
  const { tree } = set;
  const levels: number[] = [];
  const indices: number[] = [];
  const sets: Int32Array[] = [];
  const refined = new Map<number, Int32Array>();
  const ch = new Float64Array(4);
  for (let i = 0; i < tree.size; i++) {
    const id = set.nodeFibre[i]!;
    const f = set.pool.get(id);
    if (f.length === 0) continue;
    let g = refined.get(id);
    if (g === undefined) {
      g = unionSorted([f, domain.refineAll(f)]);
      refined.set(id, g);
    }
    const l = tree.level[i]!;
    const k = tree.index[i]!;
    levels.push(l);
    indices.push(k);
    sets.push(g);
    const nc = nodeChildren('trial', l, k, ch);
    for (let c = 0; c < nc; c++) {
      levels.push(ch[2 * c]!);
      indices.push(ch[2 * c + 1]!);
      sets.push(f);
    }
  }
  return DoubleTree.fromNodeSets(domain, levels, indices, sets, { close: true, pool: set.pool });
}
