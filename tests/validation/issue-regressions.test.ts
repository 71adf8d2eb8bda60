/**
 * The concrete bad calls reported in the robustness fuzz run (issue 11), each now refused before
 * any work with a typed error naming the argument or field.
 */
import { afterEach, describe, expect, it } from 'vitest';
import {
  ChronomeshError, DoubleTree, HeatProblem, InvalidArgumentError, InvalidIndexSetError, InvalidMeshError,
  ResourceLimitError, SpaceTimeSystem, convergencePlotSvg, intervalDomain, measureOperatorCost, rectangleDomain,
  pcg, setMemoryBudget, sliceToSvg, sliceToVtu, solve, solveAdaptive, spaceTimeErrors, triangulatedDomain, vtkCollection,
} from '../../src/index';
import { validateAdaptiveOptions } from '../../src/adapt/adaptive-options';
import { validatePcgArguments, validateSolveOptions } from '../../src/system/pcg-options';
import { validateSystemOptions } from '../../src/system/system-options';

const I = () => intervalDomain(0, 1, 2);
const R = () => rectangleDomain(0, 1, 0, 1, 2, 2);
const P = (d: ReturnType<typeof I>) => new HeatProblem({ domain: d, T: 1, initial: () => 1 });
const solveOn = (d: ReturnType<typeof I>, L: number) => new SpaceTimeSystem(P(d), DoubleTree.sparseGrid(d, L)).solve();

/** Runs f, expects a ChronomeshError of class `cls` whose field is `field`; returns the message. */
function refused(f: () => unknown, cls: new (...a: never[]) => ChronomeshError, field: string | RegExp): string {
  let err: unknown;
  try {
    f();
  } catch (e) {
    err = e;
  }
  expect(err, 'expected a throw').toBeInstanceOf(cls);
  const e = err as ChronomeshError;
  if (typeof field === 'string') expect(e.field).toBe(field);
  else expect(e.field).toMatch(field);
  return e.message;
}

afterEach(() => void setMemoryBudget(null));

describe('accepted silently before: solve options (validators for SpaceTimeSystem.solve and pcg)', () => {
  const n = 10;
  it('tolerances and iteration caps', () => {
    refused(() => validateSolveOptions({ relTol: -1 }, n), InvalidArgumentError, 'opts.relTol');
    refused(() => validateSolveOptions({ relTol: '1e-6' }, n), InvalidArgumentError, 'opts.relTol');
    refused(() => validateSolveOptions({ relTol: Infinity }, n), InvalidArgumentError, 'opts.relTol');
    refused(() => validateSolveOptions({ relTol: NaN }, n), InvalidArgumentError, 'opts.relTol');
    refused(() => validateSolveOptions({ maxIterations: 1.5 }, n), InvalidArgumentError, 'opts.maxIterations');
    refused(() => validateSolveOptions({ maxIterations: -1 }, n), InvalidArgumentError, 'opts.maxIterations');
    refused(() => validateSolveOptions('x', n), InvalidArgumentError, 'opts');
    expect(validateSolveOptions(undefined, n)).toEqual({});
    expect(validateSolveOptions({ relTol: 1e-6, maxIterations: 20 }, n)).toEqual({ relTol: 1e-6, maxIterations: 20 });
  });
  it('initial guess and right-hand side of the wrong length or non-finite are named as such', () => {
    refused(() => validateSolveOptions({ initialGuess: new Float64Array(3) }, n), InvalidArgumentError, 'opts.initialGuess');
    refused(() => validateSolveOptions({ initialGuess: new Float64Array(n).fill(NaN) }, n), InvalidArgumentError, 'opts.initialGuess[0]');
    refused(() => validateSolveOptions({ rightHandSide: [1, 2] }, n), InvalidArgumentError, 'opts.rightHandSide');
  });
  it('inner solver kinds and misspelt keys', () => {
    refused(() => validateSystemOptions({ inner: { kind: 'bogus' } }), InvalidArgumentError, 'opts.inner.kind');
    refused(() => validateSystemOptions({ inner: { kind: 'multigrid', cycles: 0 } }), InvalidArgumentError, 'opts.inner.cycles');
    const msg = refused(() => validateSolveOptions({ reltol: 1e-6 }, n), InvalidArgumentError, 'opts.reltol');
    expect(msg).toMatch(/did you mean 'relTol'/);
  });
  it('pcg with a non-square operator or mismatched preconditioner', () => {
    const S = { inSize: 2, outSize: 3, apply: () => {} };
    refused(() => validatePcgArguments(S, new Float64Array(2), {}), InvalidArgumentError, 'S.outSize');
    const sq = { inSize: 2, outSize: 2, apply: () => {} };
    refused(() => validatePcgArguments(sq, new Float64Array(2), { preconditioner: { inSize: 3, outSize: 3, apply: () => {} } }), InvalidArgumentError, 'opts.preconditioner.inSize');
    refused(() => validatePcgArguments(sq, Float64Array.of(1, NaN)), InvalidArgumentError, 'b[1]');
    refused(() => validatePcgArguments(null, new Float64Array(2)), InvalidArgumentError, 'S');
  });
});

describe('accepted silently before: the public entries themselves', () => {
  const dI = I();
  const sys = new SpaceTimeSystem(P(dI), DoubleTree.sparseGrid(dI, 2));
  it('SpaceTimeSystem.solve refuses bad options before building the right-hand side', () => {
    for (const [o, f] of [[{ relTol: -1 }, 'opts.relTol'], [{ relTol: '1e-6' }, 'opts.relTol'], [{ maxIterations: 1.5 }, 'opts.maxIterations'],
      [{ maxIterations: -1 }, 'opts.maxIterations'], [{ relTol: Infinity }, 'opts.relTol'], [{ relTol: NaN }, 'opts.relTol'],
      ['x', 'opts'], [{ initialGuess: new Float64Array(3) }, 'opts.initialGuess'], [{ initialGuess: new Float64Array(sys.size).fill(NaN) }, 'opts.initialGuess[0]']] as const) {
      refused(() => sys.solve(o as never), InvalidArgumentError, f);
    }
  });
  it('SpaceTimeSystem refuses a set of another domain, a foreign problem and unknown inner solvers', () => {
    refused(() => new SpaceTimeSystem(P(I()), DoubleTree.sparseGrid(I(), 2)), InvalidIndexSetError, 'trialSet');
    refused(() => new SpaceTimeSystem(null as never, DoubleTree.sparseGrid(I(), 2)), InvalidArgumentError, 'problem');
    const d = I();
    refused(() => new SpaceTimeSystem(P(d), DoubleTree.sparseGrid(d, 2), { inner: { kind: 'bogus' } } as never), InvalidArgumentError, 'opts.inner.kind');
  });
  it('pcg refuses an operator whose inSize ≠ outSize', () => {
    refused(() => pcg({ inSize: 2, outSize: 3, apply: () => {} }, new Float64Array(2)), InvalidArgumentError, 'S.outSize');
    refused(() => pcg({ inSize: 1, outSize: 1, apply: () => {} }, Float64Array.of(1), { relTol: NaN }), InvalidArgumentError, 'opts.relTol');
  });
  it('solveAdaptive refuses bad options before the first step', () => {
    const p = P(I());
    refused(() => solveAdaptive(p, { theta: '0.5' } as never), InvalidArgumentError, 'opts.theta');
    refused(() => solveAdaptive(p, { maxSteps: 2.5 }), InvalidArgumentError, 'opts.maxSteps');
    refused(() => solveAdaptive(p, { maxSeconds: NaN }), InvalidArgumentError, 'opts.maxSeconds');
    refused(() => solveAdaptive(p, 5 as never), InvalidArgumentError, 'opts');
    refused(() => solveAdaptive(p, { onStep: 5 } as never), InvalidArgumentError, 'opts.onStep');
  });
});

describe('accepted silently before: adaptive options', () => {
  const p = P(I());
  it('refuses strings, fractions, NaN and non-objects', () => {
    refused(() => validateAdaptiveOptions({ theta: '0.5' }, p), InvalidArgumentError, 'opts.theta');
    refused(() => validateAdaptiveOptions({ maxSteps: 2.5 }, p), InvalidArgumentError, 'opts.maxSteps');
    refused(() => validateAdaptiveOptions({ maxSeconds: NaN }, p), InvalidArgumentError, 'opts.maxSeconds');
    refused(() => validateAdaptiveOptions(5, p), InvalidArgumentError, 'opts');
    refused(() => validateAdaptiveOptions({ onStep: 5 }, p), InvalidArgumentError, 'opts.onStep');
    expect(validateAdaptiveOptions({ maxSeconds: Infinity, theta: 0.3 }, p)).toEqual({ maxSeconds: Infinity, theta: 0.3 });
  });
  it('an initial set from another domain is named as such, not as a bad vertex id', () => {
    const other = DoubleTree.sparseGrid(R(), 2);
    const msg = refused(() => validateAdaptiveOptions({ initialSet: other }, p), InvalidIndexSetError, 'opts.initialSet');
    expect(msg).toMatch(/does not belong to this domain/);
  });
  it('solve(problem, options) checks the options before the first step', () => {
    refused(() => solve(p, { theta: '0.5' } as never), InvalidArgumentError, 'how.theta');
    refused(() => solve(p, { maxStep: 3 } as never), InvalidArgumentError, 'how.maxStep');
    refused(() => solve(p, { onStep: 5 } as never), InvalidArgumentError, 'how.onStep');
    refused(() => solve(p, 2.5), InvalidArgumentError, 'how');
    refused(() => solve(null as never), InvalidArgumentError, 'problem');
  });
});

describe('accepted silently before: coordinates, coefficients, plots', () => {
  it('strings as coordinates or κ values', () => {
    refused(() => triangulatedDomain(['0', '0', '1', '0', '0', '1'] as never, [0, 1, 2]), InvalidMeshError, 'points[0]');
    refused(() => triangulatedDomain([['0', 0], [1, 0], [0, 1]] as never, [0, 1, 2]), InvalidMeshError, 'points[0][0]');
    refused(() => intervalDomain(0, 1, 2, { kappa: ['1', 2] as never }), InvalidMeshError, 'kappa[0]');
    refused(() => intervalDomain(0, 1, 2, { kappa: () => '1' as never }), InvalidMeshError, 'kappa[0]');
    refused(() => intervalDomain(0, 1, 2, { kappa: '1' as never }), InvalidMeshError, 'kappa');
    refused(() => intervalDomain(0, 1, 2, { kapa: 1 } as never), InvalidArgumentError, 'opts.kapa');
  });
  it('plot options with zero or negative width or a reversed range', () => {
    const { solution } = solveOn(R(), 1);
    const slice = solution.slice(0.5);
    refused(() => sliceToSvg(slice, { width: 0 }), InvalidArgumentError, 'opts.width');
    refused(() => sliceToSvg(slice, { width: -10 }), InvalidArgumentError, 'opts.width');
    refused(() => sliceToSvg(slice, { range: [1, 0] }), InvalidArgumentError, 'opts.range');
    refused(() => convergencePlotSvg([{ label: 'a', points: [[1, 1]] }], { width: NaN }), InvalidArgumentError, 'opts.width');
    refused(() => convergencePlotSvg([{ label: 'a', points: [[1, 1]] }], { height: -1 }), InvalidArgumentError, 'opts.height');
  });
  it('sliceToVtu with a values array of the wrong length', () => {
    const { solution } = solveOn(I(), 3);
    const slice = solution.slice(0.5);
    refused(() => sliceToVtu({ ...slice, values: new Float64Array(257) }), InvalidArgumentError, 'slice.values');
  });
});

describe('untyped crashes before', () => {
  it('null or foreign objects where a domain, problem, solution or options are expected', () => {
    refused(() => new HeatProblem(null as never), InvalidArgumentError, 'spec');
    refused(() => DoubleTree.sparseGrid(null as never, 2), InvalidArgumentError, 'domain');
    refused(() => solve({} as never, 2), InvalidArgumentError, 'problem');
    refused(() => spaceTimeErrors(null as never, { value: () => 0, gradient: () => {} }), InvalidArgumentError, 'solution');
    const { solution } = solveOn(I(), 2);
    refused(() => spaceTimeErrors(solution, null as never), InvalidArgumentError, 'exact');
    refused(() => spaceTimeErrors(solution, { value: () => 0 } as never), InvalidArgumentError, 'exact.gradient');
    refused(() => sliceToVtu(null as never), InvalidArgumentError, 'slice');
    refused(() => sliceToSvg({ t: 0 } as never), InvalidArgumentError, 'slice.mesh');
    refused(() => measureOperatorCost(null as never), InvalidArgumentError, 'opts');
  });
});

describe('NaN out before', () => {
  it('exporters refuse NaN times, widths and values', () => {
    const { solution } = solveOn(I(), 2);
    const slice = solution.slice(0.5);
    refused(() => sliceToVtu({ ...slice, t: NaN }), InvalidArgumentError, 'slice.t');
    refused(() => sliceToSvg({ ...slice, values: slice.values.map(() => NaN) }), InvalidArgumentError, 'slice.values[0]');
    refused(() => vtkCollection([{ t: NaN, file: 'a.vtu' }]), InvalidArgumentError, 'entries[0].t');
    refused(() => sliceToSvg(slice, { width: NaN }), InvalidArgumentError, 'opts.width');
  });
  it('spaceTimeErrors names the point where the exact solution returned NaN', () => {
    const { solution } = solveOn(I(), 2);
    const msg = refused(() => spaceTimeErrors(solution, { value: () => NaN, gradient: (_t, _x, _y, g) => { g[0] = 0; } }), InvalidArgumentError, 'exact.value');
    expect(msg).toMatch(/exact\.value\([0-9.e-]+, [0-9.e-]+, 0\) returned NaN/);
    refused(() => spaceTimeErrors(solution, { value: () => 0, gradient: () => {} }), InvalidArgumentError, 'exact.gradient');
  });
});

describe('hangs and memory before: refused before allocating', () => {
  it('solve(P(R), 10) on a 24 GB machine (budget = half of it) is refused with estimate and budget', () => {
    setMemoryBudget(12 * 1024 ** 3);
    const t0 = performance.now();
    const msg = refused(() => solve(P(R()), 10), ResourceLimitError, 'how');
    expect(performance.now() - t0).toBeLessThan(2000);
    expect(msg).toMatch(/about 2\.4e\+7 unknowns.*would need about 1[0-9] GiB, more than the memory budget of 12 GiB/);
  });
  it('huge generators, uniform and adapted sets, grid sampling, operator-cost repetitions', () => {
    setMemoryBudget(256 * 1024 ** 2);
    refused(() => rectangleDomain(0, 1, 0, 1, 10000, 10000), ResourceLimitError, 'nx');
    refused(() => R().uniformSet(40), ResourceLimitError, 'level');
    const t0 = performance.now();
    refused(() => R().adaptedSet(() => 0, 60), ResourceLimitError, 'meshSize');
    expect(performance.now() - t0).toBeLessThan(20000);
    refused(() => measureOperatorCost({ dim: 1, level: 2, repetitions: 1e9 }), InvalidArgumentError, 'opts.repetitions');
    refused(() => measureOperatorCost({ dim: 2, level: 30 }), ResourceLimitError, 'opts.level');
    const { solution } = solveOn(R(), 1);
    const xs = { length: 1e5 } as ArrayLike<number>;
    refused(() => solution.sampleGrid([0.5], Array.from(xs, (_, i) => i / 1e5), Array.from(xs, (_, i) => i / 1e5)), ResourceLimitError, 'xs');
  });
});
