/**
 * Moving coefficient vectors between nested double trees Λ ⊆ Λ̲. Hierarchical
 * hats and temporal wavelets do not depend on the set they belong to, so the
 * same function has the same coefficients in both sets (zero on Λ̲ \ Λ).
 */
import { checkFloat64Array, checkInstance, checkInt32Array, checkInteger } from '../validation/index';
import { InvalidIndexSetError } from '../errors';
import { DoubleTree } from '../spacetime/double-tree';
import { positionsIn } from '../spacetime/fibre-pool';

/** For every coefficient of `small`, its position in `large` (which must contain `small`). *
 * @example
 * ```ts
 * import { DoubleTree, embeddingMap, enlargeDoubleTree, intervalDomain, prolongCoefficients } from 'chronomesh';
 * const domain = intervalDomain(0, 1, 2);
 * const small = DoubleTree.sparseGrid(domain, 2);
 * const big = enlargeDoubleTree(domain, small);
 * const x = prolongCoefficients(embeddingMap(small, big), new Float64Array(small.size).fill(1), big.size);
 * console.log(x.length === big.size);
 * ```
 */
export function embeddingMap(small: DoubleTree, large: DoubleTree): Int32Array {
  checkInstance(small, DoubleTree, 'small', 'a DoubleTree');
  checkInstance(large, DoubleTree, 'large', 'a DoubleTree');
  if (small.kind !== large.kind) throw new InvalidIndexSetError(`small is a ${small.kind} set but large a ${large.kind} set`, { field: 'large', expected: small.kind, received: large.kind });
  const map = new Int32Array(small.size);
  const fpn = small.kind === 'test' ? 2 : 1;
  for (let i = 0; i < small.tree.size; i++) {
    const l = small.tree.level[i]!;
    const k = small.tree.index[i]!;
    const j = large.tree.find(l, k);
    const fs = small.fibre(i);
    if (fs.length === 0) continue;
    if (j < 0) throw new InvalidIndexSetError(`temporal node (${l}, ${k}) of the smaller set is missing from the larger one`, { field: 'large' });
    const fl = large.fibre(j);
    const pos = positionsIn(fs, fl);
    for (let p = 0; p < pos.length; p++) {
      if (fl[pos[p]!] !== fs[p]) throw new InvalidIndexSetError(`pair (level ${l}, index ${k}, vertex ${fs[p]}) is missing from the larger set`, { field: 'large' });
    }
    for (let s = 0; s < fpn; s++) {
      const a = small.functionOffset[fpn * i + s]!;
      const b = large.functionOffset[fpn * j + s]!;
      for (let p = 0; p < pos.length; p++) map[a + p] = b + pos[p]!;
    }
  }
  return map;
}

/** x on `large` with the coefficients of `small` placed by `map` and zeros elsewhere. *
 * @example
 * ```ts
 * import { prolongCoefficients } from 'chronomesh';
 * console.log(prolongCoefficients(Int32Array.of(0, 2), Float64Array.of(5, 7), 3)); // → Float64Array(3) [ 5, 0, 7 ]
 * ```
 */
export function prolongCoefficients(map: Int32Array, x: Float64Array, largeSize: number): Float64Array {
  checkInt32Array(map, 'map');
  checkFloat64Array(x, 'x', { length: map.length, finite: true });
  checkInteger(largeSize, 'largeSize', 0, 2 ** 31 - 1);
  for (let p = 0; p < map.length; p++) {
    const q = map[p]!;
    if (q < 0 || q >= largeSize) throw new InvalidIndexSetError(`map[${p}] = ${q} is outside 0…${largeSize - 1}`, { field: `map[${p}]`, expected: `[0, ${largeSize - 1}]`, received: q });
  }
  const out = new Float64Array(largeSize);
  for (let p = 0; p < map.length; p++) out[map[p]!] = x[p]!;
  return out;
}
