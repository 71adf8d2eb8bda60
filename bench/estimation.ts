/**
 * Benchmark cases of the estimation layer (`estimation.` rows), per space-time unknown: one
 * forward solve, one gradient (forward + adjoint solve), one Hessian–vector product (two solves)
 * and one application of the probe functional's Eᵀ W E, for a d = 2 sparse grid with three
 * separable sources and eight probes read at 20 times (the setting of examples/heater-estimation).
 * The gradient/forward time ratio (`gradientOverForward`, from interleaved pairs) is the figure of
 * merit: ideally about 2 (one forward and one adjoint solve of similar iteration counts).
 *
 * `estimation.region-build` and `estimation.region-hessian-apply`: a space-time tracking functional
 * (regionTracking over a quarter of the unit square, with a target) built on the sets of adaptive
 * runs (u0 ≡ 1, T = 0.5, to about 2·10⁴ and 8·10⁴ unknowns; 5·10³ with `--quick`), per unknown of
 * the set; `bytesPerUnknown` is what one functional holds: the growth of heap and array buffers
 * over one build, between two forced collections (`npm run bench` exposes the collector).
 */
import {
  DoubleTree, HeatProblem, ReducedFunctional, SpaceTimeSystem, probeMisfit, rectangleDomain, regionTracking, solveAdaptive, sourceAmplitudes,
} from '../src/index';
import type { BenchCase, BenchInstance } from './harness';

type Which = 'forward' | 'gradient' | 'hessian-vector' | 'probe-hessian-apply';

function model(level: number): ReducedFunctional {
  const domain = rectangleDomain(0, 2, 0, 1, 4, 2, { insulated: (_x, y) => y > 1e-9 });
  const system = new SpaceTimeSystem(new HeatProblem({ domain, T: 1 }), DoubleTree.sparseGrid(domain, level));
  const bump = (cx: number) => (x: number, y: number) => Math.exp(-((x - cx) ** 2 + (y - 0.5) ** 2) / 0.0144);
  const params = sourceAmplitudes(system, [0.5, 1, 1.5].map((c) => ({ time: () => 1, space: bump(c) })));
  const points = Array.from({ length: 8 }, (_, k) => [0.2 + 0.2 * k, 0.3 + 0.05 * k]);
  const times = Array.from({ length: 20 }, (_, j) => (j + 1) / 20);
  const J = probeMisfit(system, { times, points, data: times.map(() => points.map(() => 0.01)) });
  return new ReducedFunctional(system, params, J, { accuracy: 1e-6 });
}

function instance(J: ReducedFunctional, which: Which): BenchInstance {
  const m = Float64Array.of(1, 2, 3);
  const n = J.system.size;
  const extra: Record<string, number> = { parameters: J.size, rows: J.functional.rowCount };
  switch (which) {
    case 'forward':
      return { units: n, run: () => void J.state(m), extra };
    case 'gradient': {
      const g = J.gradient(m);
      // Interleaved forward / gradient pairs: their time ratio is robust to a machine whose load changes between rows.
      const ratios: number[] = [];
      for (let rep = 0; rep < 3; rep++) {
        let t = performance.now();
        J.state(m);
        const tf = performance.now() - t;
        t = performance.now();
        J.gradient(m);
        ratios.push((performance.now() - t) / tf);
      }
      ratios.sort((a, b) => a - b);
      return {
        units: n, run: () => void J.gradient(m),
        extra: { ...extra, forwardIterations: g.forwardIterations, adjointIterations: g.adjointIterations, gradientOverForward: +ratios[1]!.toFixed(2) },
      };
    }
    case 'hessian-vector':
      return { units: n, run: () => void J.hessianVector(m), extra };
    case 'probe-hessian-apply': {
      const v = new Float64Array(n).map((_, i) => Math.sin(0.37 * i));
      const out = new Float64Array(n);
      return { units: n, run: () => void J.functional.hessianApply(v, out), extra };
    }
  }
}

/** Sizes are sparse-grid levels on (0, 2) × (0, 1) with 4 × 2 cells (5.2e3 and 2.1e4 unknowns). */
export function estimationCases(quick: boolean): BenchCase[] {
  const levels = quick ? [3] : [4, 5];
  let cached: { level: number; J: ReducedFunctional } | null = null;
  const get = (level: number) => {
    if (!cached || cached.level !== level) cached = { level, J: model(level) };
    return cached.J;
  };
  const cases: BenchCase[] = [];
  const tracked = quick ? [5e3] : [2e4, 8e4];
  for (const size of tracked) {
    for (const which of ['region-build', 'region-hessian-apply'] as const) {
      cases.push({ component: `estimation.${which}`, sizes: [size], setup: (n) => trackingInstance(n, which) });
    }
  }
  for (const level of levels) {
    for (const which of ['forward', 'gradient', 'hessian-vector', 'probe-hessian-apply'] as const) {
      cases.push({ component: `estimation.${which}.L${level}`, sizes: [level], setup: (l) => instance(get(l), which) });
    }
  }
  return cases;
}

let adaptiveSet: { size: number; system: SpaceTimeSystem } | null = null;

function trackingInstance(size: number, which: 'region-build' | 'region-hessian-apply'): BenchInstance {
  if (!adaptiveSet || adaptiveSet.size !== size) {
    const problem = new HeatProblem({ domain: rectangleDomain(0, 1, 0, 1, 2, 2), T: 0.5, initial: () => 1 });
    adaptiveSet = { size, system: new SpaceTimeSystem(problem, solveAdaptive(problem, { maxUnknowns: size }).set) };
  }
  const { system } = adaptiveSet;
  const n = system.size;
  const build = () => regionTracking(system, { inside: (x, y) => x < 0.5 && y < 0.5, target: (t, x, y) => t * x * y });
  const gc = (globalThis as { gc?: () => void }).gc;
  const mem = () => {
    gc?.();
    gc?.(); // a second pass frees what the first left to finalizers
    const m = process.memoryUsage();
    return m.heapUsed + m.arrayBuffers;
  };
  const before = mem();
  const J = build();
  const bytesPerUnknown = Math.round((mem() - before) / n);
  const extra = { rows: J.rowCount, temporalLevels: system.trialSet.tree.maxLevel + 1, bytesPerUnknown };
  if (which === 'region-build') return { units: n, run: () => void build(), extra };
  const v = new Float64Array(n).map((_, i) => Math.sin(0.37 * i));
  const out = new Float64Array(n);
  return { units: n, run: () => void J.hessianApply(v, out), extra };
}
