/** Construction, closure and validation of double trees (docs/method.md §5.1). */
import { describe, expect, it } from 'vitest';
import { DoubleTree, InvalidArgumentError, InvalidIndexSetError, TemporalTree, intervalDomain, rectangleDomain, nodeParents } from '../../src/index';
import { seededRandom } from './reference';

/** Brute-force check of the double-tree property on the pair list. */
function assertClosed(dt: DoubleTree, domain: ReturnType<typeof rectangleDomain>): void {
  const pairs = new Set<string>();
  const { levels, indices, vertices } = dt.pairs();
  for (let p = 0; p < dt.size; p++) pairs.add(`${levels[p]}:${indices[p]}:${vertices[p]}`);
  const par = new Float64Array(4);
  for (let p = 0; p < dt.size; p++) {
    const np = nodeParents('trial', levels[p]!, indices[p]!, par);
    for (let q = 0; q < np; q++) expect(pairs.has(`${par[2 * q]}:${par[2 * q + 1]}:${vertices[p]}`)).toBe(true);
    // Spatial closure through Dirichlet vertices: every free vertex of close({ν}) is in the fibre.
    const closed = domain.close([vertices[p]!]);
    for (const v of closed) expect(pairs.has(`${levels[p]}:${indices[p]}:${v}`)).toBe(true);
  }
}

/** The smallest double tree containing the given trial pairs, by a work list over string keys. */
function bruteForceClosure(domain: ReturnType<typeof rectangleDomain>, levels: number[], indices: number[], vertices: number[]): Set<string> {
  const set = new Set<string>();
  const work: [number, number, number][] = levels.map((l, p) => [l, indices[p]!, vertices[p]!]);
  const par = new Float64Array(4);
  while (work.length > 0) {
    const [l, i, v] = work.pop()!;
    const key = `${l}:${i}:${v}`;
    if (set.has(key)) continue;
    set.add(key);
    const np = nodeParents('trial', l, i, par);
    for (let q = 0; q < np; q++) work.push([par[2 * q]!, par[2 * q + 1]!, v]);
    for (const w of domain.close([v])) work.push([l, i, w]);
  }
  return set;
}

describe('double trees', () => {
  it('sparse and full grids have the expected sizes (counted independently)', () => {
    const domain = intervalDomain(0, 1, 2);
    for (let L = 0; L <= 6; L++) {
      // d = 1, 2 initial cells: level ℓ_x has 2^{ℓ_x+1} − 1 free vertices in all; time level ℓ has 2^{ℓ−1} (2 at ℓ = 0).
      const nt = (l: number) => (l === 0 ? 2 : 2 ** (l - 1));
      const nx = (l: number) => 2 ** (l + 1) - 1;
      let sparse = 0;
      let tAll = 0;
      for (let l = 0; l <= L; l++) { sparse += nt(l) * nx(L - l); tAll += nt(l); }
      expect(DoubleTree.sparseGrid(domain, L).size).toBe(sparse);
      expect(DoubleTree.fullGrid(domain, L, L).size).toBe(tAll * nx(L));
    }
  });

  it('closure of random pairs is the smallest double tree containing them', () => {
    const domain = rectangleDomain(0, 1, 0, 1, 2, 2);
    const cand = domain.refineTowards(domain.uniformSet(1), [0.1, 0.2], 5);
    for (let seed = 1; seed <= 5; seed++) {
      const rand = seededRandom(seed);
      const levels: number[] = [], indices: number[] = [], vertices: number[] = [];
      for (let p = 0; p < 6; p++) {
        const l = Math.floor(rand() * 12);
        levels.push(l);
        indices.push(l === 0 ? 1 : Math.floor(rand() * 2 ** (l - 1)));
        vertices.push(cand[Math.floor(rand() * cand.length)]!);
      }
      const dt = DoubleTree.fromPairs(domain, { levels, indices, vertices }, { close: true });
      assertClosed(dt, domain);
      // Minimality: the closure equals the smallest double tree containing the pairs, computed
      // here independently by a plain work list (temporal parents and spatial closure of each
      // vertex until nothing changes). A closed superset with even one extra pair fails this.
      const smallest = bruteForceClosure(domain, levels, indices, vertices);
      const got = dt.pairs();
      const gotKeys = new Set(Array.from({ length: dt.size }, (_, p) => `${got.levels[p]}:${got.indices[p]}:${got.vertices[p]}`));
      expect(dt.size).toBe(smallest.size);
      for (const k of smallest) expect(gotKeys.has(k), k).toBe(true);
      // Every requested pair is present.
      const all = dt.pairs();
      const keys = new Set(Array.from({ length: dt.size }, (_, p) => `${all.levels[p]}:${all.indices[p]}:${all.vertices[p]}`));
      levels.forEach((l, p) => expect(keys.has(`${l}:${indices[p]}:${vertices[p]}`)).toBe(true));
    }
  });

  it('deep temporal refinement toward t = 0 (level 45) works', () => {
    const domain = intervalDomain(0, 1, 2);
    const dt = DoubleTree.fromPairs(domain, { levels: [45], indices: [0], vertices: [domain.initialFreeVertices()[0]!] }, { close: true });
    expect(dt.tree.maxLevel).toBe(45);
    expect(dt.size).toBe(dt.tree.size);
  });

  it('rejects a set with a missing temporal parent, naming the pair', () => {
    const domain = intervalDomain(0, 1, 2);
    const v = domain.initialFreeVertices()[0]!;
    expect(() => DoubleTree.fromPairs(domain, { levels: [0, 0, 1, 2], indices: [0, 1, 0, 0], vertices: [v, v, v, v] })).not.toThrow();
    const w = domain.uniformSet(1).find((u) => u !== v)!;
    // (2, 0, w) needs (1, 0, w), which is absent.
    const bad = () => DoubleTree.fromPairs(domain, { levels: [0, 0, 1, 2, 0, 0, 2], indices: [0, 1, 0, 0, 0, 1, 0], vertices: [v, v, v, v, w, w, w] });
    expect(bad).toThrow(InvalidIndexSetError);
    expect(bad).toThrow(`pair (level 1, index 0, vertex ${w}) is missing`);
  });

  it('rejects a fibre that is not closed in space, naming the missing vertex', () => {
    const domain = rectangleDomain(0, 1, 0, 1, 2, 2);
    const fine = domain.uniformSet(2);
    const coarse = new Set(domain.close([]));
    const v = fine.find((u) => !coarse.has(u) && domain.close([u]).length > 2)!;
    const closure = domain.close([v]);
    const missing = closure.filter((u) => u !== v);
    expect(() => DoubleTree.fromPairs(domain, { levels: [0], indices: [0], vertices: [v] })).toThrow(InvalidIndexSetError);
    expect(() => DoubleTree.fromPairs(domain, { levels: [0], indices: [0], vertices: [v] })).toThrow(/is not closed under godparents/);
    expect(missing.length).toBeGreaterThan(0);
  });

  it('rejects bad pair arrays with typed errors', () => {
    const domain = intervalDomain(0, 1, 2);
    expect(() => DoubleTree.fromPairs(domain, { levels: [0], indices: [0, 1], vertices: [1] })).toThrow(InvalidArgumentError);
    expect(() => DoubleTree.fromPairs(domain, { levels: [0], indices: [0], vertices: [99999] })).toThrow(/is not a vertex id/);
    expect(() => DoubleTree.fromPairs(domain, { levels: [-1], indices: [0], vertices: [1] }, { close: true })).toThrow();
    const dirichlet = Array.from({ length: domain.vertexCount }, (_, v) => v).find((v) => !domain.isFree(v))!;
    expect(() => DoubleTree.fromPairs(domain, { levels: [0], indices: [0], vertices: [dirichlet] })).toThrow(/Dirichlet vertex/);
    expect(() => DoubleTree.sparseGrid(domain, 2.5)).toThrow(/integer level/);
    // A level that would not fit in memory is refused up front instead of exhausting it.
    expect(() => DoubleTree.sparseGrid(rectangleDomain(0, 1, 0, 1, 2, 2), 20)).toThrow(/would have about .* unknowns, more than maxUnknowns/);
    expect(() => DoubleTree.fullGrid(domain, 25, 25)).toThrow(/full grid of levels \(25, 25\)/);
    expect(() => new DoubleTree('trial', TemporalTree.full('trial', 1), new Int32Array(1), DoubleTree.sparseGrid(domain, 0).pool)).toThrow(/nodeFibre has length/);
  });
});
