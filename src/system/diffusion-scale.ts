/**
 * The smallest diffusion scale the space-time system resolves in double precision.
 *
 * B = ∂t ⊗ M_x + M_t ⊗ A_x: relative to the time derivative, the diffusion term carries the factor
 * κT/L² (in the scaled variables t/T, x/L). When it falls below about the rounding unit the
 * diffusion is lost next to ∂t in every application of B, and nothing the solver does brings it
 * back. Measured with u0 ≡ 1 and zero boundary values (default adaptive settings, runs to 3·10³
 * unknowns): in 1D E/‖u_δ‖ was 2.4·10⁻⁵ at κT/L² = 10⁻¹⁶ and 29, 1 250 and 79 at 10⁻¹⁷, 10⁻¹⁸ and
 * 10⁻¹⁹ (a meaningless estimate, PCG up to 163 iterations); at 10⁻⁴⁰ a residual came out
 * non-finite in 1D and CG broke down in 2D. A problem below the limit is refused before any work,
 * a decade above where it was seen to fail.
 */
import { InvalidArgumentError } from '../errors';
import type { HeatProblem } from './heat-problem';

/** Problems that passed the check. */
const checked = new WeakSet<HeatProblem>();

/** κ_max T / diam(Ω)² must be at least this (module comment). */
export const SMALLEST_DIFFUSION_SCALE = 1e-15;

/**
 * Refuses a problem whose fastest diffusion, κ_max T / diam(Ω)², is below
 * {@link SMALLEST_DIFFUSION_SCALE}, naming the figures and what to do.
 * @internal
 */
export function checkDiffusionScale(problem: HeatProblem): void {
  // Every system of an adaptive run asks again; a problem's T and initial mesh never change.
  if (checked.has(problem)) return;
  const f = problem.domain.forest;
  let kappa = 0;
  for (let e = 0; e < f.kappa.length; e++) kappa = Math.max(kappa, f.kappa[e]!);
  const c = f.initialMesh.coords;
  const d = f.dim;
  let span2 = 0;
  for (let k = 0; k < d; k++) {
    let lo = Infinity, hi = -Infinity;
    for (let i = k; i < c.length; i += d) {
      lo = Math.min(lo, c[i]!);
      hi = Math.max(hi, c[i]!);
    }
    span2 += (hi - lo) ** 2;
  }
  const ratio = (kappa * problem.T) / span2;
  if (ratio >= SMALLEST_DIFFUSION_SCALE) {
    checked.add(problem);
    return;
  }
  const L = Math.sqrt(span2);
  throw new InvalidArgumentError(
    `κT/L² = ${ratio.toExponential(2)} (largest κ ${kappa.toExponential(2)}, T = ${problem.T}, domain diameter L = ${L.toExponential(2)}) is below ${SMALLEST_DIFFUSION_SCALE}: ` +
      `over this horizon heat spreads about √(κT) = ${Math.sqrt(kappa * problem.T).toExponential(2)}, and in double precision the diffusion term vanishes next to the time derivative ` +
      '(estimates were measured to be meaningless below 1e-17); solve on a smaller domain around the region of interest, or over a longer horizon',
    { field: 'T', expected: `κT/L² ≥ ${SMALLEST_DIFFUSION_SCALE}`, received: problem.T },
  );
}
