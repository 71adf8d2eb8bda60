/**
 * Riesz stability of the trial basis Σ (docs/method.md §3.1): condition numbers of the Gram matrices of
 * all levels ≤ L in L2(0,1), and in H¹(0,1) after rescaling each function by its H¹ norm
 * (‖σ‖²_{H¹} = ‖σ‖² + ‖σ'‖²). The Gram matrices are applied with the tree operators (which the
 * operator tests check against the dense reference); spectra by ml-matrix (small L) or Lanczos.
 */
import { describe, expect, it } from 'vitest';
import { TemporalTree, TreeOperatorPlan, derivativeNorms } from '../../src/time/index';
import { denseEigenvalues, lanczosExtremes } from './spectra';

type Op = (x: Float64Array, y: Float64Array) => void;

function gramOperators(L: number): { n: number; l2: Op; h1: Op } {
  const t = TemporalTree.full('trial', L);
  const n = t.size;
  const M = new TreeOperatorPlan('mass', t, t, 'full');
  const K = new TreeOperatorPlan('stiffness', t, t, 'full');
  const alpha = derivativeNorms(t);
  const d = alpha.map((a) => 1 / Math.sqrt(1 + a * a));
  const tmp = new Float64Array(n);
  const a = new Float64Array(n);
  const b = new Float64Array(n);
  return {
    n,
    l2: (x, y) => M.apply(x, y),
    h1: (x, y) => {
      for (let i = 0; i < n; i++) tmp[i] = d[i]! * x[i]!;
      M.apply(tmp, a);
      K.apply(tmp, b);
      for (let i = 0; i < n; i++) y[i] = d[i]! * (a[i]! + b[i]!);
    },
  };
}

function denseCond(op: Op, n: number): number {
  const cols: Float64Array[] = [];
  for (let j = 0; j < n; j++) {
    const e = new Float64Array(n);
    e[j] = 1;
    const y = new Float64Array(n);
    op(e, y);
    cols.push(y);
  }
  const A = Array.from({ length: n }, (_, i) => Array.from({ length: n }, (_, j) => 0.5 * (cols[j]![i]! + cols[i]![j]!)));
  const ev = denseEigenvalues(A);
  return ev[n - 1]! / ev[0]!;
}

function lanczosCond(op: Op, n: number, steps: number): number {
  const [lo, hi] = lanczosExtremes(op, n, steps);
  return hi / lo;
}

describe('Riesz condition numbers of Σ', () => {
  it('L2 below 10 and H¹ below 6 for L ≤ 12, non-decreasing in L and levelling off', () => {
    const cL2: number[] = [];
    const cH1: number[] = [];
    for (let L = 0; L <= 12; L++) {
      const g = gramOperators(L);
      if (L <= 7) {
        cL2.push(denseCond(g.l2, g.n));
        cH1.push(denseCond(g.h1, g.n));
        if (L === 7) {
          // Lanczos (80 steps) agrees with the dense spectrum where both are available
          expect(Math.abs(lanczosCond(g.l2, g.n, 80) - cL2[7]!)).toBeLessThan(1e-6 * cL2[7]!);
          expect(Math.abs(lanczosCond(g.h1, g.n, 80) - cH1[7]!)).toBeLessThan(1e-6 * cH1[7]!);
        }
      } else {
        cL2.push(lanczosCond(g.l2, g.n, 80));
        cH1.push(lanczosCond(g.h1, g.n, 80));
      }
    }
    console.log('cond L2 by L:', cL2.map((c) => c.toFixed(3)).join(' '));
    console.log('cond H1 by L:', cH1.map((c) => c.toFixed(3)).join(' '));
    // L = 0: Gram of √3(1−s), √3 s is [[1, ½], [½, 1]] (closed form), condition 3
    expect(cL2[0]).toBeCloseTo(3, 12);
    for (let L = 1; L <= 12; L++) {
      // principal submatrices: interlacing makes the condition non-decreasing (common practice)
      expect(cL2[L]!).toBeGreaterThanOrEqual(cL2[L - 1]! * (1 - 1e-6));
      expect(cH1[L]!).toBeGreaterThanOrEqual(cH1[L - 1]! * (1 - 1e-6));
      expect(cL2[L]!).toBeLessThan(10);
      expect(cH1[L]!).toBeLessThan(6);
    }
    // levelling off: the increments shrink over the last levels
    const inc = (c: number[], L: number) => c[L]! - c[L - 1]!;
    expect(inc(cL2, 12)).toBeLessThan(inc(cL2, 11));
    expect(inc(cL2, 11)).toBeLessThan(inc(cL2, 10));
    expect(inc(cL2, 12)).toBeLessThan(0.35);
    for (let L = 9; L <= 12; L++) expect(inc(cH1, L)).toBeLessThan(0.06);
  }, 60_000);
});
