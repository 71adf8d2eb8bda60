/**
 * Level bookkeeping shared by both temporal bases (docs/method.md §3): level ranges,
 * node counts per level, exact powers of two and argument validation.
 * Indices are exact integers held in Float64 (< 2^53), never arrays sized 2^level.
 */
import { InvalidArgumentError, describeValue } from '../errors';

/** Which temporal basis: `'trial'` = Σ (three-point wavelets), `'test'` = Ψ (orthonormal multiwavelets). */
export type TemporalBasisKind = 'trial' | 'test';

/**
 * Deepest supported temporal level. At level 52 the trial single-scale node
 * numbers reach 2^52, still exact in a Float64.
 *
 * @example
 * ```ts
 * import { MAX_TEMPORAL_LEVEL } from 'chronomesh';
 * console.log(MAX_TEMPORAL_LEVEL); // → 52
 * ```
 */
export const MAX_TEMPORAL_LEVEL = 52;

/** POW2[l] = 2^l exactly, l = 0 … MAX_TEMPORAL_LEVEL + 1. */
export const POW2: Float64Array = (() => {
  const p = new Float64Array(MAX_TEMPORAL_LEVEL + 2);
  let v = 1;
  for (let l = 0; l < p.length; l++, v *= 2) p[l] = v;
  return p;
})();

/** SQRT_POW2[l] = 2^{l/2} (correctly rounded for even l, one rounding for odd l). */
export const SQRT_POW2: Float64Array = (() => {
  const p = new Float64Array(MAX_TEMPORAL_LEVEL + 2);
  for (let l = 0; l < p.length; l++) p[l] = l % 2 === 0 ? POW2[l >> 1]! : POW2[l >> 1]! * Math.SQRT2;
  return p;
})();

/** Number of nodes of a basis on a level: 2 (trial, level 0), 1 (test, level 0), 2^{l−1} (l ≥ 1). */
export function nodesOnLevel(kind: TemporalBasisKind, level: number): number {
  if (level === 0) return kind === 'trial' ? 2 : 1;
  return POW2[level - 1]!;
}

/** Functions per node: 1 for trial, 2 for test. */
export function functionsPerNode(kind: TemporalBasisKind): 1 | 2 {
  return kind === 'trial' ? 1 : 2;
}

export function checkKind(kind: unknown, field = 'kind'): asserts kind is TemporalBasisKind {
  if (kind !== 'trial' && kind !== 'test') {
    throw new InvalidArgumentError(`${field} must be 'trial' or 'test'; received ${describeValue(kind)}`, {
      field,
      expected: "'trial' | 'test'",
      received: kind,
    });
  }
}

export function checkLevel(level: unknown, field = 'level'): asserts level is number {
  if (typeof level !== 'number' || !Number.isInteger(level) || level < 0 || level > MAX_TEMPORAL_LEVEL) {
    throw new InvalidArgumentError(
      `${field} must be an integer in [0, ${MAX_TEMPORAL_LEVEL}]; received ${describeValue(level)}`,
      { field, expected: `integer in [0, ${MAX_TEMPORAL_LEVEL}]`, received: level },
    );
  }
}

/** Validates a (level, index) pair of the given basis; `where` is appended to the message (e.g. " (nodes[3])"). */
export function checkNode(kind: TemporalBasisKind, level: unknown, index: unknown, where = '', field = 'index', levelField = 'level'): void {
  checkLevel(level, levelField + where);
  const n = nodesOnLevel(kind, level);
  if (typeof index !== 'number' || !Number.isInteger(index) || index < 0 || index >= n) {
    throw new InvalidArgumentError(
      `${field}${where} of a ${kind} node on level ${level} must be an integer in [0, ${n - 1}]; received ${describeValue(index)}`,
      { field: field + where, expected: `integer in [0, ${n - 1}]`, received: index },
    );
  }
}

/** Validates the interval length T (finite, > 0). */
export function checkT(T: unknown, field = 'T'): asserts T is number {
  if (typeof T !== 'number' || !Number.isFinite(T) || T <= 0) {
    throw new InvalidArgumentError(`${field} must be a finite number > 0; received ${describeValue(T)}`, {
      field,
      expected: 'finite number > 0',
      received: T,
    });
  }
}
