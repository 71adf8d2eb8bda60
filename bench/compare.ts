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
 * solution with `spaceTimeErrors`; the finest 2D stepping mesh with the same rules evaluated once
 * per distinct coordinate, bench/separable-error.ts). Wall times exclude the error computation.
 * Figures taken on a shared machine are rough.
 *
 * Run: `npm run -s bench -- compare.` (or `compare.1d`, `compare.2d`); `--quick` uses smaller
 * searches.
 */
import { totalmem } from 'node:os';
import { HeatProblem, intervalDomain, rectangleDomain, setMemoryBudget, solveAdaptive, spaceTimeErrors, type SpatialDomain } from '../src/index';
import { unitInterval, unitSquare, type HeatExact } from '../tests/helpers/heat-exact';
import { UniformP1, steppingGradientError, timeStep, type SteppingOptions } from './time-stepping';
import { timedSteppingError } from './separable-error';

const T = 0.5;

interface Run {
  label: string;
  /** True L2(0,T;H¹₀) error. */
  error: number;
  seconds: number;
  /** CPU seconds of this process (user + system) for the same work: robust to other load. */
  cpu: number;
  unknowns: number;
}

/** CPU seconds of this process so far (user + system). */
function cpuNow(): number {
  const u = process.cpuUsage();
  return (u.user + u.system) / 1e6;
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
        let lastK = 0;
        for (const f of quick ? [1] : method === 'euler' ? [1, 4, 16] : [0.5, 1, 2]) {
          const K = Math.max(8, Math.round(base * f));
          if (K === lastK) continue; // small meshes: the floor of 8 steps repeats a configuration
          lastK = K;
          if (dim === 2 && K * 4 ** L > 6e6) continue;
          const opts: SteppingOptions = { method, steps: K, grading: q, damping: 4 };
          const label = `${method === 'euler' ? 'IE' : 'CN'} L=${L} K=${K} q=${q}`;
          if (exact.factors) {
            // 2D: the error streamed with the separable evaluator (same rules, tested against the
            // per-point loop to 1e-12), its cost excluded; the per-point loop would take most of
            // the suite's time on the long implicit-Euler runs.
            const setup = () => new UniformP1(domainFor(dim), uniformSetOf(dim, L));
            const { result: r, error, seconds, cpu } = timedSteppingError(setup, T, exact.factors, opts);
            runs.push({ label, error, seconds, cpu, unknowns: r.unknowns });
            if (error < maxError * 0.5 && f >= 1) break;
            continue;
          }
          const t0 = performance.now();
          const c0 = cpuNow();
          const d = new UniformP1(domainFor(dim), uniformSetOf(dim, L));
          const r = timeStep(d, T, () => 1, opts);
          const seconds = (performance.now() - t0) / 1000;
          const cpu = cpuNow() - c0;
          const error = steppingGradientError(r, exact);
          runs.push({ label, error, seconds, cpu, unknowns: r.unknowns });
          if (error < maxError * 0.5 && f >= 1) break;
        }
      }
    }
  }
  if (dim === 2 && !quick) runs.push(...finerSteppingRuns(exact, levels[levels.length - 1]!));
  return runs;
}

/**
 * 2D meshes finer than the searched ones. The per-point error loop would cost far more than the
 * solve there, so the error is streamed step by step with the separable evaluator
 * (bench/separable-error.ts: the exact solution is a product of two slab factors) and its CPU time
 * is excluded. Crank–Nicolson with q = 3 and K = 0.25/h, the cheapest configuration that reached
 * the floor on the searched meshes, and with fewer steps where that still reaches 0.05. Finer
 * levels still: bench/stepping-run.ts.
 */
function finerSteppingRuns(exact: HeatExact, finest: number): Run[] {
  const runs: Run[] = [];
  if (!exact.factors) return runs;
  for (const L of [finest + 1]) {
    const h = 2 ** -(L + 1);
    const K0 = Math.ceil(0.25 / h);
    // K0 reaches the mesh's floor; 0.625·K0 (80 steps on L = 8) is the fewest steps that still
    // reach 0.05 there (bench/stepping-run.ts on L = 8: K = 72, 80, 88 gave 0.0518, 0.0494, 0.0477).
    for (const K of [Math.round(0.625 * K0), K0]) {
      const { result: r, error, seconds, cpu } = timedSteppingError(() => new UniformP1(domainFor(2), uniformSetOf(2, L)), T, exact.factors, {
        method: 'crank-nicolson',
        steps: K,
        grading: 3,
        damping: 4,
      });
      runs.push({ label: `CN L=${L} K=${K} q=3`, error, seconds, cpu, unknowns: r.unknowns });
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
 * One adaptive run (solveAdaptive with the default settings, no unknown cap below `maxUnknowns`).
 * The true error of a step's solution is computed in the onStep callback, and its cost subtracted,
 * so `seconds` and `cpu` are the solver's own to reach that step. In 2D the error is computed only
 * at steps whose estimate E has come within reach of the next unreached target (true error ≈
 * 1.5–1.7 E on this problem at these sizes, docs/adaptivity.md §7): its cost grows faster than the
 * solve's.
 */
function adaptiveRuns(dim: 1 | 2, quick: boolean, exact: HeatExact, targets: number[]): Run[] {
  const runs: Run[] = [];
  // In 2D the run goes on to about 2.5·10⁶ unknowns (≈ 10 GB), where its true error passes 0.02;
  // the library's default budget (half the machine, with a conservative estimate) would stop it
  // earlier, so this bench allows 85 % of the machine, like the adaptive. suite.
  const maxUnknowns = quick ? (dim === 1 ? 8000 : 3e4) : (dim === 1 ? 2e5 : 2.6e6);
  if (dim === 2 && !quick) setMemoryBudget(Math.floor(0.85 * totalmem()));
  const problem = new HeatProblem({ domain: makeDomain(dim), T, initial: () => 1 });
  const open = [...targets].sort((a, b) => b - a);
  let excluded = 0;
  let excludedCpu = 0;
  const t0 = performance.now();
  const c0 = cpuNow();
  solveAdaptive(problem, {
    maxUnknowns,
    maxSteps: 1000,
    onStep: (step, solution) => {
      const seconds = (performance.now() - t0 - excluded) / 1000;
      const cpu = cpuNow() - c0 - excludedCpu;
      if (dim === 2 && !quick && !(step.estimate * 1.5 <= open[0]!)) return undefined;
      const e0 = performance.now();
      const ec = cpuNow();
      const error = spaceTimeErrors(solution, exact).gradientL2;
      runs.push({ label: `adaptive step ${step.step} #Λ=${step.unknowns}`, error, seconds, cpu, unknowns: step.unknowns });
      excluded += performance.now() - e0;
      excludedCpu += cpuNow() - ec;
      while (open.length > 0 && error <= open[0]!) open.shift();
      return open.length === 0 ? false : undefined;
    },
  });
  return runs;
}

/**
 * For a target no searched mesh reached: the level the observed error rate in h would need, and
 * the CPU time of CN at K = 0.25/h there, grown from the two finest timed meshes by their observed
 * cost factor per level (about 8: 4× the vertices, 2× the steps). A rough extrapolation, labelled so.
 */
function extrapolatedStepping(ts: Run[], target: number): string {
  const cn = ts.filter((r) => /^CN L=\d+ K=\d+ q=3$/.test(r.label) && r.label.endsWith('q=3'));
  const byL = new Map<number, Run>();
  for (const r of cn) {
    const L = Number(/L=(\d+)/.exec(r.label)![1]);
    const K = Number(/K=(\d+)/.exec(r.label)![1]);
    if (K === Math.ceil(0.25 * 2 ** (L + 1))) byL.set(L, r);
  }
  const Ls = [...byL.keys()].sort((a, b) => a - b);
  // Error rate and cost growth from the two finest meshes.
  if (Ls.length < 2) return 'not enough meshes to extrapolate';
  const L1 = Ls[Ls.length - 2]!;
  const L2 = Ls[Ls.length - 1]!;
  const m1 = byL.get(L1)!;
  const m2 = byL.get(L2)!;
  const errRate = Math.log2(m1.error / m2.error) / (L2 - L1);
  const costFactor = (byL.get(L2)!.cpu / byL.get(L1)!.cpu) ** (1 / (L2 - L1));
  if (!(errRate > 0)) return 'error not decreasing with h';
  const levels = Math.max(1, Math.ceil(Math.log2(m2.error / target) / errRate));
  const cpu = m2.cpu * costFactor ** levels;
  return `level ${L2 + levels} (h = 2^-${L2 + levels + 1}), ≈ ${cpu.toExponential(1)} cpu-s (error rate ${errRate.toFixed(2)} and cost ×${costFactor.toFixed(1)} per level from L = ${L1}, ${L2}; measure it with bench/stepping-run.ts)`;
}

function cheapest(runs: Run[], target: number): Run | null {
  let best: Run | null = null;
  for (const r of runs) if (r.error <= target && (best === null || r.cpu < best.cpu)) best = r;
  return best;
}

function fmt(r: Run | null): string {
  if (r === null) return 'not reached'.padEnd(64);
  return `${r.cpu.toFixed(2).padStart(8)} cpu-s ${r.seconds.toFixed(2).padStart(8)} s ${String(r.unknowns).padStart(9)} unk (${r.label}, err ${r.error.toFixed(4)})`.padEnd(64);
}

/** Runs the comparison for the selected dimensions and prints the tables. */
export function runCompare(prefixes: string[], quick: boolean): void {
  const dims: (1 | 2)[] = [];
  if (prefixes.some((p) => 'compare.1d'.startsWith(p) || p.startsWith('compare.1d'))) dims.push(1);
  if (prefixes.some((p) => 'compare.2d'.startsWith(p) || p.startsWith('compare.2d'))) dims.push(2);
  for (const dim of dims) {
    const exact = dim === 1 ? unitInterval : unitSquare;
    const targets = dim === 1 ? [0.05, 0.02, 0.01] : [0.1, 0.05, 0.03, 0.02];
    const ts = steppingRuns(dim, quick, exact, targets[targets.length - 1]!);
    const ad = adaptiveRuns(dim, quick, exact, targets);
    console.log(`\ncompare.${dim}d  u0 ≡ 1, T = ${T}, error in L2(0,T;H¹₀); both single-threaded, compared by CPU seconds (wall seconds also shown)`);
    console.log('all time-stepping runs:');
    for (const r of ts) console.log(`  ${r.label.padEnd(28)} err  ${r.error.toFixed(4)}  ${r.cpu.toFixed(2)} cpu-s  ${r.seconds.toFixed(2)} s  ${r.unknowns} unk`);
    console.log('all adaptive runs (errors computed near the targets):');
    for (const r of ad) console.log(`  ${r.label.padEnd(28)} err  ${r.error.toFixed(4)}  ${r.cpu.toFixed(2)} cpu-s  ${r.seconds.toFixed(2)} s  ${r.unknowns} unk`);
    console.log(`${'target'.padEnd(8)} ${'time stepping (cheapest found)'.padEnd(64)} ${'adaptive'.padEnd(64)} cpu ratio TS/adaptive   unknowns ratio TS/adaptive`);
    for (const target of targets) {
      const a = cheapest(ts, target);
      const b = cheapest(ad, target);
      const tr = a && b ? (a.cpu / b.cpu).toFixed(2) : '—';
      const ur = a && b ? (a.unknowns / b.unknowns).toFixed(2) : '—';
      console.log(`${String(target).padEnd(8)} ${fmt(a)} ${fmt(b)} ${tr.padStart(10)}   ${ur.padStart(10)}`);
      if (!a && b && dim === 2) console.log(`${''.padEnd(8)} time stepping, extrapolated: ${extrapolatedStepping(ts, target)}`);
    }
  }
}
