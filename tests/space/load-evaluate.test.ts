/** Quadrature rules, load vectors, point evaluation and nodal values. */
import { describe, expect, it } from 'vitest';
import { evaluateAt, intervalDomain, lShapeDomain, loadVector, nodalValues, rectangleDomain, triangulatedDomain, type SpatialDomain } from '../../src/space/index';
import { INTERVAL_POINTS, INTERVAL_WEIGHTS, TRIANGLE_POINTS, TRIANGLE_WEIGHTS } from '../../src/space/quadrature';
import { denseNodalMatrices, denseTransform, hierarchicalHat } from './reference';
import { growForest, matVec, randomClosedSubset, randomVector, relErr, rng } from './random-sets';

const fact = (n: number): number => (n <= 1 ? 1 : n * fact(n - 1));

describe('quadrature rules', () => {
  it('triangle rule integrates all monomials x^a y^b, a + b ≤ 5, exactly: ∫_ref x^a y^b = a! b! / (a + b + 2)! (common practice)', () => {
    for (let a = 0; a <= 5; a++) {
      for (let b = 0; a + b <= 5; b++) {
        let s = 0;
        for (let q = 0; q < TRIANGLE_WEIGHTS.length; q++) {
          // reference triangle (0,0), (1,0), (0,1): x = λ1, y = λ2, area 1/2
          s += 0.5 * TRIANGLE_WEIGHTS[q]! * TRIANGLE_POINTS[3 * q + 1]! ** a * TRIANGLE_POINTS[3 * q + 2]! ** b;
        }
        expect(s).toBeCloseTo((fact(a) * fact(b)) / fact(a + b + 2), 15);
      }
    }
    // degree 6 is not exact (the rule is degree 5)
    let s6 = 0;
    for (let q = 0; q < TRIANGLE_WEIGHTS.length; q++) s6 += 0.5 * TRIANGLE_WEIGHTS[q]! * TRIANGLE_POINTS[3 * q + 1]! ** 6;
    expect(Math.abs(s6 - fact(6) / fact(8))).toBeGreaterThan(1e-6);
  });
  it('3-point Gauss–Legendre integrates x^k, k ≤ 5, on (0, 1) exactly', () => {
    for (let k = 0; k <= 5; k++) {
      let s = 0;
      for (let q = 0; q < 3; q++) s += INTERVAL_WEIGHTS[q]! * INTERVAL_POINTS[2 * q + 1]! ** k;
      expect(s).toBeCloseTo(1 / (k + 1), 15);
    }
  });
});

describe('loadVector', () => {
  const cases: [string, () => SpatialDomain][] = [
    ['interval', () => intervalDomain(-1, 1, 3, { insulated: (x) => x > 0 })],
    ['L-shape', () => lShapeDomain(1, { insulated: (x) => x < -0.99 })],
    ['unstructured', () => triangulatedDomain([0, 0, 2, 0, 3, 1, 1.2, 0.9, 0, 2, 2.5, 2.4], [[0, 1, 3], [1, 2, 3], [0, 3, 4], [3, 2, 5], [3, 5, 4]])],
  ];
  for (const [name, make] of cases) {
    it(`${name}: ∫ f φ for a globally linear f equals (T_ref)ᵀ M_nodal f_nodal`, () => {
      const r = rng(17 + name.length);
      for (let trial = 0; trial < 3; trial++) {
        const dom = make();
        const grown = growForest(dom, r, 1, 2, 6);
        const set = randomClosedSubset(dom, grown, r, 0.2 + 0.4 * r());
        const f = (x: number, y: number) => 1.5 - 2 * x + 0.7 * y;
        const b = loadVector(dom, set, f);
        const { M, globalId } = denseNodalMatrices(dom, set);
        const fn = Array.from(globalId, (v) => f(dom.coordinate(v, 0), dom.dim === 2 ? dom.coordinate(v, 1) : 0));
        const Mf = matVec(M, fn);
        const T = denseTransform(dom, globalId, set);
        const ref = Array.from(set, (_, j) => T.reduce((s, row, w) => s + row[j]! * Mf[w]!, 0));
        expect(relErr(b, Float64Array.from(ref))).toBeLessThan(1e-13);
      }
    });
  }
  it('∫ x⁴ y φ_v on the initial mesh matches the hat integral by fine subdivision', () => {
    const dom = rectangleDomain(0, 1, 0, 1, 2, 2);
    const set = dom.initialFreeVertices(); // the centre vertex
    const b = loadVector(dom, set, (x, y) => x ** 4 * y);
    // midpoint rule on a fine grid of the hat (slowly convergent but independent): 1e-5 accuracy
    const hat = hierarchicalHat(dom, set[0]!);
    const N = 1000;
    let s = 0;
    for (let i = 0; i < N; i++) for (let j = 0; j < N; j++) {
      const x = (i + 0.5) / N, y = (j + 0.5) / N;
      s += x ** 4 * y * hat(x, y);
    }
    expect(Math.abs(b[0]! - s / N ** 2)).toBeLessThan(1e-6);
  });
});

describe('evaluateAt and nodalValues', () => {
  for (const [name, dom] of [
    ['interval', intervalDomain(0, 2, 2, { insulated: (x) => x === 0 })],
    ['L-shape', lShapeDomain(2, { insulated: (_x, y) => y > 0.99 })],
  ] as const) {
    it(`${name}: equals Σ c_j (hierarchical hat_j)(x) at random points and mesh vertices`, () => {
      const r = rng(99);
      const grown = growForest(dom, r, 1, 3, 8);
      const set = randomClosedSubset(dom, grown, r, 0.4);
      const c = randomVector(r, set.length);
      const hats = Array.from(set, (v) => hierarchicalHat(dom, v));
      const pts: number[] = [];
      while (pts.length < 200 * dom.dim) {
        const x = dom.dim === 1 ? 2 * r() : 2 * r() - 1, y = 2 * r() - 1;
        if (dom.dim === 2 && x > 0 && y < 0) continue; // outside the L
        pts.push(...(dom.dim === 1 ? [x] : [x, y]));
      }
      const vals = evaluateAt(dom, set, c, pts);
      const ref = Array.from({ length: vals.length }, (_, p) => hats.reduce((s, h, j) => s + c[j]! * h(pts[p * dom.dim]!, dom.dim === 2 ? pts[p * dom.dim + 1]! : 0), 0));
      expect(relErr(vals, ref)).toBeLessThan(1e-13);
      const { mesh, values } = nodalValues(dom, set, c);
      const T = denseTransform(dom, mesh.globalId, set);
      expect(relErr(values, matVec(T, c))).toBeLessThan(1e-14);
    });
  }
  it('rejects points outside Ω and names them', () => {
    const dom = lShapeDomain(1);
    const set = dom.uniformSet(1);
    expect(() => evaluateAt(dom, set, new Float64Array(set.length), [0, 0, 0.5, -0.5])).toThrow(/points\[1\] = \(0.5, -0.5\) lies outside the domain/);
    expect(() => evaluateAt(dom, set, new Float64Array(set.length), [NaN, 0])).toThrow(/points\[0\]/);
  });
});
