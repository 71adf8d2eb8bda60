/**
 * A spatial vertex set on which the load quadrature resolves given data (docs/adaptivity.md §2.1).
 *
 * Loads ∫ g φ are computed with the degree-5 rules of ./quadrature on the leaf elements of a
 * fibre's mesh. Data with features much smaller than an element (a localized source, a hot spot in
 * the initial state) can fall between the quadrature points of every element: the load is then
 * about zero, the residual too, and the estimator reports a wrong answer as accurate (a source of
 * width 0.003 on the 2 × 2 unit square gave E = 3·10⁻¹⁶ and u ≈ 0 at its centre).
 *
 * For every element, starting from the initial mesh, the element's own rule is compared with the
 * same rule on 4^m congruent sub-elements (2^m in 1D), m chosen so that the sub-elements are no
 * larger than SAMPLE_FRACTION of the domain's diameter (and at least 8 times smaller than the
 * element): if the three (two) nodal loads ∫ g λ_j differ by more than DATA_TOLERANCE of ∫ |g| over the
 * domain, the element is bisected and its children are checked in turn. The vertices this creates,
 * closed, are returned, with the shortest diffusion time h²/κ of the elements they create (h their
 * shortest edge). Features narrower than about SAMPLE_FRACTION·diam(Ω)/3 can still be missed
 * (the sub-element rules sample them too sparsely).
 */
import { InvalidArgumentError, describeValue } from '../errors';
import { BYTES_PER_FOREST_VERTEX, memoryBudget } from '../validation/index';
import { elementDiffusionTime } from './diffusion-time';
import { sameValues } from '../numerics/same-values';
import { INTERVAL_POINTS, INTERVAL_WEIGHTS, TRIANGLE_POINTS, TRIANGLE_WEIGHTS } from './quadrature';
import type { VertexClosure } from './vertex-closure';

/** Largest sub-element, as a fraction of the domain's diameter. */
const SAMPLE_FRACTION = 1 / 128;
/** Relative mismatch of an element's loads (against ∫ |g| over Ω) that makes it bisected. */
export const DATA_TOLERANCE = 0.01;
/** Generations below the initial mesh at most. */
const MAX_DEPTH = 40;

/** A datum to resolve: its name (for errors) and its values. */
export interface SampledDatum {
  readonly field: string;
  readonly value: (x: number, y: number) => number;
}

/** See the file comment. @internal */
export function dataResolvedSet(closure: VertexClosure, data: readonly SampledDatum[]): { set: Int32Array; tau: number } {
  const f = closure.forest;
  const d = closure.dim;
  const created: number[] = [];
  let tau = Infinity;
  if (data.length === 0) return { set: closure.close(created), tau };
  const delta = sampleSpacing(f);
  const coarse = new Float64Array(3), fine = new Float64Array(3);
  const ne0 = f.initialElementCount;
  const initialFine = new Float64Array(ne0 * (d + 1));
  let previous: Float64Array | null = null;
  for (const datum of data) {
    const g = checked(datum);
    // Samples of a time-dependent datum that repeat the previous one on a fixed point set (a source
    // constant in time, or switched off) would refine nothing new: skipped.
    const print = fingerprint(f, g);
    if (previous !== null && sameValues(print, previous)) continue;
    previous = print;
    // ∫ |g| over Ω with the fine rules of the initial elements (the scale of the mismatches); their
    // fine nodal loads are kept for the first visit of each initial element below.
    let scale = 0;
    for (let e = 0; e < ne0; e++) {
      scale += loads(f, e, g, subdivisions(f, e, delta), fine);
      for (let j = 0; j <= d; j++) initialFine[e * (d + 1) + j] = fine[j]!;
    }
    if (!(scale > 0)) continue;
    tau = Math.min(tau, bisectWhere(closure, created, (e) => {
      loads(f, e, g, 0, coarse);
      if (e < ne0) for (let j = 0; j <= d; j++) fine[j] = initialFine[e * (d + 1) + j]!;
      else loads(f, e, g, subdivisions(f, e, delta), fine);
      let mismatch = 0;
      for (let j = 0; j <= d; j++) mismatch += Math.abs(coarse[j]! - fine[j]!);
      return mismatch > DATA_TOLERANCE * scale;
    }));
  }
  return { set: closure.close(created), tau };
}

/** The longest sub-element edge of the fine rules: SAMPLE_FRACTION of the domain's diameter. @internal */
export function sampleSpacing(f: VertexClosure['forest']): number {
  return domainDiameter(f) * SAMPLE_FRACTION;
}

/** The diameter of the domain's bounding box (from the initial vertices). @internal */
export function domainDiameter(f: VertexClosure['forest']): number {
  const d = f.dim;
  let lo0 = Infinity, hi0 = -Infinity, lo1 = Infinity, hi1 = -Infinity;
  for (let v = 0; v < f.initialVertexCount; v++) {
    const x = f.vCoord[v * d]!, y = d === 2 ? f.vCoord[v * d + 1]! : 0;
    lo0 = Math.min(lo0, x); hi0 = Math.max(hi0, x); lo1 = Math.min(lo1, y); hi1 = Math.max(hi1, y);
  }
  return Math.hypot(hi0 - lo0, hi1 - lo1);
}

/**
 * Bisects, from the initial elements down (at most MAX_DEPTH generations), every forest element
 * for which `unresolved(e)` holds, and checks its children in turn; the midpoints created are
 * appended to `created`. Returns the shortest diffusion time h²/κ of the elements created (∞ if
 * none). Stops early at the memory budget's vertex count (the caller's next step refuses the run).
 * @internal
 */
export function bisectWhere(closure: VertexClosure, created: number[], unresolved: (e: number) => boolean): number {
  const f = closure.forest;
  const maxVertices = memoryBudget() / BYTES_PER_FOREST_VERTEX;
  let tau = Infinity;
  let sp = 0;
  for (let e = 0; e < f.initialElementCount; e++) sp = closure.pushStack(sp, e);
  while (sp > 0) {
    const e = closure.stack[--sp]!;
    if (f.eGen[e]! >= MAX_DEPTH || !unresolved(e)) continue;
    if (f.vertexCount >= maxVertices) break;
    created.push(f.bisect(e));
    const c = f.eChild[e]!;
    sp = closure.pushStack(sp, c);
    sp = closure.pushStack(sp, c + 1);
    tau = Math.min(tau, elementDiffusionTime(f, c), elementDiffusionTime(f, c + 1));
  }
  return tau;
}

function checked(datum: SampledDatum): (x: number, y: number) => number {
  return (x, y) => {
    const v = datum.value(x, y);
    if (!Number.isFinite(v)) {
      throw new InvalidArgumentError(`${datum.field} is ${describeValue(v)} at (x, y) = (${x}, ${y}); it must be finite on the whole domain`, { field: datum.field, expected: 'a finite number', received: v });
    }
    return v;
  };
}

/** Values of g at the points of the element rules on 16 (2D) or 4 (1D) sub-elements of every initial element. */
function fingerprint(f: VertexClosure['forest'], g: (x: number, y: number) => number): Float64Array {
  const values: number[] = [];
  const record = (x: number, y: number): number => {
    const v = g(x, y);
    values.push(v);
    return v;
  };
  const out = new Float64Array(3);
  for (let e = 0; e < f.initialElementCount; e++) loads(f, e, record, 2, out);
  return Float64Array.from(values);
}


/** m such that 2^m sub-edges of element e are no longer than min(delta, its diameter / 8). */
function subdivisions(f: VertexClosure['forest'], e: number, delta: number): number {
  const d = f.dim, nv = f.nv;
  let diam = 0;
  for (let i = 0; i < nv; i++) {
    for (let j = i + 1; j < nv; j++) {
      const a = f.eVert[e * nv + i]!, b = f.eVert[e * nv + j]!;
      let s = 0;
      for (let k = 0; k < d; k++) s += (f.vCoord[a * d + k]! - f.vCoord[b * d + k]!) ** 2;
      diam = Math.max(diam, Math.sqrt(s));
    }
  }
  return Math.min(d === 2 ? 7 : 14, Math.max(3, Math.ceil(Math.log2(diam / delta))));
}

/**
 * The nodal loads ∫ g λ_j over element e with the element's rule applied on 4^m (2D) or 2^m (1D)
 * congruent sub-elements, written into out[0 … dim]; returns the same rule's ∫ |g|.
 */
function loads(f: VertexClosure['forest'], e: number, g: (x: number, y: number) => number, m: number, out: Float64Array): number {
  const d = f.dim;
  out.fill(0);
  let total = 0;
  if (d === 1) {
    const x0 = f.vCoord[f.eVert[2 * e]!]!, x1 = f.vCoord[f.eVert[2 * e + 1]!]!;
    const n = 2 ** m, h = Math.abs(x1 - x0) / n;
    for (let s = 0; s < n; s++) {
      for (let q = 0; q < INTERVAL_WEIGHTS.length; q++) {
        const b = (s + INTERVAL_POINTS[2 * q + 1]!) / n; // barycentric coordinate of x1
        const v = h * INTERVAL_WEIGHTS[q]! * g((1 - b) * x0 + b * x1, 0);
        out[0] = out[0]! + v * (1 - b);
        out[1] = out[1]! + v * b;
        total += Math.abs(v);
      }
    }
    return total;
  }
  const a = f.eVert[3 * e]!, b = f.eVert[3 * e + 1]!, c = f.eVert[3 * e + 2]!;
  const ax = f.vCoord[2 * a]!, ay = f.vCoord[2 * a + 1]!, bx = f.vCoord[2 * b]!, by = f.vCoord[2 * b + 1]!, cx = f.vCoord[2 * c]!, cy = f.vCoord[2 * c + 1]!;
  const n = 2 ** m;
  const area = 0.5 * Math.abs((bx - ax) * (cy - ay) - (cx - ax) * (by - ay)) / (n * n);
  // Sub-triangles of the regular n × n subdivision in barycentric steps (i, j): upward (i, j),
  // (i+1, j), (i, j+1) and downward (i+1, j), (i, j+1), (i+1, j+1).
  for (let i = 0; i < n; i++) {
    for (let j = 0; i + j < n; j++) {
      for (let up = 0; up < 2; up++) {
        if (up === 1 && i + j + 1 >= n) continue;
        for (let q = 0; q < TRIANGLE_WEIGHTS.length; q++) {
          const l0 = TRIANGLE_POINTS[3 * q]!, l1 = TRIANGLE_POINTS[3 * q + 1]!, l2 = TRIANGLE_POINTS[3 * q + 2]!;
          // Barycentric coordinates (w.r.t. b, c) of the point: corners (i, j), (i+1, j), (i, j+1)
          // upward, (i+1, j), (i, j+1), (i+1, j+1) downward, in units of 1/n.
          const pb = up === 0 ? (i + l1) / n : (i + l0 + l2) / n;
          const pc = up === 0 ? (j + l2) / n : (j + l1 + l2) / n;
          const pa = 1 - pb - pc;
          const v = area * TRIANGLE_WEIGHTS[q]! * g(pa * ax + pb * bx + pc * cx, pa * ay + pb * by + pc * cy);
          out[0] = out[0]! + v * pa;
          out[1] = out[1]! + v * pb;
          out[2] = out[2]! + v * pc;
          total += Math.abs(v);
        }
      }
    }
  }
  return total;
}
