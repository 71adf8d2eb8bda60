/**
 * How much the diffusivity jumps across the interfaces of the initial mesh (docs/method.md §6.2).
 *
 * K_X prices each trial function σ_λ ⊗ φ_ν with the dual norm of Mφ_ν on the fibre's own mesh, while
 * S measures it on the test fibres, unions of the trial fibres of temporal neighbours and often finer.
 * Where a hat straddles an interface between a fast material κ₁ and a slow one κ₂ and its fibre has
 * no vertex inside the slow side, the finer test mesh holds functions that live in the slow material
 * alone and are far cheaper in energy, so S exceeds what K_X expects by up to about κ₁/κ₂ (the
 * eigenvector of the largest eigenvalue of K_X S sits on the interface vertex). Measured on (0, 1) in
 * two cells, κ = 1 left of ½ and κ₂ right of it, u0 ≡ 1, held at 0 and 1, T = 0.5, exact inner solves,
 * sets of 61–70 unknowns from the adaptive loop: cond(K_X S) 5.9 (κ₂ = 1), 63 (10⁻²), 585 (10⁻³),
 * 1.7·10⁴ (10⁻⁴), 6.4·10⁷ (10⁻⁶); with the default V-cycles the loop ran at ≤ 24 PCG iterations per
 * step for 10⁻², up to 554 for 10⁻³, and stopped unconverged at 2 421 unknowns for 10⁻⁴. A finer
 * initial mesh does not cure it (32 cells: up to 78 iterations per step for 10⁻⁴).
 *
 * A convection edge with a large transfer coefficient slows the solver too (whether by the same
 * mechanism is not checked): the Robin term h adds to the stiffness of the surface hats alone.
 * Measured on (0, 1) in two cells with h at both ends, ambient 0, u0 ≡ 1, T = 0.5, along the
 * default loop to 2·10⁴ unknowns: at most 10 PCG iterations per step for a Biot number hL/κ = 10²,
 * 413 for 10⁴, 203 for 10⁶, and unconverged at 5 545 unknowns for 10⁸ (also with exact inner
 * solves: 97 for 10⁴ at 3·10³ unknowns). On the 2 × 2 square: 14, 189, 13 and 11. A surface meant
 * to follow the ambient is better held at it.
 */
import type { SpatialDomain } from './domain';
import { EdgeKind } from './boundary';
import { domainDiameter } from './data-resolution';
import { boundaryEdgeFrames, normalDiffusivity } from './surface-flux-mismatch';

/** Contrast above which the front ends warn: where PCG was measured to need hundreds of iterations (module comment). */
export const HIGH_CONTRAST = 1e3;
/** Contrast from which an unconverged solve names the interface as a likely cause. */
export const NOTABLE_CONTRAST = 1e2;
/** Biot number hL/κ from which an unconverged solve names the convection edge as a likely cause. */
export const NOTABLE_BIOT = 1e3;
/** Biot number from which the front ends warn: where PCG was measured to need hundreds of iterations. */
export const HIGH_BIOT = 1e4;

/** The largest jump of the diffusivity across an interior facet of the initial mesh. @internal */
export interface DiffusionContrast {
  /** Ratio of the larger to the smaller diffusivity across the facet (n·K·n for a tensor). */
  ratio: number;
  /** The two initial elements, the faster first. */
  elements: [number, number];
  /** Their diffusivities across the facet. */
  kappa: [number, number];
  /** Midpoint of the shared facet ([x, 0] in 1D). */
  at: [number, number];
}

/** The interface of the initial mesh with the largest diffusivity contrast, or null where κ is the same on both sides of every facet. @internal */
export function diffusionContrast(domain: SpatialDomain): DiffusionContrast | null {
  const f = domain.forest;
  const d = f.dim;
  const nv = f.nv;
  const xy = f.vCoord;
  const K = f.kappaTensor;
  // n·K·n of element e's material for the unit normal (nx, ny) (κ for a scalar)
  const across = (e: number, nx: number, ny: number): number => {
    const m = f.eMat[e]!;
    if (K === null || d === 1) return f.kappa[m]!;
    return K[3 * m]! * nx * nx + 2 * K[3 * m + 1]! * nx * ny + K[3 * m + 2]! * ny * ny;
  };
  // facets as sorted vertex pairs (1D: the vertex twice) → first element that has it
  const first = new Map<string, number>();
  let worst: DiffusionContrast | null = null;
  for (let e = 0; e < f.initialElementCount; e++) {
    const facets: [number, number][] = [];
    for (let k = 0; k < nv; k++) {
      const a = f.eVert[nv * e + k]!;
      facets.push(d === 1 ? [a, a] : [a, f.eVert[nv * e + ((k + 1) % nv)]!]);
    }
    for (const [a, b] of facets) {
      const key = a < b ? `${a},${b}` : `${b},${a}`;
      const other = first.get(key);
      if (other === undefined) {
        first.set(key, e);
        continue;
      }
      const ax = xy[d * a]!, ay = d === 2 ? xy[d * a + 1]! : 0;
      const bx = xy[d * b]!, by = d === 2 ? xy[d * b + 1]! : 0;
      const len = Math.hypot(bx - ax, by - ay);
      const nx = d === 1 ? 1 : -(by - ay) / len, ny = d === 1 ? 0 : (bx - ax) / len;
      const k1 = across(other, nx, ny), k2 = across(e, nx, ny);
      const ratio = Math.max(k1, k2) / Math.min(k1, k2);
      if (ratio > 1 && (worst === null || ratio > worst.ratio)) {
        worst = {
          ratio,
          elements: k1 >= k2 ? [other, e] : [e, other],
          kappa: k1 >= k2 ? [k1, k2] : [k2, k1],
          at: [(ax + bx) / 2, (ay + by) / 2],
        };
      }
    }
  }
  return worst;
}

/** The convection edge with the largest Biot number. @internal */
export interface StiffestTransfer {
  /** hL/κ: transfer coefficient h, domain diameter L, κ = n·K·n of the element at the edge. */
  biot: number;
  /** Index of the initial boundary edge (numbered as the domain's boundary tables). */
  edge: number;
  /** Midpoint of the edge ([x, 0] in 1D). */
  at: [number, number];
  h: number;
}

/** The initial convection edge with the largest Biot number hL/κ (module comment), or null without convection. @internal */
export function stiffestTransfer(domain: SpatialDomain): StiffestTransfer | null {
  const f = domain.forest;
  const b = f.boundary;
  const d = f.dim;
  const xy = f.vCoord;
  const L = domainDiameter(f);
  let frames: ReturnType<typeof boundaryEdgeFrames> | null = null;
  let worst: StiffestTransfer | null = null;
  for (let e = 0; e < b.edgeCount; e++) {
    const h = b.transfer[e]!;
    if (b.edgeKind[e] !== EdgeKind.Convection || !(h > 0)) continue;
    frames ??= boundaryEdgeFrames(f);
    const biot = (h * L) / normalDiffusivity(f, frames, e);
    if (worst !== null && !(biot > worst.biot)) continue;
    const i = b.edgeVertices[2 * e]!, j = b.edgeVertices[2 * e + 1]!;
    const at: [number, number] = d === 1 ? [xy[i]!, 0] : [(xy[2 * i]! + xy[2 * j]!) / 2, (xy[2 * i + 1]! + xy[2 * j + 1]!) / 2];
    worst = { biot, edge: e, at, h };
  }
  return worst;
}
