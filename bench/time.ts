/** Benchmark cases of the time module (`time.` rows): 1D tree operators, ns per (#in + #out) node. */
import type { BenchCase } from './harness';
import { TemporalTree, TreeOperatorPlan, type LevelPart, type TemporalBasisKind, type TemporalForm } from '../src/time/index';

/** Uniform tree with about `nodes` nodes. */
function uniform(kind: TemporalBasisKind, nodes: number): TemporalTree {
  return TemporalTree.full(kind, Math.max(0, Math.round(Math.log2(nodes))));
}

/**
 * Tree graded towards t = 0 with about `nodes` nodes over `depth` levels: on level l the
 * min(2^{l−1}, m) nodes nearest 0, so the refined zone halves from level to level.
 */
function graded(kind: TemporalBasisKind, nodes: number, depth = 45): TemporalTree {
  const m = Math.max(1, Math.round(nodes / (depth + 1)));
  const ls: number[] = [];
  const ks: number[] = [];
  for (let l = 0; l <= depth; l++) {
    const w = l === 0 ? (kind === 'trial' ? 2 : 1) : 2 ** (l - 1);
    for (let k = 0; k < Math.min(w, m); k++) {
      ls.push(l);
      ks.push(k);
    }
  }
  return TemporalTree.fromNodes(kind, ls, ks);
}

interface OperatorSpec {
  name: string;
  form: TemporalForm;
  inKind: TemporalBasisKind;
  outKind: TemporalBasisKind;
}

const OPERATORS: OperatorSpec[] = [
  { name: 'mass', form: 'mass', inKind: 'trial', outKind: 'test' }, // N: Ψ ← Σ
  { name: 'deriv', form: 'derivIn', inKind: 'trial', outKind: 'test' }, // D: Ψ ← Σ
  { name: 'massT', form: 'mass', inKind: 'test', outKind: 'trial' }, // Nᵀ: Σ ← Ψ
  { name: 'derivT', form: 'derivOut', inKind: 'test', outKind: 'trial' }, // Dᵀ: Σ ← Ψ
  { name: 'massTrial', form: 'mass', inKind: 'trial', outKind: 'trial' }, // Σ ← Σ
];
const PARTS: LevelPart[] = ['lower', 'upper', 'full'];

export function timeCases(quick: boolean): BenchCase[] {
  const sizes = quick ? [1e3, 1e4] : [1e3, 1e4, 1e5, 1e6];
  const cases: BenchCase[] = [];
  for (const op of OPERATORS) {
    for (const part of PARTS) {
      for (const shape of ['uniform', 'graded'] as const) {
        cases.push({
          component: `time.${op.name}.${part}.${shape}`,
          sizes,
          setup(size: number) {
            const make = shape === 'uniform' ? uniform : graded;
            const tin = make(op.inKind, size / 2);
            const tout = make(op.outKind, size / 2);
            const plan = new TreeOperatorPlan(op.form, tin, tout, part, 1);
            const x = new Float64Array(tin.functionCount);
            for (let i = 0; i < x.length; i++) x[i] = Math.sin(i + 1);
            const y = new Float64Array(tout.functionCount);
            return {
              units: tin.size + tout.size,
              run: () => plan.apply(x, y),
              extra: { entriesPerUnit: +(plan.entryCount / (tin.size + tout.size)).toFixed(1) },
            };
          },
        });
      }
    }
  }
  return cases;
}
