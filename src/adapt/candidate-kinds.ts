/**
 * Which candidates of Λ̲ \ Λ refine in space and which in time (docs/adaptivity.md §2): a
 * candidate (λ, ν) is *spatial* if ν is new for λ — in neither the fibre of λ in Λ nor the fibre
 * of any temporal parent of λ in Λ — and *temporal* otherwise (a vertex already used one level up
 * in time, offered to a finer temporal function).
 */
import { nodeParents } from '../time/index';
import type { DoubleTree } from '../spacetime/double-tree';
import { unionSorted } from '../spacetime/fibre-pool';

/** 1 for spatial candidates, 0 otherwise (coefficients of Λ itself included), per coefficient of `enlarged`. */
export function spatialCandidates(set: DoubleTree, enlarged: DoubleTree): Uint8Array {
  const out = new Uint8Array(enlarged.size);
  const par = new Float64Array(4);
  const empty = new Int32Array(0);
  const tree = enlarged.tree;
  for (let i = 0; i < tree.size; i++) {
    const o = enlarged.functionOffset[i]!;
    const fib = enlarged.fibre(i);
    if (fib.length === 0) continue;
    const l = tree.level[i]!, k = tree.index[i]!;
    const parts: Int32Array[] = [];
    const own = set.tree.find(l, k);
    parts.push(own >= 0 ? set.fibre(own) : empty);
    const np = nodeParents('trial', l, k, par);
    for (let q = 0; q < np; q++) {
      const j = set.tree.find(par[2 * q]!, par[2 * q + 1]!);
      if (j >= 0) parts.push(set.fibre(j));
    }
    const known = parts.length === 1 ? parts[0]! : unionSorted(parts);
    let p = 0;
    for (let a = 0; a < fib.length; a++) {
      const v = fib[a]!;
      while (p < known.length && known[p]! < v) p++;
      out[o + a] = p < known.length && known[p] === v ? 0 : 1;
    }
  }
  return out;
}
