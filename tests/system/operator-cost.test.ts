/**
 * The operator-cost API: sizes, that every timing is reported, PCG count, and input errors.
 * Timings themselves are not compared here (no performance claims from unit tests; see bench/).
 */
import { describe, expect, it } from 'vitest';
import { DoubleTree, InvalidArgumentError, intervalDomain, measureOperatorCost, rectangleDomain, testIndexSet } from '../../src/index';

describe('measureOperatorCost', () => {
  it('reports per-unknown costs for the requested grid', () => {
    const c = measureOperatorCost({ dim: 2, level: 3, measurePcg: true, repetitions: 3 });
    const grid = DoubleTree.sparseGrid(rectangleDomain(0, 1, 0, 1, 2, 2), 3);
    expect(c.unknowns).toBe(grid.size);
    expect(c.testUnknowns).toBe(testIndexSet(grid).size);
    expect(Object.keys(c.nsPerUnknown).sort()).toEqual(['B', 'precond', 'schur']);
    for (const v of Object.values(c.nsPerUnknown)) {
      expect(Number.isFinite(v)).toBe(true);
      expect(v).toBeGreaterThan(0);
    }
    expect(c.pcgIterations).toBeGreaterThan(3);
    expect(c.pcgIterations).toBeLessThan(40);
    const f = measureOperatorCost({ dim: 1, level: 3, grid: 'full', repetitions: 1 });
    expect(f.unknowns).toBe(DoubleTree.fullGrid(intervalDomain(0, 1, 2), 3, 3).size);
  });
  it('rejects bad dimensions and levels', () => {
    expect(() => measureOperatorCost({ dim: 3 as never, level: 2 })).toThrow(InvalidArgumentError);
    expect(() => measureOperatorCost({ dim: 1, level: -1 })).toThrow(/opts\.level must be an integer in \[0, 30\], received -1/);
  });
});
