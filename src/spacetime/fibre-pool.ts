/**
 * Interning of spatial fibres (sorted Int32Array of free vertex ids).
 *
 * Every double tree of one problem (Λ, Λ_Y, the intermediate sets of the
 * tensor apply) draws its fibres from one pool, so that identical fibres are
 * one object with one small integer id. Spatial operator plans are then
 * cached per pair of fibre ids (a sparse grid has only L + 1 distinct fibres).
 */
import { InvalidArgumentError, describeValue } from '../errors';
import { unionOfTwoSorted } from '../space/operator-plan';

/**
 * Interns sorted vertex sets so that equal fibres share one id (and one cached spatial plan).
 *
 * @example
 * ```ts
 * import { FibrePool } from 'chronomesh';
 * const pool = new FibrePool();
 * const a = pool.intern(Int32Array.of(1, 4, 7));
 * const b = pool.intern(Int32Array.of(1, 4, 7)); // same content → same id
 * console.log(a === b); // → true
 * ```
 */
export class FibrePool {
  private readonly byHash = new Map<number, number[]>();
  private readonly byRef = new WeakMap<Int32Array, number>();
  /** The distinct fibres; a fibre's id is its position here. */
  readonly fibres: Int32Array[] = [];

  /** Returns the id of a fibre with the content of `set` (which must be sorted ascending). */
  intern(set: Int32Array): number {
    if (!(set instanceof Int32Array)) {
      throw new InvalidArgumentError(`set must be a sorted Int32Array of vertex ids, received ${describeValue(set)}`, { field: 'set', expected: 'Int32Array', received: describeValue(set) });
    }
    for (let i = 1; i < set.length; i++) {
      if (!(set[i]! > set[i - 1]!)) {
        throw new InvalidArgumentError(`set must be strictly increasing, but set[${i}] = ${set[i]} follows ${set[i - 1]}`, { field: `set[${i}]`, expected: 'strictly increasing ids', received: set[i] });
      }
    }
    const known = this.byRef.get(set);
    if (known !== undefined) return known;
    const h = hashInts(set);
    let bucket = this.byHash.get(h);
    if (bucket === undefined) {
      bucket = [];
      this.byHash.set(h, bucket);
    }
    for (const id of bucket) {
      if (sameInts(this.fibres[id]!, set)) {
        this.byRef.set(set, id);
        return id;
      }
    }
    const id = this.fibres.length;
    this.fibres.push(set);
    bucket.push(id);
    this.byRef.set(set, id);
    return id;
  }

  get(id: number): Int32Array {
    return this.fibres[id]!;
  }
}

function hashInts(a: Int32Array): number {
  let h = 0x811c9dc5 ^ a.length;
  for (let i = 0; i < a.length; i++) {
    h ^= a[i]!;
    h = Math.imul(h, 0x01000193);
  }
  return h >>> 0;
}

/** Whether two Int32Arrays hold the same values. @internal */
export function sameInts(a: Int32Array, b: Int32Array): boolean {
  if (a.length !== b.length) return false;
  for (let i = 0; i < a.length; i++) if (a[i] !== b[i]) return false;
  return true;
}

/** Sorted union of several sorted Int32Arrays (k-way merge by repeated pairwise merge). */
export function unionSorted(sets: Int32Array[]): Int32Array {
  if (sets.length === 0) return new Int32Array(0);
  let acc = sets[0]!;
  for (let s = 1; s < sets.length; s++) acc = unionOfTwoSorted(acc, sets[s]!);
  return acc;
}

/** True if every element of sorted `sub` is in sorted `sup`. */
export function isSortedSubset(sub: Int32Array, sup: Int32Array): boolean {
  let j = 0;
  for (let i = 0; i < sub.length; i++) {
    const x = sub[i]!;
    while (j < sup.length && sup[j]! < x) j++;
    if (j >= sup.length || sup[j] !== x) return false;
  }
  return true;
}

/** Position of every element of sorted `sub` in sorted `sup` (sub ⊆ sup). */
export function positionsIn(sub: Int32Array, sup: Int32Array): Int32Array {
  const out = new Int32Array(sub.length);
  let j = 0;
  for (let i = 0; i < sub.length; i++) {
    while (sup[j]! < sub[i]!) j++;
    out[i] = j;
  }
  return out;
}
