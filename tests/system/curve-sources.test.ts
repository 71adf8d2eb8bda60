/**
 * Sources concentrated at a point (1D) or on a curve (2D), against outside references.
 *
 * - A unit point source switched on at t = 0 at x₀ in the rod (0, 1) held at 0, starting at rest,
 *   has two closed forms (tests/helpers/point-source.ts: eigenfunction series with the steady
 *   Green's function, and images of the free-space kernel integrated in time). They are checked
 *   against each other where both converge; then point values and the true error ‖∂x(u − u_δ)‖ in
 *   L2(0,T;L2) along an adaptive run, against its estimator E.
 * - A straight line source across the unit square (insulated top and bottom, held sides) gives a
 *   y-independent field, the rod's solution with x₀ the line's position: on a line along initial
 *   edges (x = ½, where pieces lie on edges shared by two elements) and on one crossing elements
 *   (x = 0.37), as a polyline with a kink-free middle point.
 * - Load vectors against a closed form: with all of the boundary insulated, the hierarchical
 *   coefficients of an affine g are its values at the initial vertices and 0 elsewhere (its
 *   hierarchical surpluses vanish; common practice), so Σ_j g(v_j) ℓ_j = ∫_Γ ρ g ds, which Simpson's
 *   rule gives exactly for ρ, g affine (a quadratic along each segment).
 */
import { describe, expect, it } from 'vitest';
import {
  DoubleTree, HeatProblem, InvalidArgumentError, SpaceTimeSystem, intervalDomain, lShapeDomain, problemFingerprint, rectangleDomain, solveAdaptive,
  sourceAmplitudes, spaceTimeErrors, triangulatedDomain, type KnownSolution,
} from '../../src/index';
import { nodalCurveLoad } from '../../src/space/curve-load';
import { checkSourceCurve } from '../../src/space/source-curve';
import { curveLoadVector } from '../../src/space/load';
import { imageForm, rod, seriesForm } from '../helpers/point-source';
import { loadTimeBreakpoints } from '../../src/system/load-time-rule';

describe('concentrated sources', () => {
  it('the two closed forms of the rod agree (t = 0.005 … 0.1)', () => {
    for (const t of [0.005, 0.02, 0.1]) {
      for (const x of [0.05, 0.25, 0.3, 0.7]) {
        const [a, ga] = seriesForm(t, x, 0.25), [b, gb] = imageForm(t, x, 0.25);
        expect(Math.abs(a - b)).toBeLessThan(1e-12);
        if (x !== 0.25) expect(Math.abs(ga - gb)).toBeLessThan(1e-9);
      }
    }
  });

  it('1D point source: point values and the true error against E along an adaptive run', () => {
    const x0 = 0.25;
    const problem = new HeatProblem({ domain: intervalDomain(0, 1, 2), T: 0.5, curveSources: [{ curve: [[x0]], time: () => 1 }] });
    const exact: KnownSolution = {
      value: (t, x) => rod(t, x, x0)[0],
      gradient: (t, x, _y, g) => { g[0] = rod(t, x, x0)[1]; },
    };
    const ratios: number[] = [];
    const errors: number[] = [];
    const { solution, history } = solveAdaptive(problem, {
      maxUnknowns: 2500,
      onStep: (step, sol) => {
        if (step.step % 4 !== 0) return;
        const e = spaceTimeErrors(sol, exact).gradientL2;
        errors.push(e);
        ratios.push(e / step.estimate);
      },
    });
    for (const [t, x] of [[0.02, 0.25], [0.02, 0.4], [0.2, 0.25], [0.5, 0.8]] as const) {
      expect(Math.abs(solution.evaluate(t, [x])[0]! - rod(t, x, x0)[0])).toBeLessThan(2e-3 * rod(0.5, x0, x0)[0]);
    }
    // honest estimator: err/E within a band of width ≤ 3, and the error falls
    expect(ratios.length).toBeGreaterThan(3);
    expect(Math.max(...ratios) / Math.min(...ratios)).toBeLessThan(3);
    for (const r of ratios) expect(r).toBeGreaterThan(0.3);
    expect(errors[errors.length - 1]!).toBeLessThan(0.3 * errors[0]!);
    expect(history.length).toBeGreaterThan(8);
  });

  it('2D line source across coarse elements: err/E stays in a narrow band from the first step (manufactured kink, by hand)', () => {
    // u = t·k(x), k = 0.63x left of x = 0.37 and 0.37(1 − x) right of it: ∂t u − Δu = k + t δ(x − 0.37)
    // (k'' = −δ), insulated at y = 0 and 1. With candidates only half a mesh size deep the kink, 0.005
    // from the vertex x = 0.375, was nearly invisible to them: at 45 unknowns E = 8.7e-3 against the
    // error 3.6e-2 (err/E 4.1, 1.2–4.1 over the run); with candidates a quarter mesh size deep along
    // the source, 1.15–2.27 (the largest at the second step, 45 unknowns; 1.3–1.7 from 10² on).
    const domain = rectangleDomain(0, 1, 0, 1, 2, 2, { insulated: (_x, y) => y < 1e-9 || y > 1 - 1e-9 });
    const k = (x: number): number => (x < 0.37 ? 0.63 * x : 0.37 * (1 - x));
    const problem = new HeatProblem({ domain, T: 1, source: (_t, x) => k(x), curveSources: [{ curve: [[0.37, 0], [0.37, 1]], time: (t) => t }] });
    const exact: KnownSolution = { value: (t, x) => t * k(x), gradient: (t, x, _y, g) => { g[0] = t * (x < 0.37 ? 0.63 : -0.37); g[1] = 0; } };
    const ratios: number[] = [];
    solveAdaptive(problem, {
      maxUnknowns: 1200,
      // elements split 8 × 8: the kink lies inside elements (docs/error-norms.md §7)
      onStep: (s, sol) => { ratios.push(spaceTimeErrors(sol, exact, { elementSplits: 8 }).gradientL2 / s.estimate); },
    });
    expect(ratios.length).toBeGreaterThan(4);
    expect(Math.max(...ratios)).toBeLessThan(2.5);
    expect(Math.max(...ratios) / Math.min(...ratios)).toBeLessThan(3); // the band asked of the estimator
    expect(Math.min(...ratios)).toBeGreaterThan(0.7);
  });

  for (const xc of [0.5, 0.37]) {
    it(`2D line source along x = ${xc}: the rod's solution in every row`, () => {
      const domain = rectangleDomain(0, 1, 0, 1, 2, 2, { insulated: (_x, y) => y < 1e-9 || y > 1 - 1e-9 });
      const problem = new HeatProblem({ domain, T: 0.5, curveSources: [{ curve: [[xc, 0], [xc, 0.4], [xc, 1]] }] });
      const { solution } = solveAdaptive(problem, { maxUnknowns: 12000 });
      const peak = rod(0.5, xc, xc)[0];
      for (const [t, x, y] of [[0.05, xc, 0.5], [0.05, 0.6, 0.2], [0.5, xc, 0.9], [0.5, 0.8, 0.5], [0.3, 0.1, 0.05]] as const) {
        expect(Math.abs(solution.evaluate(t, [x, y])[0]! - rod(t, x, xc)[0]), `(${t}, ${x}, ${y})`).toBeLessThan(2e-3 * peak);
      }
    });
  }

  it('2D load vectors: Σ g(v) ℓ_v over the initial vertices is ∫_Γ ρ g ds (Simpson), on refined meshes', () => {
    const domain = rectangleDomain(0, 2, 0, 1, 4, 2, { insulated: () => true, reaction: 1 }); // reaction: an all-insulated body needs it (it does not enter the loads)
    const density = (x: number, y: number) => 1 + 0.5 * x - 0.25 * y;
    const g = (x: number, y: number) => 2 - x + 3 * y;
    // along an initial edge, across elements, through a vertex, and folded back over itself
    const curves = [
      [[0.5, 0], [0.5, 1]],
      [[0.1, 0.13], [1.77, 0.91], [1.2, 0.05]],
      [[0, 0], [1, 0.5], [2, 1]],
      [[0.3, 0.3], [1.7, 0.6], [0.3, 0.3]],
    ];
    for (const pts of curves) {
      let exact = 0;
      for (let k = 0; k + 1 < pts.length; k++) {
        const [ax, ay] = pts[k]!, [bx, by] = pts[k + 1]!;
        const f = (s: number) => density(ax! + s * (bx! - ax!), ay! + s * (by! - ay!)) * g(ax! + s * (bx! - ax!), ay! + s * (by! - ay!));
        exact += (Math.hypot(bx! - ax!, by! - ay!) / 6) * (f(0) + 4 * f(0.5) + f(1));
      }
      const curve = checkSourceCurve(domain, pts, density, 'c');
      for (const level of [0, 2, 5]) {
        const set = domain.uniformSet(level);
        const load = curveLoadVector(domain, set, curve);
        let sum = 0;
        for (let i = 0; i < set.length; i++) {
          const v = set[i]!;
          if (v >= domain.initialVertexCount) continue;
          const x = domain.forest.vCoord[2 * v]!, y = domain.forest.vCoord[2 * v + 1]!;
          sum += g(x, y) * load[i]!;
        }
        expect(Math.abs(sum - exact) / Math.abs(exact), `${JSON.stringify(pts)} level ${level}`).toBeLessThan(1e-12);
      }
    }
  });

  it('2D nodal loads equal a brute-force reference: the curve sampled densely, each sample located by a search over all elements', () => {
    // The identity above is blind to a piece given to the wrong element (barycentric coordinates of
    // any triangle reproduce affine functions); this reference is not: midpoint rule with 4 000
    // samples per segment, each sample's hats from the first element that holds it. A piece given to a
    // wrong element was off by 1.4 (relative) here.
    const domain = rectangleDomain(0, 1.2, 0, 0.6, 4, 2);
    const curves = [
      [[0.1, 0.075], [1.1, 0.075], [1.1, 0.225], [0.1, 0.225], [0.1, 0.375], [1.1, 0.375]], // on and off edges at level 2
      [[0.05, 0.55], [0.6, 0.3], [1.15, 0.05]], // through vertices
      [[0.013, 0.021], [0.77, 0.431], [0.31, 0.59]], // oblique
    ];
    const adaptive = solveAdaptive(new HeatProblem({ domain, T: 0.5, initial: () => 1 }), { maxUnknowns: 1500 }).set;
    const meshes = [domain.leafMesh(domain.uniformSet(2)), domain.leafMesh(domain.uniformSet(3)), domain.leafMesh(adaptive.fibre(0))];
    for (const pts of curves) {
      const curve = checkSourceCurve(domain, pts, (x: number) => 1 + x, 'c');
      for (const mesh of meshes) {
        const r = new Float64Array(mesh.vertexCount);
        nodalCurveLoad(mesh, curve, r);
        const ref = new Float64Array(mesh.vertexCount);
        const el = mesh.elements, xy = mesh.coords, N = 4000;
        for (let k = 0; k + 1 < pts.length; k++) {
          const [ax, ay] = pts[k]!, [bx, by] = pts[k + 1]!;
          const len = Math.hypot(bx! - ax!, by! - ay!);
          for (let i = 0; i < N; i++) {
            const s = (i + 0.5) / N, x = ax! + s * (bx! - ax!), y = ay! + s * (by! - ay!);
            for (let e = 0; e < mesh.elementCount; e++) {
              const i0 = el[3 * e]!, i1 = el[3 * e + 1]!, i2 = el[3 * e + 2]!;
              const x0 = xy[2 * i0]!, y0 = xy[2 * i0 + 1]!;
              const ux = xy[2 * i1]! - x0, uy = xy[2 * i1 + 1]! - y0, vx = xy[2 * i2]! - x0, vy = xy[2 * i2 + 1]! - y0;
              const det = ux * vy - uy * vx;
              const l1 = ((x - x0) * vy - (y - y0) * vx) / det, l2 = (ux * (y - y0) - uy * (x - x0)) / det, l0 = 1 - l1 - l2;
              if (l0 < -1e-12 || l1 < -1e-12 || l2 < -1e-12) continue;
              const w = (len / N) * (1 + x);
              ref[i0] += w * l0;
              ref[i1] += w * l1;
              ref[i2] += w * l2;
              break;
            }
          }
        }
        let diff = 0, top = 0;
        for (let i = 0; i < r.length; i++) {
          diff = Math.max(diff, Math.abs(r[i]! - ref[i]!));
          top = Math.max(top, Math.abs(ref[i]!));
        }
        // the reference's own error: O(N⁻²) per element crossing (the integrand has kinks there), 3e-6 at most seen
        expect(diff / top, `${JSON.stringify(pts)} on ${mesh.elementCount} elements`).toBeLessThan(2e-5);
      }
    }
  });

  it('sources close to a held boundary on the coarsest meshes: the estimator is awake from the first step', () => {
    // 1D: x₀ = 0.01 in two cells (err/E at the first step was 4.7 before the first set resolved it)
    const x0 = 0.01;
    const exact: KnownSolution = { value: (t, x) => rod(t, x, x0)[0], gradient: (t, x, _y, g) => { g[0] = rod(t, x, x0)[1]; } };
    const ratios: number[] = [];
    solveAdaptive(new HeatProblem({ domain: intervalDomain(0, 1, 2), T: 0.5, curveSources: [{ curve: [[x0]] }] }), {
      maxUnknowns: 600,
      onStep: (step, sol) => { if (step.step < 6) ratios.push(spaceTimeErrors(sol, exact).gradientL2 / step.estimate); },
    });
    expect(ratios[0]!).toBeLessThan(2);
    expect(Math.max(...ratios) / Math.min(...ratios)).toBeLessThan(3);
    // 2D: a short cable next to a corner of the square cut into two triangles (no free vertex); E at
    // the first step was 0.35 of its largest value over the next steps, and for a cable along a held
    // edge 0.44 (a run with a tolerance could have stopped there)
    const square = triangulatedDomain([[0, 0], [1, 0], [1, 1], [0, 1]], [[0, 1, 2], [0, 2, 3]]);
    for (const curve of [[[0.05, 0.05], [0.12, 0.05]], [[0.05, 0.3], [0.05, 0.7]]]) {
      const E = solveAdaptive(new HeatProblem({ domain: square, T: 0.5, curveSources: [{ curve }] }), { maxUnknowns: 3000, maxSteps: 6 }).history.map((h) => h.estimate);
      expect(E[0]! / Math.max(...E), JSON.stringify(curve)).toBeGreaterThan(0.6);
    }
  });

  it('a short pulse in the time profile is resolved by the loads (superposition of two switch-ons)', () => {
    // on during [0.3, 0.31] only: u(t) = U(t − 0.3) − U(t − 0.31) (linearity, common practice)
    const x0 = 0.25;
    const problem = new HeatProblem({ domain: intervalDomain(0, 1, 2), T: 1, curveSources: [{ curve: [[x0]], time: (t) => (t >= 0.3 && t < 0.31 ? 100 : 0) }] });
    const breaks = loadTimeBreakpoints(problem).times;
    expect(breaks.some((t) => Math.abs(t - 0.3) < 0.01)).toBe(true);
    // the loop refines in time toward both switches, in many small steps (45 to 3 853 unknowns);
    // temporal candidates two levels deep take fewer (29 to 3 494; docs/adaptivity.md §2.2)
    const one = solveAdaptive(problem, { maxUnknowns: 4000, maxSteps: 200 });
    const two = solveAdaptive(problem, { maxUnknowns: 4000, maxSteps: 200, enlargement: { temporalLevels: 2 } });
    expect(two.history.length).toBeLessThan(0.8 * one.history.length);
    const U = (t: number, x: number) => (t > 0 ? rod(t, x, x0)[0] : 0);
    // within 1.5 % plus a small absolute slack against the peak 5.6: depth 1 is within 1.1 % at the
    // source during the pulse and 0.5 % just after it; at t = 0.8 both depths are 6–7·10⁻⁴ off the
    // small value 0.0076 (slack 10⁻³, 0.02 % of the peak; depth 1 was 3·10⁻⁴ off before its
    // candidates went deeper around the source, with the same L2(0,T;H¹) error per unknown)
    for (const [run, slack] of [[one, 1e-3], [two, 1e-3]] as const) {
      for (const [t, x] of [[0.305, 0.25], [0.35, 0.25], [0.5, 0.6], [0.8, 0.25]] as const) {
        const exact = 100 * (U(t - 0.3, x) - U(t - 0.31, x));
        expect(Math.abs(run.solution.evaluate(t, [x])[0]! - exact), `(${t}, ${x})`).toBeLessThan(0.015 * exact + slack);
      }
    }
  });

  it('as a parameter: sourceAmplitudes with a curve term reproduces the scaled right-hand side; fingerprints tell curves apart', () => {
    const domain = rectangleDomain(0, 1, 0, 1, 2, 2);
    const set = DoubleTree.sparseGrid(domain, 3);
    const system = new SpaceTimeSystem(new HeatProblem({ domain, T: 0.5 }), set);
    const cable = { curve: [[0.1, 0.3], [0.9, 0.6]], time: (t: number) => 1 + t };
    const map = sourceAmplitudes(system, [cable, { time: () => 1, space: (x: number) => x }]);
    const b = new Float64Array(system.size);
    map.addTo(Float64Array.of(2.5, 0), b);
    const ref = system.rightHandSide({ curveSources: [{ ...cable, time: (t: number) => 2.5 * (1 + t) }] });
    let diff = 0, norm = 0;
    for (let i = 0; i < b.length; i++) {
      diff = Math.max(diff, Math.abs(b[i]! - ref[i]!));
      norm = Math.max(norm, Math.abs(ref[i]!));
    }
    expect(norm).toBeGreaterThan(0);
    expect(diff / norm).toBeLessThan(1e-13);
    expect(() => sourceAmplitudes(system, [{ curve: [[0.1, 0.3], [1.9, 0.6]] }])).toThrow(/segment 0 of terms\[0\]\.curve/);
    const fp = (curve: number[][]) => problemFingerprint(new HeatProblem({ domain, T: 0.5, curveSources: [{ curve }] }));
    expect(fp([[0.1, 0.3], [0.9, 0.6]])).toBe(fp([[0.1, 0.3], [0.9, 0.6]]));
    expect(fp([[0.1, 0.3], [0.9, 0.6]])).not.toBe(fp([[0.1, 0.3], [0.9, 0.61]]));
    expect(fp([[0.1, 0.3], [0.9, 0.6]])).not.toBe(problemFingerprint(new HeatProblem({ domain, T: 0.5 })));
  });

  it('input errors name the source and the point, before any work', () => {
    const square = rectangleDomain(0, 1, 0, 1, 2, 2);
    const make = (curveSources: unknown) => () => new HeatProblem({ domain: square, T: 1, curveSources: curveSources as never });
    expect(make([{ curve: [[0.5, 0.5]] }])).toThrow(/curveSources\[0\]\.curve has 1 point; in 2D a source curve is a polyline of at least two points/);
    expect(make([{ curve: [[0.2, 0.2], [0.2, 0.2]] }])).toThrow(/curveSources\[0\]\.curve\[0\] and curveSources\[0\]\.curve\[1\] coincide/);
    expect(make([{ curve: [[0.2, 0.2], [1.5, 0.2]] }])).toThrow(/segment 0 of curveSources\[0\]\.curve, from \(0\.2, 0\.2\) to \(1\.5, 0\.2\), leaves the domain \(38\.5 % of it lies outside\)/);
    expect(make([{ curve: [[0.2, NaN], [0.5, 0.2]] }])).toThrow(/curveSources\[0\]\.curve\[0\] has coordinate NaN/);
    expect(make([{ curve: [[0.2, 0.2], [0.5, 0.2]], power: 3 }])).toThrow(InvalidArgumentError);
    expect(make([{ curve: [[0.2, 0.2], [0.5, 0.2]], density: 2 }])).toThrow(/curveSources\[0\]\.density must be a function/);
    // an L-shape: a segment from one arm to the other crosses the missing quarter
    const L = lShapeDomain(1);
    expect(() => new HeatProblem({ domain: L, T: 1, curveSources: [{ curve: [[-0.5, -0.5], [0.5, 0.5], [0.5, -0.5]] }] })).toThrow(/segment 1 of curveSources\[0\]\.curve/);
    // through the re-entrant corner: out of the domain beyond it; across the corner diagonally: inside
    expect(() => new HeatProblem({ domain: L, T: 1, curveSources: [{ curve: [[-0.5, 0.5], [0.5, -0.5]] }] })).toThrow(/leaves the domain \(50\.0 % of it lies outside\)/);
    expect(() => new HeatProblem({ domain: L, T: 1, curveSources: [{ curve: [[-1, -1], [1, 1]] }] })).not.toThrow();
    // along the notch's edges, which are held at 0: the source would vanish there, so it is refused;
    // along an insulated edge it is heat put in through the edge, and accepted
    expect(() => new HeatProblem({ domain: L, T: 1, curveSources: [{ curve: [[1, 0], [0, 0], [0, -1]] }] })).toThrow(/segment 0 of curveSources\[0\]\.curve runs along a boundary edge held at a value/);
    const bottomInsulated = rectangleDomain(0, 1, 0, 1, 2, 2, { insulated: (_x, y) => y < 1e-9 });
    expect(() => new HeatProblem({ domain: bottomInsulated, T: 1, curveSources: [{ curve: [[0.2, 0], [0.8, 0]] }] })).not.toThrow();
    expect(() => new HeatProblem({ domain: square, T: 1, curveSources: [{ curve: [[0.2, 0.5], [0.2, 0], [0.8, 0]] }] })).toThrow(/segment 1 of curveSources\[0\]\.curve runs along a boundary edge held at a value/);
    // a start 10⁻⁷ outside is not rounding
    expect(() => new HeatProblem({ domain: L, T: 1, curveSources: [{ curve: [[0.5, -1e-7], [0.5, 0.5]] }] })).toThrow(/leaves the domain \(0\.000020 % of it lies outside\)/);
    expect(() => new HeatProblem({ domain: intervalDomain(0, 1, 2), T: 1, curveSources: [{ curve: [[1.2]] }] })).toThrow(/curveSources\[0\]\.curve\[0\] = \[1\.2\] lies outside the domain/);
    expect(() => new HeatProblem({ domain: intervalDomain(0, 1, 2), T: 1, curveSources: [{ curve: [[0.2], [0.4]] }] })).toThrow(/in 1D a concentrated source sits at one point/);
    // non-finite data at run time name the source
    const bad = new HeatProblem({ domain: square, T: 1, curveSources: [{ curve: [[0.2, 0.2], [0.6, 0.7]], density: (x) => (x > 0.5 ? NaN : 1) }] });
    expect(() => solveAdaptive(bad, { maxUnknowns: 200 })).toThrow(/curveSources\[0\]\.density\(0\.\d+, 0\.\d+\) returned NaN/);
  });
});
