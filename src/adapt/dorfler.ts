/**
 * Dörfler (bulk) marking in linear time (docs/method.md §7): a set M of
 * candidates with Σ_M η² ≥ θ² Σ η², of size at most about twice the minimal
 * one, found by binning the η² by powers of two instead of sorting.
 */
import { InvalidArgumentError } from '../errors';
import { checkFloat64Array, checkNumber } from '../validation/index';

const BINS = 64;

/**
 * Indices of the marked entries of `eta2` (squared indicators; entries ≤ 0 are never marked).
 *
 * @example
 * ```ts
 * import { dorflerMark } from 'chronomesh';
 * dorflerMark(Float64Array.of(1, 100, 4, 0.01), 0.5); // Int32Array [1]
 * ```
 */
export function dorflerMark(eta2: Float64Array, theta: number): Int32Array {
  checkFloat64Array(eta2, 'eta2', { finite: false }); // the loop below names a bad indicator
  checkNumber(theta, 'theta', { min: 0, max: 1, minOpen: true, maxOpen: true });
  if (!(theta > 0 && theta < 1)) throw new InvalidArgumentError(`Dörfler parameter theta = ${theta} must lie in (0, 1)`, { field: 'theta', expected: '(0, 1)', received: theta });
  let total = 0;
  let max = 0;
  let positive = 0;
  for (let i = 0; i < eta2.length; i++) {
    const e = eta2[i]!;
    if (!(e >= 0)) throw new InvalidArgumentError(`indicator ${i} is ${e}; expected a finite number ≥ 0`, { field: `eta2[${i}]`, received: e });
    if (e > 0) {
      total += e;
      positive++;
      if (e > max) max = e;
    }
  }
  if (total === 0) return new Int32Array(0);
  // Bin b holds η² in (max·2^{-(b+1)}, max·2^{-b}]; the last bin collects everything smaller.
  const bin = new Uint8Array(eta2.length);
  const count = new Int32Array(BINS + 1);
  for (let i = 0; i < eta2.length; i++) {
    const e = eta2[i]!;
    if (e <= 0) { bin[i] = 255; continue; }
    const b = Math.min(BINS - 1, Math.floor(Math.log2(max / e)));
    bin[i] = b;
    count[b + 1]!++;
  }
  // Positive entries ordered by bin (largest first), index order within a bin (counting sort).
  for (let b = 0; b < BINS; b++) count[b + 1]! += count[b]!;
  const order = new Int32Array(positive);
  for (let i = 0; i < eta2.length; i++) if (bin[i]! !== 255) order[count[bin[i]!]!++] = i;
  // The shortest prefix with Σ η² ≥ θ² Σ η² (within a factor 2 of the minimal set: bins are
  // powers of two).
  const target = theta * theta * total;
  let acc = 0;
  let k = 0;
  while (k < positive && acc < target) acc += eta2[order[k++]!]!;
  return order.slice(0, k).sort();
}
