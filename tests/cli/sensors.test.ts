/**
 * Sensor histories of problem files (`"sensors": {"points", "times"}`): parsed and checked before
 * any work, read with SpaceTimeSolution.sampleAtPoints, written to sensors.csv and --json.
 *
 * Outside references: u0 ≡ 1 on (0, 1) with u = 0 at both ends has the Fourier-series /
 * method-of-images solution of Carslaw & Jaeger, Conduction of Heat in Solids, 2nd ed., 1959, §3.3
 * (tests/helpers/heat-exact.ts); and the readings equal the library's independent point evaluation
 * (`evaluate`) at the same absolute times.
 */
import { mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { buildProblem, parseProblem, runProblem } from '../../src/problem-file/index';
import { solveFile } from '../../src/cli/solve-command';
import { writeFileSync } from 'node:fs';
import { heatExact1D } from '../helpers/heat-exact';

const ROD = { domain: { shape: 'interval', from: 0, to: 1, cells: 2 }, horizon: 0.5, initial: '1', maxDofs: 2000 };

describe('problem-file sensors', () => {
  it('n times are spread evenly over [start, horizon], both ends included; listed times are kept', () => {
    const s = parseProblem({ ...ROD, start: 2, horizon: 3, sensors: { points: [[0.5]], times: 5 } }).sensors!;
    expect(s.times).toEqual([2, 2.25, 2.5, 2.75, 3]);
    expect(parseProblem({ ...ROD, sensors: { points: [[0.5]] } }).sensors!.times).toHaveLength(101);
    expect(parseProblem({ ...ROD, sensors: { points: [[0.5]], times: [0.1, 0.4] } }).sensors!.times).toEqual([0.1, 0.4]);
    expect(parseProblem(ROD).sensors).toBeNull();
  });

  it('bad sensors are named before any work', () => {
    const cases: [unknown, RegExp][] = [
      [{ points: [[0.5]], time: 5 }, /sensors\.time: unknown field; did you mean 'times'\?/],
      [{ points: [] }, /sensors\.points: must be a non-empty list of \[x\]/],
      [{ points: [[0.5, 0.5]] }, /sensors\.points\[0\]: must be \[x\]/],
      [{ points: [[0.5], ['a']] }, /sensors\.points\[1\]\[0\]: must be a number/],
      [{ points: [[0.5]], times: 1 }, /sensors\.times: must be \(an integer in \[2, 1000000\]\)/],
      [{ points: [[0.5]], times: [0.1, 0.7] }, /sensors\.times\[1\]: must be in \[0, horizon = 0\.5\]/],
      [{ points: [[0.5]], times: 'all' }, /sensors\.times: must be a count of evenly spaced times/],
      [[1, 2], /sensors: must be an object/],
    ];
    for (const [sensors, message] of cases) expect(() => parseProblem({ ...ROD, sensors })).toThrow(message);
    expect(() => buildProblem(parseProblem({ ...ROD, sensors: { points: [[0.5], [1.2]] } }))).toThrow(/sensors\.points\[1\]: the point \(1\.2\) lies outside the domain/);
  });

  it('readings equal point evaluation and the series solution; sensors.csv and --json carry them', () => {
    const spec = parseProblem({ ...ROD, sensors: { points: [[0.1], [0.5], [1]], times: 6 } });
    const run = runProblem(buildProblem(spec));
    const s = run.sensors!;
    const exact = heatExact1D();
    s.times.forEach((t, k) => {
      const e = run.solution.evaluate(t, [0.1, 0.5, 1]);
      s.points.forEach((p, i) => {
        expect(Math.abs(s.values[k]![i]! - e[i]!)).toBeLessThan(1e-12);
        // against Carslaw & Jaeger §3.3 (away from t = 0, where u0 jumps against the boundary values)
        if (t >= 0.1) expect(Math.abs(s.values[k]![i]! - exact.value(t, p[0]!))).toBeLessThan(3e-3);
      });
    });
    expect(s.values.map((r) => r[2])).toEqual([0, 0, 0, 0, 0, 0]); // held at 0 at x = 1
    const dir = mkdtempSync(join(tmpdir(), 'chronomesh-sensors-'));
    const file = join(dir, 'rod.json');
    writeFileSync(file, JSON.stringify({ ...ROD, sensors: { points: [[0.1], [0.5]], times: [0.2, 0.5] } }));
    const lines: string[] = [];
    solveFile(file, { log: (l) => lines.push(l), progress: () => {}, out: join(dir, 'out') });
    expect(lines.join('\n')).toMatch(/sensor histories: 2 sensors at 2 times \(sensors\.csv with --out\); at t = 0\.5: u\(0\.1\) = [\d.e-]+, u\(0\.5\) = [\d.e-]+/);
    const csv = readFileSync(join(dir, 'out', 'sensors.csv'), 'utf8').trim().split('\n');
    expect(csv[0]).toBe('t,u(0.1),u(0.5)');
    expect(csv).toHaveLength(3);
    expect(Number(csv[1]!.split(',')[0])).toBe(0.2);
    const json: string[] = [];
    solveFile(file, { log: (l) => json.push(l), progress: () => {}, json: true });
    const doc = JSON.parse(json.join('')) as { sensors: { times: number[]; points: number[][]; values: number[][] } };
    expect(doc.sensors.times).toEqual([0.2, 0.5]);
    expect(doc.sensors.values[1]![1]).toBeCloseTo(Number(csv[2]!.split(',')[2]), 15);
  });
});
