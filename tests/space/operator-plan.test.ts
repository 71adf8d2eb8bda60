/** Hierarchical operators vs the independent dense reference (./reference.ts) on random closed sets. */
import { describe, expect, it } from 'vitest';
import {
  SpatialOperatorPlan, intervalDomain, lShapeDomain, rectangleDomain, squareWithHoleDomain, triangulatedDomain, type SpatialDomain,
} from '../../src/space/index';
import { sharedLeafMesh } from '../../src/space/operator-plan';
import { denseSpatialMatrices } from './reference';
import { growForest, matVec, randomClosedSubset, randomVector, relErr, rng } from './random-sets';

const domains: [string, () => SpatialDomain][] = [
  ['interval, variable κ and c, one end insulated', () => intervalDomain(-1, 2, 3, { kappa: [1, 3, 0.5], reaction: (x) => 1 + x * x, insulated: (x) => x > 0 })],
  ['unit square', () => rectangleDomain(0, 1, 0, 1, 2, 2, { kappa: (x, y) => 1 + x + 2 * y, reaction: 0.7 })],
  // anisotropic: a tensor rotated differently on every initial element, with a reaction term
  ['unit square, diffusion tensor varying per element', () => rectangleDomain(0, 1, 0, 1, 2, 2, {
    diffusionTensor: (x, y) => ({ xx: 2 + x, xy: 0.7 - y, yy: 0.5 + y }), reaction: 0.7,
  })],
  ['unstructured polygon, one strongly anisotropic tensor', () => triangulatedDomain(
    [0, 0, 1, 0, 1.3, 0.8, 0.4, 1.2, -0.2, 0.6, 0.5, 0.45], [0, 1, 5, 1, 2, 5, 2, 3, 5, 3, 4, 5, 4, 0, 5],
    { diffusionTensor: { xx: 10, xy: 3, yy: 1 } },
  )],
  ['L-shape, insulated top', () => lShapeDomain(1, { insulated: (_x, y) => y > 0.99 })],
  ['square with hole', () => squareWithHoleDomain(1, { reaction: (x) => (x > 0 ? 2 : 0) })],
  ['unstructured polygon', () => triangulatedDomain(
    [0, 0, 2, 0, 3, 1, 1.2, 0.9, 0, 2, 2.5, 2.4],
    [[0, 1, 3], [1, 2, 3], [0, 3, 4], [3, 2, 5], [3, 5, 4]],
    { kappa: [1, 2, 3, 4, 5], insulated: [[0, 1]] },
  )],
  ['interval, value / convection ends', () => intervalDomain(0, 1, 3, { boundary: [{ kind: 'value', where: [[0]], value: 2 }, { kind: 'convection', where: [[3]], transferCoefficient: 4, ambient: 1 }] })],
  ['interval, convection both ends, c = 0', () => intervalDomain(0, 1, 2, { kappa: [1, 3], boundary: [{ kind: 'convection', where: () => true, transferCoefficient: 0.7 }] })],
  ['square, value + flux + convection (h varies per edge)', () => rectangleDomain(0, 1, 0, 1, 2, 2, {
    kappa: (x) => (x < 0.5 ? 1 : 2),
    boundary: [
      { kind: 'value', where: (mx) => mx < 1e-9, value: (t, _x, y) => t + y },
      { kind: 'convection', where: (mx) => mx > 1 - 1e-9, transferCoefficient: (_mx, my) => 1 + 3 * my, ambient: 0.5 },
      { kind: 'flux', where: (_mx, my) => my < 1e-9, flux: 2 },
    ],
  })],
  ['unstructured polygon, all boundary convective', () => triangulatedDomain(
    [0, 0, 2, 0, 3, 1, 1.2, 0.9, 0, 2, 2.5, 2.4],
    [[0, 1, 3], [1, 2, 3], [0, 3, 4], [3, 2, 5], [3, 5, 4]],
    { boundary: [{ kind: 'convection', where: () => true, transferCoefficient: 2 }, { kind: 'value', where: [[0, 1]] }] },
  )],
];

describe('SpatialOperatorPlan vs dense reference', () => {
  for (const [name, make] of domains) {
    it(`${name}: apply / applySplit / applySum, equal and different sets`, () => {
      const r = rng(name.length * 7919);
      for (let trial = 0; trial < 4; trial++) {
        const dom = make();
        const grown = growForest(dom, r, dom.dim === 1 ? 2 : 1, 2, dom.dim === 1 ? 4 : 6);
        const sIn = randomClosedSubset(dom, grown, r, 0.05 + 0.3 * r());
        const sOut = trial === 0 ? sIn : randomClosedSubset(dom, grown, r, 0.05 + 0.3 * r());
        const { M, A } = denseSpatialMatrices(dom, sIn, sOut);
        const plan = new SpatialOperatorPlan(dom, sIn, sOut);
        const x = randomVector(r, sIn.length);
        const x2 = randomVector(r, sIn.length);
        const wm = 0.3 + r(), wa = 0.2 + r();
        // offsets exercise xOff / yOff
        const xs = new Float64Array(sIn.length + 3);
        xs.set(x, 3);
        const y = new Float64Array(sOut.length + 2);
        plan.apply(xs, 3, y, 2, wm, wa);
        const Mx = matVec(M, x), Ax = matVec(A, x), Ax2 = matVec(A, x2);
        const ref = Mx.map((v, i) => wm * v + wa * Ax[i]!);
        expect(relErr(y.subarray(2), ref)).toBeLessThan(1e-12);
        const yM = new Float64Array(sOut.length), yA = new Float64Array(sOut.length);
        plan.applySplit(x, 0, yM, 0, yA, 0);
        expect(relErr(yM, Mx)).toBeLessThan(1e-12);
        expect(relErr(yA, Ax)).toBeLessThan(1e-12);
        const ys = new Float64Array(sOut.length);
        plan.applySum(x, 0, x2, 0, ys, 0);
        expect(relErr(ys, Mx.map((v, i) => v + Ax2[i]!))).toBeLessThan(1e-12);
        // The same operator on the leaf mesh of a closed superset (the whole grown forest), as the
        // estimator's one-shot passes use it: the hierarchical M and A do not depend on the mesh.
        const onSuper = new SpatialOperatorPlan(dom, sIn, sOut, sharedLeafMesh(dom, grown));
        const yS = new Float64Array(sOut.length), ySA = new Float64Array(sOut.length);
        onSuper.applySplit(x, 0, yS, 0, ySA, 0);
        expect(relErr(yS, Mx)).toBeLessThan(1e-12);
        expect(relErr(ySA, Ax)).toBeLessThan(1e-12);
      }
    });
  }

  it('a shared leaf mesh that does not cover the sets is refused', () => {
    const dom = rectangleDomain(0, 1, 0, 1, 2, 2);
    const fine = dom.uniformSet(3);
    const coarse = dom.uniformSet(1);
    expect(() => new SpatialOperatorPlan(dom, fine, fine, sharedLeafMesh(dom, coarse))).toThrow(/not in the set the leaf mesh was built for/);
  });

  it('deep grading (60 generations toward a corner, 50 levels in 1D) stays exact', () => {
    // dyadic coordinates keep the reference's geometry exact at this depth
    const r = rng(2024);
    for (const dom of [rectangleDomain(0, 1, 0, 1, 1, 1, { reaction: 3 }), intervalDomain(0, 1, 1, { reaction: 3 })]) {
      const base = dom.uniformSet(1);
      const deep = dom.refineTowards(base, dom.dim === 2 ? [0, 0] : [0], dom.dim === 2 ? 60 : 50);
      let maxGen = 0;
      for (const v of deep) maxGen = Math.max(maxGen, dom.generation(v));
      expect(maxGen).toBeGreaterThanOrEqual(dom.dim === 2 ? 58 : 50);
      const sOut = randomClosedSubset(dom, deep, r, 0.5);
      const { M, A } = denseSpatialMatrices(dom, deep, sOut);
      const plan = new SpatialOperatorPlan(dom, deep, sOut);
      const x = randomVector(r, deep.length);
      const yM = new Float64Array(sOut.length), yA = new Float64Array(sOut.length);
      plan.applySplit(x, 0, yM, 0, yA, 0);
      expect(relErr(yM, matVec(M, x))).toBeLessThan(1e-12);
      expect(relErr(yA, matVec(A, x))).toBeLessThan(1e-12);
    }
  });

  it('a copy of the same set behaves like the same array', () => {
    const dom = rectangleDomain(0, 1, 0, 1, 2, 2);
    const s = dom.uniformSet(2);
    const p1 = new SpatialOperatorPlan(dom, s, s), p2 = new SpatialOperatorPlan(dom, s, s.slice());
    const x = randomVector(rng(3), s.length);
    const y1 = new Float64Array(s.length), y2 = new Float64Array(s.length);
    p1.apply(x, 0, y1, 0, 1, 1);
    p2.apply(x, 0, y2, 0, 1, 1);
    expect(Array.from(y2)).toEqual(Array.from(y1));
  });
});
