/**
 * κ and c that vary inside initial elements, which the library takes at the centroids: the
 * problem-file front end measures the variation and `chronomesh solve` warns. Expected values are
 * worked by hand below (a linear κ sampled at fixed interior points).
 */
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { buildProblem, parseProblem } from '../../src/problem-file/index';
import { solveFile } from '../../src/cli/solve-command';

describe('coefficients that vary inside initial elements', () => {
  it('are measured at interior points: κ = 1 + x on one cell (0, 2)', () => {
    // centroid x = 1: κ = 2; interior points 0.2, 0.6, 1.4, 1.8: κ = 1.2 … 2.8; largest |κ − 2| = 0.8, scale 2.8
    const built = buildProblem(parseProblem({ domain: { shape: 'interval', from: 0, to: 2, cells: 1 }, horizon: 1, initial: '1', diffusion: '1 + x' }));
    expect(built.coefficientSpread).toHaveLength(1);
    expect(built.coefficientSpread[0]!.field).toBe('diffusion');
    expect(built.coefficientSpread[0]!.relative).toBeCloseTo(0.8 / 2.8, 12);
    expect(built.coefficientSpread[0]!.centroid).toEqual([1, 0]);
  });

  it('show none for coefficients constant per element, including jumps along element edges', () => {
    const domain = { shape: 'rectangle', from: [0, 0], to: [2, 1], cells: [2, 1] };
    for (const diffusion of ['3', 'x < 1 ? 1 : 10']) {
      expect(buildProblem(parseProblem({ domain, horizon: 1, initial: '1', diffusion, reaction: 'y > 2 ? 1 : 0' })).coefficientSpread).toEqual([]);
    }
    const r = buildProblem(parseProblem({ domain, horizon: 1, initial: '1', reaction: 'x*y' })).coefficientSpread;
    expect(r.map((s) => s.field)).toEqual(['reaction']);
  });

  it('give a warning from the command line above 1 %', () => {
    const file = join(mkdtempSync(join(tmpdir(), 'chronomesh-coef-')), 'p.json');
    writeFileSync(file, JSON.stringify({ domain: { shape: 'rectangle', from: [0, 0], to: [2, 1], cells: [2, 1] }, horizon: 0.1, initial: '1', diffusion: '1 + x', maxDofs: 100 }));
    const progress: string[] = [];
    solveFile(file, { log: () => {}, progress: (l) => progress.push(l) });
    expect(progress.filter((l) => /^warning: diffusion varies by up to \d+ % inside the initial element with centroid/.test(l))).toHaveLength(1);
  });

  it('h along convection edges: measured per initial edge, warned from the command line above 1 %', () => {
    // rectangle (0, 2) × (0, 1), 2 × 1 cells, convection on y = 0 with h = 1 + x: the edge (1, 2)
    // has midpoint 1.5 (h = 2.5) and samples x = 1.1 … 1.9 (h = 2.1 … 2.9): spread 0.4 / 2.9; the
    // edge (0, 1) gives 0.4 / 1.9, the largest
    const domain = { shape: 'rectangle', from: [0, 0], to: [2, 1], cells: [2, 1] };
    const part = (h: string) => ({ kind: 'convection', where: 'y < 1e-9', transferCoefficient: h, ambient: '0' });
    const built = buildProblem(parseProblem({ domain, horizon: 1, initial: '1', boundary: [part('1 + x')] }));
    expect(built.coefficientSpread).toHaveLength(1);
    expect(built.coefficientSpread[0]!.field).toBe('boundary[0].transferCoefficient');
    expect(built.coefficientSpread[0]!.relative).toBeCloseTo(0.4 / 1.9, 12);
    expect(built.coefficientSpread[0]!.centroid).toEqual([0.5, 0]);
    // constant per edge (a jump at a vertex shows none), or constant: nothing
    for (const h of ['5', 'x < 1 ? 1 : 3']) expect(buildProblem(parseProblem({ domain, horizon: 1, initial: '1', boundary: [part(h)] })).coefficientSpread).toEqual([]);
    const file = join(mkdtempSync(join(tmpdir(), 'chronomesh-coef-')), 'h.json');
    writeFileSync(file, JSON.stringify({ domain, horizon: 0.1, initial: '1', boundary: [part('1 + x')], maxDofs: 100 }));
    const progress: string[] = [];
    solveFile(file, { log: () => {}, progress: (l) => progress.push(l) });
    expect(progress.filter((l) => /^warning: boundary\[0\]\.transferCoefficient varies by up to 21 % along the initial boundary edge with midpoint \(0\.5, 0\); it is taken constant per initial boundary edge/.test(l))).toHaveLength(1);
  });
});

describe('a diffusion tensor in a problem file, from the command line', () => {
  const run = (diffusion: object, extra: object = {}): string[] => {
    const file = join(mkdtempSync(join(tmpdir(), 'chronomesh-tensor-')), 'p.json');
    writeFileSync(file, JSON.stringify({ domain: { shape: 'rectangle', from: [0, 0], to: [1, 1], cells: [2, 2] }, horizon: 0.1, initial: '1', diffusion, maxDofs: 150, ...extra }));
    const progress: string[] = [];
    solveFile(file, { log: () => {}, progress: (l) => progress.push(l) });
    return progress;
  };

  it('says how many V-cycles the mapped anisotropy takes (ratio 10 on right triangles: 30, 4 cycles; docs/method.md §4.4)', () => {
    const p = run({ xx: 1, xy: 0, yy: 0.1 });
    expect(p).toContain('diffusion tensor with eigenvalue ratio up to 10; mapped by K^(-1/2) the elements have anisotropy up to 30, so the spatial inner solvers run 4 V-cycles per application (docs/method.md §4.4)');
    // each entry is constant: no spread warning
    expect(p.filter((l) => /varies by up to/.test(l))).toEqual([]);
  });

  it('warns when the cycles reach their limit of 16 and names the remedy', () => {
    // A = 750 > 128: the adaptive strategy refuses such elements unless the file accepts them
    // (docs/adaptivity.md §2.6), naming the flattest element and the field that accepts it
    expect(() => run({ xx: 1, xy: 0, yy: 0.004 })).toThrow(/too flat for the adaptive loop \(8 of 8 initial elements, 100 % of the area, beyond mapped anisotropy 128\); the flattest, element \d+ .* has 750.*acceptFlatElements/);
    const p = run({ xx: 1, xy: 0, yy: 0.004 }, { acceptFlatElements: true });
    expect(p.filter((l) => /^warning: diffusion tensor with eigenvalue ratio up to 250; .* anisotropy up to 750, so .* 16 V-cycles .* the most they run: .* stretched along the strong direction by about √250/.test(l))).toHaveLength(1);
  }, 60_000);

  it('warns per entry that varies inside an initial element', () => {
    const p = run({ xx: '1 + x', xy: 0, yy: 1 });
    expect(p.filter((l) => /^warning: diffusion\.xx varies by up to \d+ % inside the initial element/.test(l))).toHaveLength(1);
  });
});
