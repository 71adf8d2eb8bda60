/**
 * `curveSources` in problem files: parsed and checked before any work, shifted with `start`, and
 * solved. Outside reference: the rod's point-source solution (tests/helpers/point-source.ts:
 * eigenfunction series and images), switched off after a quarter of the run by superposition
 * (u(t) = U(t) − U(t − τ) for a source switched off at τ; linearity, common practice).
 */
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { buildProblem, parseProblem, runProblem } from '../../src/problem-file/index';
import { solveFile } from '../../src/cli/solve-command';
import { rod } from '../helpers/point-source';

const ROD = { domain: { shape: 'interval', from: 0, to: 1, cells: 2 }, horizon: 0.5, maxDofs: 3000 };
const SQUARE = { domain: { shape: 'rectangle', from: [0, 0], to: [1, 1], cells: [2, 2] }, horizon: 0.5, maxDofs: 500 };

describe('problem-file curveSources', () => {
  it('a point source switched off at t = 1.25 in a run over [1, 1.5]: probes against the closed form', () => {
    const spec = parseProblem({
      ...ROD, start: 1, horizon: 1.5,
      curveSources: [{ curve: [[0.25]], time: 't < 1.25 ? 1 : 0' }],
      probes: [[1.2, 0.25], [1.2, 0.6], [1.5, 0.25], [1.5, 0.7]],
    });
    const run = runProblem(buildProblem(spec));
    const peak = rod(0.5, 0.25, 0.25)[0];
    const exact = (t: number, x: number) => rod(t, x, 0.25)[0] - (t > 0.25 ? rod(t - 0.25, x, 0.25)[0] : 0);
    expect(run.probes).toHaveLength(4);
    for (const { t, x, value } of run.probes) expect(Math.abs(value - exact(t - 1, x)), `(${t}, ${x})`).toBeLessThan(3e-3 * peak);
  });

  it('the slice pictures written with --out show the curves', () => {
    const dir = mkdtempSync(join(tmpdir(), 'chronomesh-curves-'));
    const file = join(dir, 'cable.json');
    writeFileSync(file, JSON.stringify({ ...SQUARE, curveSources: [{ curve: [[0.2, 0.3], [0.8, 0.3], [0.8, 0.7]] }], slices: [0.25] }));
    solveFile(file, { quiet: true, log: () => {}, progress: () => {}, out: join(dir, 'out') });
    const svg = readFileSync(join(dir, 'out', 'slice-0000.svg'), 'utf8');
    expect((svg.match(/<g class="lines"[\s\S]*?<\/g>/)?.[0].match(/<polyline points="[^"]*"/g) ?? []).map((p) => p.slice(p.indexOf('"') + 1, -1).split(' ').length)).toEqual([3, 3]); // 3 points, edge and dashes
  });

  it('bad curve sources are named before any work', () => {
    const cases: [unknown, RegExp][] = [
      [[{ curve: [[0.5, 0.5]] }], /curveSources\[0\]\.curve\[0\]: must be \[x\]/],
      [[{ curve: [] }], /curveSources\[0\]\.curve: is required: \[\[x\]\] \(one point\)/],
      [[{ curve: [[0.5]], power: '2' }], /curveSources\[0\]\.power: unknown field/],
      [[{ curve: [[0.5]], time: 't +' }], /curveSources\[0\]\.time/],
      ['cable', /curveSources: must be a list/],
    ];
    for (const [curveSources, message] of cases) expect(() => parseProblem({ ...ROD, curveSources })).toThrow(message);
    // in 1D the density is an expression in x alone
    expect(() => parseProblem({ ...ROD, curveSources: [{ curve: [[0.5]], density: 'x' }] })).not.toThrow();
    expect(() => parseProblem({ ...ROD, curveSources: [{ curve: [[0.5]], density: 'x + y' }] })).toThrow(/curveSources\[0\]\.density/);
    // geometry is checked with the domain, before the run
    expect(() => buildProblem(parseProblem({ ...ROD, curveSources: [{ curve: [[1.5]] }] }))).toThrow(/curveSources\[0\]\.curve\[0\] = \[1\.5\] lies outside the domain/);
    expect(() => buildProblem(parseProblem({ ...SQUARE, curveSources: [{ curve: [[0.2, 0.2], [0.2, 1.4]] }] }))).toThrow(/segment 0 of curveSources\[0\]\.curve, from .* leaves the domain \(33\.3 % of it lies outside\)/);
    expect(() => buildProblem(parseProblem({ ...SQUARE, curveSources: [{ curve: [[0.2, 0.2], [0.6, 0.6]], time: 'log(t - 1)' }] }))).toThrow(/curveSources\[0\]\.time: "log\(t - 1\)" evaluates to NaN at t = 0/);
  });
});
