/**
 * Checkpoints and resume of adaptive runs (in process), and the memory stop. The reference for a
 * resumed run is the uninterrupted run of the same problem: same sets step by step and the same
 * estimates up to the PCG tolerance (here identical, the computation being deterministic).
 */
import { describe, expect, it } from 'vitest';
import {
  CorruptFileError, HeatProblem, InvalidArgumentError, adaptiveStepBytes, decodeSolution, encodeSolution, intervalDomain,
  rectangleDomain, setMemoryBudget, solveAdaptive, solveAdaptiveAsync,
  type AdaptiveStep,
} from '../../src/index';
import { decodeCheckpoint, encodeCheckpoint } from '../../src/adapt/checkpoint';

const rod = (T = 0.5) => new HeatProblem({ domain: intervalDomain(0, 1, 2), T, initial: (x) => (x < 0.3 ? 1 : 0) });
const plate = () => new HeatProblem({ domain: rectangleDomain(0, 1, 0, 1, 2, 2), T: 0.5, initial: () => 1, source: (t, x) => x * t });

describe('checkpoints', () => {
  it('one checkpoint per completed step, each a readable solution of that step', () => {
    const saved: { bytes: Uint8Array; step: number; unknowns: number }[] = [];
    const run = solveAdaptive(rod(), { maxSteps: 6, checkpoint: (bytes, info) => { saved.push({ bytes, step: info.step, unknowns: info.unknowns }); expect(info.bytes).toBe(bytes.length); } });
    expect(saved.map((s) => s.step)).toEqual([0, 1, 2, 3, 4, 5]);
    saved.forEach((s, k) => {
      const d = decodeSolution(s.bytes);
      expect(d.content).toBe('adaptive-checkpoint');
      expect(d.step).toBe(k);
      expect(d.solution.trialSet.size).toBe(run.history[k]!.unknowns);
    });
    const last = decodeSolution(saved[5]!.bytes).solution;
    expect(Array.from(last.coefficients)).toEqual(Array.from(run.solution.coefficients));
  });

  // an anisotropic plate: its tensor goes through the checkpoint's domain sections and fingerprint
  const laminate = () => new HeatProblem({
    domain: rectangleDomain(0, 1, 0, 1, 2, 2, { diffusionTensor: { xx: 2, xy: 0.6, yy: 0.5 } }), T: 0.3, initial: () => 1,
  });
  it.each([
    ['1D', rod, 10, 4],
    ['2D', plate, 9, 3],
    ['2D, diffusion tensor', laminate, 8, 3],
  ] as const)('%s: resuming from step k continues to the uninterrupted answer', (_name, make, steps, k) => {
    const saved: Uint8Array[] = [];
    const full = solveAdaptive(make(), { maxSteps: steps, checkpoint: (b) => { saved.push(b); } });
    const plain = solveAdaptive(make(), { maxSteps: steps });
    // checkpointing does not change the run
    expect(full.history.map((h) => h.estimate)).toEqual(plain.history.map((h) => h.estimate));
    const computed: number[] = [];
    const resumed = solveAdaptive(make(), { maxSteps: steps, resume: saved[k]!, onStep: (h) => { computed.push(h.step); } });
    expect(computed[0]).toBe(k + 1);
    expect(resumed.history.length).toBe(steps);
    resumed.history.forEach((h, i) => {
      expect(h.unknowns).toBe(full.history[i]!.unknowns);
      expect(Math.abs(h.estimate - full.history[i]!.estimate)).toBeLessThanOrEqual(1e-10 * full.history[i]!.estimate);
    });
    expect(resumed.stopReason).toBe('steps');
  });

  it('a checkpoint of an anisotropic run is refused for the same mesh with another tensor', () => {
    const saved: Uint8Array[] = [];
    solveAdaptive(laminate(), { maxSteps: 3, checkpoint: (b) => { saved.push(b); } });
    const other = new HeatProblem({ domain: rectangleDomain(0, 1, 0, 1, 2, 2, { diffusionTensor: { xx: 2, xy: -0.6, yy: 0.5 } }), T: 0.3, initial: () => 1 });
    expect(() => solveAdaptive(other, { resume: saved[1]! })).toThrow(/not the saved domain.*diffusion tensor/);
    const isotropic = new HeatProblem({ domain: rectangleDomain(0, 1, 0, 1, 2, 2, { kappa: 2 }), T: 0.3, initial: () => 1 });
    expect(() => solveAdaptive(isotropic, { resume: saved[1]! })).toThrow(/not the saved domain/);
  });

  it('a finished run continues with a larger maxSteps, and the async driver resumes too', async () => {
    let lastBytes: Uint8Array | null = null;
    const short = solveAdaptive(rod(), { maxSteps: 4, checkpoint: (b) => { lastBytes = b; } });
    expect(short.stopReason).toBe('steps');
    const longer = solveAdaptive(rod(), { maxSteps: 7 });
    const continued = await solveAdaptiveAsync(rod(), { maxSteps: 7, resume: lastBytes! });
    expect(continued.history.map((h) => h.unknowns)).toEqual(longer.history.map((h) => h.unknowns));
    expect(continued.history.at(-1)!.estimate).toBeCloseTo(longer.history.at(-1)!.estimate, 12);
  });

  it('resume refuses another problem, a plain solution, initialSet together with resume, damaged bytes and non-bytes', () => {
    const saved: Uint8Array[] = [];
    const run = solveAdaptive(rod(), { maxSteps: 3, checkpoint: (b) => { saved.push(b); } });
    expect(() => solveAdaptive(rod(0.7), { resume: saved[1]! })).toThrow(/another problem/);
    const otherData = new HeatProblem({ domain: intervalDomain(0, 1, 2), T: 0.5, initial: () => 2 });
    expect(() => solveAdaptive(otherData, { resume: saved[1]! })).toThrow(/fingerprint/);
    expect(() => solveAdaptive(rod(), { resume: encodeSolution(run.solution) })).toThrow(/not an adaptive checkpoint/);
    const p = rod();
    expect(() => solveAdaptive(p, { resume: saved[1]!, initialSet: run.set as never })).toThrow(InvalidArgumentError);
    const bad = saved[1]!.slice();
    bad[bad.length - 1]! ^= 4;
    expect(() => solveAdaptive(rod(), { resume: bad })).toThrow(CorruptFileError);
    expect(() => solveAdaptive(rod(), { resume: [1, 2, 3] as never })).toThrow(/resume must be the bytes/);
    expect(() => solveAdaptive(rod(), { checkpoint: 'file.bin' as never })).toThrow(/checkpoint/);
  });
});

describe('checkpoint history fields', () => {
  it('a history without riseChecks (written before the field existed) reads as 0 checks; a malformed count is refused naming the field', () => {
    const problem = rod();
    const run = solveAdaptive(problem, { maxSteps: 3 });
    const history = run.history.map((h) => ({ ...h }));
    const old = history.map(({ riseChecks: _drop, ...rest }) => rest) as unknown as AdaptiveStep[];
    const fromOld = decodeCheckpoint(encodeCheckpoint(problem, { solution: run.solution, next: null, history: old, stopReason: 'steps' }), problem, 'resume');
    expect(fromOld.history.map((h) => h.riseChecks)).toEqual([0, 0, 0]);
    const bad = history.map((h, i) => (i === 1 ? { ...h, riseChecks: -1 } : h));
    expect(() => decodeCheckpoint(encodeCheckpoint(problem, { solution: run.solution, next: null, history: bad, stopReason: 'steps' }), problem, 'resume'))
      .toThrow(/adaptive\.history\[1\]\.riseChecks/);
  });
});

describe('memory stop', () => {
  it('stops before a step whose estimated memory exceeds the budget, returning the last completed step', () => {
    const unlimited = solveAdaptive(plate(), { maxSteps: 12 });
    // a budget that the first steps fit and a later one does not
    const k = 5;
    const h = unlimited.history;
    const dim = plate().domain.dim;
    const budget = adaptiveStepBytes(h[k]!.unknowns, h[k]!.enlargedUnknowns, dim) * 1.01;
    const previous = setMemoryBudget(budget);
    let limited;
    try {
      limited = solveAdaptive(plate(), { maxSteps: 12 });
    } finally {
      setMemoryBudget(previous);
    }
    expect(limited.stopReason).toBe('memory');
    const n = limited.history.length;
    expect(n).toBeGreaterThan(1);
    expect(n).toBeLessThan(h.length);
    // the completed steps are those of the unlimited run, and the one it refused would not fit:
    // its system on Λ_{n} plus the estimator on #Λ̲ extrapolated with the last ratio
    limited.history.forEach((s, i) => expect(s.unknowns).toBe(h[i]!.unknowns));
    const last = limited.history[n - 1]!;
    const nextUnknowns = h[n]!.unknowns;
    expect(adaptiveStepBytes(nextUnknowns, (nextUnknowns * last.enlargedUnknowns) / last.unknowns, dim)).toBeGreaterThan(budget);
    expect(limited.solution.trialSet.size).toBe(last.unknowns);
  });
});
