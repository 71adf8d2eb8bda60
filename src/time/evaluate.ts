/**
 * Point values, end-point traces and derivative norms of temporal basis functions on (0, T),
 * from their single-scale expansions (docs/method.md §3: b(t) = T^{-1/2} b̂(t/T)).
 */
import { InvalidArgumentError, describeValue } from '../errors';
import { POW2, SQRT_POW2, checkKind, checkNode, checkT, functionsPerNode, type TemporalBasisKind } from './levels';
import { representationSpace, shapeDerivative, shapeValue } from './single-scale';
import { derivativeStencil, waveletStencil } from './wavelets';
import { TemporalTree } from './tree';

const stIdx = new Float64Array(8);
const stComp = new Int32Array(8);
const stW = new Float64Array(8);
const local = new Float64Array(2);

/** Coefficients of the local shapes on element e of the expansion held in the st* scratch (n entries). */
function localCoefficients(kind: TemporalBasisKind, n: number, e: number, out: Float64Array): void {
  out[0] = 0;
  out[1] = 0;
  for (let q = 0; q < n; q++) {
    const idx = stIdx[q]!;
    if (kind === 'trial') {
      if (idx === e) out[0] += stW[q]!;
      else if (idx === e + 1) out[1] += stW[q]!;
    } else if (idx === e) out[stComp[q]!] += stW[q]!;
  }
}

/** Value (d = 0) or d/ds (d = 1) on the reference interval of the level-l expansion in scratch, on element e at local v. */
function evalOnElement(kind: TemporalBasisKind, l: number, n: number, e: number, v: number, d: 0 | 1): number {
  localCoefficients(kind, n, e, local);
  const sp = representationSpace(kind, 0);
  const amp = kind === 'trial' ? 1 : SQRT_POW2[l]!;
  if (d === 0) return amp * (local[0]! * shapeValue(sp, 0, v) + local[1]! * shapeValue(sp, 1, v));
  return amp * POW2[l]! * (local[0]! * shapeDerivative(sp, 0) + local[1]! * shapeDerivative(sp, 1));
}

function checkSlot(kind: TemporalBasisKind, slot: unknown): void {
  const m = functionsPerNode(kind);
  if (typeof slot !== 'number' || !Number.isInteger(slot) || slot < 0 || slot >= m) {
    throw new InvalidArgumentError(`slot of a ${kind} node must be an integer in [0, ${m - 1}]; received ${describeValue(slot)}`, {
      field: 'slot', expected: `integer in [0, ${m - 1}]`, received: slot,
    });
  }
}

/**
 * Value and derivative of one basis function at t ∈ [0, T]. At a breakpoint of the function's
 * mesh the piece to the right is used (to the left at t = T), so for the discontinuous test
 * functions this is a one-sided value.
 *
 * @example
 * ```ts
 * import { evaluateTemporal } from 'chronomesh';
 * evaluateTemporal('trial', 0, 0, 0, 0); // { value: √3, derivative: −√3 }
 * ```
 */
export function evaluateTemporal(kind: TemporalBasisKind, level: number, index: number, slot: number, t: number, T = 1): { value: number; derivative: number } {
  checkKind(kind);
  checkNode(kind, level, index);
  checkSlot(kind, slot);
  checkT(T);
  if (typeof t !== 'number' || !Number.isFinite(t) || t < 0 || t > T) {
    throw new InvalidArgumentError(`t must be a finite number in [0, ${T}]; received ${describeValue(t)}`, {
      field: 't', expected: `number in [0, ${T}]`, received: t,
    });
  }
  const n = waveletStencil(kind, level, index, slot, stIdx, stComp, stW);
  const x = (t / T) * POW2[level]!;
  let e = Math.floor(x);
  if (e >= POW2[level]!) e = POW2[level]! - 1;
  const v = x - e;
  return {
    value: evalOnElement(kind, level, n, e, v, 0) / Math.sqrt(T),
    derivative: evalOnElement(kind, level, n, e, v, 1) / (T * Math.sqrt(T)),
  };
}

/**
 * Values of all functions of a tree at t = 0 (side 0) or t = T (side 1), in coefficient order
 * (for test functions the one-sided limit from inside (0, T)). Only σ_{0,0} and the k = 0
 * wavelets are nonzero at t = 0 (docs/method.md §3.1).
 *
 * @example
 * ```ts
 * import { TemporalTree, traceVector } from 'chronomesh';
 * const g = traceVector(TemporalTree.full('trial', 4), 0); // g_λ = σ_λ(0)
 * ```
 */
export function traceVector(tree: TemporalTree, side: 0 | 1, T = 1): Float64Array {
  if (!(tree instanceof TemporalTree)) {
    throw new InvalidArgumentError(`tree must be a TemporalTree; received ${describeValue(tree)}`, { field: 'tree', received: tree });
  }
  if (side !== 0 && side !== 1) {
    throw new InvalidArgumentError(`side must be 0 (t = 0) or 1 (t = T); received ${describeValue(side)}`, {
      field: 'side', expected: '0 | 1', received: side,
    });
  }
  checkT(T);
  const kind = tree.kind;
  const fpn = functionsPerNode(kind);
  const out = new Float64Array(tree.functionCount);
  const rt = 1 / Math.sqrt(T);
  for (let l = 0; l <= tree.maxLevel; l++) {
    const end = side === 0 ? 0 : POW2[l]! - 1;
    for (let p = tree.levelStart[l]!; p < tree.levelStart[l + 1]!; p++) {
      for (let s = 0; s < fpn; s++) {
        const n = waveletStencil(kind, l, tree.index[p]!, s, stIdx, stComp, stW);
        out[p * fpn + s] = rt * evalOnElement(kind, l, n, end, side, 0);
      }
    }
  }
  return out;
}

/**
 * ‖∂t b‖_{L2(0,T)} of every function of the tree, in coefficient order (for trial functions
 * the α_λ of docs/method.md §6; for test functions the norm of the piecewise derivative).
 *
 * @example
 * ```ts
 * import { TemporalTree, derivativeNorms } from 'chronomesh';
 * const alpha = derivativeNorms(TemporalTree.full('trial', 3), 2.0);
 * ```
 */
export function derivativeNorms(tree: TemporalTree, T = 1): Float64Array {
  if (!(tree instanceof TemporalTree)) {
    throw new InvalidArgumentError(`tree must be a TemporalTree; received ${describeValue(tree)}`, { field: 'tree', received: tree });
  }
  checkT(T);
  const kind = tree.kind;
  const fpn = functionsPerNode(kind);
  const out = new Float64Array(tree.functionCount);
  for (let l = 0; l <= tree.maxLevel; l++) {
    for (let p = tree.levelStart[l]!; p < tree.levelStart[l + 1]!; p++) {
      for (let s = 0; s < fpn; s++) {
        // the derivative expansion is in the orthonormal Legendre basis: ‖b̂'‖² = Σ w²
        const n = derivativeStencil(kind, l, tree.index[p]!, s, stIdx, stComp, stW);
        let sum = 0;
        for (let q = 0; q < n; q++) sum += stW[q]! * stW[q]!;
        out[p * fpn + s] = Math.sqrt(sum) / T;
      }
    }
  }
  return out;
}
