/**
 * The memory model of an adaptive step (docs/adaptivity.md §6): what `solveAdaptive` checks
 * against the memory budget before it starts a step.
 */
import { BYTES_PER_SYSTEM_UNKNOWN } from '../validation/index';

/**
 * Peak bytes per unknown of the enlarged set Λ̲ while the estimator works on it (Λ̲ with its test
 * set and the vectors of B, K_Y and Bᵀ). Measured once: the 2D L-shape run with u0 ≡ 1 up to
 * #Λ = 88,608, #Λ̲ = 444,742 grew the resident set by 356 MB, i.e. ≈ 680 B per Λ̲ unknown after
 * 800 B per Λ unknown for the system (Node 20, machine shared with other work, rough); rounded up.
 */
export const BYTES_PER_ENLARGED_UNKNOWN = 1000;

/**
 * The same for d = 2, measured after the compact V-cycle hierarchies and shared scratch
 * (docs/adaptivity.md §5): the whole process's peak, less 80 MB for Node itself, was 301 B per Λ̲
 * unknown on the unit-square reference run at #Λ = 1.07·10⁶ (#Λ̲ = 5.28·10⁶) and 317 B on the
 * L-shaped domain (u0 ≡ 1, T = 1) at #Λ = 3.6·10⁵; rounded up to 400 (with the 800 B per Λ
 * unknown of the system term, the estimate is 1.8× the reference run's peak). In d = 1 the
 * measured 790–825 B per Λ̲ unknown (204 379 unknowns, #Λ̲ ≈ 2.9 #Λ) keep the old figure.
 */
export const BYTES_PER_ENLARGED_UNKNOWN_2D = 400;

/**
 * Estimated peak memory in bytes of an adaptive step on `unknowns` = #Λ whose enlarged set has
 * `enlargedUnknowns` = #Λ̲, in space dimension `dim`: the system on Λ with its solve (800 B per
 * unknown, the figure the space-time system's own check uses) and the estimator on Λ̲ (1000 B per
 * unknown in d = 1, 400 B in d = 2; both measured with margin). `solveAdaptive` stops with reason
 * `'memory'` before a step whose estimate exceeds the memory budget.
 *
 * @example
 * ```ts
 * import { adaptiveStepBytes } from 'chronomesh';
 * console.log(adaptiveStepBytes(1e5, 5e5) / 1024 ** 3 < 2); // → true — a 1e5-unknown step with #Λ̲ = 5e5 fits in 2 GiB
 * console.log(adaptiveStepBytes(1e6, 5e6, 2) / 1024 ** 3 < 3); // → true — d = 2, 1e6 unknowns: under 3 GiB
 * ```
 */
export function adaptiveStepBytes(unknowns: number, enlargedUnknowns: number, dim: 1 | 2 = 1): number {
  const perEnlarged = dim === 2 ? BYTES_PER_ENLARGED_UNKNOWN_2D : BYTES_PER_ENLARGED_UNKNOWN;
  return unknowns * BYTES_PER_SYSTEM_UNKNOWN + enlargedUnknowns * perEnlarged;
}
