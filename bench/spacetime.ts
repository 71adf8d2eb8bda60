/**
 * Benchmark cases of the space-time system (`spacetime.` rows): one
 * application of S, of B and of K_X per unknown, on sparse grids of the unit
 * interval / square; the S rows also carry the PCG iteration count.
 */
import { benchmarkSystem } from '../src/system/operator-cost';
import { pcg } from '../src/system/pcg';
import type { SpaceTimeSystem } from '../src/system/space-time-system';
import type { BenchCase, BenchInstance } from './harness';

const systems = new Map<string, SpaceTimeSystem>();

/** The benchmark system on the sparse grid of level L (cached: S, B and K_X rows share it). */
function system(dim: 1 | 2, level: number): SpaceTimeSystem {
  const key = `${dim}:${level}`;
  let s = systems.get(key);
  if (!s) {
    systems.clear(); // keep at most one large system alive
    s = benchmarkSystem(dim, level, 'sparse');
    systems.set(key, s);
  }
  return s;
}

function instance(sys: SpaceTimeSystem, which: 'schur' | 'B' | 'precond', withPcg: boolean): BenchInstance {
  const n = sys.size;
  const x = new Float64Array(n).map((_, i) => Math.sin(0.37 * i + 0.1));
  const y = new Float64Array(which === 'B' ? sys.testSet.size : n);
  const op = which === 'schur' ? sys.S : which === 'B' ? sys.B : sys.KX;
  const extra: Record<string, number> = { testUnknowns: sys.testSet.size, rssMB: Math.round(process.memoryUsage().rss / 1e6) };
  if (withPcg) {
    const r = pcg(sys.S, sys.rightHandSide(), { preconditioner: sys.KX, relTol: 1e-6, maxIterations: 400 });
    extra.pcgIterations = r.iterations;
  }
  return { units: n, run: () => op.apply(x, y), extra };
}

/**
 * Here `sizes` are sparse-grid levels (the unknown count of a level is what the
 * row reports): d = 2 on the unit square with 2×2 cells, levels 5–9 give
 * 9.6e3 … 2.6e6 unknowns; d = 1 on (0,1) with 2 cells, levels 10, 13, 16 give
 * 1.3e4 … 1.2e6. Rows are ordered by level so each system is built once.
 */
export function spacetimeCases(quick: boolean): BenchCase[] {
  const levels = { 2: quick ? [4] : [5, 6, 7, 8, 9], 1: quick ? [8] : [10, 13, 16] } as const;
  const cases: BenchCase[] = [];
  for (const dim of [2, 1] as const) {
    for (const level of levels[dim]) {
      for (const which of ['schur', 'B', 'precond'] as const) {
        cases.push({
          component: `spacetime.${which}.d${dim}.sparse`,
          sizes: [level],
          setup: (L) => instance(system(dim, L), which, which === 'schur'),
        });
      }
    }
  }
  return cases;
}
