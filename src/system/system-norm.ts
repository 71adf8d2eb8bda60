/**
 * The size of a solution u of S u = b in the norm of the least-squares system:
 * ‖u‖²_S = uᵀ S u ≈ uᵀ b (equal for the exact solve; the algebraic error of an adaptive step is at
 * most solverFraction · E). Equivalent to the norm the estimator measures (docs/adaptivity.md §6).
 */

/** (uᵀ b)^{1/2}, 0 where rounding makes uᵀ b negative. @internal */
export function systemNorm(u: Float64Array, b: Float64Array): number {
  let ub = 0;
  for (let i = 0; i < u.length; i++) ub += u[i]! * b[i]!;
  return Math.sqrt(Math.max(0, ub));
}
