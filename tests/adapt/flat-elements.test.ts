/**
 * Initial elements that are flat as the diffusion sees them (docs/adaptivity.md §2.6).
 *
 * Bisection keeps every descendant as flat as its initial element, so a thin strip meshed with a
 * few long cells stays flat however far the loop refines. Before the loop counted the shape of
 * isotropic elements, the strip (0, 1) × (0, w) in one cell (u0 ≡ 1, held at 0 at x = 0 and 1,
 * insulated along y, T = 0.5) gave err/E 2.5–4.6 with up to 50 PCG iterations per step for w = 1/4,
 * 2.3–10.6 with up to 896 for w = 1/10, and for w ≤ 1/20 err/E of 4–12 before PCG stopped
 * unconverged. The loop now runs ⌈A/8⌉ V-cycles on a flat bulk of isotropic elements as on
 * anisotropic ones (2 where only a few elements are flat), and refuses, before any work, a bulk with
 * A > 128 unless told to accept it.
 *
 * Reference (outside the project): the solution does not depend on y, so it is the slab solution
 * on (0, 1) with u0 ≡ 1 held at 0, by Fourier series and method of images (Carslaw & Jaeger,
 * Conduction of Heat in Solids, 2nd ed., 1959, §3.3; tests/helpers/heat-exact.ts, checked there).
 * The closed form A = 3r of the rectangle generator's right triangles under K = diag(1, 1/r) is
 * worked by hand in tests/system/anisotropic-diffusion.test.ts (docs/method.md §4.4).
 */
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { HeatProblem, InvalidMeshError, rectangleDomain, solveAdaptive, spaceTimeErrors, triangulatedDomain, type KnownSolution } from '../../src/index';
import { solveFile } from '../../src/cli/solve-command';
import { heatExact1D, heatExact2D } from '../helpers/heat-exact';
import { innerCycles, meshFlatness } from '../../src/space/flat-elements';

const slab = heatExact1D();
/** The slab solution as a solution on the strip: constant across it. */
const exact: KnownSolution = {
  value: (t, x) => slab.value(t, x),
  gradient: (t, x, _y, g) => { slab.gradient(t, x, 0, g); g[1] = 0; },
};

/** The unit square with two slivers (A ≈ 7 500) on 1 % of its area, around the segment (0.5, 0.5)–(0.52, 0.5). */
const SLIVERED = { points: [0, 0, 1, 0, 1, 1, 0, 1, 0.5, 0.5, 0.52, 0.5], triangles: [0, 1, 4, 1, 5, 4, 1, 2, 5, 2, 3, 5, 5, 3, 4, 3, 0, 4] };
/** The unit square with thin triangles (A ≈ 200) on 10 % of its area, toward the vertex (0.9, 0.1). */
const OFF_CENTRE = { points: [0, 0, 1, 0, 1, 1, 0, 1, 0.9, 0.1], triangles: [0, 1, 4, 1, 2, 4, 2, 3, 4, 3, 0, 4] };

/** The strip (0, 1) × (0, w) in nx × 1 cells, insulated along y (held at 0 at x = 0 and x = 1). */
function strip(w: number, nx: number): HeatProblem {
  const domain = rectangleDomain(0, 1, 0, w, nx, 1, { insulated: (_mx, my) => my < 1e-12 || my > w - 1e-12 });
  return new HeatProblem({ domain, T: 0.5, initial: () => 1 });
}

/** err/E (energy norm) and PCG iterations of every step of a run to `maxUnknowns`. */
function track(problem: HeatProblem, maxUnknowns: number, acceptFlatElements = false): { ratios: number[]; iterations: number[] } {
  const ratios: number[] = [];
  const iterations: number[] = [];
  solveAdaptive(problem, {
    maxUnknowns, acceptFlatElements,
    onStep: (s, sol) => {
      ratios.push(spaceTimeErrors(sol, exact).energyL2 / s.estimate);
      iterations.push(s.pcgIterations);
    },
  });
  if (process.env.CHRONOMESH_VERBOSE) console.log(ratios.map((r) => r.toFixed(2)).join(' '), iterations.join(' '));
  return { ratios, iterations };
}

describe('initial elements flat as the diffusion sees them', () => {
  it('a flat isotropic triangle counts as the fat one under the mapped tensor: A = 3/w² on the strip of width w in one cell', () => {
    for (const w of [1, 1 / 4, 1 / 10, 1 / 50]) {
      const flat = rectangleDomain(0, 1, 0, w, 1, 1).mappedAnisotropy;
      // x' = x, y' = y/w maps the strip onto the unit square and κI onto K = diag(1, 1/w²)
      const mapped = rectangleDomain(0, 1, 0, 1, 1, 1, { diffusionTensor: { xx: 1, xy: 0, yy: 1 / (w * w) } }).mappedAnisotropy;
      expect(flat / mapped).toBeCloseTo(1, 9);
      expect(flat).toBeCloseTo(3 / (w * w), 6);
    }
  });

  it('strip of width 1/4 in one cell (A = 48): ⌈A/8⌉ V-cycles keep PCG short and E within a factor 3.5 of the error', () => {
    const { ratios, iterations } = track(strip(1 / 4, 1), 2000);
    expect(ratios.length).toBeGreaterThan(8);
    // measured 1.55–2.94 and at most 15 iterations; with one V-cycle (before) 2.47–4.61 and up to 50
    expect(Math.min(...ratios)).toBeGreaterThan(1);
    expect(Math.max(...ratios)).toBeLessThan(3.5);
    expect(Math.max(...iterations)).toBeLessThanOrEqual(25);
  }, 120_000);

  it('the same strip in 4 cells (A = 3): err/E as on the reference problems', () => {
    const { ratios, iterations } = track(strip(1 / 4, 4), 2000);
    // measured 1.05–1.55, at most 15 iterations
    expect(Math.min(...ratios)).toBeGreaterThan(0.8);
    expect(Math.max(...ratios)).toBeLessThan(2);
    expect(Math.max(...iterations)).toBeLessThanOrEqual(25);
  }, 120_000);

  it('refuses elements with A > 128 before any work, naming the flattest element, and runs when told', () => {
    let steps = 0;
    const problem = strip(1 / 10, 1);
    let caught: unknown = null;
    try {
      solveAdaptive(problem, { maxUnknowns: 500, onStep: () => { steps++; } });
    } catch (e) {
      caught = e;
    }
    expect(caught).toBeInstanceOf(InvalidMeshError);
    const err = caught as InvalidMeshError;
    expect(err.field).toMatch(/^domain\.triangles\[[01]\]$/);
    expect(err.received).toBeCloseTo(300, 6);
    expect(err.expected).toBe('mapped anisotropy of the mesh ≤ 128');
    expect(err.message).toMatch(/too flat for the adaptive loop \(2 of 2 initial elements, 100 % of the area, beyond mapped anisotropy 128\); the flattest, element [01] with vertices .*, has 300\..* more vertices along the long sides.*acceptFlatElements: true/);
    expect(steps).toBe(0);
    // told to accept them, it runs (E is not to be trusted there: err/E 2.7–5.6 measured)
    expect(track(problem, 300, true).ratios.length).toBeGreaterThan(0);
  }, 60_000);

  it.each([['two slivers on 1 % of the area', SLIVERED], ['thin triangles on 10 % of the area', OFF_CENTRE]])('a few flat elements in a mesh of fat ones (%s) are accepted, and E stays honest', (_name, mesh) => {
    const domain = triangulatedDomain(mesh.points, mesh.triangles);
    expect(domain.mappedAnisotropy).toBeGreaterThan(128); // the flattest element; the V-cycles go by the bulk and run 2
    expect(meshFlatness(domain)!.bulk).toBeLessThan(8); // the estimator's concern, the bulk of the mesh: fat
    const exact = heatExact2D(); // u0 ≡ 1 held at 0 on the unit square: product of slab series
    const ratios: number[] = [];
    const iterations: number[] = [];
    solveAdaptive(new HeatProblem({ domain, T: 0.5, initial: () => 1 }), {
      maxUnknowns: 2000,
      onStep: (s, sol) => { ratios.push(spaceTimeErrors(sol, exact).energyL2 / s.estimate); iterations.push(s.pcgIterations); },
    });
    if (process.env.CHRONOMESH_VERBOSE) console.log(ratios.map((r) => r.toFixed(2)).join(' '), iterations.join(' '));
    // measured to about 4 000 unknowns: err/E 1.57–1.97 and at most 15 iterations with 16 cycles (one cycle: up to 216)
    expect(Math.min(...ratios)).toBeGreaterThan(0.8);
    expect(Math.max(...ratios)).toBeLessThan(2.6);
    expect(Math.max(...iterations)).toBeLessThanOrEqual(40);
  }, 120_000);

  it('chronomesh solve warns about the few flat elements it accepts, naming how many and where', () => {
    const file = join(mkdtempSync(join(tmpdir(), 'chronomesh-flat-')), 'p.json');
    const pts: number[][] = [];
    for (let i = 0; i < SLIVERED.points.length; i += 2) pts.push([SLIVERED.points[i]!, SLIVERED.points[i + 1]!]);
    const tris: number[][] = [];
    for (let i = 0; i < SLIVERED.triangles.length; i += 3) tris.push(SLIVERED.triangles.slice(i, i + 3));
    writeFileSync(file, JSON.stringify({ domain: { shape: 'mesh', points: pts, triangles: tris }, horizon: 0.5, initial: '1', maxDofs: 200 }));
    const progress: string[] = [];
    solveFile(file, { log: () => {}, progress: (l) => progress.push(l) });
    expect(progress.filter((l) => /^warning: 2 initial elements are flat \(mapped anisotropy up to 7[45]\d\d, 1(\.\d)? % of the area; the flattest is element [1-5]\)/.test(l))).toHaveLength(1);
  }, 60_000);

  it('V-cycles go by the bulk of the mesh: ⌈A/8⌉ for a flat bulk or an anisotropic K, 2 where only a few elements are flat', () => {
    expect(innerCycles(rectangleDomain(0, 1, 0, 1, 2, 2))).toBe(1); // right isosceles, A = 3
    expect(innerCycles(rectangleDomain(0, 1, 0, 0.25, 1, 1))).toBe(6); // the strip of width 1/4, A = 48 everywhere
    expect(innerCycles(rectangleDomain(0, 1, 0, 1, 2, 2, { diffusionTensor: { xx: 1, xy: 0, yy: 0.1 } }))).toBe(4); // A = 30 under K
    for (const mesh of [SLIVERED, OFF_CENTRE]) {
      const domain = triangulatedDomain(mesh.points, mesh.triangles);
      expect(domain.mappedAnisotropy).toBeGreaterThan(8 * 16); // the flattest element alone would ask for 16
      expect(innerCycles(domain)).toBe(2);
    }
  });

  it('anisotropic diffusion: the remedy is elements stretched along the strong direction', () => {
    const K = { xx: 1, xy: 0, yy: 100 }; // strong along y
    const square = rectangleDomain(0, 1, 0, 1, 1, 1, { diffusionTensor: K });
    const problem = new HeatProblem({ domain: square, T: 0.5, initial: () => 1 });
    expect(() => solveAdaptive(problem, { maxUnknowns: 500 })).toThrow(/elements stretched along the strong direction of K/);
    // cells ten times longer along y than along x: mapped by K^(-1/2), right isosceles again
    expect(rectangleDomain(0, 1, 0, 1, 10, 1, { diffusionTensor: K }).mappedAnisotropy).toBeCloseTo(3, 6);
  });

  it('acceptFlatElements must be a boolean', () => {
    expect(() => solveAdaptive(strip(1, 1), { acceptFlatElements: 'yes' as unknown as boolean })).toThrow(/acceptFlatElements must be true or false/);
  });
});
