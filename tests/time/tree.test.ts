/** Temporal trees: construction, closure, validation, look-up and shape keys (docs/method.md §3.1, §3.2, §7). */
import { describe, expect, it } from 'vitest';
import { InvalidIndexSetError, InvalidArgumentError } from '../../src/errors';
import { MAX_TEMPORAL_LEVEL, TemporalTree, nodeChildren, nodeParents, nodeSupport } from '../../src/time/index';
import { referenceSupport } from './reference';
import { gradedTree, rng, sparseTree } from './random-trees';

/** Independent closedness check straight from the parent rule of docs/method.md §3.1. */
function isClosed(t: TemporalTree): boolean {
  const has = new Set<string>();
  for (let p = 0; p < t.size; p++) has.add(`${t.level[p]},${t.index[p]}`);
  for (let p = 0; p < t.size; p++) {
    const l = t.level[p]!;
    const k = t.index[p]!;
    if (l === 0) continue;
    const parents = l === 1 ? (t.kind === 'trial' ? ['0,0', '0,1'] : ['0,0']) : [`${l - 1},${Math.floor(k / 2)}`];
    if (!parents.every((q) => has.has(q))) return false;
  }
  return true;
}

describe('TemporalTree', () => {
  it('sorts by (level, index), removes duplicates, fills levelStart', () => {
    const t = TemporalTree.fromNodes('trial', [2, 0, 1, 0, 2, 0], [1, 1, 0, 0, 0, 1]);
    expect(t.size).toBe(5);
    expect(Array.from(t.level)).toEqual([0, 0, 1, 2, 2]);
    expect(Array.from(t.index)).toEqual([0, 1, 0, 0, 1]);
    expect(Array.from(t.levelStart)).toEqual([0, 2, 3, 5]);
    expect(t.maxLevel).toBe(2);
    expect(t.functionCount).toBe(5);
    expect(t.find(2, 1)).toBe(4);
    expect(t.find(2, 2)).toBe(-1);
    expect(t.find(7, 0)).toBe(-1);
    const s = TemporalTree.fromNodes('test', [0, 1], [0, 0]);
    expect(s.functionCount).toBe(4);
  });

  it('rejects a set that is not closed, naming the missing parent', () => {
    // (5,3) needs (4,1); everything else present
    const ls = [0, 0, 1, 2, 3, 5];
    const ks = [0, 1, 0, 0, 0, 3];
    expect(() => TemporalTree.fromNodes('trial', ls, ks)).toThrow(InvalidIndexSetError);
    expect(() => TemporalTree.fromNodes('trial', ls, ks)).toThrow(
      'node (level 5, index 3) of trial tree has missing parent (level 4, index 1) (input position 5)',
    );
    expect(() => TemporalTree.fromNodes('trial', [0, 1], [0, 0])).toThrow(
      'node (level 1, index 0) of trial tree has missing parent (level 0, index 1)',
    );
    expect(() => TemporalTree.fromNodes('test', [1], [0])).toThrow('node (level 1, index 0) of test tree has missing parent (level 0, index 0)');
  });

  it('closes on request, at any depth, and the result is the smallest closed superset', () => {
    const t = TemporalTree.fromNodes('trial', [45], [2 ** 44 - 1], { close: true });
    expect(t.size).toBe(2 + 45);
    expect(isClosed(t)).toBe(true);
    expect(t.find(44, 2 ** 43 - 1)).toBeGreaterThanOrEqual(0);
    const r = rng(3);
    for (let rep = 0; rep < 20; rep++) {
      const kind = rep % 2 ? 'trial' : 'test';
      const t2 = sparseTree(kind, 30, 15, rep + 100);
      expect(isClosed(t2)).toBe(true);
      // re-building the closed set without `close` is accepted and gives the same key
      const again = TemporalTree.fromNodes(kind, Array.from(t2.level), Array.from(t2.index));
      expect(again.shapeKey()).toBe(t2.shapeKey());
      // removing a random node with a child present makes it non-closed
      const withChild = [...Array(t2.size).keys()].filter((p) => t2.level[p]! < t2.maxLevel && t2.find(t2.level[p]! + 1, 2 * t2.index[p]!) >= 0);
      const drop = withChild[Math.floor(r() * withChild.length)]!;
      const ls = Array.from(t2.level).filter((_, p) => p !== drop);
      const ks = Array.from(t2.index).filter((_, p) => p !== drop);
      expect(() => TemporalTree.fromNodes(kind, ls, ks)).toThrow(InvalidIndexSetError);
    }
  });

  it('shapeKey identifies the node set', () => {
    const a = gradedTree('test', 40, 0, 3, 1);
    const b = TemporalTree.fromNodes('test', Array.from(a.level).reverse(), Array.from(a.index).reverse());
    expect(a.shapeKey()).toBe(b.shapeKey());
    const c = gradedTree('test', 40, 0, 3, 2);
    expect(c.shapeKey() === a.shapeKey()).toBe(c.size === a.size && c.index.every((v, i) => v === a.index[i] && c.level[i] === a.level[i]));
    expect(TemporalTree.full('trial', 2).shapeKey()).not.toBe(TemporalTree.full('test', 2).shapeKey());
  });

  it('subTreeAt equals fromNodes on the chosen nodes (random subtrees, both kinds, 45 levels)', () => {
    for (const kind of ['trial', 'test'] as const) {
      for (let seed = 1; seed <= 12; seed++) {
        const big = seed % 2 ? gradedTree(kind, 45, 0, 3, seed) : sparseTree(kind, 12, 60, seed);
        // a random subtree: each node kept with probability 1/2, then closed inside `big`
        const r = rng(seed + 17);
        const ls: number[] = [];
        const ks: number[] = [];
        for (let p = 0; p < big.size; p++) if (r() < 0.5) { ls.push(big.level[p]!); ks.push(big.index[p]!); }
        const sub = TemporalTree.fromNodes(kind, ls, ks, { close: true });
        const positions = Int32Array.from({ length: sub.size }, (_, j) => big.find(sub.level[j]!, sub.index[j]!));
        expect(positions.every((p) => p >= 0)).toBe(true);
        const fast = big.subTreeAt(positions);
        expect(fast.kind).toBe(kind);
        expect(Array.from(fast.level)).toEqual(Array.from(sub.level));
        expect(Array.from(fast.index)).toEqual(Array.from(sub.index));
        expect(Array.from(fast.levelStart)).toEqual(Array.from(sub.levelStart));
        expect(fast.maxLevel).toBe(sub.maxLevel);
        expect(fast.functionCount).toBe(sub.functionCount);
      }
      expect(TemporalTree.full(kind, 3).subTreeAt(new Int32Array(0)).size).toBe(0);
    }
  });

  it('full trees have 2^L + 1 (trial) and 2^L (test) nodes', () => {
    for (let L = 0; L <= 10; L++) {
      expect(TemporalTree.full('trial', L).size).toBe(2 ** L + 1);
      expect(TemporalTree.full('test', L).size).toBe(2 ** L);
    }
    expect(TemporalTree.full('trial', -1).size).toBe(0);
  });
});

describe('node geometry', () => {
  const sup = new Float64Array(2);
  const buf = new Float64Array(4);

  it('supports match docs/method.md §3 exactly, up to level 52', () => {
    const r = rng(7);
    for (const kind of ['trial', 'test'] as const) {
      for (let l = 0; l <= MAX_TEMPORAL_LEVEL; l++) {
        const w = l === 0 ? (kind === 'trial' ? 2 : 1) : 2 ** (l - 1);
        for (const k of [0, w - 1, Math.floor(r() * w)]) {
          nodeSupport(kind, l, k, sup);
          expect(Array.from(sup)).toEqual(referenceSupport(kind, l, k));
          expect(Number.isInteger(sup[0]) && Number.isInteger(sup[1])).toBe(true);
        }
      }
    }
    nodeSupport('trial', 52, 2 ** 51 - 1, sup);
    expect(Array.from(sup)).toEqual([2 ** 52 - 4, 2 ** 52]);
  });

  it('parents and children follow docs/method.md §3 and children supports nest in parents', () => {
    expect(nodeParents('trial', 1, 0, buf)).toBe(2);
    expect(Array.from(buf)).toEqual([0, 0, 0, 1]);
    expect(nodeParents('test', 1, 0, buf)).toBe(1);
    expect(nodeChildren('trial', 0, 1, buf)).toBe(1);
    expect(Array.from(buf.subarray(0, 2))).toEqual([1, 0]);
    expect(nodeChildren('trial', MAX_TEMPORAL_LEVEL, 5, buf)).toBe(0);
    const r = rng(8);
    const ps = new Float64Array(2);
    for (const kind of ['trial', 'test'] as const) {
      for (let rep = 0; rep < 200; rep++) {
        const l = 1 + Math.floor(r() * 51);
        const k = Math.floor(r() * 2 ** (l - 1));
        const n = nodeChildren(kind, l, k, buf);
        nodeSupport(kind, l, k, ps);
        const kids = Array.from(buf.subarray(0, 2 * n));
        for (let c = 0; c < n; c++) {
          const cl = kids[2 * c]!;
          const ck = kids[2 * c + 1]!;
          expect(nodeParents(kind, cl, ck, buf)).toBe(1);
          expect([buf[0], buf[1]]).toEqual([l, k]);
          nodeSupport(kind, cl, ck, sup);
          expect(sup[0]! >= 2 * ps[0]! && sup[1]! <= 2 * ps[1]!).toBe(true);
        }
      }
    }
  });

  it('rejects levels and indices out of range', () => {
    expect(() => nodeSupport('trial', 53, 0, sup)).toThrow(InvalidArgumentError);
    expect(() => nodeSupport('trial', 53, 0, sup)).toThrow('level must be an integer in [0, 52]; received 53');
    expect(() => nodeSupport('test', 0, 1, sup)).toThrow('index of a test node on level 0 must be an integer in [0, 0]; received 1');
    expect(() => nodeSupport('trial', 3, 4, sup)).toThrow('index of a trial node on level 3 must be an integer in [0, 3]; received 4');
    expect(() => nodeSupport('trial', 2, 0.5, sup)).toThrow(InvalidArgumentError);
    expect(() => nodeParents('trial', -1, 0, buf)).toThrow('level must be an integer in [0, 52]; received -1');
  });
});
