/**
 * Cost of anisotropic diffusion (`aniso.` rows; docs/method.md §4.4). K = diag(1, 1/r) on the unit
 * square (2 × 2 cells), with the default number of V-cycles for it (from the mapped anisotropy,
 * about 3r on these meshes):
 *
 * - `aniso.vcycle.r<r>`: one application of the spatial inner solver (the cycles the library uses
 *   for r) on a uniform mesh, per vertex; compare with `aniso.vcycle.r1` (one cycle, isotropic).
 * - `aniso.solve.r<r>`: a whole space-time solve on the sparse grid of level 5, u0 ≡ 1, T = 0.5,
 *   from zero to a relative residual of 10⁻⁸, per unknown; `pcgIterations` and `cycles` are
 *   reported with it.
 */
import type { BenchCase, BenchInstance } from './harness';
import { DoubleTree, HeatProblem, SpaceTimeSystem, rectangleDomain } from '../src/index';
import { cyclesForAnisotropy } from '../src/space/diffusion-tensor';
import { MultilevelPreconditioner } from '../src/space/multigrid/index';
import { randomVector } from './space-problems';

const RATIOS = [1, 10, 30, 100];

function domain(r: number) {
  return rectangleDomain(0, 1, 0, 1, 2, 2, r === 1 ? {} : { diffusionTensor: { xx: 1, xy: 0, yy: 1 / r } });
}

function vcycle(r: number, size: number): BenchInstance {
  const dom = domain(r);
  const mesh = dom.leafMesh(dom.uniformSet(Math.max(1, Math.round(Math.log2(size / 4) / 2))));
  const cycles = cyclesForAnisotropy(dom.mappedAnisotropy);
  const pre = new MultilevelPreconditioner(mesh, { cycles });
  const x = randomVector(mesh.vertexCount);
  const z = new Float64Array(mesh.vertexCount);
  return { units: mesh.vertexCount, run: () => pre.applyHierarchical(x, z, 0), extra: { cycles } };
}

function solve(r: number, level: number): BenchInstance {
  const dom = domain(r);
  const problem = new HeatProblem({ domain: dom, T: 0.5, initial: () => 1 });
  const set = DoubleTree.sparseGrid(dom, level);
  let iterations = 0;
  const run = (): void => {
    iterations = new SpaceTimeSystem(problem, set).solve({ relTol: 1e-8, maxIterations: 2000 }).pcg.iterations;
  };
  run();
  return { units: set.size, run, extra: { pcgIterations: iterations, cycles: cyclesForAnisotropy(dom.mappedAnisotropy) } };
}

export function anisotropyCases(quick: boolean): BenchCase[] {
  const cases: BenchCase[] = [];
  for (const r of RATIOS) cases.push({ component: `aniso.vcycle.r${r}`, sizes: [quick ? 1e4 : 2.6e5], setup: (n) => vcycle(r, n) });
  for (const r of RATIOS) cases.push({ component: `aniso.solve.r${r}`, sizes: [quick ? 3 : 5], setup: (l) => solve(r, l) });
  return cases;
}
