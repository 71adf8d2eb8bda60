/**
 * Functionals of a computed space-time solution with value and gradient with respect to its
 * coefficients: probe misfit, terminal tracking, space-time region tracking and weighted sums.
 * All are J(u) = ½ Σ_k w_k ((E u)_k − d_k)² over point evaluations E (see ./evaluation-rows);
 * the integrals of the tracking functionals are the quadrature sums that are actually computed
 * (degree-5 rules per leaf element, Gauss–Legendre in time between the breakpoints of the trial
 * functions), so value, gradient Eᵀ W (E u − d) and Hessian Eᵀ W E belong together exactly.
 */
import { checkOptions } from '../validation/checks';
import { InvalidArgumentError, describeValue } from '../errors';
import { nodeSupport } from '../time/index';
import { gaussLegendre01 } from '../numerics/gauss-legendre';
import type { DoubleTree } from '../spacetime/double-tree';
import type { SpaceTimeSystem } from '../system/space-time-system';
import { PointSeriesOperator } from '../spacetime/point-series';
import { FrameMeshes, SliceBlock, quadratureRows, rowTargets, sliceFrame, type EvaluationBlock, type QuadratureRows, type SliceFrame } from './evaluation-rows';

/**
 * A weighted least-squares functional J(u) = ½ Σ_k w_k (u(t_k, x_k) − d_k)² of the coefficients u
 * of a discrete solution on one trial index set. Build one with {@link probeMisfit},
 * {@link terminalTracking}, {@link regionTracking} or {@link combineFunctionals}.
 *
 * @example
 * ```ts
 * import { DoubleTree, HeatProblem, SpaceTimeSystem, intervalDomain, probeMisfit } from 'chronomesh';
 * const domain = intervalDomain(0, 1, 2);
 * const system = new SpaceTimeSystem(new HeatProblem({ domain, T: 1, initial: () => 1 }), DoubleTree.sparseGrid(domain, 4));
 * const J = probeMisfit(system, { times: [0.1, 0.2], points: [[0.5]], data: [[0.6], [0.3]] });
 * const u = system.solve().solution.coefficients;
 * console.log(J.value(u), J.gradient(u).length === system.size); // misfit, true
 * ```
 */
export class LeastSquaresFunctional {
  /** Number of point evaluations (rows). */
  readonly rowCount: number;
  private readonly buf: Float64Array;

  /** @internal The evaluation rows, in blocks (a time slice, or sensor histories). */
  readonly blocks: readonly EvaluationBlock[];

  /** @internal Use the factory functions. */
  constructor(readonly trialSet: DoubleTree, blocks: readonly EvaluationBlock[]) {
    this.blocks = blocks;
    let n = 0;
    let m = 0;
    for (const s of blocks) {
      n += s.rowCount;
      m = Math.max(m, s.rowCount);
    }
    this.rowCount = n;
    this.buf = new Float64Array(m);
  }

  private check(u: Float64Array, field: string): void {
    if (!(u instanceof Float64Array) || u.length !== this.trialSet.size) {
      throw new InvalidArgumentError(`${field} must be a Float64Array of length ${this.trialSet.size} (coefficients on the functional's index set)`, {
        field, expected: `Float64Array(${this.trialSet.size})`, received: describeValue(u),
      });
    }
  }

  /** The evaluated values (E u)_k, row by row (slices in order). */
  evaluate(u: Float64Array): Float64Array {
    this.check(u, 'u');
    const out = new Float64Array(this.rowCount);
    let o = 0;
    for (const s of this.blocks) {
      s.apply(u, out.subarray(o));
      o += s.rowCount;
    }
    return out;
  }

  /** J(u). */
  value(u: Float64Array): number {
    this.check(u, 'u');
    let J = 0;
    for (const s of this.blocks) {
      s.apply(u, this.buf);
      for (let k = 0; k < s.rowCount; k++) {
        const r = this.buf[k]! - s.targets[k]!;
        J += 0.5 * (s.scale * s.weights[k]!) * r * r;
      }
    }
    if (!Number.isFinite(J)) throw new InvalidArgumentError(`functional value is ${J}: the coefficients contain non-finite values`, { field: 'u', received: J });
    return J;
  }

  /** ∇_u J = Eᵀ W (E u − d) (written into `out` if given). */
  gradient(u: Float64Array, out?: Float64Array): Float64Array {
    this.check(u, 'u');
    const g = out ?? new Float64Array(this.trialSet.size);
    g.fill(0);
    for (const s of this.blocks) {
      s.apply(u, this.buf);
      for (let k = 0; k < s.rowCount; k++) this.buf[k] = s.scale * s.weights[k]! * (this.buf[k]! - s.targets[k]!);
      s.applyTransposed(this.buf, g);
    }
    return g;
  }

  /** ∇²_u J v = Eᵀ W E v (J is quadratic, so this does not depend on u). */
  hessianApply(v: Float64Array, out?: Float64Array): Float64Array {
    this.check(v, 'v');
    const g = out ?? new Float64Array(this.trialSet.size);
    g.fill(0);
    for (const s of this.blocks) {
      s.apply(v, this.buf);
      for (let k = 0; k < s.rowCount; k++) this.buf[k] = s.scale * s.weights[k]! * this.buf[k]!;
      s.applyTransposed(this.buf, g);
    }
    return g;
  }
}

/** Observations for {@link probeMisfit}: `data[i][k]` is the reading of sensor `points[k]` at `times[i]`. */
export interface ProbeData {
  times: ArrayLike<number>;
  /** Sensor positions: `[x]` in 1D, `[x, y]` in 2D. */
  points: ArrayLike<number>[];
  data: ArrayLike<number>[];
  /** w_k: one number for all readings (default 1), or one per reading in the shape of `data`. Use 1/σ² for noise of standard deviation σ. */
  weights?: number | ArrayLike<number>[];
}

/**
 * Σ_k w_k (u(t_k, x_k) − d_k)² / 2 over sensor readings.
 *
 * @example
 * ```ts
 * import { DoubleTree, HeatProblem, SpaceTimeSystem, rectangleDomain, probeMisfit } from 'chronomesh';
 * const domain = rectangleDomain(0, 1, 0, 1, 2, 2);
 * const system = new SpaceTimeSystem(new HeatProblem({ domain, T: 1, initial: () => 1 }), DoubleTree.sparseGrid(domain, 3));
 * const J = probeMisfit(system, { times: [0.05], points: [[0.5, 0.5], [0.25, 0.5]], data: [[0.5, 0.4]], weights: 1e4 });
 * console.log(J.rowCount); // → 2
 * ```
 */
export function probeMisfit(system: SpaceTimeSystem, obs: ProbeData): LeastSquaresFunctional {
  const { domain, T } = system.problem;
  const d = domain.dim;
  if (!obs || typeof obs !== 'object') throw new InvalidArgumentError('observations must be an object { times, points, data }', { field: 'observations' });
  checkOptions<ProbeData>(obs, 'observations', ['times', 'points', 'data', 'weights']);
  const { times, points, data } = obs;
  if (!times || typeof times.length !== 'number' || times.length === 0) throw new InvalidArgumentError('times must be a non-empty array', { field: 'times' });
  if (!Array.isArray(points) || points.length === 0) throw new InvalidArgumentError('points must be a non-empty array of coordinates', { field: 'points' });
  if (!Array.isArray(data) || data.length !== times.length) {
    throw new InvalidArgumentError(`data must have one row per time (${times.length})`, { field: 'data', expected: `${times.length} rows`, received: describeValue(data) });
  }
  const flat = new Float64Array(points.length * d);
  points.forEach((p, k) => {
    if (!p || p.length !== d) throw new InvalidArgumentError(`points[${k}] must have ${d} coordinate${d === 1 ? '' : 's'}`, { field: `points[${k}]`, received: describeValue(p) });
    for (let j = 0; j < d; j++) flat[k * d + j] = p[j]!;
  });
  const w = obs.weights ?? 1;
  const np = points.length;
  // rows time-major, as the readings: row i·np + k is sensor k at times[i]
  const targets = new Float64Array(times.length * np);
  const weights = new Float64Array(times.length * np);
  for (let i = 0; i < times.length; i++) {
    const t = times[i]!;
    if (!(Number.isFinite(t) && t >= 0 && t <= T)) throw new InvalidArgumentError(`times[${i}] = ${t} is outside [0, ${T}]`, { field: `times[${i}]`, expected: `[0, ${T}]`, received: t });
    const row = data[i];
    if (!row || row.length !== np) throw new InvalidArgumentError(`data[${i}] must have one value per point (${np})`, { field: `data[${i}]`, received: describeValue(row) });
    for (let k = 0; k < np; k++) {
      const v = row[k]!;
      if (!Number.isFinite(v)) throw new InvalidArgumentError(`data[${i}][${k}] = ${v} is not a finite number`, { field: `data[${i}][${k}]`, received: v });
      targets[i * np + k] = v;
      const wk = typeof w === 'number' ? w : w[i]?.[k];
      if (typeof wk !== 'number' || !(wk >= 0) || !Number.isFinite(wk)) {
        throw new InvalidArgumentError(`weight of reading [${i}][${k}] is ${describeValue(wk)}; expected a finite number ≥ 0`, { field: typeof w === 'number' ? 'weights' : `weights[${i}][${k}]`, expected: 'finite ≥ 0', received: wk });
      }
      weights[i * np + k] = wk;
    }
  }
  for (let k = 0; k < flat.length; k++) {
    if (!Number.isFinite(flat[k]!)) throw new InvalidArgumentError(`points[${Math.floor(k / d)}] has a coordinate ${flat[k]}; expected finite numbers`, { field: `points[${Math.floor(k / d)}]`, received: flat[k] });
  }
  // One operator for all readings: the spatial work is done once for all times.
  const E = new PointSeriesOperator(domain, system.trialSet, T, times, flat);
  for (let k = 0; k < np; k++) {
    if (!E.inside[k]) {
      const c = Array.from(flat.subarray(k * d, (k + 1) * d)).join(', ');
      throw new InvalidArgumentError(`points[${k}] = (${c}) lies outside the domain`, { field: `points[${k}]`, expected: 'a point of the closed domain', received: c });
    }
  }
  return new LeastSquaresFunctional(system.trialSet, [new SeriesBlock(E, weights, targets)]);
}

/**
 * ‖u(T) − u_target‖²_{L2(Ω)} / 2, integrated with the degree-5 rule on the leaf mesh of u(T, ·)
 * (exact when u_target is a polynomial of degree ≤ 2 on each leaf element; default target 0).
 *
 * @example
 * ```ts
 * import { DoubleTree, HeatProblem, SpaceTimeSystem, intervalDomain, terminalTracking } from 'chronomesh';
 * const domain = intervalDomain(0, 1, 2);
 * const system = new SpaceTimeSystem(new HeatProblem({ domain, T: 0.1, initial: () => 1 }), DoubleTree.sparseGrid(domain, 5));
 * const J = terminalTracking(system, (x) => Math.sin(Math.PI * x));
 * console.log(J.value(system.solve().solution.coefficients));
 * ```
 */
export function terminalTracking(system: SpaceTimeSystem, target?: (x: number, y: number) => number): LeastSquaresFunctional {
  if (target !== undefined && typeof target !== 'function') throw new InvalidArgumentError('target must be a function (x, y) => number', { field: 'target' });
  const { domain, T } = system.problem;
  const { frame, sigma } = sliceFrame(domain, system.trialSet, T, [T]);
  const rows = quadratureRows(frame.mesh, () => true);
  const targets = target ? rowTargets(frame.mesh, rows, target, 'target', T) : new Float64Array(rows.count);
  return new LeastSquaresFunctional(system.trialSet, [new SliceBlock({ t: T, frame, sigma: sigma[0]!, rows }, 1, targets)]);
}

/** Options of {@link regionTracking}. */
export interface RegionTrackingOptions {
  /** Time window [from, to] ⊆ [0, T] (default the whole interval). */
  from?: number;
  to?: number;
  /** Spatial region as a predicate (taken at quadrature points; default all of Ω). */
  inside?: (x: number, y: number) => boolean;
  /** Desired state u_d(t, x, y) (default 0). */
  target?: (t: number, x: number, y: number) => number;
  /** Gauss–Legendre points per time interval between trial breakpoints (default 2: exact in t for u²). */
  timePoints?: number;
}

/**
 * ∫_from^to ∫_region (u − u_d)² / 2 dx dt. Time quadrature: Gauss–Legendre on every interval
 * between consecutive breakpoints of the trial functions (u is linear in t there); space: the
 * degree-5 rule on each leaf element of the slice, the region's indicator taken at the points
 * (exact when the region is a union of leaf elements). Cost: the value of every active trial
 * function at every time point, plus one leaf mesh and one set of quadrature rows per distinct
 * union of active fibres (on adaptive sets usually one: the coarsest temporal function's fibre
 * holds nearly every vertex). Memory per time point is about 8 bytes per row with a target, and
 * a few bytes per active fibre entry without one.
 *
 * @example
 * ```ts
 * import { DoubleTree, HeatProblem, SpaceTimeSystem, intervalDomain, regionTracking } from 'chronomesh';
 * const domain = intervalDomain(0, 1, 2);
 * const system = new SpaceTimeSystem(new HeatProblem({ domain, T: 1, initial: () => 1 }), DoubleTree.sparseGrid(domain, 4));
 * const J = regionTracking(system, { from: 0.5, inside: (x) => x < 0.5, target: () => 0.1 });
 * console.log(J.value(system.solve().solution.coefficients));
 * ```
 */
export function regionTracking(system: SpaceTimeSystem, opts: RegionTrackingOptions = {}): LeastSquaresFunctional {
  checkOptions<RegionTrackingOptions>(opts, 'options', ['from', 'to', 'inside', 'target', 'timePoints']);
  const { domain, T } = system.problem;
  const from = opts.from ?? 0;
  const to = opts.to ?? T;
  if (!(Number.isFinite(from) && from >= 0 && from <= T)) throw new InvalidArgumentError(`from = ${from} must lie in [0, ${T}]`, { field: 'from', expected: `[0, ${T}]`, received: from });
  if (!(Number.isFinite(to) && to > from && to <= T)) throw new InvalidArgumentError(`to = ${to} must lie in (from, ${T}]`, { field: 'to', expected: `(${from}, ${T}]`, received: to });
  const nq = opts.timePoints ?? 2;
  if (!Number.isInteger(nq) || nq < 1 || nq > 20) throw new InvalidArgumentError(`timePoints = ${nq} must be an integer in [1, 20]`, { field: 'timePoints', expected: '[1, 20]', received: nq });
  for (const k of ['inside', 'target'] as const) {
    if (opts[k] !== undefined && typeof opts[k] !== 'function') throw new InvalidArgumentError(`${k} must be a function`, { field: k });
  }
  const inside = opts.inside ?? (() => true);
  const target = opts.target;
  const breaks = temporalBreakpoints(system.trialSet, T, from, to);
  const { nodes, weights } = gaussLegendre01(nq);
  // One frame for the time points of an interval (the active functions do not change between
  // breakpoints), one leaf mesh and one set of rows for all frames with the same vertices (`inside`
  // does not depend on t), and one array of zero targets for all slices when there is no target.
  const meshes = new FrameMeshes(domain);
  const specs: { t: number; frame: SliceFrame; sigma: Float64Array; rows: QuadratureRows; scale: number }[] = [];
  let most = 0;
  for (let b = 0; b + 1 < breaks.length; b++) {
    const a = breaks[b]!;
    const h = breaks[b + 1]! - a;
    const times = Array.from(nodes, (s) => a + h * s);
    const { frame, sigma, shared } = sliceFrame(domain, system.trialSet, T, times, meshes);
    const rows = (shared.rows ??= quadratureRows(frame.mesh, inside));
    if (rows.count === 0) continue;
    most = Math.max(most, rows.count);
    times.forEach((t, q) => specs.push({ t, frame, sigma: sigma[q]!, rows, scale: h * weights[q]! }));
  }
  const zeros = new Float64Array(target ? 0 : most);
  const slices: EvaluationBlock[] = specs.map(({ t, frame, sigma, rows, scale }) => {
    const targets = target ? rowTargets(frame.mesh, rows, (x, y) => target(t, x, y), 'target', t) : zeros;
    return new SliceBlock({ t, frame, sigma, rows }, scale, targets);
  });
  return new LeastSquaresFunctional(system.trialSet, slices);
}

/** Sorted breakpoints of the trial functions within [from, to], including both ends. */
function temporalBreakpoints(set: DoubleTree, T: number, from: number, to: number): number[] {
  const tree = set.tree;
  const s = new Float64Array(2);
  const pts = new Set<number>([from, to]);
  for (let i = 0; i < tree.size; i++) {
    const l = tree.level[i]!;
    nodeSupport('trial', l, tree.index[i]!, s);
    const scale = T * 2 ** -l;
    for (let j = s[0]!; j <= s[1]!; j++) {
      const t = j * scale;
      if (t > from && t < to) pts.add(t);
    }
  }
  return [...pts].sort((p, q) => p - q);
}

/**
 * Σ_c α_c J_c for functionals on the same index set (α_c ≥ 0).
 *
 * @example
 * ```ts
 * import { DoubleTree, HeatProblem, SpaceTimeSystem, combineFunctionals, intervalDomain, probeMisfit, terminalTracking } from 'chronomesh';
 * const domain = intervalDomain(0, 1, 2);
 * const system = new SpaceTimeSystem(new HeatProblem({ domain, T: 1, initial: () => 1 }), DoubleTree.sparseGrid(domain, 4));
 * const J = combineFunctionals([[1, terminalTracking(system)], [1e-2, probeMisfit(system, { times: [0.5], points: [[0.5]], data: [[0.01]] })]]);
 * console.log(J.rowCount);
 * ```
 */
export function combineFunctionals(terms: Array<[number, LeastSquaresFunctional]>): LeastSquaresFunctional {
  if (!Array.isArray(terms) || terms.length === 0) throw new InvalidArgumentError('terms must be a non-empty array of [weight, functional] pairs', { field: 'terms' });
  const set = terms[0]![1]?.trialSet;
  const blocks: EvaluationBlock[] = [];
  terms.forEach(([alpha, J], i) => {
    if (!(J instanceof LeastSquaresFunctional)) throw new InvalidArgumentError(`terms[${i}][1] must be a functional (e.g. from probeMisfit)`, { field: `terms[${i}]` });
    if (J.trialSet !== set) throw new InvalidArgumentError(`terms[${i}] lives on another index set; all terms must belong to the same system`, { field: `terms[${i}]` });
    if (!(Number.isFinite(alpha) && alpha >= 0)) throw new InvalidArgumentError(`terms[${i}] has weight ${alpha}; expected a finite number ≥ 0`, { field: `terms[${i}][0]`, expected: '≥ 0', received: alpha });
    for (const s of J.blocks) blocks.push(s.scaled(alpha));
  });
  return new LeastSquaresFunctional(set!, blocks);
}

/** Sensor readings as an {@link EvaluationBlock}: rows of a {@link PointSeriesOperator}. */
class SeriesBlock implements EvaluationBlock {
  constructor(private readonly E: PointSeriesOperator, readonly weights: Float64Array, readonly targets: Float64Array, readonly scale = 1) {}
  get rowCount(): number { return this.E.rowCount; }
  apply(u: Float64Array, out: Float64Array): void { this.E.apply(u, out); }
  applyTransposed(r: Float64Array, g: Float64Array): void { this.E.applyTransposed(r, g); }
  scaled(alpha: number): EvaluationBlock { return new SeriesBlock(this.E, this.weights, this.targets, alpha * this.scale); }
}
