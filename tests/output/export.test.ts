/** Export formats: VTK XML slices and collections, CSV probe tables, SVG plots, spatial integrals. */
import { describe, expect, it } from 'vitest';
import {
  DoubleTree, HeatProblem, InvalidArgumentError, SpaceTimeSystem, convergencePlotSvg, probeTableCsv, rectangleDomain,
  sliceToVtu, spatialIntegral, regionIntegral, vtkCollection,
} from '../../src/index';

// u = 1 + t solves the insulated problem with reaction c and source 1 + c(1 + t) exactly (see exactness.test.ts).
const c = 1.5;
const domain = rectangleDomain(0, 2, 0, 1, 2, 1, { insulated: () => true, reaction: c });
const { solution } = new SpaceTimeSystem(
  new HeatProblem({ domain, T: 1, initial: () => 1, source: (t) => 1 + c * (1 + t) }),
  DoubleTree.sparseGrid(domain, 3),
).solve({ relTol: 1e-12 });

describe('exports', () => {
  it('spatial integral equals area × (1 + t) for the exactly reproduced solution', () => {
    for (const t of [0, 0.25, 1]) expect(spatialIntegral(solution, t)).toBeCloseTo(2 * (1 + t), 8);
  });

  it('region integrals: the left half and the top-right quarter hold their share of u = 1 + t', () => {
    for (const t of [0, 0.6]) {
      expect(regionIntegral(solution, t, (x) => x < 1)).toBeCloseTo(1 + t, 8);
      expect(regionIntegral(solution, t, (x, y) => x > 1 && y > 0.5)).toBeCloseTo(0.5 * (1 + t), 8);
    }
    expect(() => regionIntegral(solution, 0, 3 as never)).toThrow(/predicate/);
    // a predicate that answers NaN or nothing is a mistake, not "outside"; numbers count as truth
    expect(() => regionIntegral(solution, 0, (() => NaN) as never)).toThrow(/^inside\([\d.]+, [\d.]+\) returned NaN; expected true or false$/);
    expect(() => regionIntegral(solution, 0, (() => undefined) as never)).toThrow(/returned undefined/);
    expect(regionIntegral(solution, 0.5, ((x: number) => (x < 1 ? 1 : 0)) as never)).toBeCloseTo(regionIntegral(solution, 0.5, (x) => x < 1), 12);
  });

  it('VTK XML slice has consistent counts and one value per point', () => {
    const slice = solution.slice(0.5);
    const xml = sliceToVtu(slice, 'temperature');
    const n = Number(/NumberOfPoints="(\d+)"/.exec(xml)![1]);
    const m = Number(/NumberOfCells="(\d+)"/.exec(xml)![1]);
    expect(n).toBe(slice.mesh.vertexCount);
    expect(m).toBe(slice.mesh.elementCount);
    const field = /Name="temperature" format="ascii">([^<]*)</.exec(xml)![1]!.trim().split(/\s+/).map(Number);
    expect(field.length).toBe(n);
    for (const v of field) expect(v).toBeCloseTo(1.5, 8);
    const conn = /Name="connectivity" format="ascii">([^<]*)</.exec(xml)![1]!.trim().split(/\s+/).map(Number);
    expect(conn.length).toBe(3 * m);
    expect(Math.max(...conn)).toBeLessThan(n);
    const types = /Name="types" format="ascii">([^<]*)</.exec(xml)![1]!.trim().split(/\s+/);
    expect(new Set(types)).toEqual(new Set(['5'])); // VTK_TRIANGLE in the VTK file-format specification
  });

  it('collection lists files by time', () => {
    const pvd = vtkCollection([{ t: 0, file: 'a.vtu' }, { t: 0.5, file: 'b&c.vtu' }]);
    expect(pvd).toContain('timestep="0.5"');
    expect(pvd).toContain('file="b&amp;c.vtu"');
  });

  it('probe table has a header and one row per time', () => {
    const csv = probeTableCsv(solution, [0, 0.5, 1], [[0.5, 0.5], [1.5, 0.2]]);
    const rows = csv.trim().split('\n').map((r) => r.split(','));
    expect(rows[0]).toEqual(['t', 'integral', 'u(0.5 0.5)', 'u(1.5 0.2)']);
    expect(rows.length).toBe(4);
    expect(Number(rows[2]![2])).toBeCloseTo(1.5, 8);
    expect(() => probeTableCsv(solution, [0], [[0.5]])).toThrow(InvalidArgumentError);
  });

  it('SVG plot contains one polyline per series and rejects non-positive values', () => {
    const svg = convergencePlotSvg([
      { label: 'a', points: [[10, 1], [100, 0.1]] },
      { label: 'b', points: [[10, 2], [100, 0.5]] },
    ], { referenceSlopes: [-1] });
    expect(svg.match(/<polyline/g)!.length).toBe(2);
    expect(svg.startsWith('<svg')).toBe(true);
    expect(() => convergencePlotSvg([{ label: 'a', points: [[10, 0]] }])).toThrow(/finite positive/);
  });
});
