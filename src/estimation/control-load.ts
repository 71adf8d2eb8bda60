/**
 * Right-hand side b = Bᵀ K_Y ℓ for a source χ(t) h(x) whose time factor χ is a piecewise
 * polynomial on a user grid (a basis function of a control amplitude). As for the system's own
 * loads, ℓ[(μ,ν)] = ∫ ψ_μ χ dt · ∫ h φ_ν dx; here the time integral is split at the grid points
 * as well as at the midpoint of the test interval, so Gauss–Legendre with 3 points is exact for
 * piecewise-linear χ (ψ_μ is linear on each half of its interval, docs/method.md §3.2).
 */
import { evaluateTemporal } from '../time/index';
import { loadVector } from '../space/index';
import { gaussLegendre01 } from '../numerics/gauss-legendre';
import type { SpaceTimeSystem } from '../system/space-time-system';

/** One basis function of the amplitude: `value` on [from, to], zero outside. */
export interface ControlBasis {
  from: number;
  to: number;
  value: (t: number) => number;
}

const GAUSS = gaussLegendre01(3);

/** b for the source basis.value(t) · h(x) on the system's sets; spatial loads cached per fibre in `cache`. */
export function controlLoad(
  system: SpaceTimeSystem, basis: ControlBasis, grid: Float64Array, h: (x: number, y: number) => number,
  cache: Map<number, Float64Array> = new Map(),
): Float64Array {
  const testSet = system.testSet;
  const { tree } = testSet;
  const { domain, T } = system.problem;
  const lf = new Float64Array(testSet.size);
  const cuts: number[] = [];
  for (let i = 0; i < tree.size; i++) {
    const fibreId = testSet.nodeFibre[i]!;
    const fibre = testSet.pool.get(fibreId);
    if (fibre.length === 0) continue;
    const l = tree.level[i]!;
    const k = tree.index[i]!;
    const width = l === 0 ? T : T * 2 ** -(l - 1);
    const a = l === 0 ? 0 : k * width;
    const b = l === 0 ? T : (k + 1) * width;
    const lo = Math.max(a, basis.from);
    const hi = Math.min(b, basis.to);
    if (!(hi > lo)) continue;
    cuts.length = 0;
    cuts.push(lo, hi);
    const mid = 0.5 * (a + b);
    if (mid > lo && mid < hi) cuts.push(mid);
    for (let g = 0; g < grid.length; g++) if (grid[g]! > lo && grid[g]! < hi) cuts.push(grid[g]!);
    cuts.sort((p, q) => p - q);
    let c0 = 0;
    let c1 = 0;
    for (let s = 0; s + 1 < cuts.length; s++) {
      const s0 = cuts[s]!;
      const len = cuts[s + 1]! - s0;
      for (let q = 0; q < GAUSS.nodes.length; q++) {
        const t = s0 + len * GAUSS.nodes[q]!;
        const w = len * GAUSS.weights[q]! * basis.value(t);
        c0 += w * evaluateTemporal('test', l, k, 0, t, T).value;
        c1 += w * evaluateTemporal('test', l, k, 1, t, T).value;
      }
    }
    let load = cache.get(fibreId);
    if (!load) {
      load = loadVector(domain, fibre, h);
      cache.set(fibreId, load);
    }
    const o0 = testSet.functionOffset[2 * i]!;
    const o1 = testSet.functionOffset[2 * i + 1]!;
    for (let p = 0; p < fibre.length; p++) {
      lf[o0 + p] = c0 * load[p]!;
      lf[o1 + p] = c1 * load[p]!;
    }
  }
  const v = new Float64Array(testSet.size);
  system.KY.apply(lf, v);
  const out = new Float64Array(system.size);
  system.Bt.apply(v, out);
  return out;
}
