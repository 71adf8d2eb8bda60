/**
 * One whole adaptive run in its own process (so that its peak memory is its own):
 * `node --import tsx bench/adaptive-run.ts d1|d2 MAX_UNKNOWNS MAX_SECONDS`.
 * Reference problems: u0 ≡ 1 with u = 0 on the boundary, T = 0.5, on (0, 1) (d1) or the unit
 * square (d2), from the sparse grid of level 1. Prints one JSON row per step and a summary row
 * (the `adaptive.` suite of bench/run.ts reads them).
 */
import { HeatProblem, intervalDomain, rectangleDomain, setMemoryBudget, solveAdaptive } from '../src/index';
import { totalmem } from 'node:os';
import { observedRate } from '../src/problem-file/run';

const [which = 'd2', maxU = '1e6', maxS = '300'] = process.argv.slice(2);
// The library's default budget is half the machine (a step's estimate is conservative, ≈ 1.5× the
// measured peak); this whole-run bench may use 85 % of it, so the d = 2 run can pass 10⁶ unknowns.
setMemoryBudget(Math.floor(0.85 * totalmem()));
const domain = which === 'd1' ? intervalDomain(0, 1, 2) : rectangleDomain(0, 1, 0, 1, 2, 2);
const problem = new HeatProblem({ domain, T: 0.5, initial: () => 1 });
const component = `adaptive.${which}`;
const t0 = performance.now();
/** CPU seconds of this process so far (user + system): robust to other load on the machine. */
const cpu = (): number => { const u = process.cpuUsage(); return (u.user + u.system) / 1e6; };
const result = solveAdaptive(problem, {
  maxUnknowns: Number(maxU),
  maxSeconds: Number(maxS),
  maxSteps: 10_000,
  onStep: (s) => {
    const t = s.timings;
    const rss = process.resourceUsage().maxRSS * 1024;
    console.log(JSON.stringify({
      component: `${component}.step`, size: s.unknowns, nsPerUnit: (s.seconds * 1e9) / s.unknowns, step: s.step, estimate: s.estimate,
      pcgIterations: s.pcgIterations, riseChecks: s.riseChecks, enlarged: s.enlargedUnknowns, seconds: s.seconds,
      setupShare: t.setup / s.seconds, solveShare: t.solve / s.seconds, estimateShare: t.estimate / s.seconds, refineShare: t.refine / s.seconds,
      rssBytesPerUnknown: rss / s.unknowns, elapsed: (performance.now() - t0) / 1000, cpuSeconds: cpu(),
    }));
  },
});
const h = result.history;
// Least-squares slope of −log E against log N over the second half of the steps (the CLI's rate).
const rate = observedRate(h.map((s) => ({ dofs: s.unknowns, estimate: s.estimate }))) ?? NaN;
const seconds = (performance.now() - t0) / 1000;
const final = h.at(-1)!;
const peak = process.resourceUsage().maxRSS * 1024;
// The adaptive-loop targets, read off the history: (setup + estimate + refine) / solve per step at
// ≥ 10⁵ unknowns (target ≤ 1), and the largest ratio E_k / E_{k−1} after step 10 (target ≤ 1.05).
const big = h.filter((s) => s.unknowns >= 1e5 && s.timings.solve > 0).map((s) => (s.timings.setup + s.timings.estimate + s.timings.refine) / s.timings.solve);
let largestRise: number | null = null;
for (let k = 11; k < h.length; k++) largestRise = Math.max(largestRise ?? 0, h[k]!.estimate / h[k - 1]!.estimate);
console.log(JSON.stringify({
  component: `${component}.run`, size: final.unknowns, nsPerUnit: (seconds * 1e9) / final.unknowns, steps: h.length, seconds, cpuSeconds: cpu(),
  estimate: final.estimate, rate, stopReason: result.stopReason,
  peakRssBytes: peak, rssBytesPerUnknown: peak / final.unknowns,
  outsideSolveRatio: big.length > 0 ? [Math.min(...big), Math.max(...big)] : null, largestRiseAfterStep10: largestRise,
  // glibc's malloc keeps freed blocks of up to 32 MB in the process unless its mmap threshold is
  // fixed (docs/adaptivity.md §5); the row says which allocator setting the run had.
  mallocMmapThreshold: process.env.MALLOC_MMAP_THRESHOLD_ ?? 'default',
}));
