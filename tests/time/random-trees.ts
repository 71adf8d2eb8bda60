/** Seeded random temporal trees for the tests (uniform, sparse, graded towards t = 0 or t = T). */
import { TemporalTree, type TemporalBasisKind } from '../../src/time/index';
import type { NodeRef } from './reference';
import { rng } from '../helpers/random';

export { rng };

function width(kind: TemporalBasisKind, l: number): number {
  return l === 0 ? (kind === 'trial' ? 2 : 1) : 2 ** (l - 1);
}

/** About n random nodes on levels ≤ maxLevel (index uniform on the level), then closed. */
export function sparseTree(kind: TemporalBasisKind, maxLevel: number, n: number, seed: number): TemporalTree {
  const r = rng(seed);
  const ls: number[] = [];
  const ks: number[] = [];
  for (let i = 0; i < n; i++) {
    const l = Math.floor(r() * (maxLevel + 1));
    ls.push(l);
    ks.push(Math.floor(r() * width(kind, l)));
  }
  return TemporalTree.fromNodes(kind, ls, ks, { close: true });
}

/**
 * Graded tree: on every level ≤ maxLevel the `perLevel` nodes nearest t = 0 (side 0) or t = T
 * (side 1), plus now and then one a few places further in, closed.
 */
export function gradedTree(kind: TemporalBasisKind, maxLevel: number, side: 0 | 1, perLevel: number, seed: number): TemporalTree {
  const r = rng(seed);
  const ls: number[] = [];
  const ks: number[] = [];
  for (let l = 0; l <= maxLevel; l++) {
    const w = width(kind, l);
    for (let j = 0; j < Math.min(perLevel, w); j++) {
      ls.push(l);
      ks.push(side === 0 ? j : w - 1 - j);
    }
    if (r() < 0.3) {
      const j = Math.min(w - 1, perLevel + Math.floor(r() * 3));
      ls.push(l);
      ks.push(side === 0 ? j : w - 1 - j);
    }
  }
  return TemporalTree.fromNodes(kind, ls, ks, { close: true });
}

export function nodesOf(t: TemporalTree): NodeRef[] {
  const out: NodeRef[] = [];
  for (let p = 0; p < t.size; p++) out.push({ level: t.level[p]!, index: t.index[p]! });
  return out;
}
