/**
 * toleranceForecast and convergenceRate (src/adapt/forecast.ts): where a run that missed its tolerance would
 * have reached it.
 *
 * Outside reference: on a history that follows an exact power law E = C·N^(−r), the least-squares
 * slope of log E against log N is r and the extrapolation gives N* = (C/tol)^(1/r) exactly
 * (common practice: least squares reproduces data that lie on a line). The run check ties the
 * documented behaviour (over-estimates early in a run, close late) to the library's own 1D run.
 */
import { describe, expect, it } from 'vitest';
import { HeatProblem, convergenceRate, intervalDomain, solveAdaptive, toleranceForecast } from '../../src/index';
import { InvalidArgumentError } from '../../src/errors';

/** Steps whose E lies exactly on C·N^(−r), growing by irregular factors, with seconds a·N. */
function powerLawSteps(C: number, r: number, a: number): { unknowns: number; estimate: number; seconds: number }[] {
  const growth = [1.3, 1.7, 1.15, 2.1, 1.4, 1.25, 1.9, 1.05, 1.6];
  const steps = [];
  let N = 37;
  for (const g of growth) {
    steps.push({ unknowns: N, estimate: C * N ** -r, seconds: a * N });
    N = Math.round(N * g);
  }
  return steps;
}

describe('toleranceForecast', () => {
  it('reproduces the size and time of an exact power law', () => {
    for (const [C, r] of [[2, 0.37], [0.5, 0.5], [3, 1]] as const) {
      const steps = powerLawSteps(C, r, 2e-5);
      const tol = 1e-3;
      const f = toleranceForecast(steps, tol)!;
      expect(f.rate).toBeCloseTo(r, 10);
      const exactN = (C / tol) ** (1 / r);
      expect(Math.abs(f.unknowns / exactN - 1)).toBeLessThan(1e-9);
      // whole-run time ∝ final #Λ: Σ seconds so far scaled by N*/N_last, recomputed here
      const last = steps[steps.length - 1]!;
      const sum = steps.reduce((s, x) => s + x.seconds, 0);
      expect(Math.abs(f.seconds / ((sum * exactN) / last.unknowns) - 1)).toBeLessThan(1e-9);
    }
  });

  it('convergenceRate is the least-squares slope over the second half of the steps', () => {
    // E = N^(-1/3) on the second half, a different law before: only the later half counts
    const history = [10, 20, 40, 80, 160, 320].map((n, i) => ({ unknowns: n, estimate: i < 3 ? 1 : n ** (-1 / 3) }));
    expect(convergenceRate(history)).toBeCloseTo(1 / 3, 12);
    expect(convergenceRate(history.slice(0, 3))).toBeCloseTo(0, 15); // its second half is flat at E = 1
    expect(convergenceRate([{ unknowns: 10, estimate: 1 }])).toBeNull(); // one point: no slope
    expect(convergenceRate([{ unknowns: 10, estimate: 1 }, { unknowns: 10, estimate: 0.5 }])).toBeNull(); // one distinct N
    expect(convergenceRate([])).toBeNull();
    // N must grow at least twofold over the fitted steps: 151 → 153 unknowns with E falling 12 %
    // would read as a rate of 10 (the last steps of a run stopped at the deepest temporal level)
    expect(convergenceRate([{ unknowns: 55, estimate: 0.31 }, { unknowns: 56, estimate: 0.24 }, { unknowns: 151, estimate: 0.221 }, { unknowns: 153, estimate: 0.193 }])).toBeNull();
    const start = { unknowns: 50, estimate: 0.4 };
    expect(convergenceRate([start, { unknowns: 100, estimate: 0.2 }, { unknowns: 199, estimate: 0.1 }])).toBeNull();
    expect(convergenceRate([start, { unknowns: 100, estimate: 0.2 }, { unknowns: 200, estimate: 0.1 }])).toBeCloseTo(1, 12);
    expect(() => convergenceRate([{ unknowns: 10, estimate: 1 }, { unknowns: 20, estimate: Number.NaN }])).toThrow(/history\[1\]\.estimate/);
    expect(() => convergenceRate([null as unknown as { unknowns: number; estimate: number }])).toThrow(InvalidArgumentError);
  });

  it('forecasts at the rate of the steps since N was an eighth of its last value', () => {
    // E falls like N^(-1/4) up to N = 6400 and like N^(-1/2) after (continuous there): the steps
    // from 6400 to 51 200 lie on the second law, so the forecast must follow it exactly, while the
    // second half of the steps (from 3200) mixes both laws
    const E = (n: number) => (n <= 6400 ? n ** -0.25 : 6400 ** -0.25 * (n / 6400) ** -0.5);
    const history = Array.from({ length: 10 }, (_, k) => 100 * 2 ** k).map((n) => ({ unknowns: n, estimate: E(n), seconds: 1e-4 * n }));
    const tol = 1e-3;
    const f = toleranceForecast(history, tol)!;
    expect(f.rate).toBeCloseTo(0.5, 12);
    expect(Math.abs(f.unknowns / (6400 * (6400 ** -0.25 / tol) ** 2) - 1)).toBeLessThan(1e-9);
    expect(convergenceRate(history)!).toBeLessThan(0.49);
  });

  it('gives no forecast when the tolerance is reached or E is not falling steadily', () => {
    const falling = powerLawSteps(1, 0.5, 1e-5);
    expect(toleranceForecast(falling, 10)).toBeNull(); // already reached
    expect(toleranceForecast(falling.slice(0, 2), 1e-6)).toBeNull(); // one step in the second half: no rate
    const flat = falling.map((s, i) => ({ ...s, estimate: 0.1 * (1 + 0.01 * Math.sin(i)) }));
    expect(toleranceForecast(flat, 1e-3)).toBeNull();
    const rising = falling.map((s) => ({ ...s, estimate: 1 / s.estimate }));
    expect(toleranceForecast(rising, 1e-3)).toBeNull();
    expect(toleranceForecast([], 1e-3)).toBeNull();
  });

  it('names a bad argument', () => {
    const steps = powerLawSteps(1, 0.5, 1e-5);
    expect(() => toleranceForecast(steps, 0)).toThrow(InvalidArgumentError);
    expect(() => toleranceForecast(steps, Number.NaN)).toThrow(/tolerance/);
    const broken = steps.map((s, i) => (i === 3 ? { ...s, estimate: Number.NaN } : s));
    try {
      toleranceForecast(broken, 1e-3);
      expect.unreachable();
    } catch (e) {
      expect(e).toBeInstanceOf(InvalidArgumentError);
      expect((e as InvalidArgumentError).field).toBe('history[3].estimate');
    }
    expect(() => toleranceForecast([{ unknowns: -1, estimate: 1, seconds: 0 }], 1e-3)).toThrow(InvalidArgumentError);
  });

  it('on the 1D run of u0 ≡ 1, a forecast from a fifth of the size is close and errs on the high side', () => {
    const problem = new HeatProblem({ domain: intervalDomain(0, 1, 2), T: 0.5, initial: () => 1 });
    const { history } = solveAdaptive(problem, { maxUnknowns: 8000, maxSteps: 200 });
    const steps = history;
    const last = steps[steps.length - 1]!;
    // the longest prefix that ends at most at a fifth of the final size
    let k = 0;
    while (steps[k + 1]!.unknowns <= last.unknowns / 5) k++;
    const f = toleranceForecast(steps.slice(0, k + 1), last.estimate)!;
    expect(f).not.toBeNull();
    const ratio = f.unknowns / last.unknowns;
    expect(ratio, `forecast ${f.unknowns} against ${last.unknowns} (rate ${f.rate})`).toBeGreaterThan(0.9);
    expect(ratio).toBeLessThan(2.5);
  });
});
