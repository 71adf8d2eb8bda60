/**
 * Main unit test of the temporal module (docs/method.md §3.3): every fast tree operator (lower, upper,
 * full; all forms and basis pairs, transposes included) against the independent dense
 * pointwise reference on seeded random trees of different shapes.
 */
import { describe, expect, it } from 'vitest';
import { TemporalTree, TreeOperatorPlan, type LevelPart, type TemporalBasisKind, type TemporalForm } from '../../src/time/index';
import { denseTemporalForms, referenceNorm } from './reference';
import { gradedTree, nodesOf, rng, sparseTree } from './random-trees';

const FORMS: TemporalForm[] = ['mass', 'derivIn', 'derivOut', 'stiffness'];
const PAIRS: [TemporalBasisKind, TemporalBasisKind][] = [
  ['test', 'trial'], // N, D (Ψ ← Σ)
  ['trial', 'test'], // transposes (Σ ← Ψ)
  ['trial', 'trial'], // Σ ← Σ
  ['test', 'test'],
];
const PARTS: LevelPart[] = ['lower', 'upper', 'full'];

type TreePair = { name: string; make: (ko: TemporalBasisKind, ki: TemporalBasisKind) => [TemporalTree, TemporalTree]; T: number };

const SHAPES: TreePair[] = [
  { name: 'uniform', make: (ko, ki) => [TemporalTree.full(ko, 4), TemporalTree.full(ki, 5)], T: 1 },
  { name: 'sparse', make: (ko, ki) => [sparseTree(ko, 9, 30, 11), sparseTree(ki, 8, 30, 12)], T: 2.5 },
  { name: 'graded to t=0, 45 levels', make: (ko, ki) => [gradedTree(ko, 45, 0, 3, 21), gradedTree(ki, 44, 0, 2, 22)], T: 0.3 },
  { name: 'graded to t=T, 45 levels', make: (ko, ki) => [gradedTree(ko, 44, 1, 2, 31), gradedTree(ki, 45, 1, 3, 32)], T: 7 },
  { name: 'graded to t=0, 52 levels', make: (ko, ki) => [gradedTree(ko, 52, 0, 2, 41), gradedTree(ki, 52, 0, 2, 42)], T: 1 },
];

/** Cauchy–Schwarz scale ‖q^{(dq)}‖ of every function of a tree, from the reference quadrature. */
function scales(t: TemporalTree, d: 0 | 1, T: number): number[] {
  const f = t.kind === 'trial' ? 1 : 2;
  const out: number[] = [];
  for (let p = 0; p < t.size; p++) for (let s = 0; s < f; s++) out.push(referenceNorm(t.kind, t.level[p]!, t.index[p]!, s, d, T));
  return out;
}

/** The fast operator as a dense matrix: one batched apply to the identity. */
function fastMatrix(plan: TreeOperatorPlan): Float64Array {
  const nI = plan.inTree.functionCount;
  const X = new Float64Array(nI * nI);
  for (let j = 0; j < nI; j++) X[j * nI + j] = 1;
  const Y = new Float64Array(plan.outTree.functionCount * nI).fill(Number.NaN); // apply must overwrite
  plan.apply(X, Y, nI);
  return Y;
}

describe('tree operators vs dense pointwise reference', () => {
  for (const shape of SHAPES) {
    for (const [ko, ki] of PAIRS) {
      it(`${shape.name}: ${ko} ← ${ki}, all forms and parts`, () => {
        const [tout, tin] = shape.make(ko, ki);
        const T = shape.T;
        const nI = tin.functionCount;
        const nO = tout.functionCount;
        const lvOut = Array.from({ length: nO }, (_, i) => tout.level[ko === 'trial' ? i : i >> 1]!);
        const lvIn = Array.from({ length: nI }, (_, j) => tin.level[ki === 'trial' ? j : j >> 1]!);
        const sc = [scales(tout, 0, T), scales(tout, 1, T), scales(tin, 0, T), scales(tin, 1, T)];
        const r = rng(nI * 7 + nO);
        const x = Float64Array.from({ length: nI }, () => 2 * r() - 1);
        const dense = denseTemporalForms(ko, nodesOf(tout), ki, nodesOf(tin), T);
        for (const form of FORMS) {
          const dq = form === 'derivOut' || form === 'stiffness' ? 1 : 0;
          const dp = form === 'derivIn' || form === 'stiffness' ? 1 : 0;
          const full = dense[form];
          for (const part of PARTS) {
            const keep = (i: number, j: number) =>
              part === 'full' || (part === 'lower' ? lvOut[i]! > lvIn[j]! : lvOut[i]! <= lvIn[j]!);
            const plan = new TreeOperatorPlan(form, tin, tout, part, T);
            const F = fastMatrix(plan);
            // entrywise, relative to the Cauchy–Schwarz bound |C_ij| ≤ ‖q_i^{(dq)}‖ ‖p_j^{(dp)}‖
            let worst = 0;
            for (let i = 0; i < nO; i++) {
              for (let j = 0; j < nI; j++) {
                const ref = keep(i, j) ? full[i]![j]! : 0;
                const bound = sc[dq]![i]! * sc[2 + dp]![j]!;
                const err = Math.abs(F[i * nI + j]! - ref);
                if (bound === 0) expect(err).toBe(0);
                else worst = Math.max(worst, err / bound);
              }
            }
            expect(worst, `${form} ${part}`).toBeLessThanOrEqual(1e-12);
            // and a random vector through the batch-1 path, each entry relative to Σ_j bound_ij |x_j|
            const y = new Float64Array(nO).fill(Number.NaN);
            plan.apply(x, y);
            let worstRow = 0;
            for (let i = 0; i < nO; i++) {
              let s = 0;
              let mag = 0;
              for (let j = 0; j < nI; j++) {
                if (keep(i, j)) s += full[i]![j]! * x[j]!;
                mag += sc[dq]![i]! * sc[2 + dp]![j]! * Math.abs(x[j]!);
              }
              if (mag === 0) expect(y[i]).toBe(0);
              else worstRow = Math.max(worstRow, Math.abs(y[i]! - s) / mag);
            }
            expect(worstRow, `${form} ${part} vector`).toBeLessThanOrEqual(1e-12);
          }
        }
      }, 30_000);
    }
  }
});

describe('tree operator plans', () => {
  it('full = lower + upper, and batched columns equal single applies', () => {
    const tin = sparseTree('trial', 12, 60, 5);
    const tout = sparseTree('test', 11, 60, 6);
    const r = rng(9);
    const batch = 3;
    const X = Float64Array.from({ length: tin.functionCount * batch }, () => r() - 0.5);
    const parts = PARTS.map((p) => new TreeOperatorPlan('derivIn', tin, tout, p, 1.5));
    const Ys = parts.map((p) => {
      const Y = new Float64Array(tout.functionCount * batch);
      p.apply(X, Y, batch);
      return Y;
    });
    const close = (a: number, b: number) => expect(Math.abs(a - b)).toBeLessThanOrEqual(1e-13 * Math.max(1, Math.abs(b)));
    for (let i = 0; i < Ys[0]!.length; i++) close(Ys[2]![i]!, Ys[0]![i]! + Ys[1]![i]!);
    for (let b = 0; b < batch; b++) {
      const x = Float64Array.from({ length: tin.functionCount }, (_, j) => X[j * batch + b]!);
      const y = new Float64Array(tout.functionCount);
      parts[2]!.apply(x, y);
      for (let i = 0; i < y.length; i++) close(Ys[2]![i * batch + b]!, y[i]!);
    }
  });

  it('handles empty input or output trees', () => {
    const empty = TemporalTree.fromNodes('trial', [], []);
    const t = TemporalTree.full('test', 3);
    const y = new Float64Array(t.functionCount).fill(5);
    new TreeOperatorPlan('mass', empty, t, 'full').apply(new Float64Array(0), y);
    expect(Array.from(y).every((v) => v === 0)).toBe(true);
    const y0 = new Float64Array(0);
    new TreeOperatorPlan('mass', t, empty, 'full').apply(new Float64Array(t.functionCount), y0);
    expect(empty.maxLevel).toBe(-1);
  });

  it('costs a bounded number of stored entries per node (linear in #in + #out)', () => {
    const ratio = (L: number) => {
      const a = TemporalTree.full('trial', L);
      const b = TemporalTree.full('test', L);
      return new TreeOperatorPlan('derivIn', a, b, 'full').entryCount / (a.size + b.size);
    };
    const r8 = ratio(8);
    const r14 = ratio(14);
    expect(r14).toBeLessThan(1.05 * r8);
    const deep = (L: number) => {
      const a = gradedTree('trial', L, 0, 3, 1);
      const b = gradedTree('test', L, 1, 3, 2);
      return new TreeOperatorPlan('mass', a, b, 'full').entryCount / (a.size + b.size);
    };
    expect(deep(50)).toBeLessThan(1.2 * deep(25));
  });
});
