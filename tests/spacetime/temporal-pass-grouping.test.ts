/**
 * Grouping of spatial vertices by the shape of their pair of temporal fibres (the batching of the
 * time-direction pass). The reference is the definition itself: two vertices share a group iff
 * their input and their output fibres hold the same temporal node positions (common practice for
 * hashing: equal hashes must not merge different keys, so a constant hash is the worst case).
 */
import { describe, expect, it } from 'vitest';
import { CompiledShapes, groupByFibreShape, TemporalPassPlan, vertexFibres } from '../../src/spacetime/temporal-pass';
import { testIndexSet } from '../../src/spacetime/test-index-set';
import { randomDoubleTree, smallDomain, type TreeShape } from './fixtures';
import { seededRandom } from './reference';

function referenceGroups(vb: number, vin: ReturnType<typeof vertexFibres>, vout: ReturnType<typeof vertexFibres>): string[] {
  const byKey = new Map<string, number[]>();
  for (let v = 0; v < vb; v++) {
    const a = Array.from(vin.node.subarray(vin.start[v]!, vin.start[v + 1]!));
    const b = Array.from(vout.node.subarray(vout.start[v]!, vout.start[v + 1]!));
    if (a.length === 0 || b.length === 0) continue;
    const key = `${a.join(',')}|${b.join(',')}`;
    byKey.set(key, [...(byKey.get(key) ?? []), v]);
  }
  return [...byKey.values()].map((g) => g.join(',')).sort();
}

describe('temporal pass: vertices grouped by fibre shape', () => {
  for (const dim of [1, 2] as const) {
    for (const shape of ['sparse', 'graded-start', 'random'] as TreeShape[]) {
      it(`d = ${dim}, ${shape}: the hashed grouping equals the definition, also when every hash collides`, () => {
        const trial = randomDoubleTree(smallDomain(dim), shape, seededRandom(31 + dim));
        const test = testIndexSet(trial);
        let vb = 0;
        for (const dt of [trial, test]) for (let i = 0; i < dt.tree.size; i++) for (const v of dt.fibre(i)) vb = Math.max(vb, v + 1);
        const vin = vertexFibres(trial, vb);
        const vout = vertexFibres(test, vb);
        const expected = referenceGroups(vb, vin, vout);
        expect(expected.length).toBeGreaterThan(1);
        // The default hash, a constant one (every shape collides) and a coarse one of the shape.
        const coarse = (v: number): number => (vin.start[v + 1]! - vin.start[v]!) % 2;
        for (const hash of [undefined, () => 0, coarse]) {
          const got = groupByFibreShape(vin, vout, hash).map((g) => g.join(',')).sort();
          expect(got).toEqual(expected);
        }
      });
    }
  }
});

/** a equals b up to rounding: max |a − b| ≤ 1e-14 max |b|, and b is not all zero. */
function close(a: Float64Array, b: Float64Array): void {
  let scale = 0;
  let diff = 0;
  for (let i = 0; i < a.length; i++) {
    scale = Math.max(scale, Math.abs(b[i]!));
    diff = Math.max(diff, Math.abs(a[i]! - b[i]!));
  }
  expect(scale).toBeGreaterThan(0);
  expect(diff).toBeLessThanOrEqual(1e-14 * scale);
}

describe('temporal pass: vertices of one shape in batches of bounded size', () => {
  // Batching only splits the independent columns of the same 1D programs, so the result must be
  // the same however the vertices of a shape are split, up to rounding (a batch of one column sums
  // each row before adding it; the unsplit plan is checked against dense matrices in
  // tensor-apply.test.ts).
  for (const dim of [1, 2] as const) {
    it(`d = ${dim}: a plan with batches of one vertex gives the same results`, () => {
      const rnd = seededRandom(77 + dim);
      const trial = randomDoubleTree(smallDomain(dim), 'sparse', rnd);
      const test = testIndexSet(trial);
      for (const [input, output, part] of [[trial, test, 'upper'], [test, trial, 'lower']] as const) {
        const whole = new TemporalPassPlan(['derivIn', 'mass'], input, output, part, 0.7);
        const split = new TemporalPassPlan(['derivIn', 'mass'], input, output, part, 0.7, { batchEntries: 1 });
        expect(split.groupCount).toBeGreaterThan(whole.groupCount);
        const x = Float64Array.from({ length: input.size }, () => rnd() - 0.5);
        const x2 = Float64Array.from({ length: input.size }, () => rnd() - 0.5);
        const ys = [new Float64Array(output.size), new Float64Array(output.size)];
        const zs = [new Float64Array(output.size), new Float64Array(output.size)];
        whole.applyEach(x, ys);
        split.applyEach(x, zs);
        close(zs[0]!, ys[0]!);
        close(zs[1]!, ys[1]!);
        const y = new Float64Array(output.size).fill(1);
        const z = new Float64Array(output.size).fill(1);
        whole.applySummed([x, x2], y, true);
        split.applySummed([x, x2], z, true);
        close(z, y);
      }
    });
  }
});

describe('temporal pass applied in parts over vertex ranges', () => {
  // A pass applied once may be built and applied for a range of vertices at a time (the
  // estimator's one-shot passes, to bound their memory); the parts write disjoint outputs, so
  // their union must be the whole pass, up to rounding (batches of different sizes).
  for (const dim of [1, 2] as const) {
    it(`d = ${dim}: parts over 1, 3 and 7 vertex ranges give the whole pass, with shapes compiled once`, () => {
      const rnd = seededRandom(91 + dim);
      const trial = randomDoubleTree(smallDomain(dim), 'graded-start', rnd);
      const test = testIndexSet(trial);
      let vb = 0;
      for (const dt of [trial, test]) for (let i = 0; i < dt.tree.size; i++) for (const v of dt.fibre(i)) vb = Math.max(vb, v + 1);
      for (const [input, output, part] of [[trial, test, 'upper'], [test, trial, 'lower']] as const) {
        const whole = new TemporalPassPlan(['derivOut', 'mass'], input, output, part, 1.3);
        const x = Float64Array.from({ length: input.size }, () => rnd() - 0.5);
        const ys = [new Float64Array(output.size), new Float64Array(output.size)];
        whole.applyEach(x, ys);
        for (const parts of [1, 3, 7]) {
          const compiled = new CompiledShapes();
          const zs = [new Float64Array(output.size), new Float64Array(output.size)];
          const summed = new Float64Array(output.size);
          const cut = (k: number): number => Math.round((k * vb) / parts);
          for (let k = 0; k < parts; k++) {
            const plan = new TemporalPassPlan(['derivOut', 'mass'], input, output, part, 1.3, { vertices: [cut(k), cut(k + 1)], compiled });
            plan.applyEach(x, zs);
            plan.applySummed([x, x], summed, true);
          }
          close(zs[0]!, ys[0]!);
          close(zs[1]!, ys[1]!);
          expect(compiled.size).toBe(groupByFibreShape(vertexFibres(input, vb), vertexFibres(output, vb)).length);
          // applySummed of (x, x) is the sum of both forms applied to x
          close(summed, ys[0]!.map((v, i) => v + ys[1]![i]!));
        }
      }
    });
  }
});
