/**
 * Slice and index-set pictures: structure of the SVG (axes, ticks, colour bar, labels), escaping,
 * colour-map choice, range from data, and linear colour interpolation inside triangles.
 */
import { describe, expect, it } from 'vitest';
import {
  DoubleTree, HeatProblem, SpaceTimeSystem, indexSetToSvg, intervalDomain, lShapeDomain, rectangleDomain, sliceToSvg,
  type TimeSlice,
} from '../../src/index';
import { colorAt, chooseColorMap } from '../../src/output/colormap';
import { niceTicks } from '../../src/output/svg-common';

const square = rectangleDomain(0, 1, 0, 1, 1, 1);
/** A slice with prescribed nodal values on the two-triangle unit square. */
function squareSlice(values: number[]): TimeSlice {
  const mesh = square.leafMesh(square.initialFreeVertices());
  const v = new Float64Array(mesh.vertexCount);
  for (let i = 0; i < mesh.vertexCount; i++) v[i] = values[i] ?? 0;
  return { t: 0, mesh, values: v };
}

function count(svg: string, re: RegExp): number {
  return (svg.match(re) ?? []).length;
}

describe('slice pictures', () => {
  const dom = lShapeDomain(1);
  const { solution } = new SpaceTimeSystem(new HeatProblem({ domain: dom, T: 1, initial: () => 1 }), DoubleTree.sparseGrid(dom, 4)).solve();
  const svg = sliceToSvg(solution.slice(0.05), { title: 'Bracket & edges <cold> "t = 0.05"', quantity: 'temperature [K]' });

  it('has axes with ticks and coordinate labels, a colour bar with ticks and the quantity name', () => {
    expect(svg).toContain('<g class="axes"');
    expect(count(svg, /class="tick x-tick"/g)).toBeGreaterThanOrEqual(3);
    expect(count(svg, /class="tick y-tick"/g)).toBeGreaterThanOrEqual(3);
    expect(svg).toMatch(/class="tick-label x-tick-label"[^>]*>-0\.5</);
    expect(svg).toMatch(/class="axis-label x-label"[^>]*>x</);
    expect(svg).toMatch(/class="axis-label y-label"[^>]*>y</);
    expect(svg).toContain('<g class="colorbar">');
    expect(count(svg, /class="tick colorbar-tick"/g)).toBeGreaterThanOrEqual(3);
    expect(svg).toMatch(/class="colorbar-label"[^>]*>temperature \[K\]</);
  });

  it('escapes all text', () => {
    expect(svg).toContain('Bracket &amp; edges &lt;cold&gt; &quot;t = 0.05&quot;');
    expect(svg).not.toMatch(/<cold>/);
  });

  it('takes the range from the data and uses the sequential map for one-signed data', () => {
    const s = solution.slice(0.05);
    const max = Math.max(...s.values);
    const ticks = [...svg.matchAll(/class="tick-label colorbar-tick-label"[^>]*>([^<]*)</g)].map((m) => Number(m[1]));
    expect(Math.max(...ticks)).toBeLessThanOrEqual(max + 1e-12);
    expect(Math.max(...ticks)).toBeGreaterThan(0.5 * max);
    expect(svg).toContain('stop-color="rgb(68,1,84)"'); // viridis starts at #440154 (published map)
  });

  it('uses a diverging map, symmetric about 0, for signed data and reports values beyond a given range', () => {
    const signed = squareSlice([-1, 0.5, 2, -0.3]);
    expect(chooseColorMap(-1, 2)).toBe('diverging');
    expect(chooseColorMap(-0.001, 1)).toBe('sequential'); // a small undershoot stays sequential
    const d = sliceToSvg(signed);
    expect(d).toContain('stop-color="rgb(59,76,192)"'); // cool end of the cool-to-warm map
    const ticks = [...d.matchAll(/colorbar-tick-label"[^>]*>([^<]*)</g)].map((m) => Number(m[1]));
    expect(Math.min(...ticks)).toBeLessThan(-1); // symmetric range [-2, 2]
    const clamped = sliceToSvg(squareSlice([0, 0.5, 1.27, 0.2]), { range: [0, 1] });
    expect(clamped).toMatch(/class="range-note"[^>]*>data 0\.00 … 1\.27 exceed the range</);
  });

  it('draws given curves over the field (the curves of concentrated sources), where they are, and checks them', () => {
    // the plot frame maps the square's corners to the field's extreme polygon coordinates
    const s = sliceToSvg(squareSlice([0, 1, 0, 1]), { lines: [[[0, 0], [1, 1]], [[0.25, 0.75], [0.75, 0.75], [0.75, 0.25]]] });
    const polys = [...s.matchAll(/<polygon points="([^"]*)"/g)].flatMap((m) => m[1]!.split(' ').map((q) => q.split(',').map(Number)));
    const X = (x: number) => Math.min(...polys.map((p) => p[0]!)) + x * (Math.max(...polys.map((p) => p[0]!)) - Math.min(...polys.map((p) => p[0]!)));
    const Y = (y: number) => Math.max(...polys.map((p) => p[1]!)) - y * (Math.max(...polys.map((p) => p[1]!)) - Math.min(...polys.map((p) => p[1]!)));
    const lines = [...s.matchAll(/<g class="lines"[\s\S]*?<\/g>/g)][0]![0];
    const drawn = [...lines.matchAll(/<polyline points="([^"]*)"/g)].map((m) => m[1]!.split(' ').map((q) => q.split(',').map(Number)));
    expect(drawn).toHaveLength(4); // a dark edge and a dashed light line per curve
    const expected = [[[0, 0], [1, 1]], [[0.25, 0.75], [0.75, 0.75], [0.75, 0.25]]];
    expected.forEach((curve, i) => curve.forEach(([x, y], k) => {
      expect(Math.abs(drawn[2 * i]![k]![0]! - X(x!))).toBeLessThan(0.02);
      expect(Math.abs(drawn[2 * i]![k]![1]! - Y(y!))).toBeLessThan(0.02);
    }));
    expect(s.indexOf('class="lines"')).toBeGreaterThan(s.indexOf('class="field"')); // drawn over the field
    // in 1D, a point is a vertical marker
    const rod = intervalDomain(0, 1, 2);
    const { solution } = new SpaceTimeSystem(new HeatProblem({ domain: rod, T: 1, initial: () => 1 }), DoubleTree.sparseGrid(rod, 3)).solve();
    expect(count(sliceToSvg(solution.slice(0.1), { lines: [[[0.3]]] }), /class="line-marker"/g)).toBe(1);
    expect(() => sliceToSvg(squareSlice([0, 0, 0, 0]), { lines: [[[0.5]]] })).toThrow(/opts\.lines\[0\]\[0\]/);
    expect(() => sliceToSvg(squareSlice([0, 0, 0, 0]), { lines: [[]] })).toThrow(/opts\.lines\[0\] must be a non-empty array of points/);
  });

  it('interpolates colours linearly inside triangles: a linear field is split into sub-triangles whose colours follow it', () => {
    // u = x on the unit square (vertices (0,0), (1,0), (0,1), (1,1)).
    const mesh = square.leafMesh(square.initialFreeVertices());
    const vals = Array.from({ length: mesh.vertexCount }, (_, i) => mesh.coords[2 * i]!);
    const s = sliceToSvg(squareSlice(vals), { colorMap: 'sequential' });
    const polys = [...s.matchAll(/<polygon points="([^"]*)" fill="(#[0-9a-f]{6})"/g)];
    expect(polys.length).toBeGreaterThan(2 * 16); // much more than one flat colour per triangle
    // Each sub-triangle's colour is the map's colour at its centroid's x (u = x is exact there).
    const xs = polys.map((p) => p[1]!.split(' ').map((q) => Number(q.split(',')[0])));
    const left = Math.min(...xs.flat()), right = Math.max(...xs.flat());
    for (let k = 0; k < polys.length; k += 7) {
      const cx = (xs[k]!.reduce((a, b) => a + b) / 3 - left) / (right - left);
      // Same colour up to rounding of the written coordinates (±2 per channel).
      const got = polys[k]![2]!, want = colorAt('sequential', cx);
      for (const o of [1, 3, 5]) expect(Math.abs(parseInt(got.slice(o, o + 2), 16) - parseInt(want.slice(o, o + 2), 16))).toBeLessThanOrEqual(2);
    }
  });

  it('1D slices have axes, ticks and labels', () => {
    const d1 = intervalDomain(0, 2, 2);
    const { solution: s1 } = new SpaceTimeSystem(new HeatProblem({ domain: d1, T: 1, initial: () => 1 }), DoubleTree.sparseGrid(d1, 5)).solve();
    const p = sliceToSvg(s1.slice(0.1), { title: 'rod', quantity: 'u' });
    expect(p).toContain('<g class="axes"');
    expect(p).toContain('class="graph"');
    expect(count(p, /class="tick x-tick"/g)).toBeGreaterThanOrEqual(3);
    expect(p).toMatch(/x-tick-label"[^>]*>2(\.0)?</);
    expect(p).toMatch(/class="axis-label y-label"[^>]*>u</);
  });

  it('nice ticks step by 1, 2 or 5 × 10^k (common practice) and stay inside the range', () => {
    const u = niceTicks(0, 1, 5);
    expect(u.length).toBe(6);
    u.forEach((v, i) => expect(v).toBeCloseTo(0.2 * i, 12));
    expect(niceTicks(-1, 1, 4)).toEqual([-1, -0.5, 0, 0.5, 1]);
    const t = niceTicks(0.013, 0.987, 5);
    expect(t[0]).toBeGreaterThanOrEqual(0.013);
    expect(t[t.length - 1]).toBeLessThanOrEqual(0.987);
  });
});

describe('index-set pictures', () => {
  it('1D: one support rectangle per unknown in the (t, x) plane, log-time axis in decades', () => {
    const d = intervalDomain(0, 1, 2);
    const set = DoubleTree.sparseGrid(d, 4);
    const svg = indexSetToSvg(d, set, 1, { logTime: true, title: 'sparse grid' });
    const supports = svg.slice(svg.indexOf('<g class="supports"'), svg.indexOf('</g>', svg.indexOf('<g class="supports"')));
    expect(count(supports, /<rect x=/g)).toBe(set.size);
    expect(svg).toMatch(/axis-label x-label"[^>]*>t \(logarithmic\)</);
    expect(svg).toMatch(/x-tick-label"[^>]*>1e-1</);
    expect(svg).toContain(`${set.size} unknowns`);
  });

  it('2D: unknowns per temporal level and spatial generation sum to #Λ; meshes at the chosen times', () => {
    const d = lShapeDomain(1);
    const set = DoubleTree.sparseGrid(d, 3);
    const svg = indexSetToSvg(d, set, 2, { times: [0.5, 2] });
    const bars = (cls: string) => {
      const part = svg.slice(svg.indexOf(`panel ${cls}`));
      return [...part.slice(0, part.indexOf('</g>')).matchAll(/<title>\d+: (\d+)<\/title>/g)].reduce((a, m) => a + Number(m[1]), 0);
    };
    expect(bars('temporal-levels')).toBe(set.size);
    expect(bars('spatial-levels')).toBe(set.size);
    expect(count(svg, /class="panel mesh-at-time"/g)).toBe(2);
    expect(svg).toMatch(/mesh at t = 0\.5 \(\d+ triangles\)/);
    expect(() => indexSetToSvg(d, set, 2, { times: [3] })).toThrow(/outside/);
  });

  it('a set whose clock starts later (a continued run) is labelled in absolute times', () => {
    const d2 = lShapeDomain(1);
    expect(indexSetToSvg(d2, DoubleTree.sparseGrid(d2, 3), 2, { times: [0.5, 2], start: 10 })).toMatch(/mesh at t = 10\.5 \(\d+ triangles\)[\s\S]*mesh at t = 12 \(/);
    const d1 = intervalDomain(0, 1, 2);
    const set = DoubleTree.sparseGrid(d1, 4);
    expect(indexSetToSvg(d1, set, 1, { logTime: true, start: 3 })).toMatch(/axis-label x-label"[^>]*>t − 3 \(logarithmic\)</);
    const linear = indexSetToSvg(d1, set, 1, { start: 3 });
    const labels = [...linear.matchAll(/x-tick-label"[^>]*>([^<]*)</g)].map((m) => Number(m[1]));
    expect(Math.min(...labels)).toBe(3);
    expect(Math.max(...labels)).toBe(4);
    expect(() => indexSetToSvg(d1, set, 1, { start: NaN })).toThrow(/opts\.start = NaN must be a finite number/);
  });
});
