/**
 * The local vertex order of a leaf mesh is (generation, id) (docs/method.md §4.1). The linear-time
 * ordering used for large meshes must give exactly what a comparison sort by that key gives.
 */
import { describe, expect, it } from 'vitest';
import { byGenerationThenId } from '../../src/space/leaf-mesh-extraction';
import { rng } from '../helpers/random';

function reference(ids: Int32Array, gen: Int32Array): number[] {
  return Array.from(ids).sort((a, b) => gen[a]! - gen[b]! || a - b);
}

describe('leaf mesh: vertices in (generation, id) order', () => {
  for (const n of [0, 1, 7, 300, 20_000, 70_000]) {
    it(`${n} vertices (ids up to 2^25, distinct; both the bucketed and the radix path)`, () => {
      const random = rng(n + 11);
      const bound = 1 << 25;
      const gen = new Int32Array(bound);
      const seen = new Set<number>();
      const ids = new Int32Array(n);
      for (let k = 0; k < n; k++) {
        let v: number;
        do v = Math.floor(random() * bound); while (seen.has(v));
        seen.add(v);
        ids[k] = v;
        gen[v] = Math.floor(random() * 40);
      }
      // The caller's buffer is longer than n; only its first n entries count.
      const work = new Int32Array(n + 5).fill(-7);
      work.set(ids);
      expect(Array.from(byGenerationThenId(work, n, gen))).toEqual(reference(ids, gen));
    });
  }
});
