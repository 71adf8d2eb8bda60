/**
 * SpaceTimeSolution.sampleAtPoints (src/spacetime/point-series.ts): sensor histories from per-
 * function point values, checked against `evaluate`, which shares no code with it beyond the
 * temporal basis (it builds u(t, ·) on the leaf mesh of the functions active at t and converts
 * hierarchical to nodal values forward; the series reads point weights off the transposed
 * transform on the union of all fibres and finds active functions by a per-level search).
 */
import { describe, expect, it } from 'vitest';
import { DoubleTree, HeatProblem, InvalidArgumentError, SpaceTimeSolution, intervalDomain, lShapeDomain, rectangleDomain, solveAdaptive, squareWithHoleDomain } from '../../src/index';
import { seededRandom } from '../spacetime/reference';

/** max |series − evaluate| over the times and points, relative to the largest |u| seen. */
function mismatch(u: SpaceTimeSolution, times: number[], points: number[]): number {
  const h = u.sampleAtPoints(times, points);
  const np = points.length / u.domain.dim;
  let diff = 0, scale = 0;
  times.forEach((t, k) => {
    const e = u.evaluate(t, points);
    for (let p = 0; p < np; p++) {
      diff = Math.max(diff, Math.abs(h.get(k, p) - e[p]!));
      scale = Math.max(scale, Math.abs(e[p]!));
    }
  });
  expect(scale).toBeGreaterThan(0);
  return diff / scale;
}

describe('sampleAtPoints', () => {
  const rand = seededRandom(11);
  const randomPoints = (n: number, box: [number, number, number, number], inside: (x: number, y: number) => boolean) => {
    const pts: number[] = [];
    while (pts.length < 2 * n) {
      const x = box[0] + rand() * (box[1] - box[0]), y = box[2] + rand() * (box[3] - box[2]);
      if (inside(x, y)) pts.push(x, y);
    }
    return pts;
  };

  it('equals evaluate on adaptive solutions refined deep toward t = 0 (d = 1 and 2, L-shape, hole)', () => {
    const T = 0.5;
    const times = [0, 1e-9, 3e-6, 1e-3, 0.01, 0.1234, 0.25, 0.499, 0.5, ...Array.from({ length: 12 }, () => rand() * T)];
    const rod = solveAdaptive(new HeatProblem({ domain: intervalDomain(0, 1, 2), T, initial: () => 1 }), { maxUnknowns: 3000 });
    expect(rod.solution.trialSet.tree.maxLevel).toBeGreaterThan(15);
    expect(mismatch(rod.solution, times, [0, 1e-4, 0.013, 0.3, 0.5, 0.77, 1])).toBeLessThan(1e-12);
    // random points inside each domain, plus points on its boundary (outer corner, re-entrant corner)
    for (const [domain, box, inside, boundary] of [
      [lShapeDomain(1), [-1, 1, -1, 1], (x: number, y: number) => !(x > 0 && y < 0), [0, 0, -1, -1, 1, 1]],
      [squareWithHoleDomain(1), [-1, 1, -1, 1], (x: number, y: number) => !(Math.abs(x) < 1 / 3 && Math.abs(y) < 1 / 3), [1 / 3, 1 / 3, -1, 1, 0, 1 / 3]],
      [rectangleDomain(0, 2, 0, 1, 2, 1), [0, 2, 0, 1], () => true, [0, 0, 2, 0.5]],
    ] as const) {
      const r = solveAdaptive(new HeatProblem({ domain, T, initial: () => 1, source: (t, x) => x * t }), { maxUnknowns: 4000 });
      const points = [...randomPoints(12, [...box] as [number, number, number, number], inside), ...boundary];
      expect(mismatch(r.solution, times, points)).toBeLessThan(1e-12);
    }
  });

  it('adds held boundary values (the lifting) as evaluate does', () => {
    const domain = intervalDomain(0, 1, 2, { boundary: [{ kind: 'value', where: [[0]], value: (t) => 1 + t }] });
    const r = solveAdaptive(new HeatProblem({ domain, T: 1, initial: () => 1 }), { maxUnknowns: 1500 });
    const times = [0, 0.001, 0.3, 0.7, 1];
    expect(mismatch(r.solution, times, [0, 0.05, 0.4, 1])).toBeLessThan(1e-12);
    const h = r.solution.sampleAtPoints(times, [0]);
    for (let k = 0; k < times.length; k++) expect(h.get(k, 0)).toBeCloseTo(1 + times[k]!, 12); // held exactly at x = 0
  });

  it('random coefficients on a sparse grid: the same as evaluate', () => {
    const domain = rectangleDomain(0, 2, 0, 1, 2, 1);
    const set = DoubleTree.sparseGrid(domain, 4);
    const u = new SpaceTimeSolution(domain, set, Float64Array.from({ length: set.size }, () => rand() - 0.5), 3);
    expect(mismatch(u, [0, 0.4, 1.5, 2.99, 3], randomPoints(20, [0, 2, 0, 1], () => true))).toBeLessThan(1e-12);
  });

  it('outside points get opts.outside; bad times and points are typed errors naming the entry', () => {
    const domain = lShapeDomain(1);
    const set = DoubleTree.sparseGrid(domain, 2);
    const u = new SpaceTimeSolution(domain, set, Float64Array.from({ length: set.size }, () => rand()), 1);
    const h = u.sampleAtPoints([0.5], [0.5, -0.5, -0.5, 0.5]); // (0.5, −0.5) lies in the notch
    expect(h.get(0, 0)).toBeNaN();
    expect(h.get(0, 1)).toBe(u.evaluate(0.5, [-0.5, 0.5])[0]);
    expect(u.sampleAtPoints([0.5], [0.5, -0.5], { outside: -7 }).get(0, 0)).toBe(-7);
    const field = (f: () => unknown): string | undefined => {
      try { f(); } catch (e) { expect(e).toBeInstanceOf(InvalidArgumentError); return (e as InvalidArgumentError).field; }
      return undefined;
    };
    expect(field(() => u.sampleAtPoints([0.5, 1.5], [0, 0]))).toBe('times[1]');
    expect(field(() => u.sampleAtPoints([0.5], [0, Number.NaN]))).toBe('points[1]');
    expect(field(() => u.sampleAtPoints([0.5], [0, 0, 1]))).toBe('points');
    expect(field(() => u.sampleAtPoints([0.5], [0, 0], { outside: 'x' as unknown as number }))).toBe('opts.outside');
    expect(u.sampleAtPoints([], [0, 0]).shape).toEqual([0, 1]);
  });
});
