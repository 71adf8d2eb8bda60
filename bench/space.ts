/**
 * Benchmark cases of the space module (`space.` rows), cost per vertex of the set.
 *
 * uniform: unit square, n × n cells, 3 uniform levels (≈ size free vertices).
 * graded:  unit square, every element bisected while its diameter exceeds H·r (r = distance of
 *          its centroid to the corner (0, 0)), down to 40 generations at the corner; H calibrated
 *          so that the set has ≈ size free vertices.
 */
import type { BenchCase, BenchInstance } from './harness';
import { SpatialOperatorPlan, rectangleDomain, loadVector } from '../src/space/index';
import { gradedProblem, randomVector, type Kind, type Problem } from './space-problems';
import { hierarchicalToNodal, hierarchicalToNodalTransposed } from '../src/space/hierarchical';


const cache = new Map<string, Problem>();

function uniformProblem(size: number): Problem {
  const n = Math.max(1, Math.round((Math.sqrt(size) + 1) / 8));
  const dom = rectangleDomain(0, 1, 0, 1, n, n);
  return { dom, set: dom.uniformSet(3) };
}


function problem(kind: Kind, size: number): Problem {
  const key = `${kind}:${size}`;
  let p = cache.get(key);
  if (!p) {
    p = kind === 'uniform' ? uniformProblem(size) : gradedProblem(size);
    cache.clear(); // keep memory bounded: one problem at a time
    cache.set(key, p);
  }
  return p;
}


type Op = 'stiffness' | 'mass' | 'split' | 'transform' | 'leafmesh' | 'plan' | 'load';

function instance(op: Op, kind: Kind, size: number): BenchInstance {
  const { dom, set } = problem(kind, size);
  const units = set.length;
  const extra = { depth: 0, meshVertices: 0 };
  if (op === 'leafmesh') return { units, run: () => void dom.leafMesh(set) };
  if (op === 'plan') return { units, run: () => void new SpatialOperatorPlan(dom, set, set) };
  if (op === 'load') {
    const out = new Float64Array(units);
    return { units, run: () => void loadVector(dom, set, (x, y) => x * y + 1, out) };
  }
  const plan = new SpatialOperatorPlan(dom, set, set);
  const mesh = plan.mesh;
  let depth = 0;
  for (let i = 0; i < mesh.vertexCount; i++) depth = Math.max(depth, mesh.generation[i]!);
  extra.depth = depth;
  extra.meshVertices = mesh.vertexCount;
  const x = randomVector(units), y = new Float64Array(units), y2 = new Float64Array(units);
  const v = randomVector(mesh.vertexCount);
  const run =
    op === 'stiffness' ? () => plan.apply(x, 0, y, 0, 0, 1)
    : op === 'mass' ? () => plan.apply(x, 0, y, 0, 1, 0)
    : op === 'split' ? () => plan.applySplit(x, 0, y, 0, y2, 0)
    : () => { hierarchicalToNodal(mesh, v); hierarchicalToNodalTransposed(mesh, v); };
  return { units, run, extra };
}

export function spaceCases(quick: boolean): BenchCase[] {
  const sizes = quick ? [1e3, 1e4] : [1e3, 1e4, 1e5, 1e6];
  const cases: BenchCase[] = [];
  for (const kind of ['uniform', 'graded'] as Kind[]) {
    for (const op of ['stiffness', 'mass', 'split', 'transform', 'leafmesh', 'plan', 'load'] as Op[]) {
      cases.push({ component: `space.${op}.${kind}`, sizes, setup: (size) => instance(op, kind, size) });
    }
  }
  return cases;
}
