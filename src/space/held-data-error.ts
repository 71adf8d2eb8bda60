/**
 * The data error of held boundary values (docs/error-norms.md §8).
 *
 * The lifting (./boundary-lifting) interpolates a held value g linearly between the initial
 * vertices along each value edge, so the solver solves the problem whose held values are I₀g.
 * Every discrete solution u_δ then has the trace I₀g there, and u − u_δ has the trace
 * e = g − I₀g on each value edge whatever the index set: an error no refinement removes and the
 * estimator (which measures the residual of the problem with data I₀g) does not see.
 *
 * Its size is estimated by
 *
 *   D² = ½ ∫₀ᵀ Σ over value edges E of κ_E · Σ_k (kπ/2) b_k(t)² dt,
 *
 * with b_k(t) the sine coefficients of e(t, ·) along E (e vanishes at both ends of E) and κ_E the
 * diffusivity of the initial element next to E. (kπ/2) b_k² is the Dirichlet energy of the bounded
 * harmonic extension of b_k sin(kπs/ℓ) into the half-strip on the domain's side of E (independent of
 * the length ℓ), so Σ_k (kπ/2) b_k² is the squared H^{1/2}_{00}(E) norm of e in its sine-series form
 * (common practice; Lions & Magenes, Non-Homogeneous Boundary Value Problems I, 1972, ch. 1 §11,
 * from memory). By Dirichlet's principle every function with trace e on E and zero trace on the rest
 * of the line through E has at least the energy of the half-plane harmonic extension; that energy is
 * at least 0.64 of the half-strip one over the first 24 sine modes (computed for this module with an
 * independent quadrature of the half-plane form ∫|ξ| |ê(ξ)|² dξ / 2π), hence the factor ½. So for one
 * value edge on a convex domain held at zero elsewhere, D is a lower bound of ‖κ^{1/2}∇(u − u_δ)‖ in
 * L2(0,T;L2) for every u_δ; with several edges, natural conditions next to them, or re-entrant
 * corners it is an estimate of the same order (checked against true errors in the tests).
 *
 * The coefficients come from 31 samples per edge (modes up to 31: data that vary on less than 1/32
 * of an edge are under-resolved and D then reads low), at the points of a 3-point Gauss rule on 16
 * equal time intervals.
 */
import { InvalidArgumentError } from '../errors';
import { gaussLegendre01 } from '../numerics/gauss-legendre';
import { EdgeKind } from './boundary';
import type { BisectionForest } from './forest';

/** Samples per edge: e at s = j/SAMPLES, j = 1 … SAMPLES − 1. */
const SAMPLES = 32;
/** Time quadrature: 3-point Gauss on this many equal intervals of (0, T). */
const TIME_INTERVALS = 16;
const TIME_POINTS = 3;

/**
 * The estimated data error of held boundary values and the edge where most of it sits.
 *
 * @example
 * ```ts
 * import { HeatProblem, rectangleDomain } from 'chronomesh';
 * // the bottom face held at sin(πx): not affine between the initial vertices x = 0, ½, 1
 * const domain = rectangleDomain(0, 1, 0, 1, 2, 2, { boundary: [{ kind: 'value', where: (_x, y) => y < 1e-9, value: (_t, x) => Math.sin(Math.PI * x) }] });
 * const d = new HeatProblem({ domain, T: 0.5 }).heldDataError();
 * console.log(d.estimate > 0.05, d.worst?.part); // → true 0
 * ```
 */
export interface HeldDataError {
  /** D in L2(0,T;H¹) (κ-weighted); 0 when every held value is affine along its initial edges. */
  readonly estimate: number;
  /**
   * The initial boundary edge with the largest contribution: the index of its boundary part, its
   * initial vertices and end points, and its share of D² (0 … 1); null when D = 0.
   */
  readonly worst: {
    readonly part: number;
    readonly vertices: readonly [number, number];
    readonly from: readonly [number, number];
    readonly to: readonly [number, number];
    readonly share: number;
  } | null;
}

/** D of the held values of `forest`'s boundary over (0, T) (see the file comment). @internal */
export function heldDataError(forest: BisectionForest, T: number): HeldDataError {
  const bt = forest.boundary;
  if (forest.dim === 1) return { estimate: 0, worst: null }; // point values are exact
  const coords = forest.initialMesh.coords;
  const kappaNext = edgeDiffusivity(forest);
  const { nodes, weights } = gaussLegendre01(TIME_POINTS);
  const dt = T / TIME_INTERVALS;
  // sin(kπ j / SAMPLES) for k, j = 1 … SAMPLES − 1.
  const M = SAMPLES - 1;
  const sines = new Float64Array(M * M);
  for (let k = 1; k <= M; k++) for (let j = 1; j <= M; j++) sines[(k - 1) * M + (j - 1)] = Math.sin((k * Math.PI * j) / SAMPLES);
  const e = new Float64Array(M);
  let total = 0;
  let worstEdge = -1;
  let worstValue = 0;
  let gMax = 0; // largest |g| sampled: rounding in e is relative to it
  for (let b = 0; b < bt.edgeCount; b++) {
    if (bt.edgeKind[b] !== EdgeKind.Value) continue;
    const p = bt.edgePart[b]!;
    const g = bt.parts[p]?.data;
    if (!g) continue;
    const va = bt.edgeVertices[2 * b]!, vb = bt.edgeVertices[2 * b + 1]!;
    const ax = coords[2 * va]!, ay = coords[2 * va + 1]!, bx = coords[2 * vb]!, by = coords[2 * vb + 1]!;
    let edgeSum = 0;
    for (let iv = 0; iv < TIME_INTERVALS; iv++) {
      for (let q = 0; q < TIME_POINTS; q++) {
        const t = (iv + nodes[q]!) * dt;
        const ga = sample(g, t, ax, ay, p), gb = sample(g, t, bx, by, p);
        gMax = Math.max(gMax, Math.abs(ga), Math.abs(gb));
        for (let j = 1; j <= M; j++) {
          const s = j / SAMPLES;
          e[j - 1] = sample(g, t, ax + s * (bx - ax), ay + s * (by - ay), p) - ((1 - s) * ga + s * gb);
        }
        let energy = 0;
        for (let k = 1; k <= M; k++) {
          let c = 0;
          const row = (k - 1) * M;
          for (let j = 0; j < M; j++) c += e[j]! * sines[row + j]!;
          c *= 2 / SAMPLES;
          energy += ((k * Math.PI) / 2) * c * c;
        }
        edgeSum += weights[q]! * dt * energy;
      }
    }
    edgeSum *= 0.5 * kappaNext[b]!;
    total += edgeSum;
    if (edgeSum > worstValue) { worstValue = edgeSum; worstEdge = b; }
  }
  // Affine data leave only rounding in e (relative 1e-16 of |g|): that is no data error.
  let kappaMax = 0;
  for (let b = 0; b < bt.edgeCount; b++) kappaMax = Math.max(kappaMax, kappaNext[b]!);
  if (!(Math.sqrt(total) > 1e-12 * gMax * Math.sqrt(T * kappaMax))) return { estimate: 0, worst: null };
  const va = bt.edgeVertices[2 * worstEdge]!, vb = bt.edgeVertices[2 * worstEdge + 1]!;
  return {
    estimate: Math.sqrt(total),
    worst: {
      part: bt.edgePart[worstEdge]!,
      vertices: [va, vb],
      from: [coords[2 * va]!, coords[2 * va + 1]!],
      to: [coords[2 * vb]!, coords[2 * vb + 1]!],
      share: worstValue / total,
    },
  };
}

function sample(g: (t: number, x: number, y: number) => number, t: number, x: number, y: number, part: number): number {
  const v = g(t, x, y);
  if (!Number.isFinite(v)) {
    throw new InvalidArgumentError(`the value of boundary part ${part} is ${String(v)} at t = ${t}, (x, y) = (${x}, ${y}); it must be finite on the whole part`, {
      field: `boundary[${part}].value`, expected: 'a finite number', received: v,
    });
  }
  return v;
}

/** κ of the initial element that has boundary edge b (2D). */
function edgeDiffusivity(forest: BisectionForest): Float64Array {
  const bt = forest.boundary;
  const mesh = forest.initialMesh;
  const nv = mesh.coords.length / 2;
  const owner = new Map<number, number>();
  const el = mesh.elements;
  for (let t = 0; t < el.length / 3; t++) {
    for (let i = 0; i < 3; i++) {
      const a = el[3 * t + i]!, c = el[3 * t + ((i + 1) % 3)]!;
      owner.set(Math.min(a, c) * nv + Math.max(a, c), t);
    }
  }
  const out = new Float64Array(bt.edgeCount);
  for (let b = 0; b < bt.edgeCount; b++) {
    const a = bt.edgeVertices[2 * b]!, c = bt.edgeVertices[2 * b + 1]!;
    const t = owner.get(Math.min(a, c) * nv + Math.max(a, c));
    out[b] = t === undefined ? 1 : mesh.kappa[t]!;
  }
  return out;
}
