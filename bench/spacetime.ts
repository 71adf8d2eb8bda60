/**
 * Benchmark cases of the space-time system (`spacetime.` rows): one
 * application of S, of B and of K_X per unknown, on sparse grids of the unit
 * interval / square; the S rows also carry the PCG iteration count.
 */
import { benchmarkSystem } from '../src/system/operator-cost';
import { pcg } from '../src/system/pcg';
import type { SpaceTimeSystem } from '../src/system/space-time-system';
import { DoubleTree } from '../src/spacetime/double-tree';
import { intervalDomain, rectangleDomain } from '../src/space/index';
import type { BenchCase, BenchInstance } from './harness';

const systems = new Map<string, SpaceTimeSystem>();

/** Sparse-grid level whose number of unknowns is closest (in ratio) to `target`. */
function levelFor(dim: 1 | 2, target: number): number {
  const domain = dim === 1 ? intervalDomain(0, 1, 2) : rectangleDomain(0, 1, 0, 1, 2, 2);
  let best = 0;
  let bestErr = Infinity;
  for (let L = 0; L <= 24; L++) {
    const n = DoubleTree.sparseGrid(domain, L).size;
    const err = Math.abs(Math.log(n / target));
    if (err < bestErr) { best = L; bestErr = err; }
    if (n > 3 * target) break;
  }
  return best;
}

function system(dim: 1 | 2, target: number): SpaceTimeSystem {
  const key = `${dim}:${target}`;
  let s = systems.get(key);
  if (!s) {
    s = benchmarkSystem(dim, levelFor(dim, target), 'sparse');
    systems.set(key, s);
  }
  return s;
}

function instance(sys: SpaceTimeSystem, which: 'schur' | 'B' | 'precond', withPcg: boolean): BenchInstance {
  const n = sys.size;
  const x = new Float64Array(n).map((_, i) => Math.sin(0.37 * i + 0.1));
  const y = new Float64Array(which === 'B' ? sys.testSet.size : n);
  const op = which === 'schur' ? sys.S : which === 'B' ? sys.B : sys.KX;
  const extra: Record<string, number> = { testUnknowns: sys.testSet.size };
  if (withPcg) {
    const r = pcg(sys.S, sys.rightHandSide(), { preconditioner: sys.KX, relTol: 1e-6, maxIterations: 400 });
    extra.pcgIterations = r.iterations;
  }
  return { units: n, run: () => op.apply(x, y), extra };
}

export function spacetimeCases(quick: boolean): BenchCase[] {
  const sizes2 = quick ? [2e3] : [1e4, 3e4, 1e5, 3e5, 1e6];
  const sizes1 = quick ? [1e3] : [1e4, 1e5, 1e6];
  const cases: BenchCase[] = [];
  for (const [dim, sizes] of [[2, sizes2], [1, sizes1]] as const) {
    for (const which of ['schur', 'B', 'precond'] as const) {
      cases.push({
        component: `spacetime.${which}.d${dim}.sparse`,
        sizes: [...sizes],
        setup: (size) => instance(system(dim, size), which, which === 'schur'),
      });
    }
  }
  return cases;
}
