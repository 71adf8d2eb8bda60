/**
 * One adaptive run on a reference problem (u0 ≡ 1, u = 0 on the boundary, T = 0.5; d1 = (0, 1),
 * d2 = the unit square, default settings) with the true L2(0,T;H¹₀) error against the exact
 * solution (tests/helpers/heat-exact.ts: Fourier series / method of images, Carslaw & Jaeger §3.3)
 * at every step where #Λ has doubled since the last evaluation, up to `MAX_ERROR_UNKNOWNS`:
 *
 *   node --import tsx bench/rate-study.ts d1|d2 MAX_UNKNOWNS [MAX_ERROR_UNKNOWNS] > run.jsonl
 *
 * One JSON line per step: step, N = #Λ, E, err (null where not evaluated), cpu = CPU seconds of
 * the solver alone (the error evaluations are subtracted), pcg iterations, peak RSS so far.
 * `bench/rate-plot.ts` draws the lines as a log–log SVG (docs/adaptivity.md §7).
 */
import { HeatProblem, intervalDomain, rectangleDomain, setMemoryBudget, solveAdaptive, spaceTimeErrors } from '../src/index';
import { unitInterval, unitSquare } from '../tests/helpers/heat-exact';
import { totalmem } from 'node:os';

const [which = 'd2', maxU = '2e5', maxErrU = 'Infinity'] = process.argv.slice(2);
if (which !== 'd1' && which !== 'd2') throw new Error(`first argument must be d1 or d2, not ${which}`);
setMemoryBudget(Math.floor(0.9 * totalmem()));
const d2 = which === 'd2';
const problem = new HeatProblem({ domain: d2 ? rectangleDomain(0, 1, 0, 1, 2, 2) : intervalDomain(0, 1, 2), T: 0.5, initial: () => 1 });
const exact = d2 ? unitSquare : unitInterval;
const cpuNow = (): number => { const u = process.cpuUsage(); return (u.user + u.system) / 1e6; };
const c0 = cpuNow();
let excluded = 0;
let nextError = 1000;
const result = solveAdaptive(problem, {
  maxUnknowns: Number(maxU),
  maxSteps: 10_000,
  onStep: (s, solution) => {
    const cpu = cpuNow() - c0 - excluded;
    let err: number | null = null;
    if (s.unknowns >= nextError && s.unknowns <= Number(maxErrU)) {
      const e0 = cpuNow();
      err = spaceTimeErrors(solution, exact).gradientL2;
      excluded += cpuNow() - e0;
      nextError = 2 * s.unknowns;
    }
    console.log(JSON.stringify({ step: s.step, N: s.unknowns, E: s.estimate, err, cpu, pcg: s.pcgIterations, peakRss: process.resourceUsage().maxRSS * 1024 }));
  },
});
console.error(`stop ${result.stopReason} after ${result.history.length} steps; error evaluations took ${excluded.toFixed(1)} CPU s`);
