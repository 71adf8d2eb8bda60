/**
 * Grouping of spatial vertices by the shape of their pair of temporal fibres (the batching of the
 * time-direction pass). The reference is the definition itself: two vertices share a group iff
 * their input and their output fibres hold the same temporal node positions (common practice for
 * hashing: equal hashes must not merge different keys, so a constant hash is the worst case).
 */
import { describe, expect, it } from 'vitest';
import { groupByFibreShape, vertexFibres } from '../../src/spacetime/temporal-pass';
import { testIndexSet } from '../../src/spacetime/test-index-set';
import { randomDoubleTree, smallDomain, type TreeShape } from './fixtures';
import { seededRandom } from './reference';

function referenceGroups(vb: number, vin: ReturnType<typeof vertexFibres>, vout: ReturnType<typeof vertexFibres>): string[] {
  const byKey = new Map<string, number[]>();
  for (let v = 0; v < vb; v++) {
    const a = Array.from(vin.node.subarray(vin.start[v]!, vin.start[v + 1]!));
    const b = Array.from(vout.node.subarray(vout.start[v]!, vout.start[v + 1]!));
    if (a.length === 0 || b.length === 0) continue;
    const key = `${a.join(',')}|${b.join(',')}`;
    byKey.set(key, [...(byKey.get(key) ?? []), v]);
  }
  return [...byKey.values()].map((g) => g.join(',')).sort();
}

describe('temporal pass: vertices grouped by fibre shape', () => {
  for (const dim of [1, 2] as const) {
    for (const shape of ['sparse', 'graded-start', 'random'] as TreeShape[]) {
      it(`d = ${dim}, ${shape}: the hashed grouping equals the definition, also when every hash collides`, () => {
        const trial = randomDoubleTree(smallDomain(dim), shape, seededRandom(31 + dim));
        const test = testIndexSet(trial);
        let vb = 0;
        for (const dt of [trial, test]) for (let i = 0; i < dt.tree.size; i++) for (const v of dt.fibre(i)) vb = Math.max(vb, v + 1);
        const vin = vertexFibres(trial, vb);
        const vout = vertexFibres(test, vb);
        const expected = referenceGroups(vb, vin, vout);
        expect(expected.length).toBeGreaterThan(1);
        // The default hash, a constant one (every shape collides) and a coarse one of the shape.
        const coarse = (v: number): number => (vin.start[v + 1]! - vin.start[v]!) % 2;
        for (const hash of [undefined, () => 0, coarse]) {
          const got = groupByFibreShape(vb, vin, vout, hash).map((g) => g.join(',')).sort();
          expect(got).toEqual(expected);
        }
      });
    }
  }
});
