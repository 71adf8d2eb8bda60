/**
 * Benchmark cases of the spatial multilevel preconditioner (`space.vcycle*` rows),
 * cost per leaf-mesh vertex.
 *
 * uniform: unit square split into 2 × 2 cells (8 triangles), all vertices up to a
 *          generation G ≈ log2(size / 4) (so the V-cycle has G + 1 levels).
 * graded:  unit square 2 × 2, every element bisected while its diameter exceeds H·r
 *          (r = distance of its centroid to the corner (0, 0)), down to 40 generations
 *          at the corner; H calibrated so that the set has ≈ size free vertices.
 * `space.vcycle.*` times one application z = V r (α = 16); `space.vcycle-setup.*` times
 * the constructor (assembly, Galerkin hierarchy, coarse ordering; the α-dependent coarse
 * factor is built on the first application and is not part of it).
 */
import type { BenchCase, BenchInstance } from './harness';
import type { LeafMesh } from '../src/space/leaf-mesh';
import { MultilevelPreconditioner } from '../src/space/multigrid/index';
import { gradedProblem, randomVector, uniformGenerationProblem, type Kind } from './space-problems';


const cache = new Map<string, LeafMesh>();


function uniformMesh(size: number): LeafMesh {
  const p = uniformGenerationProblem(Math.max(1, Math.round(Math.log2(size / 4))));
  return p.dom.leafMesh(p.set);
}

function gradedMesh(size: number): LeafMesh {
  const p = gradedProblem(size);
  return p.dom.leafMesh(p.set);
}

function mesh(kind: Kind, size: number): LeafMesh {
  const key = `${kind}:${size}`;
  let m = cache.get(key);
  if (!m) {
    m = kind === 'uniform' ? uniformMesh(size) : gradedMesh(size);
    cache.clear(); // one mesh at a time
    cache.set(key, m);
  }
  return m;
}


function applyInstance(kind: Kind, size: number): BenchInstance {
  const m = mesh(kind, size);
  const pre = new MultilevelPreconditioner(m);
  const r = randomVector(m.vertexCount);
  const z = new Float64Array(m.vertexCount);
  pre.applyNodal(r, z, 16); // builds the coarse factor for this α
  return { units: m.vertexCount, run: () => pre.applyNodal(r, z, 16), extra: { levels: pre.levels } };
}

function setupInstance(kind: Kind, size: number): BenchInstance {
  const m = mesh(kind, size);
  let levels = 0;
  return {
    units: m.vertexCount,
    run: () => void (levels = new MultilevelPreconditioner(m).levels),
    get extra() { return { levels }; },
  };
}

export function spaceMultigridCases(quick: boolean): BenchCase[] {
  const sizes = quick ? [1e3, 1e4] : [1e3, 1e4, 1e5, 1e6];
  const out: BenchCase[] = [];
  for (const kind of ['uniform', 'graded'] as const) {
    out.push({ component: `space.vcycle.${kind}`, sizes, setup: (s) => applyInstance(kind, s) });
  }
  for (const kind of ['uniform', 'graded'] as const) {
    out.push({ component: `space.vcycle-setup.${kind}`, sizes, setup: (s) => setupInstance(kind, s) });
  }
  return out;
}
