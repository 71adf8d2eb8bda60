/**
 * spaceTimeErrors against outside references:
 * - the energy identity ∫₀ᵀ‖∇u‖² dt = (‖u0‖² − ‖u(T)‖²)/(2κ) for u0 ≡ 1 with zero boundary
 *   values (the error of the zero function is ‖∇u‖_{L2(L2)}), with u from Carslaw & Jaeger §3.3
 *   (tests/helpers/heat-exact.ts);
 * - closed forms: zero error for a function the discrete space contains, and
 *   ∫₀ᵀ∫₀¹ (π t cos πx)² = π² T³/6 and a time singularity at a user-named time;
 * - sparse grids on u0 ≡ 1: agreement with an independent evaluation written here
 *   (u_δ from solution.slice at the vertices of every slice, polynomially graded rules).
 */
import { describe, expect, it } from 'vitest';
import {
  DoubleTree, HeatProblem, InvalidArgumentError, SpaceTimeSolution, SpaceTimeSystem, intervalDomain, rectangleDomain,
  spaceTimeErrors, type SpatialDomain,
} from '../../src/index';
import { gaussLegendre01 } from '../../src/numerics/gauss-legendre';
import { heatExact1D, heatExact2D, unitInterval } from '../helpers/heat-exact';

function zeroSolution(domain: SpatialDomain, set: DoubleTree, T: number): SpaceTimeSolution {
  return new SpaceTimeSolution(domain, set, new Float64Array(set.size), T);
}

describe('energy identity (u0 ≡ 1, zero boundary values; Carslaw & Jaeger §3.3)', () => {
  it('1D, unit interval and a scaled interval with κ ≠ 1: to 1e-6 relative', () => {
    for (const [a, b, kappa, L] of [[0, 1, 1, 4], [0, 1, 1, 8], [-1, 2, 0.3, 5]] as const) {
      const domain = intervalDomain(a, b, 2, { kappa });
      const u = heatExact1D({ a, b, kappa });
      const T = 0.5;
      const e = spaceTimeErrors(zeroSolution(domain, DoubleTree.sparseGrid(domain, L), T), u, { timePoints: 6 });
      const rel = e.gradientL2 ** 2 / u.gradientEnergy(T) - 1;
      console.log(`1D (${a}, ${b}), κ = ${kappa}, L = ${L}: energy identity relative error ${rel.toExponential(2)} (${e.slices} slices)`);
      expect(Math.abs(rel)).toBeLessThan(1e-6);
    }
  });

  it('2D, unit square and a rectangle with κ ≠ 1: to 1e-6 relative', () => {
    for (const [x1, y1, kappa, L] of [[1, 1, 1, 3], [2, 1, 0.5, 3]] as const) {
      const domain = rectangleDomain(0, x1, 0, y1, 2 * x1, 2 * y1, { kappa });
      const u = heatExact2D({ x1, y1, kappa });
      const T = 0.5;
      const e = spaceTimeErrors(zeroSolution(domain, DoubleTree.sparseGrid(domain, L), T), u, { timePoints: 6 });
      const rel = e.gradientL2 ** 2 / u.gradientEnergy(T) - 1;
      console.log(`2D (0, ${x1}) × (0, ${y1}), κ = ${kappa}, L = ${L}: energy identity relative error ${rel.toExponential(2)} (${e.slices} slices)`);
      expect(Math.abs(rel)).toBeLessThan(1e-6);
    }
  }, 120_000);
});

describe('closed forms', () => {
  it('a function the discrete space contains has error 0 (1D and 2D)', () => {
    // u = (1 + t)·h(x) with h the initial-mesh hat at the midpoint vertex: linear in t, so it is
    // a combination of the two level-0 trial functions σ₀₀ = √(3/T)(1 − t/T), σ₀₁ = √(3/T) t/T.
    for (const dim of [1, 2] as const) {
      const domain = dim === 1 ? intervalDomain(0, 1, 2) : rectangleDomain(0, 1, 0, 1, 2, 2);
      const set = DoubleTree.sparseGrid(domain, 3);
      const T = 0.7;
      const coef = new Float64Array(set.size);
      const hat = (x: number, y: number) => (dim === 1 ? 1 - Math.abs(2 * x - 1) : hatSquare(x, y));
      const tree = set.tree;
      for (let i = 0; i < tree.size; i++) {
        if (tree.level[i] !== 0) continue;
        const fibre = set.fibre(i);
        const mesh = domain.leafMesh(fibre);
        for (let p = 0; p < fibre.length; p++) {
          const v = Array.from(mesh.globalId).indexOf(fibre[p]!);
          const x = mesh.coords[dim * v]!, y = dim === 2 ? mesh.coords[2 * v + 1]! : 0;
          if (Math.abs(x - 0.5) < 1e-12 && Math.abs(y - (dim === 2 ? 0.5 : 0)) < 1e-12) {
            coef[set.functionOffset[i]! + p] = Math.sqrt(T / 3) * (tree.index[i] === 0 ? 1 : 1 + T);
          }
        }
      }
      const sol = new SpaceTimeSolution(domain, set, coef, T);
      // the construction is right: point values agree with (1 + t) h(x)
      for (const [t, x, y] of [[0.1, 0.3, 0.4], [0.5, 0.55, 0.2], [0.7, 0.5, 0.5]]) {
        const got = sol.evaluate(t!, dim === 1 ? [x!] : [x!, y!])[0]!;
        expect(Math.abs(got - (1 + t!) * hat(x!, y!))).toBeLessThan(1e-14);
      }
      const e = spaceTimeErrors(sol, {
        value: (t, x, y) => (1 + t) * hat(x, y),
        gradient: (t, x, y, g) => {
          if (dim === 1) g[0] = (1 + t) * (x < 0.5 ? 2 : -2);
          else hatSquareGradient(x, y, g, 1 + t);
        },
      });
      expect(e.gradientL2).toBeLessThan(1e-12);
      expect(e.valueL2).toBeLessThan(1e-13);
    }
  });

  it('zero discrete solution, u = t sin πx: ∫₀ᵀ∫₀¹ |∂x u|² = π² T³/6, ∫∫ u² = T³/6', () => {
    const domain = intervalDomain(0, 1, 2);
    const T = 0.8;
    const e = spaceTimeErrors(zeroSolution(domain, DoubleTree.sparseGrid(domain, 4), T), {
      value: (t, x) => t * Math.sin(Math.PI * x),
      gradient: (t, x, _y, g) => { g[0] = Math.PI * t * Math.cos(Math.PI * x); },
    });
    expect(Math.abs(e.gradientL2 ** 2 / ((Math.PI ** 2 * T ** 3) / 6) - 1)).toBeLessThan(1e-7);
    expect(Math.abs(e.valueL2 ** 2 / (T ** 3 / 6) - 1)).toBeLessThan(1e-7);
  });

  it('elementSplits: a kink inside elements, u = t·k(x) with k(x) = min(0.63x, 0.37(1 − x)): ∫₀ᵀ∫|∂x u|² = T³/3·(0.63²·0.37 + 0.37²·0.63) by hand', () => {
    const T = 1;
    const exact = (0.63 ** 2 * 0.37 + 0.37 ** 2 * 0.63) * T ** 3 / 3;
    const kinked = {
      value: (t: number, x: number) => t * (x < 0.37 ? 0.63 * x : 0.37 * (1 - x)),
      gradient: (t: number, x: number, _y: number, g: Float64Array) => { g[0] = t * (x < 0.37 ? 0.63 : -0.37); g[1] = 0; },
    };
    const rel = (d: SpatialDomain, s: number): number => {
      const e = spaceTimeErrors(zeroSolution(d, DoubleTree.sparseGrid(d, 0), T), kinked, { elementSplits: s });
      return Math.abs(e.gradientL2 ** 2 / exact - 1);
    };
    // the kink x = 0.37 lies in elements away from the boundary (the split applies where no
    // boundary-layer grading does); the plain rule integrates the jump of |∂x u|² inside an element
    // only to O(h), splitting shrinks the straddling piece
    for (const [domain, least] of [[intervalDomain(0, 1, 4), 0.05], [rectangleDomain(0, 1, 0, 1, 4, 4), 0.003]] as const) {
      const plain = rel(domain, 1);
      const split = rel(domain, 8);
      expect(plain).toBeGreaterThan(least);
      expect(split).toBeLessThan(plain / 4);
      expect(split).toBeLessThan(0.002);
    }
    // a smooth exact solution: the split rule agrees with the plain one
    const d = rectangleDomain(0, 1, 0, 1, 2, 2);
    const smooth = { value: (t: number, x: number) => t * Math.sin(Math.PI * x), gradient: (t: number, x: number, _y: number, g: Float64Array) => { g[0] = Math.PI * t * Math.cos(Math.PI * x); g[1] = 0; } };
    const a = spaceTimeErrors(zeroSolution(d, DoubleTree.sparseGrid(d, 2), T), smooth).gradientL2;
    const b = spaceTimeErrors(zeroSolution(d, DoubleTree.sparseGrid(d, 2), T), smooth, { elementSplits: 3 }).gradientL2;
    expect(Math.abs(a / b - 1)).toBeLessThan(1e-6);
    expect(() => spaceTimeErrors(zeroSolution(d, DoubleTree.sparseGrid(d, 2), T), smooth, { elementSplits: 9 })).toThrow(/opts\.elementSplits = 9 must be an integer in \[1, 8\]/);
  });

  it('a singularity at a user-named time: u = |t − τ|^{-1/8} sin πx, ∫∫|∂x u|² = (π²/2)·(4/3)(τ^{3/4} + (T − τ)^{3/4})', () => {
    const domain = intervalDomain(0, 1, 2);
    const T = 1;
    const tau = 0.3;
    const exact = {
      value: (t: number, x: number) => Math.abs(t - tau) ** -0.125 * Math.sin(Math.PI * x),
      gradient: (t: number, x: number, _y: number, g: Float64Array) => { g[0] = Math.PI * Math.abs(t - tau) ** -0.125 * Math.cos(Math.PI * x); },
    };
    const ref = (Math.PI ** 2 / 2) * (4 / 3) * (tau ** 0.75 + (T - tau) ** 0.75);
    const sol = zeroSolution(domain, DoubleTree.sparseGrid(domain, 6), T);
    const named = spaceTimeErrors(sol, exact, { singularTimes: [tau] }).gradientL2 ** 2;
    const unnamed = spaceTimeErrors(sol, exact).gradientL2 ** 2;
    console.log(`singular time τ = 0.3 named: rel err ${(named / ref - 1).toExponential(2)}; not named: ${(unnamed / ref - 1).toExponential(2)}`);
    expect(Math.abs(named / ref - 1)).toBeLessThan(1e-6);
    expect(Math.abs(unnamed / ref - 1)).toBeGreaterThan(1e-4);
  });
});

describe('sparse grids on u0 ≡ 1 (1D): not underestimated', () => {
  it('agrees with an independent vertex-based evaluation, and the rate matches', () => {
    const domain = intervalDomain(0, 1, 2);
    const T = 0.5;
    const rows: { n: number; lib: number; ind: number }[] = [];
    for (const L of [3, 5, 7]) {
      const set = DoubleTree.sparseGrid(domain, L);
      const { solution, pcg } = new SpaceTimeSystem(new HeatProblem({ domain, T, initial: () => 1 }), set).solve({ relTol: 1e-10 });
      expect(pcg.converged).toBe(true);
      const lib = spaceTimeErrors(solution, unitInterval).gradientL2;
      const ind = independentError(solution, L, T);
      rows.push({ n: set.size, lib, ind });
    }
    console.log(rows.map((r) => `N ${r.n}: library ${r.lib.toFixed(6)}, independent ${r.ind.toFixed(6)}`).join('\n'));
    for (const r of rows) expect(Math.abs(r.lib / r.ind - 1)).toBeLessThan(1e-4);
    const slope = (a: { n: number; e: number }, b: { n: number; e: number }) => -Math.log(b.e / a.e) / Math.log(b.n / a.n);
    const sLib = slope({ n: rows[0]!.n, e: rows[0]!.lib }, { n: rows[2]!.n, e: rows[2]!.lib });
    const sInd = slope({ n: rows[0]!.n, e: rows[0]!.ind }, { n: rows[2]!.n, e: rows[2]!.ind });
    console.log(`sparse-grid rates on u0 ≡ 1: library ${sLib.toFixed(4)}, independent ${sInd.toFixed(4)}`);
    expect(Math.abs(sLib - sInd)).toBeLessThan(0.005);
  }, 120_000);
});

describe('input checks', () => {
  const domain = intervalDomain(0, 1, 2);
  const sol = zeroSolution(domain, DoubleTree.sparseGrid(domain, 2), 1);
  it('rejects bad options and non-finite exact values with typed errors', () => {
    expect(() => spaceTimeErrors(sol, unitInterval, { timePoints: 0 })).toThrow(InvalidArgumentError);
    expect(() => spaceTimeErrors(sol, unitInterval, { gradedPanels: -1 })).toThrow(InvalidArgumentError);
    expect(() => spaceTimeErrors(sol, unitInterval, { singularTimes: [1.5] })).toThrow(/singularTimes\[0\]/);
    expect(() => spaceTimeErrors(sol, { value: () => NaN, gradient: (_t, _x, _y, g) => { g[0] = 0; } })).toThrow(/exact\.value\(.*\) returned NaN/);
    expect(() => spaceTimeErrors(sol, { value: () => 0, gradient: () => {} })).toThrow(/exact\.gradient/);
  });
});

// ---------------------------------------------------------------- helpers

/** Hat of the centre vertex (0.5, 0.5) on rectangleDomain(0,1,0,1,2,2) — read off its initial mesh. */
function hatSquare(x: number, y: number): number {
  const g = new Float64Array(2);
  return hatSquareGradient(x, y, g, 1);
}

/** Writes s·∇h into g and returns h, for the centre hat; triangles found from the initial mesh. */
const squareDomain = rectangleDomain(0, 1, 0, 1, 2, 2);
const squareMesh = squareDomain.leafMesh(squareDomain.uniformSet(0));

function hatSquareGradient(x: number, y: number, g: Float64Array, s: number): number {
  const mesh = squareMesh;
  const { elements, coords } = mesh;
  for (let e = 0; e < mesh.elementCount; e++) {
    const v = [0, 1, 2].map((k) => elements[3 * e + k]!);
    const p = v.map((i) => [coords[2 * i]!, coords[2 * i + 1]!] as const);
    const det = (p[1]![0] - p[0]![0]) * (p[2]![1] - p[0]![1]) - (p[2]![0] - p[0]![0]) * (p[1]![1] - p[0]![1]);
    const l1 = ((x - p[0]![0]) * (p[2]![1] - p[0]![1]) - (p[2]![0] - p[0]![0]) * (y - p[0]![1])) / det;
    const l2 = ((p[1]![0] - p[0]![0]) * (y - p[0]![1]) - (x - p[0]![0]) * (p[1]![1] - p[0]![1])) / det;
    const l0 = 1 - l1 - l2;
    if (l0 < -1e-12 || l1 < -1e-12 || l2 < -1e-12) continue;
    const c = p.findIndex((q) => Math.abs(q[0] - 0.5) < 1e-12 && Math.abs(q[1] - 0.5) < 1e-12);
    if (c < 0) { g[0] = 0; g[1] = 0; return 0; }
    // gradient of barycentric λ_c
    const a = p[(c + 1) % 3]!, b = p[(c + 2) % 3]!;
    const dd = (a[0] - p[c]![0]) * (b[1] - p[c]![1]) - (b[0] - p[c]![0]) * (a[1] - p[c]![1]);
    g[0] = (s * (a[1] - b[1])) / dd;
    g[1] = (s * (b[0] - a[0])) / dd;
    return [l0, l1, l2][c]!;
  }
  throw new Error(`point (${x}, ${y}) outside the unit square`);
}

/**
 * Independent L2(0,T; H¹₀) error of a 1D sparse-grid solution against unitInterval: u_δ from
 * solution.slice(t) (vertex values on the slice mesh) at each time; time rule per interval of the
 * level-L grid (the breakpoints of a sparse grid of level L), the first one mapped by t = t₁ r⁴,
 * space per element 12-point Gauss, boundary elements mapped by x = x_b ± h r⁴.
 */
function independentError(solution: SpaceTimeSolution, L: number, T: number): number {
  const g12 = gaussLegendre01(12);
  const g40 = gaussLegendre01(40);
  const grad = new Float64Array(1);
  const slice = (t: number): number => {
    const { mesh, values } = solution.slice(t);
    const order = Array.from({ length: mesh.vertexCount }, (_, i) => i).sort((p, q) => mesh.coords[p]! - mesh.coords[q]!);
    let s = 0;
    for (let k = 0; k + 1 < order.length; k++) {
      const i0 = order[k]!, i1 = order[k + 1]!;
      const x0 = mesh.coords[i0]!, x1 = mesh.coords[i1]!;
      const h = x1 - x0;
      const du = (values[i1]! - values[i0]!) / h;
      const left = x0 === 0, right = x1 === 1;
      for (let q = 0; q < 40; q++) {
        const r = g40.nodes[q]!;
        let x: number, w: number;
        if (left) { x = x0 + h * r ** 4; w = h * 4 * r ** 3 * g40.weights[q]!; }
        else if (right) { x = x1 - h * r ** 4; w = h * 4 * r ** 3 * g40.weights[q]!; }
        else { if (q >= 12) break; x = x0 + h * g12.nodes[q]!; w = h * g12.weights[q]!; }
        unitInterval.gradient(t, x, 0, grad);
        s += w * (grad[0]! - du) ** 2;
      }
    }
    return s;
  };
  const n = 2 ** L;
  let total = 0;
  for (let j = 0; j < n; j++) {
    const a = (j / n) * T, b = ((j + 1) / n) * T;
    if (j === 0) {
      for (let q = 0; q < 40; q++) {
        const r = g40.nodes[q]!;
        total += (b - a) * 4 * r ** 3 * g40.weights[q]! * slice(a + (b - a) * r ** 4);
      }
    } else {
      for (let q = 0; q < 6; q++) {
        const r = gaussLegendre01(6);
        total += (b - a) * r.weights[q]! * slice(a + (b - a) * r.nodes[q]!);
      }
    }
  }
  return Math.sqrt(total);
}
