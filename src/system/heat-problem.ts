/**
 * Description of a parabolic problem (docs/method.md §1):
 *   ∂t u − ∇·(κ∇u) + c u = f  in (0,T) × Ω,  u = 0 on Γ_D,  κ∂u/∂n = 0 on Γ_N,  u(0) = u0.
 * The spatial domain (mesh, κ, c, boundary) is a {@link SpatialDomain}.
 */
import { InvalidArgumentError } from '../errors';
import { SpatialDomain, type NodalField } from '../space/index';
import { checkSourceCurve, type SourceCurve } from '../space/source-curve';
import { initialFromField, isNodalField } from './initial-field';
import { heldDataError, type HeldDataError } from '../space/held-data-error';
import { checkHeldValueContinuity } from '../space/held-value-continuity';
import { checkOptions } from '../validation/index';

/** A separable source term g(t)·h(x, y); sums of these are integrated factor by factor. */
export interface SeparableTerm {
  time: (t: number) => number;
  space: (x: number, y: number) => number;
}

/**
 * A source concentrated on a curve (2D) or at a point (1D), separable in time: the load is
 * ∫₀ᵀ ∫_Γ g(t) ρ(x, y) v ds dt in 2D (heat released per unit length and time, e.g. a heating cable
 * under a floor seen from above) and ∫₀ᵀ g(t) ρ(x₀) v(t, x₀) dt in 1D (heat released per unit time
 * at one point of a rod). A point source in 2D is not offered: it is not in H⁻¹ (the temperature
 * would be infinite at the point); spread it over a small disc with `source` instead.
 *
 * @example
 * ```ts
 * import { HeatProblem, rectangleDomain, solveAdaptive } from 'chronomesh';
 * // a heating cable along a diagonal of a square plate held at 0 round its edges, on while t < 0.3
 * const domain = rectangleDomain(0, 1, 0, 1, 2, 2);
 * const problem = new HeatProblem({ domain, T: 0.5, curveSources: [{ curve: [[0.2, 0.2], [0.8, 0.8]], time: (t) => (t < 0.3 ? 20 : 0) }] });
 * const { solution } = solveAdaptive(problem, { maxUnknowns: 2000 });
 * console.log(solution.evaluate(0.3, [0.5, 0.5])[0]! > 2 * solution.evaluate(0.3, [0.8, 0.2])[0]!); // → true
 * ```
 */
export interface CurveSource {
  /** The points of the curve: `[[x]]` (one point) in 1D, a polyline `[[x, y], …]` of at least two points in 2D; inside the domain. */
  curve: ArrayLike<number>[];
  /** Time profile g(t) (default 1). */
  time?: (t: number) => number;
  /** Density ρ(x, y) along the curve (default 1). */
  density?: (x: number, y: number) => number;
}

/** Input of {@link HeatProblem}. */
export interface HeatProblemSpec {
  domain: SpatialDomain;
  /** Final time T > 0. */
  T: number;
  /**
   * Initial state u0(x, y) (may be discontinuous and violate the boundary condition); default 0.
   * Also a {@link NodalField}, such as the state of an earlier run (`solution.state(t)`): its mesh
   * must cover the domain (checked at the initial mesh's vertices and element centroids).
   */
  initial?: ((x: number, y: number) => number) | NodalField;
  /** Source f(t, x, y), or a sum of separable terms; default 0. */
  source?: ((t: number, x: number, y: number) => number) | SeparableTerm[];
  /** Sources concentrated on curves (2D) or at points (1D), added to `source`; default none. */
  curveSources?: CurveSource[];
}

/** Keys of {@link HeatProblemSpec}; the Record type makes a new key a compile error until listed here. */
const SPEC_KEYS: Record<keyof Required<HeatProblemSpec>, true> = { domain: true, T: true, initial: true, source: true, curveSources: true };

/** A checked {@link CurveSource}. @internal */
export interface CheckedCurveSource {
  readonly curve: SourceCurve;
  readonly time: (t: number) => number;
}

/**
 * A validated parabolic problem.
 *
 * @example
 * ```ts
 * import { HeatProblem, intervalDomain } from 'chronomesh';
 * const p = new HeatProblem({ domain: intervalDomain(0, 1, 2), T: 1, initial: () => 1 });
 * console.log(p.T); // → 1
 * ```
 */
export class HeatProblem {
  readonly domain: SpatialDomain;
  readonly T: number;
  readonly initial: ((x: number, y: number) => number) | null;
  readonly source: ((t: number, x: number, y: number) => number) | null;
  readonly separableSource: SeparableTerm[] | null;
  /** The concentrated sources, checked (null without any). @internal */
  readonly curveSources: readonly CheckedCurveSource[] | null;
  private heldData: HeldDataError | null = null;

  constructor(spec: HeatProblemSpec) {
    if (spec === null || typeof spec !== 'object') throw new InvalidArgumentError('problem specification must be an object', { field: 'spec' });
    checkOptions<HeatProblemSpec>(spec, 'spec', SPEC_KEYS);
    const { domain, T } = spec;
    if (!(domain instanceof SpatialDomain)) {
      throw new InvalidArgumentError('domain must be a SpatialDomain (e.g. from intervalDomain or rectangleDomain)', { field: 'domain' });
    }
    if (typeof T !== 'number' || !Number.isFinite(T) || T <= 0) {
      throw new InvalidArgumentError(`final time T = ${String(T)} must be a finite number > 0`, { field: 'T', expected: 'finite number > 0', received: T });
    }
    if (spec.initial !== undefined && typeof spec.initial !== 'function' && !isNodalField(spec.initial)) {
      throw new InvalidArgumentError('initial must be a function (x, y) => number or a NodalField', { field: 'initial' });
    }
    this.domain = domain;
    this.T = T;
    const u0 = spec.initial;
    this.initial = isNodalField(u0) ? initialFromField(u0, domain) : u0 ?? null;
    this.source = null;
    this.separableSource = null;
    const s = spec.source;
    if (typeof s === 'function') this.source = s;
    else if (Array.isArray(s)) {
      s.forEach((term, i) => {
        if (!term || typeof term.time !== 'function' || typeof term.space !== 'function') {
          throw new InvalidArgumentError(`source[${i}] must be { time: (t) => number, space: (x, y) => number }`, { field: `source[${i}]` });
        }
      });
      this.separableSource = s;
    } else if (s !== undefined) {
      throw new InvalidArgumentError('source must be a function (t, x, y) => number or an array of separable terms', { field: 'source' });
    }
    this.curveSources = checkCurveSources(domain, spec.curveSources);
  }

  /**
   * The error that held values leave because they are interpolated linearly between the initial
   * vertices along each value edge (docs/error-norms.md §8): an estimate D of ‖κ^{1/2}∇(u − u_δ)‖ in
   * L2(0,T;L2) that no refinement reduces and the estimator E does not include. D = 0 when every held
   * value is affine along its initial edges (for instance a temperature history g(t)). Computed once,
   * from samples of the data; `solveAdaptive` refuses a tolerance below it and reports it.
   *
   * @example
   * ```ts
   * import { HeatProblem, rectangleDomain } from 'chronomesh';
   * const held = (value: (t: number, x: number, y: number) => number) =>
   *   rectangleDomain(0, 1, 0, 1, 2, 2, { boundary: [{ kind: 'value', where: (_x, y) => y < 1e-9, value }] });
   * const rough = new HeatProblem({ domain: held((_t, x) => Math.sin(Math.PI * x)), T: 0.5 });
   * const history = new HeatProblem({ domain: held((t) => 20 + 5 * t), T: 0.5 });
   * console.log(rough.heldDataError().estimate > 0.05, history.heldDataError().estimate); // → true 0
   * ```
   */
  heldDataError(): HeldDataError {
    if (this.heldData === null) {
      // A held value that jumps in time has no data error to speak of: the run would diverge.
      checkHeldValueContinuity(this.domain.forest, this.T);
      this.heldData = heldDataError(this.domain.forest, this.T);
    }
    return this.heldData;
  }

  /**
   * Refuses a tolerance that no refinement can reach because of the held values' data error
   * ({@link HeatProblem.heldDataError}): throws an {@link InvalidArgumentError} on `field` naming the
   * boundary part, the edge that carries most of the data error and the remedy, when
   * `tolerance` > 0 is below that error. `solveAdaptive`, `solve` and problem files call it before
   * any work; call it yourself when you drive the loop with your own stopping rule.
   *
   * @example
   * ```ts
   * import { HeatProblem, InvalidArgumentError, rectangleDomain } from 'chronomesh';
   * const domain = rectangleDomain(0, 1, 0, 1, 2, 2, { boundary: [{ kind: 'value', where: (_x, y) => y < 1e-9, value: (_t, x) => Math.sin(Math.PI * x) }] });
   * const problem = new HeatProblem({ domain, T: 0.5 });
   * problem.checkTolerance(0.3); // fine: above the data error (about 0.19)
   * try { problem.checkTolerance(0.01); } catch (e) { console.log(e instanceof InvalidArgumentError); } // → true
   * ```
   */
  checkTolerance(tolerance: number, field = 'tolerance'): void {
    const d = this.heldDataError();
    if (!(tolerance > 0) || d.worst === null || d.estimate <= tolerance) return;
    const w = d.worst;
    const pt = (p: readonly [number, number]): string => `(${p[0]}, ${p[1]})`;
    throw new InvalidArgumentError(
      `tolerance ${tolerance} cannot be reached: held boundary values are interpolated linearly between initial-mesh vertices, which leaves an error of about ` +
        `${d.estimate.toExponential(2)} in L2(0,T;H1) that no refinement removes and the estimator does not see; ` +
        `${Math.round(100 * w.share)} % of it on boundary part ${w.part}, edge ${pt(w.from)}–${pt(w.to)} (initial vertices ${w.vertices[0]}, ${w.vertices[1]}). ` +
        'Give the initial mesh more vertices along that part (where the held value is not affine), or loosen the tolerance',
      { field, expected: `tolerance ≥ ${d.estimate.toExponential(2)} (the held-value data error on this initial mesh)`, received: tolerance },
    );
  }
}

/** The checked concentrated sources of a spec (null when there are none). */
function checkCurveSources(domain: SpatialDomain, list: unknown): CheckedCurveSource[] | null {
  if (list === undefined) return null;
  if (!Array.isArray(list)) throw new InvalidArgumentError('curveSources must be an array of { curve, time?, density? }', { field: 'curveSources' });
  if (list.length === 0) return null;
  return list.map((c: unknown, j: number) => {
    const field = `curveSources[${j}]`;
    if (c === null || typeof c !== 'object') throw new InvalidArgumentError(`${field} must be { curve, time?, density? }`, { field });
    checkOptions<CurveSource>(c as CurveSource, field, ['curve', 'time', 'density']);
    const { curve, time, density } = c as CurveSource;
    if (time !== undefined && typeof time !== 'function') throw new InvalidArgumentError(`${field}.time must be a function (t) => number`, { field: `${field}.time` });
    return { curve: checkSourceCurve(domain, curve, density, field), time: time ?? (() => 1) };
  });
}
