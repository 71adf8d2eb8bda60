/**
 * Breakpoints of the composite time rule of the loads (docs/adaptivity.md §2.2).
 *
 * The load of a test node on the interval J is ∫_J ℓ(t; φ) ψ dt, integrated in time with 4 Gauss
 * points on each half of J (./right-hand-side.ts, ./boundary-data-load.ts). On the coarse levels J
 * is long: data that vary faster in time (a pulse, an oscillation, a moving spot passing a point, a
 * face quenched or a flux switched on briefly) are integrated wrongly there, the load misses their
 * coarse-scale part, and that data error is invisible to the estimator (a source pulse of length
 * 0.001 on (0, 1): E = 0, u ≡ 0; a boundary flux pulse: the same).
 *
 * Four groups of data are watched at fixed places: the source at points of the domain
 * (../space/sample-points.ts), the time profiles of the concentrated sources (one place each,
 * weighted by ∫_Γ |ρ| ds), the flux and ambient data (times h) at points of the natural boundary
 * edges, and the prescribed values at the vertices that carry them. The dyadic intervals
 * I_{l,k} = [k, k + 1]·T·2^{−l} are checked from l = 0 on: where, for some group, the 4-point rule
 * on I disagrees with the same rule on pieces of at most T/1024 (at least MIN_PIECES), summed over
 * the places with their weights and over the two linear moments on I, by more than TOLERANCE of
 * that group's Σ_p w_p ∫₀ᵀ |g(t, p)| dt, the midpoint becomes a breakpoint and both halves are
 * checked in turn (down to level MAX_LEVEL). The loads then integrate every half of a test interval
 * piece by piece between the breakpoints inside it: each piece is an interval that passed the
 * check. Data smooth in time give no breakpoints, and their loads are unchanged.
 */
import { InvalidArgumentError, describeValue } from '../errors';
import { gaussLegendre01 } from '../numerics/gauss-legendre';
import { boundarySamplePoints, domainSamplePoints } from '../space/sample-points';
import { heldValuesOf } from '../space/held-values';
import { curveWeight } from '../space/source-curve';
import type { HeatProblem } from './heat-problem';

/** Gauss points per half interval: as the loads. */
export const LOAD_TIME_POINTS = 4;
/** Longest piece of the fine rule, as a fraction of T. */
const PIECE_FRACTION = 1 / 1024;
const MIN_PIECES = 16;
/** Relative mismatch (of the group's total) that makes an interval split. */
const TOLERANCE = 1e-2;
/** Deepest level of the intervals split. */
const MAX_LEVEL = 30;
/** Most points of the domain (and of the boundary) watched. */
const MAX_POINTS = 512;

/**
 * Breakpoints in (0, T), sorted: `times[i]` is the midpoint of the split interval
 * I_{level[i], index[i]} = [index, index + 1]·T·2^{−level}.
 */
export interface LoadBreakpoints {
  readonly times: Float64Array;
  readonly level: Int32Array;
  readonly index: Float64Array;
}

/** Data watched at `weights.length` fixed places: `sample(t)` returns their values at time t. */
interface WatchedGroup {
  readonly weights: Float64Array;
  readonly sample: (t: number) => Float64Array;
}

// Computed once per problem (a problem's data never change).
const cache = new WeakMap<HeatProblem, LoadBreakpoints>();

/**
 * Breakpoints in (0, T) of the composite time rule of the loads, where the source or the boundary
 * data vary faster in time than the loads' Gauss rule resolves; computed once per problem. Kept
 * here rather than on HeatProblem, so that a problem's constructor does not carry the rule (a
 * one-function import of HeatProblem has a size budget). @internal
 */
export function loadTimeBreakpoints(problem: HeatProblem): LoadBreakpoints {
  let b = cache.get(problem);
  if (b === undefined) cache.set(problem, (b = loadBreakpoints(problem)));
  return b;
}

/** The breakpoints of the time-dependent data of `problem` (none without source or boundary data). @internal */
export function loadBreakpoints(problem: HeatProblem): LoadBreakpoints {
  const T = problem.T;
  const groups = [sourceGroup(problem), curveGroup(problem), boundaryGroup(problem), heldGroup(problem)].filter((g): g is WatchedGroup => g !== null);
  const { nodes, weights } = gaussLegendre01(LOAD_TIME_POINTS);
  // The two linear moments per place of the rule on [a, b] applied to `pieces` equal pieces (into
  // out, 2 per place), and Σ_p w_p ∫ |g| (returned). The loads apply the rule to each piece between
  // breakpoints, and the test functions are linear there.
  const moments = (group: WatchedGroup, a: number, b: number, pieces: number, out: Float64Array): number => {
    out.fill(0);
    let total = 0;
    const len = b - a;
    const w = group.weights;
    for (let piece = 0; piece < pieces; piece++) {
      for (let q = 0; q < LOAD_TIME_POINTS; q++) {
        const theta = (piece + nodes[q]!) / pieces;
        const v = group.sample(a + theta * len);
        const c = (len / pieces) * weights[q]!;
        for (let p = 0; p < w.length; p++) {
          const u = c * w[p]! * v[p]!;
          out[2 * p] = out[2 * p]! + u * (1 - theta);
          out[2 * p + 1] = out[2 * p + 1]! + u * theta;
          total += Math.abs(u);
        }
      }
    }
    return total;
  };
  const finePieces = (a: number, b: number): number => Math.max(MIN_PIECES, 2 ** Math.ceil(Math.log2((b - a) / (PIECE_FRACTION * T))));
  const coarse = groups.map((g) => new Float64Array(2 * g.weights.length));
  const fine = groups.map((g) => new Float64Array(2 * g.weights.length));
  // The groups' scales over (0, T); a group without data in time is dropped.
  const scales = groups.map((g, j) => moments(g, 0, T, finePieces(0, T), fine[j]!));
  const split: [number, number, number][] = []; // (time, level, index)
  const stack: number[] = [0, 0];
  while (stack.length > 0) {
    const k = stack.pop()!, l = stack.pop()!;
    if (l >= MAX_LEVEL) continue;
    const a = k * T * 2 ** -l, b = (k + 1) * T * 2 ** -l;
    let unresolved = false;
    for (let j = 0; j < groups.length && !unresolved; j++) {
      if (!(scales[j]! > 0)) continue;
      moments(groups[j]!, a, b, finePieces(a, b), fine[j]!);
      moments(groups[j]!, a, b, 1, coarse[j]!);
      let mismatch = 0;
      for (let i = 0; i < coarse[j]!.length; i++) mismatch += Math.abs(coarse[j]![i]! - fine[j]![i]!);
      unresolved = mismatch > TOLERANCE * scales[j]!;
    }
    if (!unresolved) continue;
    split.push([(a + b) / 2, l, k]);
    stack.push(l + 1, 2 * k, l + 1, 2 * k + 1);
  }
  split.sort((p, q) => p[0] - q[0]);
  return { times: Float64Array.from(split, (p) => p[0]), level: Int32Array.from(split, (p) => p[1]), index: Float64Array.from(split, (p) => p[2]) };
}

/**
 * The pieces of both halves [a, mid] and [mid, b] of a test interval, each split at the breakpoints
 * inside it, as (lo, hi) pairs into `pieces` (cleared first). @internal
 */
export function halfPieces(a: number, b: number, breaks: Float64Array, pieces: number[]): number[] {
  pieces.length = 0;
  const mid = 0.5 * (a + b);
  for (const [lo, hi] of [[a, mid], [mid, b]] as const) {
    let prev = lo;
    for (let j = firstAbove(breaks, lo); j < breaks.length && breaks[j]! < hi; j++) {
      pieces.push(prev, breaks[j]!);
      prev = breaks[j]!;
    }
    pieces.push(prev, hi);
  }
  return pieces;
}

/** Index of the first breakpoint > t (breakpoints sorted). */
function firstAbove(breaks: Float64Array, t: number): number {
  let lo = 0, hi = breaks.length;
  while (lo < hi) {
    const m = (lo + hi) >> 1;
    if (breaks[m]! <= t) lo = m + 1;
    else hi = m;
  }
  return lo;
}

/** The source at points of the domain: directly, or from the separable terms' space values (computed once). */
function sourceGroup(problem: HeatProblem): WatchedGroup | null {
  const f = problem.source, terms = problem.separableSource;
  if (!f && !terms) return null;
  const { x, y, w } = domainSamplePoints(problem.domain.forest, MAX_POINTS);
  const np = x.length;
  const space = terms ? terms.map((term, j) => Float64Array.from(x, (xp, p) => finite(term.space(xp, y[p]!), `source[${j}].space`, xp, y[p]!))) : null;
  const values = new Float64Array(np);
  const sample = (t: number): Float64Array => {
    if (f) for (let p = 0; p < np; p++) values[p] = finite(f(t, x[p]!, y[p]!), 'source', x[p]!, y[p]!, t);
    else {
      values.fill(0);
      terms!.forEach((term, j) => {
        const g = term.time(t);
        if (!Number.isFinite(g)) throw new InvalidArgumentError(`source[${j}].time(${t}) returned ${describeValue(g)}; expected a finite number`, { field: `source[${j}].time`, received: g });
        const s = space![j]!;
        for (let p = 0; p < np; p++) values[p] = values[p]! + g * s[p]!;
      });
    }
    return values;
  };
  return { weights: w, sample };
}

/** The time profiles of the concentrated sources, one place per source weighted by ∫_Γ |ρ| ds. */
function curveGroup(problem: HeatProblem): WatchedGroup | null {
  const curves = problem.curveSources;
  if (!curves) return null;
  const weights = Float64Array.from(curves, (c) => curveWeight(c.curve));
  const values = new Float64Array(curves.length);
  const sample = (t: number): Float64Array => {
    curves.forEach((c, j) => {
      const g = c.time(t);
      if (!Number.isFinite(g)) throw new InvalidArgumentError(`curveSources[${j}].time(${t}) returned ${describeValue(g)}; expected a finite number`, { field: `curveSources[${j}].time`, received: g });
      values[j] = g;
    });
    return values;
  };
  return { weights, sample };
}

/** Flux and ambient data at points of the natural boundary edges, weighted by h on convection edges. */
function boundaryGroup(problem: HeatProblem): WatchedGroup | null {
  const tables = problem.domain.forest.boundary;
  const { x, y, w, part } = boundarySamplePoints(problem.domain.forest, MAX_POINTS);
  if (x.length === 0) return null;
  const values = new Float64Array(x.length);
  const fields = tables.parts.map((q, j) => (q.kind === 'flux' ? `boundary[${j}].flux` : `boundary[${j}].ambient`));
  const sample = (t: number): Float64Array => {
    for (let p = 0; p < x.length; p++) {
      const j = part[p]!;
      values[p] = finite(tables.parts[j]!.data!(t, x[p]!, y[p]!), fields[j]!, x[p]!, y[p]!, t);
    }
    return values;
  };
  return { weights: w, sample };
}

/** The prescribed values at the vertices that carry them (weight 1 each). */
function heldGroup(problem: HeatProblem): WatchedGroup | null {
  const held = heldValuesOf(problem.domain.forest);
  if (held.vertices.length === 0) return null;
  const values = new Float64Array(held.vertices.length);
  return { weights: new Float64Array(values.length).fill(1), sample: (t) => held.values(t, values) };
}

function finite(v: number, field: string, x: number, y: number, t?: number): number {
  if (!Number.isFinite(v)) {
    // The wording of the loads' own check (./right-hand-side.ts), which meets the same values later.
    const call = t === undefined ? `${field}(${x}, ${y})` : `${field}(${t}, ${x}, ${y})`;
    throw new InvalidArgumentError(`${call} returned ${describeValue(v)}; expected a finite number`, { field, expected: 'a finite number', received: v });
  }
  return v;
}
