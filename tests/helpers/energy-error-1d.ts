import type { SpaceTimeSolution } from '../../src/index';
import { gradedGauss } from './graded-gauss';

/**
 * The error of a solution on (0, 1) against `exact` (value and ∂x) in the Y-energy with transfer h
 * at both ends, (∫∫|∂x e|² + h ∫(e(t,0)² + e(t,1)²) dt)^½ (h = 0: ‖∂x e‖ in L2(0,T;L2)), integrated by
 * hand on panels graded toward the break points in x (the ends and any interior layers) and toward
 * t = 0, from point values of the solution only: the library's error module would need the layers
 * resolved by the solution's own mesh to integrate them. ∂x of the piecewise-linear solution comes
 * from one-sided differences toward the middle, exact inside an element.
 */
export function energyError1D(
  sol: SpaceTimeSolution, exact: (t: number, x: number) => readonly [number, number], T: number,
  opts: { breaks?: readonly number[]; transfer?: number } = {},
): number {
  const h = opts.transfer ?? 0;
  const xs = gradedGauss(opts.breaks ?? [0, 1], 30, 4), ts = gradedGauss([0, 2 * T], 30, 4, T);
  const dx = 1e-9, pts = new Float64Array(2 * xs.p.length);
  xs.p.forEach((x, i) => { pts[2 * i] = x; pts[2 * i + 1] = x < 0.5 ? x + dx : x - dx; });
  let sum = 0;
  ts.p.forEach((t, k) => {
    const v = sol.evaluate(t, pts);
    let g = 0;
    xs.p.forEach((x, i) => { g += xs.w[i]! * ((v[2 * i + 1]! - v[2 * i]!) / (pts[2 * i + 1]! - x) - exact(t, x)[1]) ** 2; });
    if (h > 0) {
      const vb = sol.evaluate(t, [0, 1]);
      const e0 = vb[0]! - exact(t, 0)[0], e1 = vb[1]! - exact(t, 1)[0];
      g += h * (e0 * e0 + e1 * e1);
    }
    sum += ts.w[k]! * g;
  });
  return Math.sqrt(sum);
}
