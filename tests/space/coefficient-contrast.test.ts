/**
 * Diffusivity that jumps by orders of magnitude across an interface (docs/method.md §6.2): where it
 * is found, what an unconverged solve says about it, what `chronomesh solve` warns, and the range the
 * docs promise (contrast 100: PCG stays bounded along an adaptive run).
 *
 * The facts checked are geometric (which facet, which side, the normal diffusivity n·K·n across a
 * facet: common practice for the flux through an interface) and the solver's own iteration counts.
 */
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { DoubleTree, HeatProblem, NotConvergedError, SpaceTimeSystem, intervalDomain, rectangleDomain, solveAdaptive, type SpatialDomain } from '../../src/index';
import { diffusionContrast, stiffestTransfer } from '../../src/space/coefficient-contrast';
import { solveFile } from '../../src/cli/solve-command';
import { buildProblem, parseProblem } from '../../src/problem-file/index';

const layered = (k2: number) => intervalDomain(0, 1, 2, { kappa: (mx) => (mx < 0.5 ? 1 : k2), boundary: [{ kind: 'value', where: (mx) => mx > 0.5, value: 1 }] });

/** The message of the NotConvergedError that one PCG iteration on the sparse grid of level 4 ends in. */
function unconvergedMessage(domain: SpatialDomain): string {
  const p = new HeatProblem({ domain, T: 0.5, initial: () => 1 });
  try {
    new SpaceTimeSystem(p, DoubleTree.sparseGrid(domain, 4)).solve({ maxIterations: 1 });
  } catch (e) {
    expect(e).toBeInstanceOf(NotConvergedError);
    return (e as Error).message;
  }
  throw new Error('expected NotConvergedError');
}

describe('diffusionContrast', () => {
  it('finds the facet, the sides and the ratio in 1D and 2D', () => {
    const c = diffusionContrast(layered(1e-4))!;
    expect(c.ratio).toBeCloseTo(1e4, 6);
    expect(c.at).toEqual([0.5, 0]);
    expect(c.elements).toEqual([0, 1]); // the faster side first
    expect(c.kappa).toEqual([1, 1e-4]);
    expect(diffusionContrast(intervalDomain(0, 1, 4, { kappa: 3 }))).toBeNull();
    // 2D: κ = 1 left of x = ½, 0.01 right of it, on 4 × 2 cells; the worst facet lies on x = ½
    const sq = diffusionContrast(rectangleDomain(0, 1, 0, 1, 4, 2, { kappa: (mx) => (mx < 0.5 ? 1 : 0.01) }))!;
    expect(sq.ratio).toBeCloseTo(100, 9);
    expect(sq.at[0]).toBeCloseTo(0.5, 12);
  });

  it('takes the diffusivity across the facet, n·K·n, for a tensor', () => {
    // diag(1, 0.01) left, diag(0.01, 1) right of x = ½: across the vertical interface 1 against 0.01,
    // across the horizontal facets inside each half no jump at all
    const d = rectangleDomain(0, 1, 0, 1, 2, 2, { diffusionTensor: (mx) => (mx < 0.5 ? { xx: 1, xy: 0, yy: 0.01 } : { xx: 0.01, xy: 0, yy: 1 }) });
    const c = diffusionContrast(d)!;
    expect(c.ratio).toBeCloseTo(100, 9);
    expect(c.at[0]).toBeCloseTo(0.5, 12);
    // the same tensor everywhere: no jump across any facet
    expect(diffusionContrast(rectangleDomain(0, 1, 0, 1, 2, 2, { diffusionTensor: { xx: 1, xy: 0, yy: 0.01 } }))).toBeNull();
  });

  it('the shipped two-layer wall (contrast 20) is below the warning', () => {
    const json = JSON.parse(readFileSync(join(__dirname, '../../examples/two-layer-wall.json'), 'utf8'));
    expect(diffusionContrast(buildProblem(parseProblem(json)).domain)!.ratio).toBeCloseTo(20, 9);
  });
});

describe('stiffestTransfer', () => {
  const cooled = (h: number, kappa = 1) => intervalDomain(0, 1, 2, { kappa, boundary: [{ kind: 'convection', where: () => true, transferCoefficient: h, ambient: 0 }] });
  it('gives the Biot number hL/κ with L the domain diameter and κ across the edge', () => {
    expect(stiffestTransfer(cooled(1e4))!.biot).toBeCloseTo(1e4, 8);
    expect(stiffestTransfer(cooled(1e4, 2))!.biot).toBeCloseTo(5e3, 8);
    expect(stiffestTransfer(intervalDomain(0, 1, 2))).toBeNull(); // held ends: no convection
    // 2D: h = 30 on the top of the rectangle (0, 2) × (0, 1), L = √5, κ = 3 → 10√5
    const top = stiffestTransfer(rectangleDomain(0, 2, 0, 1, 2, 1, { kappa: 3, boundary: [{ kind: 'convection', where: (_mx, my) => my > 1 - 1e-9, transferCoefficient: 30, ambient: 0 }] }))!;
    expect(top.biot).toBeCloseTo(10 * Math.sqrt(5), 9);
    expect(top.at[1]).toBeCloseTo(1, 12);
    expect(top.h).toBe(30);
  });

  it('an unconverged solve names a stiff convection edge; a mild one is not named', () => {
    const message = (h: number): string => unconvergedMessage(cooled(h));
    expect(message(1e4)).toMatch(/the convection edge at x = [01] has a Biot number hL\/κ of 10000 \(h = 10000\).*held at it \(kind 'value'\)/);
    expect(message(10)).not.toMatch(/Biot/);
  });

  it('chronomesh solve warns from a Biot number of 10⁴', () => {
    const dir = mkdtempSync(join(tmpdir(), 'chronomesh-biot-'));
    const warnings = (h: string): string[] => {
      const file = join(dir, `p${h}.json`);
      writeFileSync(file, JSON.stringify({ domain: { shape: 'interval', from: 0, to: 1, cells: 2 }, horizon: 0.5, initial: '1', maxDofs: 40,
        boundary: [{ kind: 'convection', where: 'x > 0.5', transferCoefficient: h, ambient: '0' }] }));
      const progress: string[] = [];
      solveFile(file, { log: () => {}, progress: (l) => progress.push(l) });
      return progress.filter((l) => l.includes('Biot'));
    };
    const w = warnings('10000');
    expect(w).toHaveLength(1);
    expect(w[0]).toMatch(/^warning: the convection edge at \(1\) has a Biot number hL\/κ of 10000 \(h = 10000\)/);
    expect(warnings('100')).toHaveLength(0);
  }, 60_000);
});

describe('solves across a high-contrast interface', () => {
  it('an unconverged solve names the interface; without a jump it does not', () => {
    const run = (k2: number): string => unconvergedMessage(layered(k2));
    expect(run(1e-4)).toMatch(/the diffusivity jumps by a factor 10000 at x = 0\.5 \(1 in initial element 0 against 0\.0001 in 1\).*docs\/method\.md §6\.2/);
    expect(run(1)).not.toMatch(/jumps/);
  });

  it('contrast 100: PCG stays within 40 iterations per step along an adaptive run (the range docs/method.md §6.2 promises)', () => {
    const its: number[] = [];
    solveAdaptive(new HeatProblem({ domain: layered(1e-2), T: 0.5, initial: () => 1 }), {
      maxUnknowns: 3000, maxSteps: 200, onStep: (s) => { its.push(s.pcgIterations); },
    });
    expect(its.length).toBeGreaterThan(20);
    expect(Math.max(...its)).toBeLessThanOrEqual(40);
  }, 60_000);

  it('chronomesh solve warns before the run from a contrast of 1000, naming the interface', () => {
    const dir = mkdtempSync(join(tmpdir(), 'chronomesh-contrast-'));
    const warnings = (k2: string): string[] => {
      const file = join(dir, `p${k2}.json`);
      writeFileSync(file, JSON.stringify({ domain: { shape: 'interval', from: 0, to: 1, cells: 2 }, horizon: 0.5, diffusion: `x < 0.5 ? 1 : ${k2}`, initial: '1', maxDofs: 40 }));
      const progress: string[] = [];
      solveFile(file, { log: () => {}, progress: (l) => progress.push(l) });
      return progress.filter((l) => l.includes('diffusivity jumps'));
    };
    const w = warnings('0.001');
    expect(w).toHaveLength(1);
    expect(w[0]).toMatch(/^warning: the diffusivity jumps by a factor 1000 across the interface at \(0\.5\) \(initial elements 0 and 1\)/);
    expect(warnings('0.01')).toHaveLength(0);
  }, 60_000);
});
