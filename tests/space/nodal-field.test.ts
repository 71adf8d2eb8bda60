/**
 * NodalField (src/space/nodal-field.ts) and SpaceTimeSolution.state: the continuous piecewise-linear
 * interpolant of nodal values, located through a bucket grid.
 *
 * Outside references: linear interpolation on a simplex reproduces affine functions exactly
 * (common practice), so on any mesh the field of the nodal values of a + bx + cy is that function
 * everywhere; and the state of a solution is compared, at random points, with the library's other
 * evaluation path (SpaceTimeSolution.evaluate: forest descent and hierarchical coefficients), which
 * shares no code with it. A run started from a measured-style field on a triangulation of its own is
 * checked against the separable solution e^{−2π²t} sin πx sin πy of the unit square (separation of
 * variables; Carslaw & Jaeger, Conduction of Heat in Solids, 2nd ed., 1959, from memory).
 */
import { describe, expect, it } from 'vitest';
import { HeatProblem, InvalidArgumentError, InvalidMeshError, NodalField, intervalDomain, lShapeDomain, rectangleDomain, solveAdaptive, triangulatedDomain } from '../../src/index';
import { rng } from '../helpers/random';

/** An n × n grid of the unit square, interior points jittered, each quad cut along a random diagonal, random orientation. */
function jitteredMesh(n: number, seed: number): { points: number[]; cells: number[] } {
  const r = rng(seed);
  const points: number[] = [];
  for (let j = 0; j <= n; j++) {
    for (let i = 0; i <= n; i++) {
      const inner = i > 0 && i < n && j > 0 && j < n;
      points.push((i + (inner ? 0.6 * (r() - 0.5) : 0)) / n, (j + (inner ? 0.6 * (r() - 0.5) : 0)) / n);
    }
  }
  const cells: number[] = [];
  const id = (i: number, j: number) => j * (n + 1) + i;
  for (let j = 0; j < n; j++) {
    for (let i = 0; i < n; i++) {
      const [a, b, c, d] = [id(i, j), id(i + 1, j), id(i + 1, j + 1), id(i, j + 1)];
      const tris = r() < 0.5 ? [[a, b, c], [a, c, d]] : [[a, b, d], [b, c, d]];
      for (const t of tris) cells.push(...(r() < 0.5 ? t : [t[0]!, t[2]!, t[1]!]));
    }
  }
  return { points, cells };
}

describe('NodalField', () => {
  it('reproduces affine functions exactly on a jittered mesh of either orientation (common practice)', () => {
    const { points, cells } = jitteredMesh(12, 7);
    const g = (x: number, y: number) => 0.3 - 2 * x + 5 * y;
    const values = Array.from({ length: points.length / 2 }, (_, i) => g(points[2 * i]!, points[2 * i + 1]!));
    const field = new NodalField({ dim: 2, points, cells, values });
    expect(field.cellCount).toBe(288);
    const r = rng(3);
    for (let k = 0; k < 2000; k++) {
      const x = r(), y = r();
      expect(Math.abs(field.valueAt(x, y) - g(x, y))).toBeLessThan(1e-12);
    }
    // corners, edges and points a rounding error outside the square
    for (const [x, y] of [[0, 0], [1, 1], [0.5, 0], [1, 0.37], [-1e-13, 0.5], [0.5, 1 + 1e-13]] as const) {
      expect(Math.abs(field.valueAt(x, y) - g(x, y))).toBeLessThan(1e-11);
    }
  });

  it('in 1D: segments in any order and orientation', () => {
    const field = new NodalField({ dim: 1, points: [1, 0, 0.25, 0.5], cells: [1, 2, 3, 2, 3, 0], values: [4, 0, 1, 2] });
    for (const x of [0, 0.1, 0.25, 0.4, 0.75, 1]) expect(field.valueAt(x)).toBeCloseTo(4 * x, 13);
    expect(field.contains(1.0001)).toBe(false);
    expect(() => field.valueAt(-0.2)).toThrow(/x = -0\.2 lies outside the field's mesh/);
  });

  it('a point outside, and bad input, are typed errors naming the place', () => {
    const { points, cells } = jitteredMesh(3, 1);
    const values = new Array(points.length / 2).fill(1);
    const field = new NodalField({ dim: 2, points, cells, values });
    let caught: unknown;
    try { field.valueAt(1.001, 0.5); } catch (e) { caught = e; }
    expect(caught).toBeInstanceOf(InvalidArgumentError);
    expect(String(caught)).toMatch(/\(1\.001, 0\.5\) lies outside/);
    expect(field.contains(Number.NaN, 0.5)).toBe(false);
    expect(() => new NodalField({ dim: 3 as 2, points, cells, values })).toThrow(InvalidArgumentError);
    expect(() => new NodalField({ dim: 2, points: points.slice(1), cells, values })).toThrow(/points holds 31 numbers/);
    expect(() => new NodalField({ dim: 2, points, cells: [...cells, 0], values })).toThrow(/cells holds 55 indices/);
    const badCell = cells.slice();
    badCell[7] = 16;
    expect(() => new NodalField({ dim: 2, points, cells: badCell, values })).toThrow(/cells\[7\] \(cell 2, corner 1\) = 16 is not a point index in \[0, 15\]/);
    const nan = values.slice();
    nan[5] = Number.NaN;
    expect(() => new NodalField({ dim: 2, points, cells, values: nan })).toThrow(/values\[5\]/);
    expect(() => new NodalField({ dim: 2, points, cells, values: values.slice(1) })).toThrow(/values has length 15, expected 16/);
    // three points on one line
    let flat: unknown;
    try { new NodalField({ dim: 2, points: [0, 0, 1, 1, 2, 2, 0, 1], cells: [0, 1, 3, 0, 1, 2], values: [0, 0, 0, 0] }); } catch (e) { flat = e; }
    expect(flat).toBeInstanceOf(InvalidMeshError);
    expect(String(flat)).toMatch(/cell 1 has zero area/);
  });

  it('the state of a solution agrees with its point evaluation at random points (2D L-shape and 1D)', () => {
    const r = rng(11);
    const l = solveAdaptive(new HeatProblem({ domain: lShapeDomain(1), T: 0.05, initial: (x, y) => 1 + x * y }), { maxUnknowns: 3000 });
    for (const t of [0, 0.013, 0.05]) {
      const state = l.solution.state(t);
      const pts: number[] = [];
      while (pts.length < 800) {
        const x = 2 * r() - 1, y = 2 * r() - 1;
        if (!(x > 0 && y < 0)) pts.push(x, y);
      }
      const ref = l.solution.evaluate(t, pts);
      for (let i = 0; i < 400; i++) expect(Math.abs(state.valueAt(pts[2 * i]!, pts[2 * i + 1]!) - ref[i]!)).toBeLessThan(1e-12);
      expect(state.contains(0.5, -0.5)).toBe(false);
    }
    const rod = solveAdaptive(new HeatProblem({ domain: intervalDomain(0, 1, 2), T: 0.2, initial: () => 1 }), { maxUnknowns: 1500 });
    const state = rod.solution.state(0.2);
    for (let k = 0; k < 200; k++) {
      const x = r();
      expect(Math.abs(state.valueAt(x) - rod.solution.evaluate(0.2, [x])[0]!)).toBeLessThan(1e-12);
    }
  });

  it('starts a run on the coarsest mesh of the square (two triangles) from a field on a jittered mesh of its own', () => {
    const { points, cells } = jitteredMesh(40, 5);
    const u0 = (x: number, y: number) => Math.sin(Math.PI * x) * Math.sin(Math.PI * y);
    const field = new NodalField({ dim: 2, points, cells, values: Array.from({ length: points.length / 2 }, (_, i) => u0(points[2 * i]!, points[2 * i + 1]!)) });
    const domain = triangulatedDomain([[0, 0], [1, 0], [1, 1], [0, 1]], [[0, 1, 2], [0, 2, 3]]);
    const run = solveAdaptive(new HeatProblem({ domain, T: 0.1, initial: field }), { maxUnknowns: 8000 });
    // measured: 5 632 unknowns, E = 5.1e-3; relative differences 0.09–0.77 % at the centre and
    // 0.001–0.19 % at (0.25, 0.7), absolute at most 1.1e-3
    for (const t of [0.01, 0.05, 0.1]) {
      const decay = Math.exp(-2 * Math.PI * Math.PI * t);
      const v = run.solution.evaluate(t, [0.5, 0.5, 0.25, 0.7]);
      expect(Math.abs(v[0]! - decay)).toBeLessThan(3e-3);
      expect(Math.abs(v[1]! - decay * u0(0.25, 0.7))).toBeLessThan(3e-3);
    }
  });

  it('as the initial state of a problem: checked against the domain before any work', () => {
    const half = new NodalField({ dim: 2, points: [0, 0, 0.5, 0, 0.5, 1, 0, 1], cells: [0, 1, 2, 0, 2, 3], values: [1, 1, 1, 1] });
    const square = rectangleDomain(0, 1, 0, 1, 2, 2);
    let caught: unknown;
    try { new HeatProblem({ domain: square, T: 1, initial: half }); } catch (e) { caught = e; }
    expect(caught).toBeInstanceOf(InvalidArgumentError);
    expect((caught as InvalidArgumentError).field).toBe('initial');
    expect(String(caught)).toMatch(/does not cover the point \(1, 0\) of the domain/);
    const rod = new NodalField({ dim: 1, points: [0, 1], cells: [0, 1], values: [0, 1] });
    expect(() => new HeatProblem({ domain: square, T: 1, initial: rod })).toThrow(/initial: a 1D NodalField for a 2D domain/);
    expect(() => new HeatProblem({ domain: square, T: 1, initial: 3 as unknown as NodalField })).toThrow(/a function \(x, y\) => number or a NodalField/);
    // the field is its values: u0 = x on the rod, interpolated exactly
    const p = new HeatProblem({ domain: intervalDomain(0, 1, 2), T: 1, initial: rod });
    expect(p.initial!(0.3, 0)).toBeCloseTo(0.3, 14);
  });

  it('refuses cells that overlap, naming them (a value there would depend on which cell a point is found in)', () => {
    // The cells of a triangulation meet only in common edges or vertices (common practice). Each
    // broken mesh below must be refused with an InvalidMeshError naming the overlapping cells; the
    // unbroken ones (any orientation, random diagonals) are accepted.
    const mesh = (points: number[], cells: number[]) => () => new NodalField({ dim: 2, points, cells, values: new Array(points.length / 2).fill(0) });
    const refusal = (make: () => unknown): InvalidMeshError => {
      try { make(); } catch (e) { expect(e).toBeInstanceOf(InvalidMeshError); return e as InvalidMeshError; }
      return expect.unreachable('the mesh was accepted') as never;
    };
    for (let seed = 1; seed <= 5; seed++) {
      const { points, cells } = jitteredMesh(6, seed);
      expect(mesh(points, cells)).not.toThrow();
      // a cell repeated (same points, other orientation): same side of every edge it shares
      expect(String(refusal(mesh(points, [...cells, cells[5]!, cells[4]!, cells[3]!])))).toMatch(/cells (\d+, )?1 and 72 (lie on the same side of their common edge|share the edge)/);
      // an interior point dragged across its neighbours (a fold)
      const folded = points.slice();
      const v = 3 * 7 + 3; // point (3, 3) of the 7 × 7 grid of points
      folded[2 * v] = folded[2 * v]! + 0.4;
      folded[2 * v + 1] = folded[2 * v + 1]! + 0.4;
      expect(String(refusal(mesh(folded, cells)))).toMatch(/lie on the same side of their common edge|overlap/);
      // a second copy of the mesh on points of its own, shifted: no common edge at all
      const shifted = points.map((c, i) => c + (i % 2 === 0 ? 0.31 : 0.17));
      const n = points.length / 2;
      const e = refusal(mesh([...points, ...shifted], [...cells, ...cells.map((k) => k + n)]));
      // (the two boundaries cross, which the boundary-crossing check sees first)
      expect(String(e)).toMatch(/triangles overlap: boundary edge \[\d+, \d+\] of cell \d+ crosses boundary edge \[\d+, \d+\] of cell \d+/);
    }
    // a small triangle inside a large one, no points in common
    expect(String(refusal(mesh([0, 0, 1, 0, 0, 1, 0.1, 0.1, 0.2, 0.1, 0.1, 0.2], [0, 1, 2, 3, 4, 5])))).toMatch(/cells 0 and 1 overlap: the centroid/);
    // two triangles without a common edge that overlap at their tips, so little that neither holds
    // the other's centroid: (0,0),(1,0),(0,1) and (0.45,0.45),(1.45,0.45),(0.45,1.45) share the
    // sliver below the line x + y = 1 (area 0.005) while each centroid lies outside the other
    const tips = [0, 0, 1, 0, 0, 1, 0.45, 0.45, 1.45, 0.45, 0.45, 1.45];
    expect(String(refusal(mesh(tips, [0, 1, 2, 3, 4, 5])))).toMatch(/triangles overlap: boundary edge \[\d, \d\] of cell \d crosses boundary edge \[\d, \d\] of cell \d/);
    // two pieces that share only point 0 and overlap in angle there: the unit square (two cells,
    // angles 0°–90° at point 0) and a long thin cell between 80° and 100°. No centroid lies inside
    // another cell ((2/3, 1/3), (1/3, 2/3) and (0, 1.31)) and no edge is shared
    const c80 = 2 * Math.cos((80 * Math.PI) / 180), s80 = 2 * Math.sin((80 * Math.PI) / 180);
    const wedge = [0, 0, 1, 0, 1, 1, 0, 1, c80, s80, -c80, s80];
    expect(String(refusal(mesh(wedge, [0, 1, 2, 0, 2, 3, 0, 4, 5])))).toMatch(/triangles overlap: boundary edge \[\d, \d\] of cell \d crosses boundary edge \[\d, \d\] of cell \d/);
    // a hanging node: point 4 halves the edge [0, 1] of cell 0 but is not its corner, so the field
    // would jump along that edge
    const hanging = [0, 0, 1, 0, 0.5, 1, 0.5, -1, 0.5, 0];
    const h = refusal(mesh(hanging, [0, 1, 2, 0, 3, 4, 4, 3, 1]));
    expect(String(h)).toMatch(/not conforming: point 4 lies inside edge \[0, 1\] of cell 0 \(hanging node\)/);
    expect(h.field).toBe('cells[0..2]');
    // three cells on one edge (a fan folded onto itself)
    expect(String(refusal(mesh([0, 0, 1, 0, 0.5, 1, 0.5, -1, 0.5, 0.5], [0, 1, 2, 1, 0, 3, 0, 1, 4])))).toMatch(/cells 0, 1 and 2 share the edge between points 0 and 1/);
    // in 1D: segments that share more than an end point; touching ones are fine
    expect(() => new NodalField({ dim: 1, points: [0, 1, 0.6, 1.6], cells: [0, 1, 2, 3], values: [0, 0, 0, 0] })).toThrow(/cells 0 and 1 overlap: \[0, 1\] and \[0\.6, 1\.6\]/);
    expect(() => new NodalField({ dim: 1, points: [0, 1, 2], cells: [1, 2, 0, 1], values: [0, 0, 0] })).not.toThrow();
  });
});
