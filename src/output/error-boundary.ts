/**
 * The convection part of the energy error, ∫_I h ∫_{Γ_C} (u − u_δ)² ds dt, on the boundary parts
 * that exchange heat (docs/error-norms.md §9): the term h∫_Γ v² of the spatial form
 * a(v, v) = ∫_Ω K∇v·∇v + c v² + ∫_{Γ_C} h v², which the estimator's norm contains.
 *
 * u_δ is linear in t between breakpoints and linear along each convection segment of the union
 * mesh; the exact solution is sampled at 3 Gauss points per segment (the end point in 1D) and at
 * the time rule of every breakpoint interval, graded toward singular times as the direct rule of
 * ./error-norms is. The boundary holds far fewer points than the domain, so no time panels are
 * needed; the nodal vectors at the breakpoints are formed once more (./error-slices).
 */
import { robinSegments } from '../space/boundary-segments';
import type { BreakpointSlices } from './error-slices';
import type { TimeRule } from './error-quadrature';
import type { KnownSolution } from './error-norms';

/** Gauss–Legendre on [0, 1], 3 points (exact for degree 5; common practice). */
const S = [0.5 - Math.sqrt(0.15), 0.5, 0.5 + Math.sqrt(0.15)];
const W = [5 / 18, 8 / 18, 5 / 18];

/**
 * ∫_I Σ_s h_s ∫_s (u − u_δ)² over the convection segments of `slices.mesh` (0 where none).
 * `graded[k]` and `singular[k]` are the flags of the direct rule for breakpoint interval k (see
 * ./error-norms); `T` scales the breakpoints (fractions of T) to times. @internal
 */
export function convectionErrorSquared(slices: BreakpointSlices, exact: KnownSolution, T: number, rule: TimeRule, graded: Uint8Array, singular: Uint8Array): number {
  const mesh = slices.mesh;
  const rs = robinSegments(mesh);
  if (rs.count === 0) return 0;
  const d = mesh.dim, xy = mesh.coords, sv = rs.vertices;
  const nv = mesh.vertexCount;
  let va = new Float64Array(nv), vb = new Float64Array(nv);
  const br = slices.breaks;
  let sum = 0;
  slices.nodalAt(0, va);
  for (let k = 0; k + 1 < br.length; k++) {
    slices.nodalAt(k + 1, vb);
    const a = br[k]! * T, b = br[k + 1]! * T;
    const g = graded[k]!;
    rule.build(a, b, g === 3 ? singular[k] === 1 : g === 1, g === 3 ? singular[k + 1] === 1 : g === 2);
    for (let q = 0; q < rule.n; q++) {
      const t = rule.t[q]!, theta = (t - a) / (b - a);
      let inner = 0;
      for (let s = 0; s < rs.count; s++) {
        const p = sv[2 * s]!, r = sv[2 * s + 1]!;
        const up = (1 - theta) * va[p]! + theta * vb[p]!, ur = (1 - theta) * va[r]! + theta * vb[r]!;
        let seg = 0;
        if (p === r) {
          // 1D: the boundary point, weight h/6 per ../space/boundary-segments
          const e = up - exact.value(t, xy[d * p]!, 0);
          seg = e * e;
        } else {
          for (let g3 = 0; g3 < 3; g3++) {
            const sg = S[g3]!;
            const x = (1 - sg) * xy[2 * p]! + sg * xy[2 * r]!, y = (1 - sg) * xy[2 * p + 1]! + sg * xy[2 * r + 1]!;
            const e = (1 - sg) * up + sg * ur - exact.value(t, x, y);
            seg += W[g3]! * e * e;
          }
        }
        inner += 6 * rs.weight[s]! * seg; // weight = h|s|/6
      }
      sum += rule.w[q]! * inner;
    }
    const tmp = va;
    va = vb;
    vb = tmp;
  }
  return sum;
}
