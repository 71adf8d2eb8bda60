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
import { SeparableGradientError } from './separable-error';
import { UniformP1, timeStep } from './time-stepping';

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

const cpuNow = () => {
  const u = process.cpuUsage();
  return (u.user + u.system) / 1e6;
};
const T = 0.5;
const domain = rectangleDomain(0, 1, 0, 1, 2, 2);
const t0 = performance.now();
const c0 = cpuNow();
const d = new UniformP1(domain, domain.uniformSet(L));
const setupCpu = cpuNow() - c0;
// The error evaluator's own setup is not part of the method's cost.
const e0 = cpuNow();
const w0 = performance.now();
const err = new SeparableGradientError(d.mesh, unitSquare.factors!);
let excludedCpu = cpuNow() - e0;
let excludedWall = performance.now() - w0;
let e2 = 0;
const r = timeStep(d, T, () => 1, {
  method,
  steps: K,
  grading: q,
  damping,
  keepStates: false,
  onStep: (_k, a, b, u0, u1) => {
    const c = cpuNow();
    const w = performance.now();
    e2 += err.interval(a, b, u0, u1);
    excludedCpu += cpuNow() - c;
    excludedWall += performance.now() - w;
  },
});
const cpu = cpuNow() - c0 - excludedCpu;
const seconds = (performance.now() - t0 - excludedWall) / 1000;
console.log(
  JSON.stringify({
    label: `${method === 'euler' ? 'IE' : `CN(${damping})`} L=${L} K=${K} q=${q}`,
    error: Math.sqrt(e2),
    cpu,
    seconds,
    setupCpu,
    errorCpu: excludedCpu,
    iterations: r.iterations,
    spatialUnknowns: r.spatialUnknowns,
    unknowns: r.unknowns,
    peakRssBytes: process.resourceUsage().maxRSS * 1024,
  }),
);
