/**
 * Single-scale spaces per level (docs/method.md §3.1–3.3): refinement relations and
 * element-local forms on the level-l mesh, intervals I_{l,i} = [i h, (i+1) h], h = 2^{-l}.
 *
 * Three single-scale spaces, addressed by (idx, comp):
 * - 'hat' (continuous P1, where trial functions live): the hat φ_{l,j} at node j ∈ [0, 2^l]
 *   (idx = j, comp = 0), value 1 at its node;
 * - 'leg' (discontinuous P1, where test functions live): the L2-orthonormal Legendre pair on
 *   interval i ∈ [0, 2^l) (idx = i, comp 0: 2^{l/2}, comp 1: 2^{l/2} √3 (2v − 1), v = 2^l s − i);
 * - 'p0' (piecewise constants, where all derivatives live): comp 0 of 'leg' alone.
 *
 * A form ∫ q^{(dq)} p^{(dp)} is evaluated as the L2 pairing of the representations of q^{(dq)}
 * and p^{(dp)}: a derivative is represented directly in 'leg' (piecewise constants), never by
 * differencing prolonged values, so the tree algorithms stay accurate across 50 levels.
 */
import { POW2, SQRT_POW2, type TemporalBasisKind } from './levels';

/** Bilinear forms on (0, T), q = output (row) function, p = input (column) function. */
export type TemporalForm = 'mass' | 'derivIn' | 'derivOut' | 'stiffness';

/** A single-scale space of one level. */
export type SingleScaleSpace = 'hat' | 'leg' | 'p0';

const SQRT3 = Math.sqrt(3);

/** Derivative orders [dq, dp] of the output and input function in a form. */
export function derivOrders(form: TemporalForm): [0 | 1, 0 | 1] {
  switch (form) {
    case 'mass':
      return [0, 0];
    case 'derivIn':
      return [0, 1];
    case 'derivOut':
      return [1, 0];
    case 'stiffness':
      return [1, 1];
  }
}

/** Space holding the functions of a basis (d = 0) or their (piecewise) derivatives (d = 1). */
export function representationSpace(kind: TemporalBasisKind, d: 0 | 1): SingleScaleSpace {
  if (d === 1) return 'p0';
  return kind === 'trial' ? 'hat' : 'leg';
}

/** Single-scale functions per index: 1 (hat, p0) or 2 (Legendre pair). */
export function functionsPerSingleScaleIndex(space: SingleScaleSpace): 1 | 2 {
  return space === 'leg' ? 2 : 1;
}

/** Local shape functions per element: 2 (hat, leg) or 1 (p0). */
export function localCount(space: SingleScaleSpace): 1 | 2 {
  return space === 'p0' ? 1 : 2;
}

/**
 * Local shape function f ∈ {0,1} on the reference element v ∈ [0,1], before level scaling:
 * hat: 1 − v, v; leg and p0: 1, √3(2v − 1). Level-l functions are these times 2^{l·a},
 * a = 0 (hat) or 1/2 (leg, p0); d/ds brings a further 2^l.
 */
export function shapeValue(space: SingleScaleSpace, f: number, v: number): number {
  if (space === 'hat') return f === 0 ? 1 - v : v;
  return f === 0 ? 1 : SQRT3 * (2 * v - 1);
}

/** d/dv of {@link shapeValue} (constant on the element). */
export function shapeDerivative(space: SingleScaleSpace, f: number): number {
  if (space === 'hat') return f === 0 ? -1 : 1;
  return f === 0 ? 0 : 2 * SQRT3;
}

// Two-point Gauss–Legendre on [0,1]: exact for the degree-≤2 products needed here (common practice).
const GL2_NODES = [0.5 - 0.5 / SQRT3, 0.5 + 0.5 / SQRT3];

/** Reference element mass matrix E[2·o + i] = ∫_0^1 shape_o(out) shape_i(in) dv. */
export function referenceElementMass(outSpace: SingleScaleSpace, inSpace: SingleScaleSpace): Float64Array {
  const E = new Float64Array(4);
  for (let o = 0; o < localCount(outSpace); o++) {
    for (let i = 0; i < localCount(inSpace); i++) {
      let s = 0;
      for (const v of GL2_NODES) s += 0.5 * shapeValue(outSpace, o, v) * shapeValue(inSpace, i, v);
      E[2 * o + i] = Math.abs(s) < 1e-15 ? 0 : s;
    }
  }
  return E;
}

/**
 * Factor turning the reference element mass matrix into the level-l one on (0, T) for a form
 * with nd derivatives: h^{1 + a_out + a_in} · T^{−nd}, h = 2^{-l}, a = 0 (hat) / −1/2 (leg, p0)
 * (docs/method.md §3: ∫_I b1 ∂t b2 = T^{-1} ∫_0^1 b̂1 b̂2'). The 2^l of each derivative is already in
 * the derivative expansions.
 */
export function elementScale(outSpace: SingleScaleSpace, inSpace: SingleScaleSpace, nd: number, level: number, T: number): number {
  const halves = 2 - (outSpace === 'hat' ? 0 : 1) - (inSpace === 'hat' ? 0 : 1); // exponent of h, in halves
  const lvl = halves === 0 ? 1 : 1 / SQRT_POW2[level]! ** halves;
  return nd === 0 ? lvl : lvl / T ** nd;
}

/**
 * Refinement: the level-l single-scale function (idx, comp) as a combination of level-(l+1) ones.
 * Writes entries into outIdx/outComp/outW and returns their count (≤ 4).
 * hat: φ_{l,j} = ½ φ_{l+1,2j−1} + φ_{l+1,2j} + ½ φ_{l+1,2j+1} (terms outside [0, 2^{l+1}] dropped);
 * leg, p0: Legendre pair (constant) of I_{l,i} restricted to its halves I_{l+1,2i}, I_{l+1,2i+1}.
 */
export function prolongStencil(
  space: SingleScaleSpace,
  level: number,
  idx: number,
  comp: number,
  outIdx: Float64Array,
  outComp: Int32Array,
  outW: Float64Array,
): number {
  if (space === 'hat') {
    const nf = POW2[level + 1]!;
    let n = 0;
    const c = 2 * idx;
    if (c - 1 >= 0) {
      outIdx[n] = c - 1; outComp[n] = 0; outW[n++] = 0.5;
    }
    outIdx[n] = c; outComp[n] = 0; outW[n++] = 1;
    if (c + 1 <= nf) {
      outIdx[n] = c + 1; outComp[n] = 0; outW[n++] = 0.5;
    }
    return n;
  }
  const r = Math.SQRT1_2;
  const L = 2 * idx;
  if (comp === 0) { // leg comp 0 and p0
    outIdx[0] = L; outComp[0] = 0; outW[0] = r;
    outIdx[1] = L + 1; outComp[1] = 0; outW[1] = r;
    return 2;
  }
  // √3(2w−1) on the left half is ½·√3(2v−1) − √3/2, on the right half ½·√3(2v−1) + √3/2, times 1/√2.
  outIdx[0] = L; outComp[0] = 0; outW[0] = -0.5 * SQRT3 * r;
  outIdx[1] = L; outComp[1] = 1; outW[1] = 0.5 * r;
  outIdx[2] = L + 1; outComp[2] = 0; outW[2] = 0.5 * SQRT3 * r;
  outIdx[3] = L + 1; outComp[3] = 1; outW[3] = 0.5 * r;
  return 4;
}

/**
 * Elements of the level-l mesh on which the single-scale function (idx, comp) lives, with its
 * local shape number there. Returns the count (1 or 2).
 */
export function ssElements(space: SingleScaleSpace, level: number, idx: number, comp: number, outElem: Float64Array, outLocal: Int32Array): number {
  if (space !== 'hat') {
    outElem[0] = idx;
    outLocal[0] = comp;
    return 1;
  }
  let n = 0;
  if (idx >= 1) {
    outElem[n] = idx - 1; outLocal[n++] = 1;
  }
  if (idx < POW2[level]!) {
    outElem[n] = idx; outLocal[n++] = 0;
  }
  return n;
}

/** Single-scale index of local shape f on element e: hat e + f, leg interval e. */
export function elementFunctionIdx(space: SingleScaleSpace, e: number, f: number): number {
  return space === 'hat' ? e + f : e;
}

/** Component of local shape f: hat 0, leg f. */
export function elementFunctionComp(space: SingleScaleSpace, f: number): number {
  return space === 'hat' ? 0 : f;
}

/**
 * Single-scale indices of `space` whose support meets [lo, hi]·2^{-l} in a set of positive
 * measure, as the integer range [out[0], out[1]] (empty if out[0] > out[1]).
 */
export function ssRangeMeeting(space: SingleScaleSpace, level: number, lo: number, hi: number, out: Float64Array): void {
  if (space === 'hat') {
    const n = POW2[level]!;
    out[0] = lo < 0 ? 0 : lo;
    out[1] = hi > n ? n : hi;
  } else {
    out[0] = lo;
    out[1] = hi - 1;
  }
}
