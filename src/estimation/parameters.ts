/**
 * Parameters m of the data and their linear maps m ↦ b into right-hand sides of S u = b:
 * amplitudes of separable sources, a time-dependent control amplitude on a temporal grid, and
 * the initial state as nodal values on a uniformly refined initial mesh. Each map provides
 * b += (∂b/∂m) m and its transpose g = (∂b/∂m)ᵀ v, the two pieces an adjoint gradient needs.
 */
import { checkOptions } from '../validation/checks';
import { InvalidArgumentError, describeValue } from '../errors';
import type { CurveSource, SeparableTerm } from '../system/heat-problem';
import type { SpaceTimeSystem } from '../system/space-time-system';
import { controlLoad, type ControlBasis } from './control-load';
import { InitialStateMap } from './initial-state-map';

/**
 * A linear map from parameters m (length `size`) to right-hand sides of a space-time system.
 *
 * @example
 * ```ts
 * import { DoubleTree, HeatProblem, SpaceTimeSystem, intervalDomain, sourceAmplitudes } from 'chronomesh';
 * const domain = intervalDomain(0, 1, 2);
 * const system = new SpaceTimeSystem(new HeatProblem({ domain, T: 1 }), DoubleTree.sparseGrid(domain, 3));
 * const map = sourceAmplitudes(system, [{ time: () => 1, space: () => 1 }]);
 * const b = new Float64Array(system.size);
 * map.addTo(Float64Array.of(2), b); // b = 2 · (right-hand side of f = 1)
 * ```
 */
export interface ParameterMap {
  /** Number of parameters. */
  readonly size: number;
  /** Number of unknowns of the system the map belongs to. */
  readonly systemSize: number;
  /** A short description of each parameter (for reports). */
  readonly labels: readonly string[];
  /** b += (∂b/∂m) m. */
  addTo(m: Float64Array, b: Float64Array): void;
  /** g = (∂b/∂m)ᵀ v (overwrites g, length `size`). */
  transpose(v: Float64Array, g: Float64Array): void;
}

/** A map given by its columns b_j = ∂b/∂m_j (few parameters). */
class ColumnMap implements ParameterMap {
  readonly size: number;
  readonly systemSize: number;
  constructor(readonly columns: Float64Array[], readonly labels: readonly string[], systemSize: number) {
    this.size = columns.length;
    this.systemSize = systemSize;
  }
  addTo(m: Float64Array, b: Float64Array): void {
    for (let j = 0; j < this.size; j++) {
      const mj = m[j]!;
      if (mj === 0) continue;
      const c = this.columns[j]!;
      for (let i = 0; i < c.length; i++) b[i]! += mj * c[i]!;
    }
  }
  transpose(v: Float64Array, g: Float64Array): void {
    for (let j = 0; j < this.size; j++) {
      const c = this.columns[j]!;
      let s = 0;
      for (let i = 0; i < c.length; i++) s += c[i]! * v[i]!;
      g[j] = s;
    }
  }
}

/**
 * Amplitudes m_i of separable sources f = Σ_i m_i g_i(t) h_i(x) (e.g. heater powers): column i is
 * the system's right-hand side for the source g_i h_i alone, so a forward solve with amplitudes m
 * reproduces `system.rightHandSide({ source })` with the scaled terms. A term may also be a source
 * concentrated on a curve or at a point ({@link CurveSource}: a heating cable of unknown power).
 * Cost: one right-hand side per term, memory one vector per term.
 *
 * @example
 * ```ts
 * import { DoubleTree, HeatProblem, SpaceTimeSystem, intervalDomain, sourceAmplitudes } from 'chronomesh';
 * const domain = intervalDomain(0, 1, 2);
 * const system = new SpaceTimeSystem(new HeatProblem({ domain, T: 1 }), DoubleTree.sparseGrid(domain, 3));
 * const heaters = sourceAmplitudes(system, [
 *   { time: () => 1, space: (x) => Math.exp(-100 * (x - 0.3) ** 2) },
 *   { time: (t) => (t < 0.5 ? 1 : 0), space: (x) => Math.exp(-100 * (x - 0.7) ** 2) },
 * ]);
 * console.log(heaters.size); // → 2
 * ```
 */
export function sourceAmplitudes(system: SpaceTimeSystem, terms: (SeparableTerm | CurveSource)[]): ParameterMap {
  if (!Array.isArray(terms) || terms.length === 0) throw new InvalidArgumentError('terms must be a non-empty array of { time, space } source terms', { field: 'terms' });
  const columns = terms.map((term, i) => {
    // a concentrated source (a heating cable of unknown power, say): { curve, time?, density? }
    if (term && typeof term === 'object' && 'curve' in term) {
      try {
        return system.rightHandSide({ curveSources: [term] });
      } catch (e) {
        if (e instanceof InvalidArgumentError) throw new InvalidArgumentError(e.message.replace(/curveSources\[0\]/g, `terms[${i}]`), { field: (e.field ?? '').replace('curveSources[0]', `terms[${i}]`), received: e.received });
        throw e;
      }
    }
    if (!term || typeof term.time !== 'function' || typeof (term as SeparableTerm).space !== 'function') {
      throw new InvalidArgumentError(`terms[${i}] must be { time: (t) => number, space: (x, y) => number } or a concentrated source { curve, time?, density? }`, { field: `terms[${i}]`, received: describeValue(term) });
    }
    return system.rightHandSide({ source: [term as SeparableTerm] });
  });
  return new ColumnMap(columns, terms.map((_, i) => `amplitude ${i}`), system.size);
}

/** Options of {@link controlAmplitude}. */
export interface ControlAmplitudeOptions {
  /** Strictly increasing grid 0 = τ_0 < … < τ_n = T (n ≥ 1). */
  grid: ArrayLike<number>;
  /** 'piecewise-constant': one value per interval (n parameters); 'piecewise-linear': one per grid node (n + 1). */
  kind: 'piecewise-constant' | 'piecewise-linear';
  /** Fixed spatial profile h(x, y) of the control. */
  space: (x: number, y: number) => number;
}

/**
 * A time-dependent control amplitude a(t) on a user grid acting through a fixed profile:
 * f = a(t) h(x), a = Σ_j m_j χ_j with χ_j the interval indicators (piecewise constant) or the hat
 * functions of the grid (piecewise linear). The time integrals against the test functions are
 * split at the grid points, so they are exact for the piecewise-polynomial a.
 *
 * @example
 * ```ts
 * import { DoubleTree, HeatProblem, SpaceTimeSystem, controlAmplitude, intervalDomain } from 'chronomesh';
 * const domain = intervalDomain(0, 1, 2);
 * const system = new SpaceTimeSystem(new HeatProblem({ domain, T: 1 }), DoubleTree.sparseGrid(domain, 3));
 * const a = controlAmplitude(system, { grid: [0, 0.25, 0.5, 0.75, 1], kind: 'piecewise-linear', space: () => 1 });
 * console.log(a.size); // → 5
 * ```
 */
export function controlAmplitude(system: SpaceTimeSystem, opts: ControlAmplitudeOptions): ParameterMap {
  const T = system.problem.T;
  if (!opts || typeof opts !== 'object') throw new InvalidArgumentError('options { grid, kind, space } are required', { field: 'options' });
  checkOptions<ControlAmplitudeOptions>(opts, 'options', ['grid', 'kind', 'space']);
  const grid = Float64Array.from(opts.grid ?? []);
  if (grid.length < 2) throw new InvalidArgumentError('grid must have at least two points', { field: 'grid', received: describeValue(opts.grid) });
  if (Math.abs(grid[0]!) > 1e-12 * T || Math.abs(grid[grid.length - 1]! - T) > 1e-12 * T) {
    throw new InvalidArgumentError(`grid must start at 0 and end at T = ${T}`, { field: 'grid', expected: `[0, …, ${T}]`, received: `[${grid[0]}, …, ${grid[grid.length - 1]}]` });
  }
  grid[0] = 0;
  grid[grid.length - 1] = T;
  for (let i = 1; i < grid.length; i++) {
    if (!(grid[i]! > grid[i - 1]!)) throw new InvalidArgumentError(`grid must be strictly increasing (grid[${i}] = ${grid[i]} ≤ grid[${i - 1}])`, { field: `grid[${i}]`, received: grid[i] });
  }
  if (opts.kind !== 'piecewise-constant' && opts.kind !== 'piecewise-linear') {
    throw new InvalidArgumentError(`kind must be 'piecewise-constant' or 'piecewise-linear'`, { field: 'kind', received: describeValue(opts.kind) });
  }
  if (typeof opts.space !== 'function') throw new InvalidArgumentError('space must be a function (x, y) => number', { field: 'space' });
  const n = grid.length - 1;
  const count = opts.kind === 'piecewise-constant' ? n : n + 1;
  const columns: Float64Array[] = [];
  const labels: string[] = [];
  const cache = new Map<number, Float64Array>();
  for (let j = 0; j < count; j++) {
    const basis: ControlBasis = opts.kind === 'piecewise-constant'
      ? { from: grid[j]!, to: grid[j + 1]!, value: () => 1 }
      : {
          from: grid[Math.max(0, j - 1)]!,
          to: grid[Math.min(n, j + 1)]!,
          value: (t) => (t <= grid[j]! ? (j === 0 ? 1 : (t - grid[j - 1]!) / (grid[j]! - grid[j - 1]!)) : (j === n ? 1 : (grid[j + 1]! - t) / (grid[j + 1]! - grid[j]!))),
        };
    columns.push(controlLoad(system, basis, grid, opts.space, cache));
    labels.push(opts.kind === 'piecewise-constant' ? `a on [${grid[j]}, ${grid[j + 1]}]` : `a(${grid[j]})`);
  }
  return new ColumnMap(columns, labels, system.size);
}

/**
 * The initial state u0 as nodal values on the leaf mesh of the initial mesh refined uniformly to
 * `level` (`domain.uniformSet(level)`), including boundary vertices (u0 need not satisfy the
 * boundary condition). `mesh` lists the vertices, parameter j being u0 at mesh vertex j. The load
 * ∫ u0 φ_ν is computed exactly (mass matrix on the common refinement of that mesh and the
 * trace fibre), so the map and its transpose agree to rounding.
 *
 * @example
 * ```ts
 * import { DoubleTree, HeatProblem, SpaceTimeSystem, initialState, intervalDomain } from 'chronomesh';
 * const domain = intervalDomain(0, 1, 2);
 * const system = new SpaceTimeSystem(new HeatProblem({ domain, T: 1 }), DoubleTree.sparseGrid(domain, 4));
 * const u0 = initialState(system, 2);
 * console.log(u0.size); // → 9 — nodal values at x = 0, 0.125, …, 1 (in the order of u0.mesh.coords)
 * ```
 */
export function initialState(system: SpaceTimeSystem, level: number): InitialStateMap {
  return new InitialStateMap(system, level);
}
