/**
 * Every basis function written in the single-scale basis of its own level
 * (docs/method.md §3.1 three-point wavelets, §3.2 multiwavelets).
 */
import { POW2, SQRT_POW2, type TemporalBasisKind } from './levels';

const SQRT3 = Math.sqrt(3);
const SQRT2 = Math.SQRT2;
const SQRT6 = Math.sqrt(6);

// Unnormalised trial wavelet in level-l hat coefficients, relative offsets −1 … +3 from 2k.
const raw = new Float64Array(5);

/**
 * ‖Σ c_j φ_j‖² for hat coefficients c on n consecutive nodes of a mesh with h = 1; the function
 * is zero on the element before (after) them unless the first (last) node is the end of (0, 1).
 */
function hatNormSquared(c: Float64Array, n: number, atLeftEnd: boolean, atRightEnd: boolean): number {
  let s = 0;
  const j0 = atLeftEnd ? 1 : 0;
  const j1 = atRightEnd ? n - 1 : n;
  for (let j = j0; j <= j1; j++) {
    const a = j > 0 ? c[j - 1]! : 0;
    const b = j < n ? c[j]! : 0;
    s += (a * a + a * b + b * b) / 3;
  }
  return s;
}

/**
 * Single-scale expansion of basis function (kind, level, index, slot) on its own level:
 * entries (outIdx[e], outComp[e], outW[e]) with the conventions of single-scale.ts.
 * Returns the count (≤ 5). No validation (kernel for plan building).
 */
export function waveletStencil(
  kind: TemporalBasisKind,
  level: number,
  index: number,
  slot: number,
  outIdx: Float64Array,
  outComp: Int32Array,
  outW: Float64Array,
): number {
  if (kind === 'trial') {
    if (level === 0) {
      // σ_{0,0} = √3 (1 − s), σ_{0,1} = √3 s.
      outIdx[0] = index; outComp[0] = 0; outW[0] = SQRT3;
      return 1;
    }
    // ŝ_{l,k} = φ_{l,2k+1} − w_L φ_{l−1,k} − w_R φ_{l−1,k+1}, w = ½ at the coarse nodes 0 and 1, ¼ otherwise.
    const wL = index === 0 ? 0.5 : 0.25;
    const wR = index + 1 === POW2[level - 1]! ? 0.5 : 0.25;
    raw[0] = -0.5 * wL;
    raw[1] = -wL;
    raw[2] = 1 - 0.5 * wL - 0.5 * wR;
    raw[3] = -wR;
    raw[4] = -0.5 * wR;
    const first = index === 0 ? 1 : 0; // hat 2k−1 = −1 does not exist
    const last = index + 1 === POW2[level - 1]! ? 3 : 4; // hat 2k+3 = 2^l + 1 does not exist
    let n = 0;
    for (let r = first; r <= last; r++) raw[n++] = raw[r]!;
    // ‖ŝ‖ = h^{1/2} ‖ŝ‖_{h=1}, so σ = ŝ · 2^{l/2} / ‖ŝ‖_{h=1}.
    const scale = SQRT_POW2[level]! / Math.sqrt(hatNormSquared(raw, n, first === 1, last === 3));
    const j0 = 2 * index - 1 + first;
    for (let e = 0; e < n; e++) {
      outIdx[e] = j0 + e;
      outComp[e] = 0;
      outW[e] = raw[e]! * scale;
    }
    return n;
  }
  if (level === 0) {
    outIdx[0] = 0; outComp[0] = slot; outW[0] = 1;
    return 1;
  }
  // On J = I_{l−1,k} = I_{l,2k} ∪ I_{l,2k+1}, in the level-l Legendre pairs (χ0, χ1) of the halves:
  // ψ_even = (0, −1/√2 | 0, 1/√2),  ψ_odd = (−√2/4, −√6/4 | √2/4, −√6/4).
  const L = 2 * index;
  if (slot === 0) {
    outIdx[0] = L; outComp[0] = 1; outW[0] = -Math.SQRT1_2;
    outIdx[1] = L + 1; outComp[1] = 1; outW[1] = Math.SQRT1_2;
    return 2;
  }
  outIdx[0] = L; outComp[0] = 0; outW[0] = -SQRT2 / 4;
  outIdx[1] = L; outComp[1] = 1; outW[1] = -SQRT6 / 4;
  outIdx[2] = L + 1; outComp[2] = 0; outW[2] = SQRT2 / 4;
  outIdx[3] = L + 1; outComp[3] = 1; outW[3] = -SQRT6 / 4;
  return 4;
}

const tIdx = new Float64Array(8);
const tComp = new Int32Array(8);
const tW = new Float64Array(8);

/**
 * Expansion of the (piecewise) derivative d/ds of a basis function in the 'leg' single-scale
 * space of its level; only comp 0 (constants) occurs. Returns the count (≤ 6).
 * trial: on element e the slope is (c_{e+1} − c_e)·2^l, i.e. (c_{e+1} − c_e)·2^{l/2} times χ0;
 * test: c·χ1 has slope c·2^{l/2}·2√3·2^l, i.e. c·2√3·2^l times χ0.
 */
export function derivativeStencil(
  kind: TemporalBasisKind,
  level: number,
  index: number,
  slot: number,
  outIdx: Float64Array,
  outComp: Int32Array,
  outW: Float64Array,
): number {
  const n = waveletStencil(kind, level, index, slot, tIdx, tComp, tW);
  let m = 0;
  if (kind === 'trial') {
    const j0 = tIdx[0]!;
    const j1 = tIdx[n - 1]!;
    const e0 = j0 > 0 ? j0 - 1 : 0;
    const e1 = j1 < POW2[level]! ? j1 : j1 - 1;
    const amp = SQRT_POW2[level]!;
    for (let e = e0; e <= e1; e++) {
      const left = e >= j0 ? tW[e - j0]! : 0;
      const right = e + 1 <= j1 ? tW[e + 1 - j0]! : 0;
      outIdx[m] = e; outComp[m] = 0; outW[m++] = (right - left) * amp;
    }
    return m;
  }
  const amp = 2 * SQRT3 * POW2[level]!;
  for (let q = 0; q < n; q++) {
    if (tComp[q] !== 1) continue;
    outIdx[m] = tIdx[q]!; outComp[m] = 0; outW[m++] = tW[q]! * amp;
  }
  return m;
}
