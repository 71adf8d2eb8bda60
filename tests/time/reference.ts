/**
 * Independent dense reference for the temporal bases (docs/method.md §3): every basis function is
 * evaluated pointwise straight from its defining formula, and pairs are integrated by
 * composite Gauss–Legendre quadrature on the finest dyadic mesh of the pair, only over the
 * intervals where both functions live. Nothing here uses src/time's single-scale machinery.
 * Reused by the space-time tests.
 */
import type { LevelPart, TemporalBasisKind, TemporalForm } from '../../src/time/index';

/**
 * 3-point Gauss–Legendre rule on [−1, 1]: Abramowitz & Stegun, Handbook of Mathematical
 * Functions (1964), Table 25.4, n = 3: x = 0, ±0.774596669241483377035853079956;
 * w = 0.888888888888888888888888888889, 0.555555555555555555555555555556.
 * Exact for degree 5; the integrands here are of degree ≤ 2 on each interval.
 */
export const GAUSS3_NODES = [-0.774596669241483377035853079956, 0, 0.774596669241483377035853079956];
export const GAUSS3_WEIGHTS = [0.555555555555555555555555555556, 0.888888888888888888888888888889, 0.555555555555555555555555555556];

export interface NodeRef {
  level: number;
  index: number;
}

/**
 * A point s = (i + v)·2^{-m} of (0, 1), kept as (m, i, v) so that the element of every
 * coarser level and the position inside it are exact even at level 52 next to s = 1.
 */
interface Pt {
  m: number;
  i: number;
  v: number;
}

/**
 * The level-l element e containing p and the local coordinate w = s·2^l − e ∈ [0, 1), formed
 * from integers so that no cancellation occurs (l ≤ m).
 */
function locate(p: Pt, l: number): [number, number] {
  const f = 2 ** (p.m - l);
  const e = Math.floor(p.i / f);
  return [e, (p.i - e * f + p.v) / f];
}

/** Hat of the level-l mesh at node j: value and d/ds. */
function hat(p: Pt, l: number, j: number): [number, number] {
  const [e, w] = locate(p, l);
  if (e === j - 1) return [w, 2 ** l];
  if (e === j) return [1 - w, -(2 ** l)];
  return [0, 0];
}

/** Unnormalised function on (0,1) and its derivative (docs/method.md §3.1 and §3.2 formulas). */
function rawBasis(kind: TemporalBasisKind, l: number, k: number, slot: number, p: Pt): [number, number] {
  if (kind === 'trial') {
    if (l === 0) return hat(p, 0, k);
    // ŝ_{l,k} = φ_{l,2k+1} − w_L φ_{l−1,k} − w_R φ_{l−1,k+1}; w = 1/2 at the coarse nodes 0 and 1, else 1/4
    const last = 2 ** (l - 1);
    const wL = k === 0 ? 0.5 : 0.25;
    const wR = k + 1 === last ? 0.5 : 0.25;
    const a = hat(p, l, 2 * k + 1);
    const b = hat(p, l - 1, k);
    const c = hat(p, l - 1, k + 1);
    return [a[0] - wL * b[0] - wR * c[0], a[1] - wL * b[1] - wR * c[1]];
  }
  if (l === 0) {
    const s = locate(p, 0)[1];
    return slot === 0 ? [1, 0] : [Math.sqrt(3) * (2 * s - 1), 2 * Math.sqrt(3)];
  }
  // J = I_{l−1,k}, u = 2(s − left(J))/|J| − 1 ∈ [−1, 1]
  const [e, r] = locate(p, l - 1);
  if (e !== k) return [0, 0];
  const J = 2 ** -(l - 1);
  const u = 2 * r - 1;
  const dudS = 2 / J;
  const sg = u > 0 ? 1 : -1;
  if (slot === 0) {
    const c = Math.sqrt(12 / J);
    return [c * (Math.abs(u) - 0.5), c * sg * dudS];
  }
  const c = Math.sqrt(4 / J);
  return [c * (sg - 1.5 * u), c * -1.5 * dudS];
}

/** Support of a node as level-l numerators (docs/method.md §3.1, §3.2). */
export function referenceSupport(kind: TemporalBasisKind, l: number, k: number): [number, number] {
  if (l === 0) return [0, 1];
  if (kind === 'trial') return [Math.max(2 * k - 2, 0), Math.min(2 * k + 4, 2 ** l)];
  return [2 * k, 2 * k + 2];
}

/** Composite Gauss quadrature of f over the level-m intervals [i0, i1) of (0,1). */
function integrate(m: number, i0: number, i1: number, f: (p: Pt) => number): number {
  let s = 0;
  for (let i = i0; i < i1; i++) {
    for (let g = 0; g < 3; g++) {
      s += GAUSS3_WEIGHTS[g]! * 0.5 * f({ m, i, v: 0.5 * (1 + GAUSS3_NODES[g]!) });
    }
  }
  return s * 2 ** -m;
}

const normCache = new Map<string, number>();

/** ‖ŝ‖_{L2(0,1)} by quadrature on the function's own level. */
function rawNorm(kind: TemporalBasisKind, l: number, k: number, slot: number): number {
  if (kind === 'test') return 1; // the formulas are normalised already (the tests check it)
  const key = `${l},${k}`;
  let v = normCache.get(key);
  if (v === undefined) {
    const [lo, hi] = referenceSupport(kind, l, k);
    v = Math.sqrt(integrate(l, lo, hi, (p) => rawBasis(kind, l, k, slot, p)[0] ** 2));
    normCache.set(key, v);
  }
  return v;
}

/** Normalised basis function on (0,1): value and d/ds. */
function basisRef(kind: TemporalBasisKind, l: number, k: number, slot: number, p: Pt): [number, number] {
  const [a, b] = rawBasis(kind, l, k, slot, p);
  const n = rawNorm(kind, l, k, slot);
  return [a / n, b / n];
}

/**
 * Value and derivative of a basis function at t ∈ (0, T) by the formulas of docs/method.md §3,
 * b(t) = T^{-1/2} b̂(t/T). At breakpoints a one-sided value is returned.
 */
export function referenceValue(kind: TemporalBasisKind, l: number, k: number, slot: number, t: number, T = 1): { value: number; derivative: number } {
  const m = 52;
  const x = (t / T) * 2 ** m;
  const i = Math.min(Math.floor(x), 2 ** m - 1);
  const [a, b] = basisRef(kind, l, k, slot, { m, i, v: x - i });
  return { value: a / Math.sqrt(T), derivative: b / (T * Math.sqrt(T)) };
}

function fpn(kind: TemporalBasisKind): number {
  return kind === 'trial' ? 1 : 2;
}

const ALL_FORMS: TemporalForm[] = ['mass', 'derivIn', 'derivOut', 'stiffness'];

/**
 * Dense matrices C[i][j] = ∫_0^T q_i^{(dq)} p_j^{(dp)} dt of all four forms at once (one pass of
 * point evaluations), between output functions q (rows, coefficient order: node n, slot s →
 * row fpn·n + s) and input functions p (columns), restricted to the level pairs of `part`
 * (lower |q| > |p|, upper |q| ≤ |p|).
 */
export function denseTemporalForms(
  outKind: TemporalBasisKind,
  outNodes: NodeRef[],
  inKind: TemporalBasisKind,
  inNodes: NodeRef[],
  T: number,
  part: LevelPart = 'full',
): Record<TemporalForm, number[][]> {
  const fo = fpn(outKind);
  const fi = fpn(inKind);
  const mk = () => Array.from({ length: outNodes.length * fo }, () => new Array<number>(inNodes.length * fi).fill(0));
  const res = { mass: mk(), derivIn: mk(), derivOut: mk(), stiffness: mk() };
  const acc = [0, 0, 0, 0];
  outNodes.forEach((q, a) => {
    const [qlo, qhi] = referenceSupport(outKind, q.level, q.index);
    inNodes.forEach((p, b) => {
      if (part === 'lower' && !(q.level > p.level)) return;
      if (part === 'upper' && !(q.level <= p.level)) return;
      const [plo, phi] = referenceSupport(inKind, p.level, p.index);
      const m = Math.max(q.level, p.level);
      const lo = Math.max(qlo * 2 ** (m - q.level), plo * 2 ** (m - p.level));
      const hi = Math.min(qhi * 2 ** (m - q.level), phi * 2 ** (m - p.level));
      if (hi <= lo) return;
      for (let sq = 0; sq < fo; sq++) {
        for (let sp = 0; sp < fi; sp++) {
          acc.fill(0);
          for (let i = lo; i < hi; i++) {
            for (let g = 0; g < 3; g++) {
              const pt = { m, i, v: 0.5 * (1 + GAUSS3_NODES[g]!) };
              const u = basisRef(outKind, q.level, q.index, sq, pt);
              const w = basisRef(inKind, p.level, p.index, sp, pt);
              const wt = GAUSS3_WEIGHTS[g]! * 0.5 * 2 ** -m;
              acc[0] += wt * u[0] * w[0];
              acc[1] += wt * u[0] * w[1];
              acc[2] += wt * u[1] * w[0];
              acc[3] += wt * u[1] * w[1];
            }
          }
          // On (0, T): b(t) = T^{-1/2} b̂(t/T), dt = T ds, and each derivative brings 1/T.
          ALL_FORMS.forEach((f, n) => {
            const nd = (n & 1) + (n >> 1);
            res[f][a * fo + sq]![b * fi + sp] = acc[n]! / T ** nd;
          });
        }
      }
    });
  });
  return res;
}

/** One form of {@link denseTemporalForms}. */
export function denseTemporalMatrix(
  form: TemporalForm,
  outKind: TemporalBasisKind,
  outNodes: NodeRef[],
  inKind: TemporalBasisKind,
  inNodes: NodeRef[],
  T: number,
  part: LevelPart = 'full',
): number[][] {
  return denseTemporalForms(outKind, outNodes, inKind, inNodes, T, part)[form];
}

/** ‖b̂^{(d)}‖ mapped to (0, T) (d = 1: piecewise derivative), by the same quadrature. */
export function referenceNorm(kind: TemporalBasisKind, l: number, k: number, slot: number, d: 0 | 1, T = 1): number {
  const [lo, hi] = referenceSupport(kind, l, k);
  const v = integrate(l, lo, hi, (p) => basisRef(kind, l, k, slot, p)[d] ** 2);
  return Math.sqrt(v) / T ** d;
}

/** ∫_0^1 s^power b̂(s) ds by the same quadrature (moments). */
export function referenceMoment(kind: TemporalBasisKind, l: number, k: number, slot: number, power: number): number {
  const [lo, hi] = referenceSupport(kind, l, k);
  return integrate(l, lo, hi, (p) => locate(p, 0)[1] ** power * basisRef(kind, l, k, slot, p)[0]);
}
