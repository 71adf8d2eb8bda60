/**
 * The first adaptive set where the initial state jumps inside the domain, for horizons shorter
 * than the diffusion time of the elements there (docs/adaptivity.md §2.5).
 *
 * A jump of u0 inside the domain (a hot region against a cold one, two materials at different
 * temperatures) spreads into a layer of width about √(κt) on either side of the jump, as at a held
 * edge (./layer-resolution), and holds the whole energy of the solution there:
 * ∫₀ᵀ∫|∂x u|² dx dt = J²·√(T/(2πκ)) per unit length of the jump J (from u = (J/2) erfc(x/(2√(κt))),
 * the infinite solid with a step, Carslaw & Jaeger §2.2). An element much larger than √(κT) with its
 * h-halving candidates cannot represent that layer, so the estimator sees only the part the coarse
 * hats carry. Measured before this rule on (0, 1) in two cells, held at 0, u0 = 1 on (0.3, 0.7):
 * err/E = 3.3 at the first step for κT = 10⁻⁶ and 10.5 for κT = 10⁻⁸; at 10⁻⁸ the error was nearly all
 * of the solution's energy while E said 9.5 % of it.
 *
 * **What counts as a jump.** Within an element, u0 is sampled on the regular sub-grids of spacing
 * h/16 and h/8 (h the element's diameter): D₁₆ and D₈ are the largest differences of neighbouring
 * samples. For a u0 that is smooth at the element's scale, halving the spacing halves the difference
 * (D₁₆ ≈ D₈/2); across a jump, or a front much narrower than h/16, it stays (D₁₆ ≈ D₈). An element is
 * bisected while D₁₆ > FRONT_RATIO·D₈, D₁₆ exceeds MISMATCH of the size of u0 over the domain, and its
 * diameter exceeds 4√(κT) (in 2D not below diam(Ω)/512), as at held edges (thickerThanLayer). Smooth initial
 * states, however steep at the element's scale, and horizons of a diffusion time or more add
 * nothing; a front wider than about h/16 stops the bisection there, and the loop resolves it from
 * its candidates.
 */
import { bisectWhere } from './data-resolution';
import { thickerThanLayer } from './layer-resolution';
import type { VertexClosure } from './vertex-closure';

/** Neighbour difference on the fine sub-grid, against the size of u0 over Ω, below which nothing counts. */
const MISMATCH = 1e-3;
/** D₁₆/D₈ above which the variation is a jump at the element's scale (smooth: ½; jump: 1). */
const FRONT_RATIO = 0.75;
/** Sub-grid intervals per element edge (the fine spacing is h/FINE, the coarse one 2h/FINE). */
const FINE = 16;

/**
 * The closed vertex set that resolves the layers at jumps of `initial` inside the domain (file
 * comment), and the shortest diffusion time h²/κ of the elements it creates. @internal
 */
export function frontResolvedSet(closure: VertexClosure, initial: ((x: number, y: number) => number) | null | undefined, T: number): { set: Int32Array; tau: number } {
  const f = closure.forest;
  const created: number[] = [];
  if (!initial) return { set: closure.close(created), tau: Infinity };
  const d = f.dim;
  const coarse = thickerThanLayer(closure, T);
  // Nothing to do on horizons of the elements' diffusion time or more (no sampling then).
  let any = false;
  for (let e = 0; e < f.initialElementCount && !any; e++) any = coarse(e);
  if (!any) return { set: closure.close(created), tau: Infinity };
  // The size of u0 over Ω, from the sub-grid of spacing h/4 of each initial element.
  const samples = new SubGrid(d);
  let scale = 0;
  for (let e = 0; e < f.initialElementCount; e++) scale = Math.max(scale, samples.fill(f, e, initial, 4));
  if (!(scale > 0)) return { set: closure.close(created), tau: Infinity };
  const tau = bisectWhere(closure, created, (e) => {
    if (!coarse(e)) return false;
    samples.fill(f, e, initial, 1);
    const fine = samples.largestStep(1);
    return fine > MISMATCH * scale && fine > FRONT_RATIO * samples.largestStep(2);
  });
  return { set: closure.close(created), tau };
}

/**
 * Values of u0 on the regular sub-grid of an element with FINE intervals per edge: points i/FINE in
 * 1D; barycentric (1 − (i + j)/FINE, i/FINE, j/FINE) in 2D, i + j ≤ FINE.
 */
class SubGrid {
  private readonly values: Float64Array;
  constructor(private readonly dim: 1 | 2) {
    this.values = new Float64Array(dim === 1 ? FINE + 1 : ((FINE + 1) * (FINE + 2)) / 2);
  }

  /**
   * Samples u0 on element e at the sub-grid points whose indices are multiples of `stride`; returns
   * the largest |u0| sampled (values that are not finite count as 0 and are named by the initial
   * state's own check).
   */
  fill(f: VertexClosure['forest'], e: number, u0: (x: number, y: number) => number, stride: 1 | 4): number {
    let size = 0;
    if (this.dim === 1) {
      const x0 = f.vCoord[f.eVert[2 * e]!]!, x1 = f.vCoord[f.eVert[2 * e + 1]!]!;
      for (let i = 0; i <= FINE; i += stride) size = Math.max(size, this.put(i, u0(x0 + ((x1 - x0) * i) / FINE, 0)));
      return size;
    }
    const a = f.eVert[3 * e]!, b = f.eVert[3 * e + 1]!, c = f.eVert[3 * e + 2]!;
    const ax = f.vCoord[2 * a]!, ay = f.vCoord[2 * a + 1]!;
    const bx = f.vCoord[2 * b]! - ax, by = f.vCoord[2 * b + 1]! - ay, cx = f.vCoord[2 * c]! - ax, cy = f.vCoord[2 * c + 1]! - ay;
    for (let i = 0; i <= FINE; i += stride) {
      for (let j = 0; i + j <= FINE; j += stride) size = Math.max(size, this.put(at(i, j), u0(ax + (i * bx + j * cx) / FINE, ay + (i * by + j * cy) / FINE)));
    }
    return size;
  }

  private put(k: number, u: number): number {
    const ok = Number.isFinite(u);
    this.values[k] = ok ? u : NaN;
    return ok ? Math.abs(u) : 0;
  }

  /** Largest difference of neighbouring samples on the sub-grid of spacing `step`/FINE (pairs along the three directions of the grid in 2D). */
  largestStep(step: 1 | 2): number {
    const v = this.values;
    let best = 0;
    const pair = (p: number, q: number): void => {
      const g = Math.abs(v[p]! - v[q]!);
      if (g > best) best = g; // NaN (a value that is not finite) never counts
    };
    if (this.dim === 1) {
      for (let i = 0; i + step <= FINE; i += step) pair(i, i + step);
      return best;
    }
    for (let i = 0; i <= FINE; i += step) {
      for (let j = 0; i + j <= FINE; j += step) {
        if (i + j + step <= FINE) {
          pair(at(i, j), at(i + step, j));
          pair(at(i, j), at(i, j + step));
        }
        if (j >= step) pair(at(i, j), at(i + step, j - step));
      }
    }
    return best;
  }
}

/** Position of the 2D sub-grid point (i, j) in the row-by-row layout (rows i of length FINE + 1 − i). */
function at(i: number, j: number): number {
  return i * (FINE + 1) - (i * (i - 1)) / 2 + j;
}
