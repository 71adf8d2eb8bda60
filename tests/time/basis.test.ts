/** Facts about the two temporal bases (docs/method.md §3.1, §3.2, §9) checked on the implementation. */
import { describe, expect, it } from 'vitest';
import { TemporalTree, TreeOperatorPlan, derivativeNorms, evaluateTemporal, traceVector } from '../../src/time/index';
import { prolongStencil, shapeValue, type SingleScaleSpace } from '../../src/time/single-scale';
import { waveletStencil } from '../../src/time/wavelets';
import { GAUSS3_NODES, GAUSS3_WEIGHTS, denseTemporalForms, referenceMoment, referenceNorm, referenceValue } from './reference';
import { gradedTree, nodesOf, rng } from './random-trees';

const width = (kind: 'trial' | 'test', l: number) => (l === 0 ? (kind === 'trial' ? 2 : 1) : 2 ** (l - 1));

/** A single-scale function of a level evaluated straight from its definition (single-scale.ts header). */
function ssValue(space: SingleScaleSpace, l: number, idx: number, comp: number, s: number): number {
  const x = s * 2 ** l;
  if (space === 'hat') return Math.max(0, 1 - Math.abs(x - idx));
  if (x < idx || x >= idx + 1) return 0;
  return 2 ** (l / 2) * (comp === 0 ? 1 : Math.sqrt(3) * (2 * (x - idx) - 1));
}

describe('evaluation', () => {
  it('evaluateTemporal agrees with the formulas of docs/method.md §3 at random points, levels 0…52, both ends', () => {
    const r = rng(1);
    const T = 3;
    for (const kind of ['trial', 'test'] as const) {
      for (let l = 0; l <= 52; l++) {
        const w = width(kind, l);
        for (const k of [0, w - 1, Math.floor(r() * w)]) {
          for (let slot = 0; slot < (kind === 'trial' ? 1 : 2); slot++) {
            for (let rep = 0; rep < 4; rep++) {
              // a point inside the support, away from breakpoints
              const sup = kind === 'trial' && l > 0 ? [Math.max(2 * k - 2, 0), Math.min(2 * k + 4, 2 ** l)] : l === 0 ? [0, 1] : [2 * k, 2 * k + 2];
              const cell = sup[0]! + Math.floor(r() * (sup[1]! - sup[0]!));
              const t = T * (cell + 0.05 + 0.9 * r()) * 2 ** -l;
              const a = evaluateTemporal(kind, l, k, slot, t, T);
              const b = referenceValue(kind, l, k, slot, t, T);
              const vs = 2 ** (l / 2) * 4 / Math.sqrt(T);
              expect(Math.abs(a.value - b.value)).toBeLessThanOrEqual(1e-13 * vs);
              expect(Math.abs(a.derivative - b.derivative)).toBeLessThanOrEqual(1e-13 * vs * 2 ** l / T);
            }
          }
        }
      }
    }
    // closed form: σ_{0,0}(t) = √3 (1 − t/T)/√T
    expect(evaluateTemporal('trial', 0, 0, 0, 0.75, 3).value).toBeCloseTo((Math.sqrt(3) * 0.75) / Math.sqrt(3), 15);
  });

  it('traces at t = 0 and t = T match the formulas; only σ_{0,0} and k = 0 wavelets touch t = 0', () => {
    const T = 0.7;
    for (const kind of ['trial', 'test'] as const) {
      for (const side of [0, 1] as const) {
        const tree = gradedTree(kind, 45, side, 2, 5);
        const g = traceVector(tree, side, T);
        const f = kind === 'trial' ? 1 : 2;
        for (let p = 0; p < tree.size; p++) {
          for (let s = 0; s < f; s++) {
            const ref = referenceValue(kind, tree.level[p]!, tree.index[p]!, s, side * T, T).value;
            expect(Math.abs(g[p * f + s]! - ref)).toBeLessThanOrEqual(1e-13 * 2 ** (tree.level[p]! / 2) * 4);
          }
          if (kind === 'trial' && side === 0) {
            const touches = tree.index[p] === 0;
            expect(g[p] !== 0).toBe(touches);
          }
        }
      }
    }
  });

  it('derivative norms match quadrature of the formulas; α grows like 2^l', () => {
    for (const kind of ['trial', 'test'] as const) {
      const tree = gradedTree(kind, 44, 1, 2, 6);
      const a = derivativeNorms(tree, 2);
      const f = kind === 'trial' ? 1 : 2;
      for (let p = 0; p < tree.size; p++) {
        for (let s = 0; s < f; s++) {
          const ref = referenceNorm(kind, tree.level[p]!, tree.index[p]!, s, 1, 2);
          expect(Math.abs(a[p * f + s]! - ref)).toBeLessThanOrEqual(1e-12 * Math.max(ref, 1));
        }
      }
    }
    // closed form: ‖d/dt √3(1 − t)‖ = √3 on (0, 1)
    expect(derivativeNorms(TemporalTree.full('trial', 0))[0]).toBeCloseTo(Math.sqrt(3), 14);
  });
});

describe('basis properties', () => {
  it('vanishing moments: ∫σ = 0 for levels ≥ 1; ∫ψ = ∫ψ s = 0 for levels ≥ 1', () => {
    // through the implementation: pair every function with the level-0 test node (1 and √3(2s−1))
    for (const kind of ['trial', 'test'] as const) {
      const tree = gradedTree(kind, 48, 0, 3, 9);
      const root = TemporalTree.fromNodes('test', [0], [0]);
      const plan = new TreeOperatorPlan('mass', tree, root, 'full');
      const n = tree.functionCount;
      const X = new Float64Array(n * n);
      for (let j = 0; j < n; j++) X[j * n + j] = 1;
      const Y = new Float64Array(2 * n);
      plan.apply(X, Y, n);
      for (let j = 0; j < n; j++) {
        const l = tree.level[kind === 'trial' ? j : j >> 1]!;
        if (l === 0) continue;
        expect(Math.abs(Y[j]!)).toBeLessThanOrEqual(1e-15 * 2 ** (-l / 2) + 1e-300); // ∫ b
        if (kind === 'test') expect(Math.abs(Y[n + j]!)).toBeLessThanOrEqual(1e-15 * 2 ** (-l / 2) + 1e-300); // ∫ b·√3(2s−1)
      }
    }
    // and of the formulas of docs/method.md §3 themselves (the reference), as a cross-check
    for (let l = 1; l <= 20; l++) {
      for (const k of [0, width('trial', l) - 1]) {
        expect(Math.abs(referenceMoment('trial', l, k, 0, 0))).toBeLessThan(1e-15);
        for (const s of [0, 1]) {
          expect(Math.abs(referenceMoment('test', l, k, s, 0))).toBeLessThan(1e-14);
          expect(Math.abs(referenceMoment('test', l, k, s, 1))).toBeLessThan(1e-14);
        }
      }
    }
  });

  it('Ψ is L2-orthonormal (implementation and formulas), also across 50 levels', () => {
    for (const tree of [TemporalTree.full('test', 6), gradedTree('test', 50, 1, 3, 2)]) {
      const plan = new TreeOperatorPlan('mass', tree, tree, 'full', 4);
      const n = tree.functionCount;
      const X = new Float64Array(n * n);
      for (let j = 0; j < n; j++) X[j * n + j] = 1;
      const Y = new Float64Array(n * n);
      plan.apply(X, Y, n);
      for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) expect(Math.abs(Y[i * n + j]! - (i === j ? 1 : 0))).toBeLessThan(1e-13);
    }
    const nodes = nodesOf(TemporalTree.full('test', 5));
    const G = denseTemporalForms('test', nodes, 'test', nodes, 1).mass;
    G.forEach((row, i) => row.forEach((v, j) => expect(Math.abs(v - (i === j ? 1 : 0))).toBeLessThan(1e-13)));
  });

  it('refinement relations are exact (pointwise) for hats and Legendre pairs', () => {
    const r = rng(4);
    const idx = new Float64Array(8);
    const comp = new Int32Array(8);
    const w = new Float64Array(8);
    for (const space of ['hat', 'leg', 'p0'] as const) {
      for (let rep = 0; rep < 300; rep++) {
        const l = Math.floor(r() * 40);
        const n = space === 'hat' ? 2 ** l + 1 : 2 ** l;
        const j = [0, n - 1, Math.floor(r() * n)][rep % 3]!;
        const c = space === 'leg' ? rep % 2 : 0;
        const m = prolongStencil(space, l, j, c, idx, comp, w);
        for (let q = 0; q < 5; q++) {
          const s = Math.min(1, Math.max(0, (j + 2 * r() - 1) * 2 ** -l));
          const x = s * 2 ** (l + 1);
          if (Math.abs(x - Math.round(x)) < 1e-9) continue; // skip breakpoints of the fine mesh
          let fine = 0;
          for (let e = 0; e < m; e++) fine += w[e]! * ssValue(space, l + 1, idx[e]!, comp[e]!, s);
          expect(Math.abs(fine - ssValue(space, l, j, c, s))).toBeLessThan(1e-12 * 2 ** (l / 2));
        }
      }
    }
  });

  it('single-scale expansions of the wavelets reproduce the formulas of docs/method.md §3', () => {
    const r = rng(12);
    const idx = new Float64Array(8);
    const comp = new Int32Array(8);
    const w = new Float64Array(8);
    for (const kind of ['trial', 'test'] as const) {
      const space = kind === 'trial' ? 'hat' : 'leg';
      for (let l = 0; l <= 30; l++) {
        const wd = width(kind, l);
        for (const k of new Set([0, wd - 1, Math.floor(r() * wd), Math.min(1, wd - 1)])) {
          for (let slot = 0; slot < (kind === 'trial' ? 1 : 2); slot++) {
            const n = waveletStencil(kind, l, k, slot, idx, comp, w);
            for (let q = 0; q < 8; q++) {
              const s = Math.min(1, (k * (kind === 'trial' ? 2 : 2) + 6 * r() - 2) * 2 ** -l);
              if (s <= 0) continue;
              const x = s * 2 ** l;
              if (Math.abs(x - Math.round(x)) < 1e-9) continue;
              let v = 0;
              for (let e = 0; e < n; e++) v += w[e]! * ssValue(space, l, idx[e]!, comp[e]!, s);
              expect(Math.abs(v - referenceValue(kind, l, k, slot, s).value)).toBeLessThan(1e-12 * 2 ** (l / 2));
            }
          }
        }
      }
    }
  });

  it('interior trial wavelet = synthesis high-pass of the reversible 5/3 wavelet (ISO/IEC 15444-1)', () => {
    // ISO/IEC 15444-1 (JPEG 2000), Annex F, 5/3 lifting, without the rounding of the reversible path:
    //   analysis:  d[n] = x[2n+1] − ½(x[2n] + x[2n+2]),  s[n] = x[2n] + ¼(d[n−1] + d[n]).
    // Synthesis inverts the steps: x[2n] = s[n] − ¼(d[n−1] + d[n]), x[2n+1] = d[n] + ½(x[2n] + x[2n+2]).
    // The synthesis high-pass filter is the signal obtained from one unit detail coefficient.
    const N = 16;
    const s = new Array<number>(N).fill(0);
    const d = new Array<number>(N).fill(0);
    const n0 = 7;
    d[n0] = 1;
    const x = new Array<number>(2 * N + 1).fill(0);
    for (let n = 0; n < N; n++) x[2 * n] = s[n]! - 0.25 * ((d[n - 1] ?? 0) + d[n]!);
    for (let n = 0; n < N; n++) x[2 * n + 1] = d[n]! + 0.5 * (x[2 * n]! + x[2 * n + 2]!);
    const filter = x.slice(2 * n0 - 2, 2 * n0 + 5); // one zero either side
    expect(filter[0]).toBe(0);
    expect(filter[6]).toBe(0);
    // our interior wavelet in level-l hat coefficients, rescaled to centre value 3/4 as in the filter
    const idx = new Float64Array(8);
    const comp = new Int32Array(8);
    const w = new Float64Array(8);
    for (const [l, k] of [[3, 1], [6, 20], [45, 2 ** 40 + 3]] as const) {
      const n = waveletStencil('trial', l, k, 0, idx, comp, w);
      expect(n).toBe(5);
      expect(idx[0]).toBe(2 * k - 1);
      const scale = filter[3]! / w[2]!;
      for (let e = 0; e < 5; e++) expect(w[e]! * scale).toBeCloseTo(filter[e + 1]!, 14);
    }
  });

  it('the level-l test functions with levels ≤ l span the discontinuous P1 space of mesh 2^-l', () => {
    // dimension count and local check: every Legendre pair of level l is reproduced by Ψ_{≤l}
    const L = 4;
    const tree = TemporalTree.full('test', L);
    expect(tree.functionCount).toBe(2 * 2 ** L);
    const pts: number[] = [];
    for (let i = 0; i < 2 ** L; i++) for (const g of GAUSS3_NODES) pts.push((i + 0.5 * (1 + g)) * 2 ** -L);
    // Gram of point-values weighted by quadrature = mass matrix; orthonormality ⇒ identity ⇒ full rank
    const n = tree.functionCount;
    const V = Array.from({ length: n }, (_, f) => pts.map((t) => evaluateTemporal('test', tree.level[f >> 1]!, tree.index[f >> 1]!, f & 1, t).value));
    for (let a = 0; a < n; a++) {
      for (let b = 0; b < n; b++) {
        let m = 0;
        V[a]!.forEach((va, q) => (m += va * V[b]![q]! * GAUSS3_WEIGHTS[q % 3]! * 0.5 * 2 ** -L));
        expect(Math.abs(m - (a === b ? 1 : 0))).toBeLessThan(1e-12);
      }
    }
    expect(shapeValue('leg', 1, 1)).toBeCloseTo(Math.sqrt(3), 15);
  });
});
