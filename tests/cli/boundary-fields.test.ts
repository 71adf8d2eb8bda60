/**
 * Boundary parts in problem files (value, flux, convection) against closed forms of steady
 * conduction in a rod (common practice: with κ constant the steady temperature is linear in x).
 * The initial state is the steady state itself, so the exact solution is constant in time and
 * linear in space, and the computed probes must reproduce it up to the solver tolerance.
 */
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { solveFile } from '../../src/cli/solve-command';
import { buildProblem, parseProblem, runProblem } from '../../src/problem-file/index';

const base = { domain: { shape: 'interval', from: 0, to: 1, cells: 2 }, horizon: 0.5, strategy: 'sparse', maxDofs: 400, probes: [[0.25, 0.5], [0.5, 0.25]] };

describe('problem-file boundary parts', () => {
  it('held value at x = 0, heat flux q into the rod at x = 1: u = 1 + q x', () => {
    // κ ∂u/∂n = q at x = 1 (n = +x): u′ = q; u(0) = 1.
    const spec = parseProblem({ ...base, initial: '1 + 0.5*x', boundary: [
      { kind: 'value', where: 'x < 0.5', value: '1' },
      { kind: 'flux', where: 'x > 0.5', flux: '0.5' },
    ] });
    const r = runProblem(buildProblem(spec));
    expect(r.probes[0]!.value).toBeCloseTo(1.25, 4);
    expect(r.probes[1]!.value).toBeCloseTo(1.125, 4);
  });

  it('held value at x = 0, convection to u∞ = 0 with h = 1 at x = 1: slope s = h(u∞ − 1)/(κ + h) = −1/2', () => {
    // κ u′(1) = h (u∞ − u(1)) with u = 1 + s x  ⇒  κ s = h (u∞ − 1 − s).
    const spec = parseProblem({ ...base, initial: '1 - 0.5*x', boundary: [
      { kind: 'value', where: 'x < 0.5', value: '1' },
      { kind: 'convection', where: 'x > 0.5', transferCoefficient: '1', ambient: '0' },
    ] });
    const r = runProblem(buildProblem(spec));
    expect(r.probes[0]!.value).toBeCloseTo(0.75, 4);
    expect(r.probes[1]!.value).toBeCloseTo(0.875, 4);
  });
});

describe('edges left at the default u = 0', () => {
  it('a file that sets up its boundary and leaves edges out gets a note with the first step; one that sets nothing does not', () => {
    const dir = mkdtempSync(join(tmpdir(), 'chronomesh-defaults-'));
    const run = (content: unknown, quiet = false): string[] => {
      const file = join(dir, `p${Math.random().toString(36).slice(2)}.json`);
      writeFileSync(file, JSON.stringify(content));
      const progress: string[] = [];
      solveFile(file, { log: () => {}, progress: (l) => progress.push(l), quiet });
      return progress;
    };
    const rod = { domain: { shape: 'interval', from: 0, to: 1, cells: 2 }, horizon: 0.5, initial: '1', maxDofs: 100 };
    const oneEnd = run({ ...rod, boundary: [{ kind: 'flux', where: 'x < 0.5', flux: '1' }] });
    expect(oneEnd[0]).toMatch(/^note: 1 of 2 initial boundary end points have no part and hold u = 0 \(the default\), e\.g\. the end point x = 1;/);
    expect(oneEnd[1]).toMatch(/^step 0:/);
    const square = { domain: { shape: 'rectangle', from: [0, 0], to: [2, 1], cells: [2, 1] }, horizon: 0.5, initial: '1', maxDofs: 100 };
    expect(run({ ...square, insulated: 'y > 0.999' })[0]).toMatch(/^note: 4 of 6 initial boundary edges .* the edge with midpoint \(\d\.?\d*, \d\.?\d*\);/);
    expect(run(rod).some((l) => l.startsWith('note'))).toBe(false); // nothing set up: the default is what was asked
    expect(run({ ...rod, insulated: 'x > 0.5', boundary: [{ kind: 'value', where: 'x < 0.5', value: '1' }] }).some((l) => l.startsWith('note'))).toBe(false);
    expect(run({ ...rod, insulated: 'x > 0.5' }, true).some((l) => l.startsWith('note'))).toBe(false); // --quiet
  });
});
