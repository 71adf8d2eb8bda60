/**
 * The `compare.` suite: adaptive space-time solver (solveAdaptive) against time stepping
 * (bench/time-stepping.ts: implicit Euler and Crank–Nicolson with implicit-Euler start-up, uniform
 * P1, steps graded toward t = 0, V-cycle-preconditioned CG per step) on ∂t u = Δu, u0 ≡ 1, u = 0 on
 * ∂Ω, T = 0.5, in 1D (0, 1) and 2D (0, 1)². For each target error in L2(0, T; H¹₀) it prints the
 * cheapest configuration of each method that reaches it: wall time, unknowns, and the ratios.
 *
 * True errors against the exact solution (tests/helpers/heat-exact.ts: Fourier series and the
 * method of images, Carslaw & Jaeger §3.3), computed for both methods with Gauss points in time
 * per temporal interval and the degree-5 / 3-point spatial rules per leaf element (the adaptive
 * solution with `spaceTimeErrors`). Wall times exclude the error computation. Figures taken on a
 * shared machine are rough.
 *
 * Run: `npm run -s bench -- compare.` (or `compare.1d`, `compare.2d`); `--quick` uses smaller
 * searches.
 */
import { HeatProblem, intervalDomain, rectangleDomain, solveAdaptive, spaceTimeErrors, type SpatialDomain } from '../src/index';
import { unitInterval, unitSquare, type HeatExact } from '../tests/helpers/heat-exact';
import { UniformP1, steppingGradientError, timeStep, type SteppingOptions } from './time-stepping';

const T = 0.5;

interface Run {
  label: string;
  error: number;
  seconds: number;
  unknowns: number;
}

function makeDomain(dim: 1 | 2): SpatialDomain {
  return dim === 1 ? intervalDomain(0, 1, 2) : rectangleDomain(0, 1, 0, 1, 2, 2);
}

/** Time-stepping runs over a grid of spatial levels and step counts (graded steps, q = 2 and 3). */
function steppingRuns(dim: 1 | 2, quick: boolean, exact: HeatExact, maxError: number): Run[] {
  const runs: Run[] = [];
  const levels = dim === 1 ? (quick ? [5, 7, 9] : [5, 6, 7, 8, 9, 10, 11, 12]) : (quick ? [3, 4] : [3, 4, 5, 6, 7]);
  for (const L of levels) {
    const h = 2 ** -(L + 1); // mesh size of uniformSet(L) on the 2-cell / 2×2 initial meshes
    for (const method of ['euler', 'crank-nicolson'] as const) {
      for (const q of [2, 3]) {
        // steps: balance the temporal error against h (IE: τ ~ h², graded; CN: τ ~ h)
        const base = Math.ceil(0.25 / h);
        for (const f of quick ? [1] : method === 'euler' ? [1, 4, 16] : [0.5, 1, 2]) {
          const K = Math.max(8, Math.round(base * f));
          if (dim === 2 && K * 4 ** L > 6e6) continue;
          const opts: SteppingOptions = { method, steps: K, grading: q, damping: 4 };
          const t0 = performance.now();
          const d = new UniformP1(domainFor(dim), uniformSetOf(dim, L));
          const r = timeStep(d, T, () => 1, opts);
          const seconds = (performance.now() - t0) / 1000;
          const error = steppingGradientError(r, exact);
          runs.push({ label: `${method === 'euler' ? 'IE' : 'CN'} L=${L} K=${K} q=${q}`, error, seconds, unknowns: r.unknowns });
          if (error < maxError * 0.5 && f >= 1) break;
        }
      }
    }
  }
  return runs;
}

let cachedDomain: { dim: number; domain: SpatialDomain } | null = null;
function uniformSetOf(dim: 1 | 2, L: number): Int32Array {
  return domainFor(dim).uniformSet(L);
}
function domainFor(dim: 1 | 2): SpatialDomain {
  if (cachedDomain?.dim !== dim) cachedDomain = { dim, domain: makeDomain(dim) };
  return cachedDomain.domain;
}

/**
 * One adaptive run (solveAdaptive with the default settings, no unknown cap below `maxUnknowns`);
 * after every step the true error of that step's solution is computed in the onStep callback and
 * its cost is subtracted, so `seconds` is the solver's own wall time to reach that step.
 */
function adaptiveRuns(dim: 1 | 2, quick: boolean, exact: HeatExact, minTarget: number): Run[] {
  const runs: Run[] = [];
  const maxUnknowns = quick ? (dim === 1 ? 8000 : 3e4) : (dim === 1 ? 2e5 : 2e6);
  const problem = new HeatProblem({ domain: makeDomain(dim), T, initial: () => 1 });
  let excluded = 0;
  const t0 = performance.now();
  solveAdaptive(problem, {
    maxUnknowns,
    maxSteps: 1000,
    onStep: (step, solution) => {
      const seconds = (performance.now() - t0 - excluded) / 1000;
      const e0 = performance.now();
      const error = spaceTimeErrors(solution, exact).gradientL2;
      runs.push({ label: `adaptive step ${step.step} #Λ=${step.unknowns}`, error, seconds, unknowns: step.unknowns });
      excluded += performance.now() - e0;
      return error <= minTarget ? false : undefined;
    },
  });
  return runs;
}

function cheapest(runs: Run[], target: number): Run | null {
  let best: Run | null = null;
  for (const r of runs) if (r.error <= target && (best === null || r.seconds < best.seconds)) best = r;
  return best;
}

function fmt(r: Run | null): string {
  return r === null ? 'not reached'.padEnd(44) : `${r.seconds.toFixed(3).padStart(8)} s ${String(r.unknowns).padStart(9)} unk  (${r.label}, err ${r.error.toFixed(4)})`.padEnd(44);
}

/** Runs the comparison for the selected dimensions and prints the tables. */
export function runCompare(prefixes: string[], quick: boolean): void {
  const dims: (1 | 2)[] = [];
  if (prefixes.some((p) => 'compare.1d'.startsWith(p) || p.startsWith('compare.1d'))) dims.push(1);
  if (prefixes.some((p) => 'compare.2d'.startsWith(p) || p.startsWith('compare.2d'))) dims.push(2);
  for (const dim of dims) {
    const exact = dim === 1 ? unitInterval : unitSquare;
    const targets = dim === 1 ? [0.05, 0.02, 0.01] : [0.1, 0.05, 0.02];
    const ts = steppingRuns(dim, quick, exact, targets[targets.length - 1]!);
    const ad = adaptiveRuns(dim, quick, exact, targets[targets.length - 1]!);
    console.log(`\ncompare.${dim}d  u0 ≡ 1, T = ${T}, error in L2(0,T;H¹₀) (wall times on a shared machine: rough)`);
    console.log('all time-stepping runs:');
    for (const r of ts) console.log(`  ${r.label.padEnd(28)} err ${r.error.toFixed(4)}  ${r.seconds.toFixed(3)} s  ${r.unknowns} unk`);
    console.log('all adaptive runs:');
    for (const r of ad) console.log(`  ${r.label.padEnd(28)} err ${r.error.toFixed(4)}  ${r.seconds.toFixed(3)} s  ${r.unknowns} unk`);
    console.log(`${'target'.padEnd(8)} ${'time stepping (best found)'.padEnd(44)} ${'adaptive'.padEnd(44)} time ratio TS/adaptive   unknowns ratio TS/adaptive`);
    for (const target of targets) {
      const a = cheapest(ts, target);
      const b = cheapest(ad, target);
      const tr = a && b ? (a.seconds / b.seconds).toFixed(2) : '—';
      const ur = a && b ? (a.unknowns / b.unknowns).toFixed(2) : '—';
      console.log(`${String(target).padEnd(8)} ${fmt(a)} ${fmt(b)} ${tr.padStart(10)}   ${ur.padStart(10)}`);
    }
  }
}
