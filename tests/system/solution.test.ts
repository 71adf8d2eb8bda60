/** Point evaluation and time slices of space-time solutions agree with each other and with the coefficients. */
import { describe, expect, it } from 'vitest';
import { DoubleTree, HeatProblem, SpaceTimeSolution, SpaceTimeSystem, evaluateTemporal, evaluateAt, rectangleDomain } from '../../src/index';
import { seededRandom } from '../spacetime/reference';

describe('space-time solution output', () => {
  const domain = rectangleDomain(0, 2, 0, 1, 2, 1);
  const set = DoubleTree.sparseGrid(domain, 3);
  const rand = seededRandom(4);
  const coeffs = Float64Array.from({ length: set.size }, () => rand() - 0.5);
  const T = 3;
  const u = new SpaceTimeSolution(domain, set, coeffs, T);

  it('evaluate(t, x) equals the direct double sum Σ u_λν σ_λ(t) φ_ν(x)', () => {
    const pts = [0.3, 0.4, 1.7, 0.2, 1, 0.5];
    for (const t of [0, 0.4, 1.5, 2.99, 3]) {
      const got = u.evaluate(t, pts);
      const want = new Float64Array(3);
      for (let i = 0; i < set.tree.size; i++) {
        const s = evaluateTemporal('trial', set.tree.level[i]!, set.tree.index[i]!, 0, t, T).value;
        if (s === 0) continue;
        const fib = set.fibre(i);
        const o = set.functionOffset[i]!;
        const v = evaluateAt(domain, fib, coeffs.subarray(o, o + fib.length), pts);
        for (let p = 0; p < 3; p++) want[p]! += s * v[p]!;
      }
      for (let p = 0; p < 3; p++) expect(got[p]).toBeCloseTo(want[p]!, 12);
    }
  });

  it('slice(t) nodal values agree with point evaluation at the mesh vertices', () => {
    const s = u.slice(1.2);
    const v = u.evaluate(1.2, s.mesh.coords);
    for (let i = 0; i < s.mesh.vertexCount; i++) expect(s.values[i]).toBeCloseTo(v[i]!, 12);
  });

  it('rejects times outside [0, T] and coefficient vectors of the wrong length', () => {
    expect(() => u.evaluate(-0.1, [0.5, 0.5])).toThrow(/time t = -0.1 is outside \[0, 3\]/);
    expect(() => new SpaceTimeSolution(domain, set, new Float64Array(3), T)).toThrow(/coefficients has length 3/);
  });

  it('solve() returns the solution of S u = b on the set of the system, as PCG left it', () => {
    const sys = new SpaceTimeSystem(new HeatProblem({ domain, T, initial: (x) => x * (2 - x) }), set);
    const { solution, pcg } = sys.solve({ relTol: 1e-6 });
    expect(solution.trialSet).toBe(set);
    expect(solution.T).toBe(T);
    expect(Array.from(solution.coefficients)).toEqual(Array.from(pcg.solution));
    // The residual is recomputed here from S and b, not taken from the PCG report.
    const b = sys.rightHandSide();
    const r = new Float64Array(set.size);
    sys.S.apply(solution.coefficients, r);
    let rr = 0;
    let bb = 0;
    for (let i = 0; i < r.length; i++) { rr += (b[i]! - r[i]!) ** 2; bb += b[i]! ** 2; }
    expect(bb).toBeGreaterThan(0);
    // relTol is on the K_X-preconditioned residual; allow the condition number of K_X S (< 10 here) on top.
    expect(Math.sqrt(rr / bb)).toBeLessThan(1e-5);
  });
});

describe('grid sampling (ndarray view)', () => {
  it('sampleGrid agrees with evaluate, shapes [t, x, y], NaN outside a non-convex domain', async () => {
    const { lShapeDomain } = await import('../../src/index');
    const domain = lShapeDomain(1);
    const set = DoubleTree.sparseGrid(domain, 2);
    const rand = seededRandom(8);
    const u = new SpaceTimeSolution(domain, set, Float64Array.from({ length: set.size }, () => rand()), 1);
    const ts = [0, 0.3, 1];
    const xs = [-0.9, -0.2, 0.6];
    const ys = [-0.7, 0.4];
    const g = u.sampleGrid(ts, xs, ys);
    expect(g.shape).toEqual([3, 3, 2]);
    for (let k = 0; k < 3; k++) for (let i = 0; i < 3; i++) for (let j = 0; j < 2; j++) {
      const inside = !(xs[i]! > 0 && ys[j]! < 0); // (−1,1)² minus [0,1]×[−1,0]
      if (inside) expect(g.get(k, i, j)).toBeCloseTo(u.evaluate(ts[k]!, [xs[i]!, ys[j]!])[0]!, 12);
      else expect(Number.isNaN(g.get(k, i, j))).toBe(true);
    }
    expect(() => u.sampleGrid([0], [0])).toThrow(/needs both xs and ys/);
  });
});

describe('many right-hand sides on one operator', () => {
  it('rightHandSide(data) is linear in the data and matches a system built for that data', () => {
    const domain = rectangleDomain(0, 1, 0, 1, 2, 2);
    const set = DoubleTree.sparseGrid(domain, 3);
    const sys = new SpaceTimeSystem(new HeatProblem({ domain, T: 2 }), set);
    const f1 = (t: number, x: number, y: number) => t * x * y;
    const f2 = (_t: number, x: number) => Math.cos(3 * x);
    const u0 = (x: number, y: number) => x + y * y;
    const b1 = sys.rightHandSide({ source: f1 });
    const b2 = sys.rightHandSide({ source: f2, initial: u0 });
    const b12 = sys.rightHandSide({ source: (t, x, y) => f1(t, x, y) + f2(t, x), initial: u0 });
    for (let i = 0; i < b12.length; i++) expect(b12[i]).toBeCloseTo(b1[i]! + b2[i]!, 12);
    const direct = new SpaceTimeSystem(new HeatProblem({ domain, T: 2, source: f2, initial: u0 }), set).rightHandSide();
    for (let i = 0; i < direct.length; i++) expect(b2[i]).toBeCloseTo(direct[i]!, 12);
  });
});
