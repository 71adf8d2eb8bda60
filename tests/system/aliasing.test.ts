/**
 * The aliasing rule of apply(x, y): x and y must not share memory, and an aliased call
 * throws instead of returning a wrong result. (Why it matters: S = Bᵀ K_Y B + G writes
 * Bᵀ(K_Y B x) into y and then adds G x, reading x again; with y === x that second read
 * sees Bᵀ(…) instead of x.)
 */
import { describe, expect, it } from 'vitest';
import { DoubleTree, HeatProblem, InvalidArgumentError, SpaceTimeSystem, intervalDomain } from '../../src/index';
import { rng } from '../helpers/random';

describe('apply(x, y) aliasing', () => {
  const domain = intervalDomain(0, 1, 2);
  const sys = new SpaceTimeSystem(new HeatProblem({ domain, T: 1, initial: () => 1 }), DoubleTree.sparseGrid(domain, 3));
  const n = sys.size;
  const m = sys.testSet.size;
  const rand = rng(7);
  const x = Float64Array.from({ length: n }, () => rand() - 0.5);

  it('S, G, K_X, B, Bᵀ and K_Y refuse the same array as input and output', () => {
    const cases: [string, { apply(a: Float64Array, b: Float64Array): void }, number][] = [
      ['S', sys.S, n], ['G', sys.G, n], ['K_X', sys.KX, n], ['TensorOperatorPlan', sys.B, n], ['K_Y', sys.KY, m],
    ];
    for (const [name, op, size] of cases) {
      const v = new Float64Array(size).fill(1);
      expect(() => op.apply(v, v), name).toThrow(InvalidArgumentError);
      expect(() => op.apply(v, v), name).toThrow(new RegExp(`^${name}\\.apply\\(x, y\\): y overlaps x`));
    }
  });

  it('overlapping views of one buffer are refused, disjoint views of one buffer are fine', () => {
    const buf = new Float64Array(2 * n + 1);
    buf.set(x);
    const xv = buf.subarray(0, n);
    expect(() => sys.S.apply(xv, buf.subarray(n - 1, 2 * n - 1))).toThrow(InvalidArgumentError);
    const yDisjoint = buf.subarray(n, 2 * n);
    sys.S.apply(xv, yDisjoint);
    const y = new Float64Array(n);
    sys.S.apply(x, y);
    expect(Array.from(yDisjoint)).toEqual(Array.from(y));
  });

  it('the aliased S x would have been wrong (why the rule exists)', () => {
    // Emulate what an unchecked S.apply(v, v) computed: Bᵀ K_Y B v written over v, then G
    // applied to the overwritten v. It differs from S v, so silently accepting it would be a defect.
    const u = new Float64Array(m);
    const w = new Float64Array(m);
    sys.B.apply(x, u);
    sys.KY.apply(u, w);
    const v = new Float64Array(n);
    sys.Bt.apply(w, v);
    const aliased = Float64Array.from(v);
    sys.G.applyAdd(v, aliased);
    const y = new Float64Array(n);
    sys.S.apply(x, y);
    const diff = Math.max(...y.map((yi, i) => Math.abs(yi - aliased[i]!)));
    expect(diff).toBeGreaterThan(1e-6 * Math.max(...y.map(Math.abs)));
  });
});
