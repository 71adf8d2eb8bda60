/**
 * Poisson convergence (−Δu = f, u = 0 on ∂Ω) with the hierarchical operators, a load vector and
 * plain CG: smooth manufactured solution (P1 rates O(h) in H¹, O(h²) in L² — common practice) and
 * the L-shaped domain with the corner singularity r^{2/3} sin(2θ/3) (Grisvard, Elliptic Problems
 * in Nonsmooth Domains, 1985): uniform meshes lose the rate (H¹ error ~ N^{−1/3}), graded meshes
 * h ~ H r^{2/3} recover N^{−1/2}.
 */
import { describe, expect, it } from 'vitest';
import { intervalDomain, lShapeDomain, rectangleDomain } from '../../src/space/index';
import { SpatialOperatorPlan, loadVector, nodalValues } from '../../src/space/index';
import { conjugateGradient, poissonErrors, slope } from './poisson-helpers';

describe('Poisson convergence', () => {
  it('smooth solution sin(πx) sin(πy) on the unit square: H¹ rate 1, L² rate 2 in h', () => {
    const dom = rectangleDomain(0, 1, 0, 1, 2, 2);
    const u = (x: number, y: number) => Math.sin(Math.PI * x) * Math.sin(Math.PI * y);
    const grad = (x: number, y: number): [number, number] => [
      Math.PI * Math.cos(Math.PI * x) * Math.sin(Math.PI * y),
      Math.PI * Math.sin(Math.PI * x) * Math.cos(Math.PI * y),
    ];
    const f = (x: number, y: number) => 2 * Math.PI ** 2 * u(x, y);
    const hs: number[] = [], l2: number[] = [], h1: number[] = [];
    for (let L = 1; L <= 5; L++) {
      const e = poissonErrors(dom, dom.uniformSet(L), f, u, grad);
      hs.push(2 ** -(L + 1));
      l2.push(e.l2);
      h1.push(e.h1);
    }
    const sH1 = slope(hs.slice(2), h1.slice(2)), sL2 = slope(hs.slice(2), l2.slice(2));
    expect(sH1).toBeGreaterThan(0.95);
    expect(sH1).toBeLessThan(1.1);
    expect(sL2).toBeGreaterThan(1.9);
    expect(sL2).toBeLessThan(2.1);
  });

  it('1D: −(κu′)′ + cu = f with u = x(1 − x)eˣ: nodal exactness of P1 for κ = 1, c = 0 (common practice)', () => {
    const dom = intervalDomain(0, 1, 2);
    const set = dom.uniformSet(4);
    const u = (x: number) => x * (1 - x) * Math.exp(x);
    const f = (x: number) => -(-x * x - 3 * x) * Math.exp(x); // −u″, u″ = (−x² − 3x) eˣ
    const plan = new SpatialOperatorPlan(dom, set, set);
    const b = loadVector(dom, set, f);
    const x = new Float64Array(set.length);
    conjugateGradient((v, y) => plan.apply(v, 0, y, 0, 0, 1), b, x, 1e-13, 1000);
    const { mesh, values } = nodalValues(dom, set, x);
    // in 1D the P1 Galerkin solution interpolates the exact solution at the nodes (for exact loads)
    for (let i = 0; i < mesh.vertexCount; i++) expect(Math.abs(values[i]! - u(mesh.coords[i]!))).toBeLessThan(1e-9);
  });

  it('L-shape corner singularity: graded meshes recover the rate uniform meshes lose', () => {
    const theta = (x: number, y: number) => {
      const t = Math.atan2(y, x);
      return t < 0 ? t + 2 * Math.PI : t;
    };
    // u = w s with w = (1 − x²)(1 − y²) and s = r^{2/3} sin(2θ/3) harmonic: −Δu = −(Δw) s − 2 ∇w·∇s,
    // ∇s = (2/3) r^{−1/3} (−sin(θ/3), cos(θ/3)).
    const parts = (x: number, y: number) => {
      const r = Math.hypot(x, y), t = theta(x, y);
      const s = r ** (2 / 3) * Math.sin((2 * t) / 3);
      const c = r > 0 ? (2 / 3) * r ** (-1 / 3) : 0;
      return { s, sx: -c * Math.sin(t / 3), sy: c * Math.cos(t / 3), w: (1 - x * x) * (1 - y * y), wx: -2 * x * (1 - y * y), wy: -2 * y * (1 - x * x) };
    };
    const u = (x: number, y: number) => { const p = parts(x, y); return p.w * p.s; };
    const grad = (x: number, y: number): [number, number] => { const p = parts(x, y); return [p.wx * p.s + p.w * p.sx, p.wy * p.s + p.w * p.sy]; };
    const f = (x: number, y: number) => {
      const p = parts(x, y);
      return 2 * (2 - x * x - y * y) * p.s - 2 * (p.wx * p.sx + p.wy * p.sy);
    };
    const dom = lShapeDomain(1);
    const uni = { n: [] as number[], e: [] as number[] }, gr = { n: [] as number[], e: [] as number[] };
    for (let L = 2; L <= 6; L++) {
      const set = dom.uniformSet(L);
      uni.n.push(set.length);
      uni.e.push(poissonErrors(dom, set, f, u, grad).h1);
    }
    for (let k = 2; k <= 6; k++) {
      const H = 2 ** -k;
      const set = dom.adaptedSet((x, y) => 2 * H * Math.hypot(x, y) ** (2 / 3), 80);
      gr.n.push(set.length);
      gr.e.push(poissonErrors(dom, set, f, u, grad).h1);
    }
    // local slopes of log e against log N between consecutive levels
    const local = (d: { n: number[]; e: number[] }) => d.n.slice(1).map((_, i) => slope(d.n.slice(i, i + 2), d.e.slice(i, i + 2)));
    const lu = local(uni), lg = local(gr);
    const sU = lu[lu.length - 1]!, sG = slope(gr.n.slice(2), gr.e.slice(2));
    // uniform: the local slope drifts up toward the singular rate −1/3 (pre-asymptotically ≈ −0.4)
    for (let i = 2; i < lu.length; i++) expect(lu[i]!).toBeGreaterThan(lu[i - 1]!);
    expect(sU).toBeGreaterThan(-0.42);
    expect(sU).toBeLessThan(-0.3);
    // graded: the optimal rate −1/2 of smooth problems
    expect(sG).toBeLessThan(-0.47);
    expect(lg[lg.length - 1]!).toBeLessThan(-0.47);
    // at the same N (log-log interpolation of the graded errors) the graded error is smaller
    const N = uni.n[uni.n.length - 1]!;
    const k = gr.n.findIndex((n) => n > N);
    const eG = gr.e[k - 1]! * (N / gr.n[k - 1]!) ** lg[k - 1]!;
    expect(eG / uni.e[uni.e.length - 1]!).toBeLessThan(0.9);
  });
});
