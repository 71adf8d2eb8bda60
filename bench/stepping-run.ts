/**
 * One time-stepping configuration of the `compare.2d` baseline on a mesh finer than the suite
 * searches, with its true error measured, not extrapolated: the error is streamed step by step with
 * bench/separable-error.ts (no states stored) and its CPU time is excluded from the solve's.
 *
 *   node --import tsx bench/stepping-run.ts --level 9 --steps 256 [--grading 3] [--method cn|ie] [--damping 4]
 *
 * Problem as in compare.2d: ∂t u = Δu on (0, 1)² (2 × 2 initial cells, uniform refinement of
 * level L: h = 2^-(L+1)), u0 ≡ 1, u = 0 on ∂Ω, T = 0.5; error in L2(0, T; H¹₀) against the product
 * of Fourier-series / method-of-images factors (Carslaw & Jaeger §3.3). Prints one JSON line.
 */
import { rectangleDomain } from '../src/index';
import { unitSquare } from '../tests/helpers/heat-exact';
import { timedSteppingError } from './separable-error';
import { UniformP1 } from './time-stepping';

function option(name: string, fallback?: string): string {
  const i = process.argv.indexOf(`--${name}`);
  const v = i >= 0 ? process.argv[i + 1] : fallback;
  if (v === undefined) throw new Error(`stepping-run: --${name} is required`);
  return v;
}

const L = Number(option('level'));
const K = Number(option('steps'));
const q = Number(option('grading', '3'));
const method = option('method', 'cn') === 'ie' ? 'euler' : 'crank-nicolson';
const damping = Number(option('damping', '4'));
if (!Number.isInteger(L) || L < 1 || L > 11) throw new Error(`stepping-run: --level ${L} must be an integer in 1..11`);
if (!Number.isInteger(K) || K < 1) throw new Error(`stepping-run: --steps ${K} must be a positive integer`);
if (!(q >= 1 && q <= 4)) throw new Error(`stepping-run: --grading ${q} must be in [1, 4]`);
if (!Number.isInteger(damping) || damping < 0) throw new Error(`stepping-run: --damping ${damping} must be a non-negative integer`);

const T = 0.5;
const domain = rectangleDomain(0, 1, 0, 1, 2, 2);
const { result: r, error, cpu, seconds, setupCpu, errorCpu } = timedSteppingError(() => new UniformP1(domain, domain.uniformSet(L)), T, unitSquare.factors!, {
  method,
  steps: K,
  grading: q,
  damping,
});
console.log(
  JSON.stringify({
    label: `${method === 'euler' ? 'IE' : `CN(${damping})`} L=${L} K=${K} q=${q}`,
    error,
    cpu,
    seconds,
    setupCpu,
    errorCpu,
    iterations: r.iterations,
    spatialUnknowns: r.spatialUnknowns,
    unknowns: r.unknowns,
    peakRssBytes: process.resourceUsage().maxRSS * 1024,
  }),
);
