/**
 * Loads of the space-time system (docs/method.md §6):
 *   ℓ_f[(μ,ν)] = ∫_I ∫_Ω f ψ_μ φ_ν,   ℓ_0[ν] = ∫_Ω u0 φ_ν,   b = Bᵀ K_Y ℓ_f + g ⊗ ℓ_0.
 * ℓ_f is computed per Ψ-node μ: Gauss points in time on each half of its
 * interval (ψ_μ is linear there), piece by piece between the breakpoints of the
 * loads' composite time rule inside it (./load-time-rule.ts; none for
 * data smooth in time), and, at each such time, the spatial load of f(t, ·)
 * on the fibre of μ. Separable terms g(t)h(x) load h once per fibre.
 */
import { InvalidArgumentError, describeValue } from '../errors';
import { evaluateTemporal } from '../time/index';
import { loadVector } from '../space/index';
import { curveLoadVector } from '../space/load';
import type { DoubleTree } from '../spacetime/double-tree';
import { gaussLegendre01 } from '../numerics/gauss-legendre';
import type { HeatProblem } from './heat-problem';

import { LOAD_TIME_POINTS as TIME_POINTS, halfPieces, loadTimeBreakpoints } from './load-time-rule';

/** The interval of test node (level, index) on (0, T). */
function testNodeInterval(level: number, index: number, T: number): [number, number] {
  if (level === 0) return [0, T];
  const h = T * 2 ** -(level - 1);
  return [index * h, (index + 1) * h];
}

/** ℓ_f on the test index set (zero vector if the problem has no source). */
export function sourceLoad(problem: HeatProblem, testSet: DoubleTree): Float64Array {
  const out = new Float64Array(testSet.size);
  const { tree } = testSet;
  const T = problem.T;
  const { nodes, weights } = gaussLegendre01(TIME_POINTS);
  const domain = problem.domain;
  const f = problem.source;
  const sep = problem.separableSource;
  const curves = problem.curveSources;
  if (!f && !sep && !curves) return out;
  const breaks = loadTimeBreakpoints(problem).times;
  const pieces: number[] = [];
  // Separable factors g(t)·ℓ_x: the terms of a separable source, then the concentrated sources; the
  // spatial loads are computed once per distinct fibre.
  const factors: { time: (t: number) => number; field: string; load: (fibre: Int32Array) => Float64Array }[] = [
    ...(sep ?? []).map((term, j) => ({ time: term.time, field: `source[${j}].time`, load: (fib: Int32Array) => loadVector(domain, fib, checkedSpace(term.space, j)) })),
    ...(curves ?? []).map((c, j) => ({ time: c.time, field: `curveSources[${j}].time`, load: (fib: Int32Array) => curveLoadVector(domain, fib, c.curve) })),
  ];
  const factorCache = new Map<number, Float64Array[]>();
  let scratch = new Float64Array(0);
  for (let i = 0; i < tree.size; i++) {
    const fibreId = testSet.nodeFibre[i]!;
    const fibre = testSet.pool.get(fibreId);
    const n = fibre.length;
    if (n === 0) continue;
    const l = tree.level[i]!;
    const k = tree.index[i]!;
    const o0 = testSet.functionOffset[2 * i]!;
    const o1 = testSet.functionOffset[2 * i + 1]!;
    const [a, b] = testNodeInterval(l, k, T);
    if (scratch.length < n) scratch = new Float64Array(n);
    let spaceLoads = factorCache.get(fibreId);
    if (!spaceLoads) {
      spaceLoads = factors.map((fac) => fac.load(fibre));
      factorCache.set(fibreId, spaceLoads);
    }
    halfPieces(a, b, breaks, pieces);
    for (let piece = 0; piece < pieces.length; piece += 2) {
      const lo = pieces[piece]!, hi = pieces[piece + 1]!;
      for (let q = 0; q < nodes.length; q++) {
        const t = lo + (hi - lo) * nodes[q]!;
        const w = (hi - lo) * weights[q]!;
        const p0 = w * evaluateTemporal('test', l, k, 0, t, T).value;
        const p1 = w * evaluateTemporal('test', l, k, 1, t, T).value;
        if (f) {
          const load = loadVector(domain, fibre, checkedSource(f, t), scratch);
          for (let p = 0; p < n; p++) {
            out[o0 + p]! += p0 * load[p]!;
            out[o1 + p]! += p1 * load[p]!;
          }
        }
        for (let j = 0; j < factors.length; j++) {
          const g = factors[j]!.time(t);
          if (!Number.isFinite(g)) throw new InvalidArgumentError(`${factors[j]!.field}(${t}) returned ${describeValue(g)}; expected a finite number`, { field: factors[j]!.field, received: g });
          const load = spaceLoads[j]!;
          for (let p = 0; p < n; p++) {
            out[o0 + p]! += g * p0 * load[p]!;
            out[o1 + p]! += g * p1 * load[p]!;
          }
        }
      }
    }
  }
  return out;
}

/** ℓ_0 on the given fibre (zero if the problem has no initial state). */
export function initialLoad(problem: HeatProblem, fibre: Int32Array): Float64Array {
  if (!problem.initial || fibre.length === 0) return new Float64Array(fibre.length);
  const u0 = problem.initial;
  return loadVector(problem.domain, fibre, (x, y) => {
    const v = u0(x, y);
    if (!Number.isFinite(v)) throw new InvalidArgumentError(`initial(${x}, ${y}) returned ${describeValue(v)}; expected a finite number`, { field: 'initial', received: v });
    return v;
  });
}

function checkedSource(f: (t: number, x: number, y: number) => number, t: number): (x: number, y: number) => number {
  return (x, y) => {
    const v = f(t, x, y);
    if (!Number.isFinite(v)) throw new InvalidArgumentError(`source(${t}, ${x}, ${y}) returned ${describeValue(v)}; expected a finite number`, { field: 'source', received: v });
    return v;
  };
}

function checkedSpace(h: (x: number, y: number) => number, j: number): (x: number, y: number) => number {
  return (x, y) => {
    const v = h(x, y);
    if (!Number.isFinite(v)) throw new InvalidArgumentError(`source[${j}].space(${x}, ${y}) returned ${describeValue(v)}; expected a finite number`, { field: `source[${j}].space`, received: v });
    return v;
  };
}

