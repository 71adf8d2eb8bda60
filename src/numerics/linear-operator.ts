/**
 * The operator interface shared by the tensor-product plans, the space-time
 * system and PCG: a square or rectangular linear map applied into a
 * caller-provided output array.
 */
import { InvalidArgumentError } from '../errors';

/** A linear map with `apply(x, y)` writing y = Op x into a caller-provided array. */
export interface LinearOperator {
  /** Length of the input vector. */
  readonly inSize: number;
  /** Length of the output vector. */
  readonly outSize: number;
  /** y = Op x (overwrites y). Must not allocate per call. x and y must not share memory (an aliased call throws InvalidArgumentError). */
  apply(x: Float64Array, y: Float64Array): void;
}

/**
 * The aliasing rule of every `apply(x, y)` in chronomesh: x and y must not share memory
 * (not the same array, nor views over overlapping parts of one buffer). The operators
 * write y while they still read x — S = Bᵀ K_Y B + G, for instance, writes Bᵀ(…) into y
 * before G reads x — so an aliased call would silently return a wrong result; it throws
 * instead. Costs O(1) per call.
 *
 * @throws InvalidArgumentError (field `y`) when x and y overlap.
 */
export function checkNotAliased(x: Float64Array, y: Float64Array, owner: string): void {
  if (x.buffer !== y.buffer) return;
  const x0 = x.byteOffset;
  const y0 = y.byteOffset;
  if (x0 < y0 + y.byteLength && y0 < x0 + x.byteLength && x.length > 0 && y.length > 0) {
    throw new InvalidArgumentError(
      `${owner}.apply(x, y): y overlaps x (the same array or views of one buffer); pass a separate output array`,
      { field: 'y', expected: 'an array not sharing memory with x' },
    );
  }
}
