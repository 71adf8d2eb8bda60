/**
 * Continuing a run from a saved state: `solve --out DIR` writes DIR/end-state.json, and a problem
 * file starts from it with "initial": {"state": PATH} (src/problem-file/state-file.ts).
 *
 * Outside reference: the rod held at 1 at x = 0 until t = 0.3 and at 0 after, split into two
 * problem files at the quench, against the superposition of step responses
 * (tests/helpers/step-response.ts, Carslaw & Jaeger §3.4). Round trips of numbers through JSON text
 * are exact because Number.prototype.toString gives the shortest string that reads back to the same
 * double (ECMA-262, Number::toString).
 */
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { solveFile } from '../../src/cli/solve-command';
import { CliError } from '../../src/cli/cli-error';
import { NodalField } from '../../src/index';
import { parseProblem, parseState, stateToJson } from '../../src/problem-file/index';
import { stepResponse } from '../helpers/step-response';

const ROD = { domain: { shape: 'interval', from: 0, to: 1, cells: 2 }, tolerance: 2e-3, maxDofs: 3000 };
const quiet = { log: () => {}, progress: () => {} };

describe('restarting from a saved state', () => {
  it('the quench, split into two problem files at t = 0.3, against the exact solution', () => {
    const dir = mkdtempSync(join(tmpdir(), 'chronomesh-restart-'));
    writeFileSync(join(dir, 'held.json'), JSON.stringify({ ...ROD, horizon: 0.3, boundary: [{ kind: 'value', where: 'x < 0.5', value: '1' }] }));
    writeFileSync(join(dir, 'quenched.json'), JSON.stringify({ ...ROD, horizon: 0.2, initial: { state: 'out/end-state.json' }, probes: [[0.05, 0.1], [0.05, 0.5], [0.15, 0.2]] }));
    const lines: string[] = [];
    solveFile(join(dir, 'held.json'), { log: (l) => lines.push(l), progress: () => {}, out: join(dir, 'out') });
    expect(lines.at(-1)).toBe(`to continue from the end state: "start": 0.3, "initial": {"state": ${JSON.stringify(join(dir, 'out', 'end-state.json'))}}`);
    const saved = JSON.parse(readFileSync(join(dir, 'out', 'end-state.json'), 'utf8')) as { format: string; time: number; points: number[]; values: number[] };
    expect(saved.format).toBe('chronomesh-state');
    expect(saved.time).toBe(0.3);
    // the saved state is the run's end state: held at 1 at x = 0, and S(0.3, x) inside
    const state = parseState(saved, 'state', 1);
    expect(state.valueAt(0)).toBe(1);
    for (const x of [0.1, 0.5]) expect(Math.abs(state.valueAt(x) - stepResponse(0.3, x))).toBeLessThan(5e-3);
    const { run } = solveFile(join(dir, 'quenched.json'), quiet);
    // measured: 0.141540 against 0.14195, 0.365513 against 0.36603, 0.0816702 against 0.08155
    for (const p of run.probes) {
      const t = 0.3 + p.t;
      expect(Math.abs(p.value - (stepResponse(t, p.x) - stepResponse(t - 0.3, p.x)))).toBeLessThan(5e-3);
    }
  });

  it('a state that does not cover the domain, or of the wrong dimension, is refused before any step', () => {
    const dir = mkdtempSync(join(tmpdir(), 'chronomesh-restart-'));
    const small = new NodalField({ dim: 2, points: [0, 0, 0.5, 0, 0.5, 0.5, 0, 0.5], cells: [0, 1, 2, 0, 2, 3], values: [1, 1, 1, 1] });
    writeFileSync(join(dir, 'small.json'), stateToJson(small, 0));
    const square = { domain: { shape: 'rectangle', from: [0, 0], to: [1, 1], cells: [2, 2] }, horizon: 0.1, maxDofs: 500 };
    const progress: string[] = [];
    let caught: unknown = null;
    writeFileSync(join(dir, 'p.json'), JSON.stringify({ ...square, initial: { state: 'small.json' } }));
    try { solveFile(join(dir, 'p.json'), { log: () => {}, progress: (l) => progress.push(l) }); } catch (e) { caught = e; }
    expect(caught).toBeInstanceOf(CliError);
    expect((caught as Error).message).toMatch(/initial\.state: the state in "small\.json" does not cover the point \(1, 0\) of the domain/);
    expect(progress).toHaveLength(0);
    writeFileSync(join(dir, 'q.json'), JSON.stringify({ ...ROD, horizon: 0.1, initial: { state: 'small.json' } }));
    expect(() => solveFile(join(dir, 'q.json'), quiet)).toThrow(/initial\.state\.points: holds 2D points \(\[x, y\]\), but the problem is 1D/);
    writeFileSync(join(dir, 'r.json'), JSON.stringify({ ...square, initial: { state: 'missing.json' } }));
    expect(() => solveFile(join(dir, 'r.json'), quiet)).toThrow(/initial\.state: cannot read "missing\.json" \(ENOENT\)/);
  });

  it('state files: exact round trip, and every malformed field named', () => {
    const field = new NodalField({ dim: 2, points: [0, 0, 1 / 3, 0, 0.1, Math.PI / 7], cells: [0, 1, 2], values: [1e-300, -2 / 3, 12345.678901234567] });
    const back = parseState(JSON.parse(stateToJson(field, 0.25, 'plate')), 'state', 2);
    expect(Array.from(back.points)).toEqual(Array.from(field.points));
    expect(Array.from(back.values)).toEqual(Array.from(field.values));
    expect(Array.from(back.cells)).toEqual([0, 1, 2]);
    const ok = { points: [[0, 0], [1, 0], [0, 1]], cells: [[0, 1, 2]], values: [0, 1, 2] };
    const cases: [object, RegExp][] = [
      [{ ...ok, points: [[0, 0], [1, 'a'], [0, 1]] }, /state\.points\[1\]\[1\]: must be a finite number/],
      [{ ...ok, cells: [[0, 1, 3]] }, /state\.cells\[0\]\[2\]: must be a point index in \[0, 2\], found number 3/],
      [{ ...ok, cells: [[0, 1]] }, /state\.cells\[0\]: must be 3 point indices/],
      [{ ...ok, values: [0, 1] }, /state\.values: has 2 values for 3 points/],
      [{ ...ok, values: [0, null, 2] }, /state\.values\[1\]: must be a finite number, found null/],
      [{ ...ok, format: 'other' }, /state\.format: must be "chronomesh-state"/],
      [{ ...ok, version: 2 }, /state\.version: must be 1/],
      [{ ...ok, colour: 1 }, /state\.colour: unknown field/],
      [{ ...ok, cells: [[0, 1, 1]] }, /state\.cells: cell 0 has zero area/],
      [{ ...ok, cells: [[0, 1, 2], [2, 1, 0]] }, /state\.cells: cells 0 and 1 lie on the same side of their common edge/],
      [{ ...ok, points: [] }, /state\.points: must be a non-empty list/],
    ];
    for (const [json, message] of cases) expect(() => parseState(json, 'state', 2)).toThrow(message);
  });

  it('parseProblem: an inline state works without files; a path needs a reader', () => {
    const inline = { points: [0, 1], cells: [[0, 1]], values: [2, 4] };
    const spec = parseProblem({ ...ROD, horizon: 1, initial: { state: inline } });
    expect(spec.initialState?.pointCount).toBe(2);
    expect(spec.initial.fn(0, 0.25, 0)).toBe(2.5);
    expect(() => parseProblem({ ...ROD, horizon: 1, initial: { state: 'end.json' } })).toThrow(/initial\.state: names the file "end\.json", but no file reader was given/);
    expect(() => parseProblem({ ...ROD, horizon: 1, initial: { state: 'end.json' } }, { readText: () => '{ nope' })).toThrow(/initial\.state: "end\.json" is not valid JSON/);
    expect(() => parseProblem({ ...ROD, horizon: 1, initial: { stat: inline } })).toThrow(/initial\.stat: unknown field; did you mean 'state'\?/);
  });
});

describe('problem files that start at a later time ("start")', () => {
  it('shift every expression in t, the probes and the outputs: a manufactured solution from t = 0.2 to 0.5', () => {
    // u = (1 + t²) sin πx solves ∂t u − ∂xx u = (2t + π²(1 + t²)) sin πx, written out by hand.
    const dir = mkdtempSync(join(tmpdir(), 'chronomesh-start-'));
    writeFileSync(join(dir, 'p.json'), JSON.stringify({
      domain: ROD.domain, start: 0.2, horizon: 0.5, maxDofs: 1500,
      initial: '(1 + 0.04)*sin(pi*x)', source: '(2*t + pi^2*(1 + t^2))*sin(pi*x)', exact: '(1 + t^2)*sin(pi*x)',
      probes: [[0.2, 0.5], [0.35, 0.3], [0.5, 0.5]], slices: [0.2, 0.5],
    }));
    // the exact solution is checked before the run against the equation and u(start) = initial:
    // both fail unless the source and the exact solution are read at t = start + (solver's time)
    const { run } = solveFile(join(dir, 'p.json'), { ...quiet, out: join(dir, 'out') });
    for (const p of run.probes) expect(Math.abs(p.value - (1 + p.t * p.t) * Math.sin(Math.PI * p.x))).toBeLessThan(2e-3 * (1 + p.t * p.t));
    expect(run.exactErrors!.ratioRange[1]).toBeLessThan(3);
    const vtu = readFileSync(join(dir, 'out', 'slice-0001.vtu'), 'utf8');
    expect(vtu).toMatch(/Name="TimeValue" NumberOfTuples="1" format="ascii">0\.5</);
    expect((JSON.parse(readFileSync(join(dir, 'out', 'end-state.json'), 'utf8')) as { time: number }).time).toBe(0.5);
    // without the shift the same file is refused: u(0.2) ≠ initial read at t = 0
    writeFileSync(join(dir, 'q.json'), JSON.stringify({ ...JSON.parse(readFileSync(join(dir, 'p.json'), 'utf8')), start: undefined, horizon: 0.3, probes: [], slices: [] }));
    expect(() => solveFile(join(dir, 'q.json'), quiet)).toThrow(/exact: .* does not satisfy the initial state \(u\(0, ·\) = initial\)/);
  });

  it('a run split in two with time-dependent held values agrees with the run in one piece', () => {
    const dir = mkdtempSync(join(tmpdir(), 'chronomesh-start-'));
    const boundary = [{ kind: 'value', where: 'x < 0.5', value: '1 - exp(-10*t)' }];
    const probes = [[0.4, 0.1], [0.4, 0.5], [0.5, 0.3]];
    writeFileSync(join(dir, 'whole.json'), JSON.stringify({ ...ROD, horizon: 0.5, boundary, probes }));
    writeFileSync(join(dir, 'a.json'), JSON.stringify({ ...ROD, horizon: 0.3, boundary }));
    writeFileSync(join(dir, 'b.json'), JSON.stringify({ ...ROD, start: 0.3, horizon: 0.5, boundary, initial: { state: 'a/end-state.json' }, probes }));
    const whole = solveFile(join(dir, 'whole.json'), quiet).run;
    solveFile(join(dir, 'a.json'), { ...quiet, out: join(dir, 'a') });
    const split = solveFile(join(dir, 'b.json'), quiet).run;
    // A consistency check (the manufactured test above is the outside reference). Measured: all three
    // runs reach the tolerance (E = 1.8e-3 to 1.9e-3), the probes differ by 3.0e-4 to 4.4e-4.
    split.probes.forEach((p, i) => {
      expect(p.t).toBe(probes[i]![0]);
      expect(Math.abs(p.value - whole.probes[i]!.value)).toBeLessThan(3e-3);
    });
  });

  it('start must be ≥ 0 and below the horizon; probes and slices lie in [start, horizon]', () => {
    const base = { ...ROD, start: 0.3, horizon: 0.5 };
    expect(() => parseProblem({ ...base, horizon: 0.3 })).toThrow(/horizon: must be > start = 0\.3/);
    expect(() => parseProblem({ ...base, start: -1 })).toThrow(/start: must be ≥ 0/);
    expect(() => parseProblem({ ...base, probes: [[0.1, 0.5]] })).toThrow(/probes\[0\]\[0\] \(t\): must be in \[start = 0\.3, horizon = 0\.5\]/);
    expect(() => parseProblem({ ...base, slices: [0.6] })).toThrow(/slices\[0\]: must be in \[start = 0\.3, horizon = 0\.5\]/);
    // a held value that jumps is refused at the file's time (the core reports the solver's, 0.1)
    const dir = mkdtempSync(join(tmpdir(), 'chronomesh-start-'));
    writeFileSync(join(dir, 'jump.json'), JSON.stringify({ ...base, horizon: 0.6, boundary: [{ kind: 'value', where: 'x < 0.5', value: 't < 0.4 ? 1 : 0' }] }));
    expect(() => solveFile(join(dir, 'jump.json'), quiet)).toThrow(/boundary\[0\]\.value jumps from 1 to 0 at t ≈ 0\.4 /);
  });
});
