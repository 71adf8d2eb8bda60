/**
 * Benchmark cases of the space module (`space.` rows), cost per vertex of the set.
 *
 * uniform: unit square, n × n cells, 3 uniform levels (≈ size free vertices).
 * graded:  unit square, every element bisected while its diameter exceeds H·r (r = distance of
 *          its centroid to the corner (0, 0)), down to 40 generations at the corner; H calibrated
 *          so that the set has ≈ size free vertices.
 */
import type { BenchCase, BenchInstance } from './harness';
import { SpatialOperatorPlan, rectangleDomain, loadVector, type SpatialDomain } from '../src/space/index';
import { hierarchicalToNodal, hierarchicalToNodalTransposed } from '../src/space/hierarchical';

type Kind = 'uniform' | 'graded';

interface Problem {
  dom: SpatialDomain;
  set: Int32Array;
}

const cache = new Map<string, Problem>();

function uniformProblem(size: number): Problem {
  const n = Math.max(1, Math.round((Math.sqrt(size) + 1) / 8));
  const dom = rectangleDomain(0, 1, 0, 1, n, n);
  return { dom, set: dom.uniformSet(3) };
}

function gradedProblem(size: number): Problem {
  const make = (H: number): Problem => {
    const dom = rectangleDomain(0, 1, 0, 1, 2, 2);
    return { dom, set: dom.adaptedSet((x, y) => H * Math.hypot(x, y), 40) };
  };
  let H = 0.5;
  let p = make(H);
  for (let it = 0; it < 3 && Math.abs(p.set.length / size - 1) > 0.1; it++) {
    H *= Math.sqrt(p.set.length / size);
    p = make(H);
  }
  return p;
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

function randomVector(n: number): Float64Array {
  const x = new Float64Array(n);
  let s = 12345;
  for (let i = 0; i < n; i++) {
    s = (s * 1103515245 + 12345) % 2147483648;
    x[i] = s / 2147483648 - 0.5;
  }
  return x;
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
