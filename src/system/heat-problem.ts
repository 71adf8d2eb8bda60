/**
 * Description of a parabolic problem (docs/method.md §1):
 *   ∂t u − ∇·(κ∇u) + c u = f  in (0,T) × Ω,  u = 0 on Γ_D,  κ∂u/∂n = 0 on Γ_N,  u(0) = u0.
 * The spatial domain (mesh, κ, c, boundary) is a {@link SpatialDomain}.
 */
import { InvalidArgumentError } from '../errors';
import { SpatialDomain } from '../space/index';
import { checkOptions } from '../validation/index';

/** A separable source term g(t)·h(x, y); sums of these are integrated factor by factor. */
export interface SeparableTerm {
  time: (t: number) => number;
  space: (x: number, y: number) => number;
}

/** Input of {@link HeatProblem}. */
export interface HeatProblemSpec {
  domain: SpatialDomain;
  /** Final time T > 0. */
  T: number;
  /** Initial state u0(x, y) (may be discontinuous and violate the boundary condition); default 0. */
  initial?: (x: number, y: number) => number;
  /** Source f(t, x, y), or a sum of separable terms; default 0. */
  source?: ((t: number, x: number, y: number) => number) | SeparableTerm[];
}

/** Keys of {@link HeatProblemSpec}; the Record type makes a new key a compile error until listed here. */
const SPEC_KEYS: Record<keyof Required<HeatProblemSpec>, true> = { domain: true, T: true, initial: true, source: true };

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
    if (spec.initial !== undefined && typeof spec.initial !== 'function') {
      throw new InvalidArgumentError('initial must be a function (x, y) => number', { field: 'initial' });
    }
    this.domain = domain;
    this.T = T;
    this.initial = spec.initial ?? null;
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
  }
}
