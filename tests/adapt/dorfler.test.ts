/** Dörfler marking against the sorted (minimal) reference. */
import { describe, expect, it } from 'vitest';
import { InvalidArgumentError, dorflerMark } from '../../src/index';
import { seededRandom } from '../spacetime/reference';

/** Size of the minimal Dörfler set: sort descending and take until the bulk is reached. */
function minimalSize(eta2: Float64Array, theta: number): number {
  const s = Array.from(eta2).sort((a, b) => b - a);
  const total = s.reduce((a, b) => a + b, 0);
  let acc = 0;
  for (let i = 0; i < s.length; i++) {
    acc += s[i]!;
    if (acc >= theta * theta * total) return i + 1;
  }
  return s.length;
}

describe('Dörfler marking', () => {
  it.each([0.3, 0.5, 0.8])('reaches the bulk θ² E² with at most about twice the minimal count (θ = %f)', (theta) => {
    for (let seed = 1; seed <= 20; seed++) {
      const rand = seededRandom(seed);
      const n = 1 + Math.floor(rand() * 500);
      const eta2 = Float64Array.from({ length: n }, () => (rand() < 0.1 ? 0 : Math.exp(-20 * rand())));
      const total = eta2.reduce((a, b) => a + b, 0);
      const marked = dorflerMark(eta2, theta);
      const sum = Array.from(marked).reduce((a, i) => a + eta2[i]!, 0);
      expect(sum).toBeGreaterThanOrEqual(theta * theta * total * (1 - 1e-12));
      expect(marked.length).toBeLessThanOrEqual(2 * minimalSize(eta2, theta) + 1);
      expect(new Set(marked).size).toBe(marked.length);
      for (const i of marked) expect(eta2[i]).toBeGreaterThan(0);
    }
  });
  it('marks nothing for a zero estimator and rejects bad input', () => {
    expect(dorflerMark(new Float64Array(5), 0.5).length).toBe(0);
    expect(() => dorflerMark(Float64Array.of(1), 1)).toThrow(InvalidArgumentError);
    expect(() => dorflerMark(Float64Array.of(1, NaN), 0.5)).toThrow(/indicator 1 is NaN/);
  });
});
