/**
 * Checks that a double tree given by the user is of the right kind and belongs to the domain it
 * is used with (every vertex id of its fibres is a free vertex of that domain). A set built on
 * another domain is reported as such instead of as a bad vertex id deep inside an operator.
 */
import { InvalidArgumentError, InvalidIndexSetError } from '../errors';
import type { SpatialDomain } from '../space/index';
import { checkInstance } from '../validation/index';
import { DoubleTree } from './double-tree';

/** Checks `set` is a non-empty trial (or `kind`) DoubleTree whose fibres are free vertices of `domain`. */
export function checkSetOnDomain(set: unknown, domain: SpatialDomain, field: string, kind: 'trial' | 'test' = 'trial'): DoubleTree {
  const s = checkInstance(set, DoubleTree, field, `a ${kind} DoubleTree (e.g. DoubleTree.sparseGrid)`);
  if (s.kind !== kind) {
    throw new InvalidArgumentError(`${field} is a ${s.kind} double tree, expected a ${kind} one`, { field, expected: kind, received: s.kind });
  }
  if (s.size === 0) throw new InvalidArgumentError(`${field} is empty (no unknowns)`, { field, expected: 'at least one pair', received: 0 });
  const nv = domain.vertexCount;
  const seen = new Set<number>();
  for (let i = 0; i < s.nodeFibre.length; i++) {
    const id = s.nodeFibre[i]!;
    if (seen.has(id)) continue;
    seen.add(id);
    const f = s.pool.get(id);
    for (let p = 0; p < f.length; p++) {
      const v = f[p]!;
      if (v >= nv || !domain.isFree(v)) {
        throw new InvalidIndexSetError(
          `${field} does not belong to this domain: its fibre of temporal node ${i} holds vertex ${v}, which ` +
            (v >= nv ? `the domain does not have (it has ${nv} vertices)` : 'is a Dirichlet vertex of this domain') +
            '; build the set from the same domain object as the problem',
          { field, expected: 'a set built on the problem’s domain', received: v },
        );
      }
    }
  }
  return s;
}
