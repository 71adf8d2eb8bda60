/**
 * Breakpoints of the composite time rule of the source loads (docs/adaptivity.md §2.2).
 *
 * The load of a test node on the interval J is ∫_J ∫_Ω f ψ φ, integrated in time with 4 Gauss
 * points on each half of J (./right-hand-side.ts). On the coarse levels J is long: a source that
 * varies faster in time (a pulse, an oscillation, a moving spot passing a point) is integrated
 * wrongly there, the load misses its coarse-scale part, and that data error is invisible to the
 * estimator (a pulse of length 0.001 on (0, 1): E = 0, u ≡ 0).
 *
 * Here f is watched at fixed points of the domain (../space/sample-points.ts). The dyadic intervals
 * I_{l,k} = [k, k + 1]·T·2^{−l} are checked from l = 0 on: where the 4-point rule on I disagrees
 * with the same rule on pieces of at most T/1024 (at least MIN_PIECES), summed over the points with
 * their weights and over the two linear moments on I, by more than TOLERANCE of
 * Σ_p w_p ∫₀ᵀ |f(t, p)| dt, the midpoint becomes a breakpoint and both halves are checked in turn
 * (down to level MAX_LEVEL). The loads then integrate every half of a test interval piece by piece
 * between the breakpoints inside it: each piece is an interval that passed the check. A source
 * smooth in time gives no breakpoints, and its loads are unchanged.
 */
import { InvalidArgumentError } from '../errors';
import { gaussLegendre01 } from '../numerics/gauss-legendre';
import { domainSamplePoints } from '../space/sample-points';
import type { HeatProblem } from './heat-problem';

/** Gauss points per half interval: as the loads. */
export const SOURCE_TIME_POINTS = 4;
/** Longest piece of the fine rule, as a fraction of T. */
const PIECE_FRACTION = 1 / 1024;
const MIN_PIECES = 16;
/** Relative mismatch (of the total) that makes an interval split. */
const TOLERANCE = 1e-2;
/** Deepest level of the intervals split. */
const MAX_LEVEL = 30;
/** Most points of the domain watched. */
const MAX_POINTS = 512;

/**
 * Breakpoints in (0, T), sorted: `times[i]` is the midpoint of the split interval
 * I_{level[i], index[i]} = [index, index + 1]·T·2^{−level}.
 */
export interface SourceBreakpoints {
  readonly times: Float64Array;
  readonly level: Int32Array;
  readonly index: Float64Array;
}

/** The breakpoints of the source of `problem` (none without a source). @internal */
export function sourceBreakpoints(problem: HeatProblem): SourceBreakpoints {
  const f = problem.source, terms = problem.separableSource;
  if (!f && !terms) return { times: new Float64Array(0), level: new Int32Array(0), index: new Float64Array(0) };
  const T = problem.T;
  const { x, y, w } = domainSamplePoints(problem.domain.forest, MAX_POINTS);
  const np = x.length;
  // f(t, ·) at the points: directly, or from the separable terms' space values (computed once).
  const space = terms ? terms.map((term, j) => Float64Array.from(x, (xp, p) => finite(term.space(xp, y[p]!), `source[${j}].space`, xp, y[p]!))) : null;
  const values = new Float64Array(np);
  const sample = (t: number): Float64Array => {
    if (f) for (let p = 0; p < np; p++) values[p] = finite(f(t, x[p]!, y[p]!), 'source', x[p]!, y[p]!, t);
    else {
      values.fill(0);
      terms!.forEach((term, j) => {
        const g = term.time(t);
        if (!Number.isFinite(g)) throw new InvalidArgumentError(`source[${j}].time(${t}) returned ${g}; expected a finite number`, { field: `source[${j}].time`, received: g });
        const s = space![j]!;
        for (let p = 0; p < np; p++) values[p] = values[p]! + g * s[p]!;
      });
    }
    return values;
  };
  const { nodes, weights } = gaussLegendre01(SOURCE_TIME_POINTS);
  // The two linear moments per point of the rule on [a, b] applied to `pieces` equal pieces (into
  // out, 2·np), and Σ_p w_p ∫ |f| (returned). The loads apply the rule to each piece between
  // breakpoints, and the test functions are linear there.
  const moments = (a: number, b: number, pieces: number, out: Float64Array): number => {
    out.fill(0);
    let total = 0;
    const len = b - a;
    for (let piece = 0; piece < pieces; piece++) {
      for (let q = 0; q < SOURCE_TIME_POINTS; q++) {
        const theta = (piece + nodes[q]!) / pieces;
        const v = sample(a + theta * len);
        const c = (len / pieces) * weights[q]!;
        for (let p = 0; p < np; p++) {
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
  const coarse = new Float64Array(2 * np), fine = new Float64Array(2 * np);
  const split: [number, number, number][] = []; // (time, level, index)
  let scale = -1;
  const stack: number[] = [0, 0];
  while (stack.length > 0) {
    const k = stack.pop()!, l = stack.pop()!;
    const a = k * T * 2 ** -l, b = (k + 1) * T * 2 ** -l;
    const total = moments(a, b, finePieces(a, b), fine);
    if (scale < 0) scale = total; // the first interval is (0, T)
    if (!(scale > 0)) break;
    moments(a, b, 1, coarse);
    let mismatch = 0;
    for (let i = 0; i < 2 * np; i++) mismatch += Math.abs(coarse[i]! - fine[i]!);
    if (!(mismatch > TOLERANCE * scale) || l >= MAX_LEVEL) continue;
    split.push([(a + b) / 2, l, k]);
    stack.push(l + 1, 2 * k, l + 1, 2 * k + 1);
  }
  split.sort((p, q) => p[0] - q[0]);
  return { times: Float64Array.from(split, (p) => p[0]), level: Int32Array.from(split, (p) => p[1]), index: Float64Array.from(split, (p) => p[2]) };
}

function finite(v: number, field: string, x: number, y: number, t?: number): number {
  if (!Number.isFinite(v)) {
    // The wording of the loads' own check (./right-hand-side.ts), which meets the same values later.
    const call = t === undefined ? `${field}(${x}, ${y})` : `${field}(${t}, ${x}, ${y})`;
    throw new InvalidArgumentError(`${call} returned ${v}; expected a finite number`, { field, expected: 'a finite number', received: v });
  }
  return v;
}
