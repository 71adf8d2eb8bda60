/**
 * Space-time error norms of a discrete solution against a known solution,
 * for verification studies: ‖u − u_δ‖_{L2(I; H¹₀)} (gradient part) and
 * ‖u − u_δ‖_{L2(I; L2)} (docs/error-norms.md).
 *
 * u_δ is linear in t between consecutive breakpoints of its trial functions,
 * and all its time slices live on one leaf mesh (the union of the fibres):
 * nodal vectors are formed once per breakpoint (./error-slices). Near t = 0 and
 * user-named singular times every breakpoint interval gets Gauss points, graded
 * with t = a + s² on intervals touching the singular time (the direct rule);
 * elsewhere runs of breakpoint intervals are grouped into time panels where the
 * exact solution is sampled at 12 Gauss times only (./error-panels). Space
 * integrals use degree-5 rules, graded toward the Dirichlet boundary while the
 * boundary layer √(κt) is thinner than the element (./error-quadrature).
 */
import { InvalidArgumentError } from '../errors';
import { checkFunction, checkInstance, checkObject, checkOptions } from '../validation/index';
import { SpaceTimeSolution as SolutionClass } from '../spacetime/space-time-solution';
import { BreakpointSlices, lowerBound } from './error-slices';
import { SliceIntegrator, TimeRule } from './error-quadrature';
import { MAX_PANEL, TimePanels, intervalQuadratic } from './error-panels';
import { CellEnergy } from './error-energy';
import { convectionErrorSquared } from './error-boundary';
import { liftingOf } from '../space/boundary-lifting';
type SpaceTimeSolution = SolutionClass;

/** A known solution: value and spatial gradient (writes `dim` components into `grad`). */
export interface KnownSolution {
  value(t: number, x: number, y: number): number;
  gradient(t: number, x: number, y: number, grad: Float64Array): void;
  /** Optional, for speed: value and gradient in one call (writes `grad`, returns the value). */
  valueAndGradient?(t: number, x: number, y: number, grad: Float64Array): number;
}

/** Result of {@link spaceTimeErrors}. */
export interface SpaceTimeErrors {
  /** (∫_I ‖∇(u − u_δ)‖² dt)^{1/2} */
  gradientL2: number;
  /** (∫_I ‖u − u_δ‖² dt)^{1/2} */
  valueL2: number;
  /**
   * (∫_I a(u − u_δ, u − u_δ) dt)^{1/2} with the spatial form a(v, v) = ∫_Ω K∇v·∇v + c v² +
   * ∫_{Γ_C} h v² of the solution's domain (K = κ·I for isotropic diffusion; κ, K and c as the
   * library takes them, one value per initial element; h on the convection parts). The error in the
   * norm the estimator measures: compare E with this, not with gradientL2, when κ ≠ 1, c ≠ 0 or
   * some boundary part convects (equal to gradientL2 for κ = 1, c = 0 and no convection).
   */
  energyL2: number;
  /** Number of times at which the exact solution was sampled (on the whole mesh). */
  slices: number;
  /** Number of exact-solution evaluations (calls of `valueAndGradient`, or of `gradient` and `value`). */
  exactEvaluations: number;
}

/**
 * Options of {@link spaceTimeErrors}.
 *
 * @example
 * ```ts
 * import type { SpaceTimeErrorOptions } from 'chronomesh';
 * // A source switched on at t = 0.25 makes the solution singular there too.
 * const opts: SpaceTimeErrorOptions = { timePoints: 4, singularTimes: [0.25] };
 * console.log(opts.singularTimes); // → [ 0.25 ]
 * ```
 */
export interface SpaceTimeErrorOptions {
  /** Gauss points per time interval and per graded panel (default 3, at most 20). */
  timePoints?: number;
  /**
   * Times in (0, T] where the exact solution may be singular in time (e.g. a source switched on),
   * in addition to t = 0, which is always treated as singular.
   */
  singularTimes?: number[];
  /** Geometric panels toward each singular time (default 12: the innermost is 2^-12 of its interval, where t = a + s² makes the rest smooth). */
  gradedPanels?: number;
  /**
   * Split every element into this many pieces per edge for the spatial rule: s² sub-triangles in
   * 2D, s sub-intervals in 1D (default 1, at most 8). For exact solutions with a kink or jump
   * inside elements — along a curve source off the mesh lines, or where an expression switches —
   * which the degree-5 rule integrates only to O(h): on a 2D kink across elements of size 0.5 it
   * gave 8.8e-3 where the error is 4.4e-2 (a brute-force lattice gives 4.4e-2, the rule split
   * 4 × 4 4.35e-2). Elements at the Dirichlet boundary while its initial layer is thin keep their
   * graded rules unsplit.
   */
  elementSplits?: number;
}

/**
 * Errors of `solution` against `exact` over (0, T) × Ω.
 *
 * Accuracy: for u0 ≡ 1 on (0, 1) and (0, 1)² with zero boundary values (‖∇u(t)‖² ~ t^{-1/2}),
 * the error of the zero function reproduces ∫₀ᵀ‖∇u‖² dt = (‖u0‖² − ‖u(T)‖²)/2 to about 1e-9
 * relative in 1D and 1e-7 in 2D with the defaults (tests/output/error-norms.test.ts).
 * Cost: exact-solution evaluations at (graded times near t = 0 + 12 per time panel) × quadrature
 * points of the union mesh — about 160 per unknown on 1D sparse grids of 10³–3·10⁵ unknowns —
 * plus work linear in the coefficients for the discrete solution's own energy (per breakpoint
 * interval × element when held boundary values are non-zero) (docs/error-norms.md, `output.errors`
 * bench rows). Away from singular times the exact solution
 * must be smooth in t on the scale of T/16 (name other singular times in `singularTimes`).
 *
 * @example
 * ```ts
 * import { DoubleTree, HeatProblem, SpaceTimeSystem, intervalDomain, spaceTimeErrors } from 'chronomesh';
 * const domain = intervalDomain(0, 1, 2);
 * const u = (t: number, x: number) => Math.exp(-(Math.PI ** 2) * t) * Math.sin(Math.PI * x);
 * const sys = new SpaceTimeSystem(new HeatProblem({ domain, T: 1, initial: (x) => u(0, x) }), DoubleTree.sparseGrid(domain, 5));
 * const e = spaceTimeErrors(sys.solve().solution, {
 *   value: (t, x) => u(t, x),
 *   gradient: (t, x, _y, g) => { g[0] = Math.PI * Math.exp(-(Math.PI ** 2) * t) * Math.cos(Math.PI * x); },
 * }, { timePoints: 3 });
 * console.log(e.gradientL2);
 * ```
 */
export function spaceTimeErrors(solution: SpaceTimeSolution, exact: KnownSolution, opts: SpaceTimeErrorOptions = {}): SpaceTimeErrors {
  return evaluateErrors(solution, exact, opts, 'panels');
}

/**
 * {@link spaceTimeErrors} with a choice of time integration: `'panels'` (the default, see
 * ./error-panels) or `'direct'` (Gauss points of every breakpoint interval, the reference the
 * tests compare the panels with).
 * @internal
 */
export function evaluateErrors(solution: SpaceTimeSolution, exact: KnownSolution, opts: SpaceTimeErrorOptions, mode: 'panels' | 'direct'): SpaceTimeErrors {
  checkInstance(solution, SolutionClass, 'solution', 'a SpaceTimeSolution');
  const ex = checkObject(exact, 'exact', 'a known solution { value(t, x, y), gradient(t, x, y, grad) }');
  checkFunction(ex.value, 'exact.value', 'a function (t, x, y) => number');
  checkFunction(ex.gradient, 'exact.gradient', 'a function (t, x, y, grad) => void writing the spatial gradient');
  if (ex.valueAndGradient !== undefined) checkFunction(ex.valueAndGradient, 'exact.valueAndGradient', 'a function (t, x, y, grad) => number');
  const o = checkOptions<SpaceTimeErrorOptions>(opts, 'opts', ['timePoints', 'singularTimes', 'gradedPanels', 'elementSplits']);
  const splits = o.elementSplits ?? 1;
  if (typeof splits !== 'number' || !Number.isInteger(splits) || splits < 1 || splits > 8) {
    throw new InvalidArgumentError(`opts.elementSplits = ${String(splits)} must be an integer in [1, 8]`, { field: 'opts.elementSplits', expected: 'an integer in [1, 8]', received: splits });
  }
  const nq = o.timePoints ?? 3;
  if (typeof nq !== 'number' || !Number.isInteger(nq) || nq < 1 || nq > 20) {
    throw new InvalidArgumentError(`opts.timePoints = ${String(nq)} must be an integer in [1, 20]`, { field: 'opts.timePoints', expected: 'an integer in [1, 20]', received: nq });
  }
  const panels = o.gradedPanels ?? 12;
  if (typeof panels !== 'number' || !Number.isInteger(panels) || panels < 0 || panels > 60) {
    throw new InvalidArgumentError(`opts.gradedPanels = ${String(panels)} must be an integer in [0, 60]`, { field: 'opts.gradedPanels', expected: 'an integer in [0, 60]', received: panels });
  }
  const T = solution.T;
  // A subclass may read its trial set in reversed time (backward problems); integrate in the
  // trial set's own time s and ask the exact solution at t = T − s.
  const reversed = timeReversed(solution);
  const exactIn: KnownSolution = reversed
    ? {
      value: (s, x, y) => exact.value(T - s, x, y),
      gradient: (s, x, y, g) => exact.gradient(T - s, x, y, g),
      ...(exact.valueAndGradient ? { valueAndGradient: (s: number, x: number, y: number, g: Float64Array) => exact.valueAndGradient!(T - s, x, y, g) } : {}),
    }
    : exact;
  const singular = o.singularTimes ?? [];
  if (!Array.isArray(singular)) throw new InvalidArgumentError('opts.singularTimes must be an array of times in (0, T]', { field: 'opts.singularTimes' });
  const extra: number[] = [];
  singular.forEach((s, i) => {
    if (typeof s !== 'number' || !Number.isFinite(s) || s <= 0 || s > T) {
      throw new InvalidArgumentError(`opts.singularTimes[${i}] = ${String(s)} must be a time in (0, ${T}]`, {
        field: `opts.singularTimes[${i}]`, expected: `number in (0, ${T}]`, received: s,
      });
    }
    extra.push(reversed ? (T - s) / T : s / T);
  });

  const slices = new BreakpointSlices(solution, extra);
  const br = slices.breaks;
  const isSingular = new Uint8Array(br.length);
  isSingular[0] = 1;
  const sing = [0, ...extra];
  for (const s of extra) {
    if (s === 0) continue;
    for (let k = 0; k < br.length; k++) if (br[k] === s) isSingular[k] = 1;
  }
  // Intervals within two lengths of a singular time (but not touching it) see a steep, smooth
  // integrand: grade them toward the nearer end as well (t − a = s² there is harmless).
  const near = (a: number, b: number): -1 | 0 | 1 => {
    let best = Infinity;
    let side: -1 | 0 | 1 = 0;
    for (const s of sing) {
      const d = s <= a ? a - s : s >= b ? s - b : 0;
      if (d > 0 && d < 2 * (b - a) && d < best) { best = d; side = s <= a ? -1 : 1; }
    }
    return side;
  };
  const nI = br.length - 1;
  const graded = new Uint8Array(nI);
  for (let k = 0; k < nI; k++) {
    const left = isSingular[k] === 1;
    const right = isSingular[k + 1] === 1;
    const side = left || right ? 0 : near(br[k]!, br[k + 1]!);
    graded[k] = left || right ? 3 : side < 0 ? 1 : side > 0 ? 2 : 0;
  }
  // Panels (./error-panels): dyadic cells [c·2^-m, (c+1)·2^-m] of breakpoint intervals, at most
  // T/16 long and at most half their distance to the nearest singular time.
  const fits = (a: number, b: number): boolean => {
    const len = b - a;
    if (len > MAX_PANEL) return false;
    for (const s of sing) {
      const d = s <= a ? a - s : s >= b ? s - b : 0;
      if (len > 0.5 * d) return false;
    }
    return true;
  };
  let panelLevel = 0;
  let panelIndex = 0;
  /** End breakpoint of the largest admissible dyadic panel starting at breakpoint k, or −1. */
  const dyadicPanel = (k: number): number => {
    const a = br[k]!;
    for (let m = Math.round(-Math.log2(MAX_PANEL)); m <= 62; m++) {
      const h = 2 ** -m;
      if (h < br[k + 1]! - a) break;
      const c = a / h;
      if (c !== Math.floor(c) || !fits(a, a + h)) continue;
      const k1 = lowerBound(br, a + h);
      if (k1 >= br.length || br[k1] !== a + h) continue;
      let ok = true;
      for (let j = k; j < k1 && ok; j++) ok = graded[j] === 0;
      if (!ok) continue;
      panelLevel = m;
      panelIndex = c;
      return k1;
    }
    return -1;
  };
  const nv = slices.mesh.vertexCount;
  let va = new Float64Array(nv);
  let vb = new Float64Array(nv);
  const integ = new SliceIntegrator(slices.mesh, exactIn, splits);
  const rule = new TimeRule(nq, panels);
  const panelRule = mode === 'panels' ? new TimePanels(solution, slices, integ) : null;
  // held boundary values are linear between all breakpoints: their panels are summed per interval
  const cellEnergy = mode === 'panels' && liftingOf(solution.domain.forest).isZero ? new CellEnergy(solution) : null;
  const quad = new Float64Array(3);
  let g2 = 0;
  let v2 = 0;
  let k2 = 0;
  let count = 0;
  slices.nodalAt(0, va);
  let k = 0;
  while (k < nI) {
    if (panelRule !== null && graded[k] === 0) {
      const k1 = dyadicPanel(k);
      // a panel only where it needs fewer exact-solution times than the direct rule
      if (k1 > 0 && (k1 - k) * nq > panelRule.points) {
        panelRule.panel(k, k1);
        g2 += panelRule.g;
        v2 += panelRule.v;
        k2 += panelRule.k;
        count += panelRule.points;
        if (cellEnergy !== null) {
          // ∫‖∇u_δ‖², ∫‖u_δ‖² over the dyadic panel without visiting its breakpoints
          cellEnergy.energy(panelLevel, panelIndex);
          g2 += cellEnergy.g;
          v2 += cellEnergy.v;
          k2 += cellEnergy.k;
          k = k1;
          slices.nodalAt(k, va);
          continue;
        }
        for (; k < k1; k++) {
          slices.nodalAt(k + 1, vb);
          intervalQuadratic(slices.mesh, va, vb, (br[k + 1]! - br[k]!) * T, quad, integ.weights);
          g2 += quad[0]!;
          v2 += quad[1]!;
          k2 += quad[2]!;
          const tmp = va;
          va = vb;
          vb = tmp;
        }
        continue;
      }
    }
    slices.nodalAt(k + 1, vb);
    const a = br[k]! * T;
    const b = br[k + 1]! * T;
    const gk = graded[k]!;
    rule.build(a, b, gk === 3 ? isSingular[k] === 1 : gk === 1, gk === 3 ? isSingular[k + 1] === 1 : gk === 2);
    for (let q = 0; q < rule.n; q++) {
      const t = rule.t[q]!;
      integ.integrate(t, va, vb, (t - a) / (b - a));
      g2 += rule.w[q]! * integ.g2;
      v2 += rule.w[q]! * integ.v2;
      k2 += rule.w[q]! * integ.k2;
      count++;
    }
    const tmp = va;
    va = vb;
    vb = tmp;
    k++;
  }
  // The panel sums subtract cross terms; a solution (almost) equal to the exact one can leave a
  // tiny negative rounding residue (about 1e-16 of ‖∇u‖²).
  // the convection term h∫_Γ e² of the form, on boundary parts that exchange heat (./error-boundary)
  k2 += convectionErrorSquared(slices, exactIn, T, rule, graded, isSingular);
  return { gradientL2: Math.sqrt(Math.max(g2, 0)), valueL2: Math.sqrt(Math.max(v2, 0)), energyL2: Math.sqrt(Math.max(k2, 0)), slices: count, exactEvaluations: integ.evaluations };
}

/**
 * Whether `solution` (possibly a subclass) presents its trial set in reversed time, i.e. its slice
 * at t is the trial-set function at T − t. Compared at one generic time against both readings;
 * any other time map is refused, since the error integration reads the trial set directly.
 */
function timeReversed(solution: SpaceTimeSolution): boolean {
  const base = SolutionClass.prototype.spatialCoefficients;
  if (solution.spatialCoefficients === base) return false;
  const T = solution.T;
  const t = 0.3819660112501051 * T; // a non-dyadic time, so both readings differ
  const got = solution.spatialCoefficients(t);
  const same = (r: { set: Int32Array; coeffs: Float64Array }) =>
    r.set.length === got.set.length && r.set.every((v, i) => v === got.set[i]) && r.coeffs.every((v, i) => Math.abs(v - got.coeffs[i]!) <= 1e-12 * (1 + Math.abs(v)));
  if (same(base.call(solution, t))) return false;
  if (same(base.call(solution, T - t))) return true;
  throw new InvalidArgumentError('solution maps time to its trial set in a way spaceTimeErrors cannot follow (only t and T − t are supported)', {
    field: 'solution', expected: 'a SpaceTimeSolution, or a subclass reading its trial set at t or at T − t',
  });
}
