/**
 * The command line on a problem file whose held values are not affine along the initial edges
 * (docs/error-norms.md §8). Reference outside the project: the manufactured solution
 * u = sin(πx)(1 − y), written out by hand (∂t u − Δu = π² sin(πx)(1 − y)); its true error is
 * measured through the file's `exact` field.
 */
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { solveFile } from '../../src/cli/solve-command';
import { CliError } from '../../src/cli/cli-error';

const FILE = {
  domain: { shape: 'rectangle', from: [0, 0], to: [1, 1], cells: [2, 2] },
  horizon: 0.5,
  source: 'pi^2*sin(pi*x)*(1 - y)',
  initial: 'sin(pi*x)*(1 - y)',
  boundary: [{ kind: 'value', where: 'y < 0.001', value: 'sin(pi*x)' }],
  exact: 'sin(pi*x)*(1 - y)',
  maxDofs: 1500,
};

function write(spec: object): string {
  const file = join(mkdtempSync(join(tmpdir(), 'chronomesh-held-')), 'p.json');
  writeFileSync(file, JSON.stringify(spec));
  return file;
}

describe('held values not affine along the initial edges, on the command line', () => {
  it('are reported with a warning, in the summary and in --json, next to a true error they explain', () => {
    const lines: string[] = [];
    const progress: string[] = [];
    const { run } = solveFile(write(FILE), { json: true, log: (l) => lines.push(l), progress: (l) => progress.push(l) });
    const doc = JSON.parse(lines[0]!) as { heldDataError: number; exactErrors: { gradientL2: number } };
    expect(doc.heldDataError).toBe(run.heldDataError);
    expect(doc.heldDataError).toBeGreaterThan(0.15);
    expect(doc.heldDataError).toBeLessThanOrEqual(doc.exactErrors.gradientL2);
    expect(progress.filter((l) => l.startsWith('warning: the held boundary values are interpolated'))).toHaveLength(1);
    const plain: string[] = [];
    solveFile(write(FILE), { log: (l) => plain.push(l), progress: () => {} });
    expect(plain.some((l) => /^held-value data error .* about 1\.\d\de-1$/.test(l))).toBe(true);
  });

  it('refuse a tolerance below the data error as bad input naming the field, before any step', () => {
    const progress: string[] = [];
    let caught: unknown = null;
    try { solveFile(write({ ...FILE, tolerance: 0.05 }), { log: () => {}, progress: (l) => progress.push(l) }); } catch (e) { caught = e; }
    expect(caught).toBeInstanceOf(CliError);
    expect((caught as Error).message).toMatch(/tolerance 0\.05 cannot be reached: .* boundary part 0, edge/);
    expect(progress).toHaveLength(0);
  });

  it('stay silent when the held values are affine along every initial edge', () => {
    const progress: string[] = [];
    const lines: string[] = [];
    solveFile(write({ ...FILE, boundary: [{ kind: 'value', where: 'y < 0.001', value: '1 + x' }], exact: undefined, source: '0', initial: '1 + x' }), { json: true, log: (l) => lines.push(l), progress: (l) => progress.push(l) });
    expect((JSON.parse(lines[0]!) as { heldDataError: number }).heldDataError).toBe(0);
    expect(progress.some((l) => l.startsWith('warning'))).toBe(false);
    // nothing to solve (E = 0 and no data error): no warning either (0 ≥ 0.5·0 once gave one)
    const quiet: string[] = [];
    solveFile(write({ domain: FILE.domain, horizon: 0.5, maxDofs: 100 }), { log: () => {}, progress: (l) => quiet.push(l) });
    expect(quiet.some((l) => l.startsWith('warning'))).toBe(false);
  });
});
