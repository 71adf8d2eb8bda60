/**
 * The problem file's `exact` field: symbolic derivatives of expressions, the checks that a known
 * solution solves the stated problem, and the true errors a run reports against it.
 *
 * References outside the project: derivatives from the standard tables of calculus (common
 * practice) and, independently, central finite differences of the expressions themselves
 * (error O(h²)); the manufactured solutions are separable solutions of the heat equation written
 * out by hand (u = e^{−dπ²κt} Π sin(πx_i): Carslaw & Jaeger, Conduction of Heat in Solids, 2nd ed.,
 * §3.3 / §5.3) or polynomials whose source term is computed by hand below.
 */
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { InvalidArgumentError, spaceTimeErrors } from '../../src/index';
import { solveFile } from '../../src/cli/solve-command';
import { buildProblem, compileWithDerivatives, parseProblem, runProblem } from '../../src/problem-file/index';
import { rng } from '../helpers/random';

const V = ['t', 'x', 'y'] as const;
type F = (t: number, x: number, y: number) => number;
const PI = Math.PI;

/** Expression, its ∂/∂x and ∂/∂y by the tables of calculus (common practice). */
const TABLE: [string, F, F][] = [
  ['x^3*y - 2*x/y', (_t, x, y) => 3 * x * x * y - 2 / y, (_t, x, y) => x ** 3 + (2 * x) / (y * y)],
  ['-x^2 + y', (_t, x) => -2 * x, () => 1],
  ['sin(pi*x)*cos(2*y)', (_t, x, y) => PI * Math.cos(PI * x) * Math.cos(2 * y), (_t, x, y) => -2 * Math.sin(PI * x) * Math.sin(2 * y)],
  ['exp(-t)*tan(x) + log(1 + y^2)', (t, x) => Math.exp(-t) / Math.cos(x) ** 2, (_t, _x, y) => (2 * y) / (1 + y * y)],
  ['sqrt(1 + x*x*y)', (_t, x, y) => (x * y) / Math.sqrt(1 + x * x * y), (_t, x, y) => (x * x) / (2 * Math.sqrt(1 + x * x * y))],
  ['2^x * x^y', (_t, x, y) => Math.LN2 * 2 ** x * x ** y + 2 ** x * y * x ** (y - 1), (_t, x, y) => 2 ** x * x ** y * Math.log(x)],
  ['pow(x, 3) + x**2 * y', (_t, x, y) => 3 * x * x + 2 * x * y, (_t, x) => x * x],
  ['atan2(y, x)', (_t, x, y) => -y / (x * x + y * y), (_t, x, y) => x / (x * x + y * y)],
  ['abs(x - y) + min(x, y) + max(x*y, 0.1)', (_t, x, y) => Math.sign(x - y) + (x <= y ? 1 : 0) + (x * y >= 0.1 ? y : 0), (_t, x, y) => -Math.sign(x - y) + (x <= y ? 0 : 1) + (x * y >= 0.1 ? x : 0)],
  ['x > 0.5 ? x^2 : -y*x', (_t, x, y) => (x > 0.5 ? 2 * x : -y), (_t, x) => (x > 0.5 ? 0 : -x)],
  ['(x < y) * 3 + !(x > 1) - e^x', (_t, x) => -Math.exp(x), () => 0],
];

describe('symbolic derivatives of expressions', () => {
  it('match the tables of calculus at random points', () => {
    const rnd = rng(11);
    for (const [src, dx, dy] of TABLE) {
      const [, fx, fy] = compileWithDerivatives(src, 'exact', V, [['x'], ['y']]);
      for (let k = 0; k < 100; k++) {
        const t = rnd(), x = 0.1 + 1.3 * rnd(), y = 0.2 + 1.5 * rnd();
        expect(fx!.fn(t, x, y), `∂x ${src} at ${x}, ${y}`).toBeCloseTo(dx(t, x, y), 10);
        expect(fy!.fn(t, x, y), `∂y ${src} at ${x}, ${y}`).toBeCloseTo(dy(t, x, y), 10);
      }
    }
  });

  it('match central finite differences, first and second derivatives in t, x and y', () => {
    const rnd = rng(5);
    const h = 1e-4;
    for (const [src] of TABLE) {
      const [u, ut, ux, uy, uxx, uxy] = compileWithDerivatives(src, 'exact', V, [['t'], ['x'], ['y'], ['x', 'x'], ['x', 'y']]);
      const f = u!.fn;
      for (let k = 0; k < 40; k++) {
        const t = 0.2 + rnd(), x = 0.15 + 1.2 * rnd(), y = 0.25 + 1.4 * rnd();
        // skip points next to a kink or jump of the piecewise cases (the difference straddles it)
        if (Math.abs(x - y) < 0.01 || Math.abs(x - 0.5) < 0.01 || Math.abs(x * y - 0.1) < 0.01) continue;
        const d = (a: number, b: number) => Math.abs(a - b) / (1 + Math.abs(b));
        expect(d(ut!.fn(t, x, y), (f(t + h, x, y) - f(t - h, x, y)) / (2 * h))).toBeLessThan(1e-6);
        expect(d(ux!.fn(t, x, y), (f(t, x + h, y) - f(t, x - h, y)) / (2 * h))).toBeLessThan(1e-6);
        expect(d(uy!.fn(t, x, y), (f(t, x, y + h) - f(t, x, y - h)) / (2 * h))).toBeLessThan(1e-6);
        const hh = 1e-3;
        expect(d(uxx!.fn(t, x, y), (f(t, x + hh, y) - 2 * f(t, x, y) + f(t, x - hh, y)) / (hh * hh))).toBeLessThan(1e-4);
        const fxy = (f(t, x + hh, y + hh) - f(t, x + hh, y - hh) - f(t, x - hh, y + hh) + f(t, x - hh, y - hh)) / (4 * hh * hh);
        expect(d(uxy!.fn(t, x, y), fxy)).toBeLessThan(1e-4);
      }
    }
  });

  it('read −x^2 as −(x^2), as the compiler does', () => {
    const [u, ux] = compileWithDerivatives('-x^2', 'exact', V, [['x']]);
    expect(u!.fn(0, 3, 0)).toBe(-9);
    expect(ux!.fn(0, 3, 0)).toBe(-6);
  });

  it('reject what the expression language rejects, naming the field', () => {
    expect(() => compileWithDerivatives('sin(x', 'exact', V, [['x']])).toThrow(/^exact: does not parse/);
    expect(() => compileWithDerivatives('foo(x)', 'exact', V, [['x']])).toThrow(/exact: unknown function 'foo'/);
    expect(() => compileWithDerivatives('x + z', 'exact', ['t', 'x'], [['x']])).toThrow(/exact: unknown name 'z'/);
  });
});

const interval = { shape: 'interval', from: 0, to: 1, cells: 2 };
const square = { shape: 'rectangle', from: [0, 0], to: [1, 1], cells: [2, 2] };

function checkError(file: object): InvalidArgumentError {
  try {
    buildProblem(parseProblem(file));
  } catch (e) {
    expect(e).toBeInstanceOf(InvalidArgumentError);
    expect((e as InvalidArgumentError).field).toBe('exact');
    return e as InvalidArgumentError;
  }
  throw new Error('expected the exact solution to be rejected');
}

describe('a known solution is checked against the problem it is given with', () => {
  it('accepts separable and polynomial solutions with every kind of boundary part and a variable κ', () => {
    // u = e^{−2π²κt} sin πx sin πy with κ = 0.3 (Carslaw & Jaeger §5.3): zero on the boundary
    expect(() => buildProblem(parseProblem({ domain: square, horizon: 1, diffusion: 0.3, initial: 'sin(pi*x)*sin(pi*y)', exact: 'exp(-2*pi^2*0.3*t)*sin(pi*x)*sin(pi*y)' }))).not.toThrow();
    // u = x + t on (0, 1): ∂t u = 1, Δu = 0, so f = 1; u(t, 0) = t; κ ∂u/∂x (t, 1) = 1;
    // with h = 1 at x = 1: 1 = 1 · (u∞ − (1 + t)) gives u∞ = 2 + t
    const base = { domain: interval, horizon: 1, source: 1, initial: 'x', exact: 'x + t' };
    expect(() => buildProblem(parseProblem({ ...base, boundary: [{ kind: 'value', where: 'x < 0.5', value: 't' }, { kind: 'flux', where: 'x > 0.5', flux: 1 }] }))).not.toThrow();
    expect(() => buildProblem(parseProblem({ ...base, boundary: [{ kind: 'value', where: 'x < 0.5', value: 't' }, { kind: 'convection', where: 'x > 0.5', transferCoefficient: 1, ambient: '2 + t' }] }))).not.toThrow();
    // κ = 1 on (0, ½), 2 on (½, 1) and u = t + (2x or x + ½): ∂t u = 1, Δu = 0 in each cell, and the
    // flux κ u_x = 2 on both sides of x = ½ (a weak solution across the jump); κ u_x(t, 1) = 2
    expect(() => buildProblem(parseProblem({ domain: interval, horizon: 1, diffusion: 'x < 0.5 ? 1 : 2', source: 1, initial: 'x < 0.5 ? 2*x : x + 0.5', exact: 't + (x < 0.5 ? 2*x : x + 0.5)', boundary: [{ kind: 'value', where: 'x < 0.5', value: 't' }, { kind: 'flux', where: 'x > 0.5', flux: 2 }] }))).not.toThrow();
  });

  it('rejects a solution of another equation, initial state or boundary condition, naming which and where', () => {
    // the decay rate of the separable solution without κ
    expect(checkError({ domain: square, horizon: 1, diffusion: 0.3, initial: 'sin(pi*x)*sin(pi*y)', exact: 'exp(-2*pi^2*t)*sin(pi*x)*sin(pi*y)' }).message).toMatch(/does not satisfy the heat equation .* at t = [\d.]+, x = [\d.]+, y = [\d.]+/);
    // κ = 1 + x solves ∇·((1 + x)∇u) … with f = −1 − 4x for u = t + x², but the library takes κ at
    // the cell centroids (κ = 1.25 and 1.75 here), and the message says so
    expect(checkError({ domain: interval, horizon: 1, diffusion: '1 + x', source: '-1 - 4*x', initial: 'x^2', exact: 't + x^2', boundary: [{ kind: 'value', where: 'x < 0.5', value: 't' }, { kind: 'flux', where: 'x > 0.5', flux: 4 }] }).message).toMatch(/heat equation .*taken at initial-element centroids, here κ = 1\.25/);
    // κ jumps at x = ½ and u = t + x² has the same slope on both sides: the flux jumps (1 against 2)
    expect(checkError({ domain: interval, horizon: 1, diffusion: 'x < 0.5 ? 1 : 2', source: 'x < 0.5 ? -1 : -3', initial: 'x^2', exact: 't + x^2', boundary: [{ kind: 'value', where: 'x < 0.5', value: 't' }, { kind: 'flux', where: 'x > 0.5', flux: 4 }] }).message).toMatch(/continuity of the flux .* jumps from 1 to 2 at t = [\d.]+, x = 0\.5: 1 against 2/);
    expect(checkError({ domain: interval, horizon: 1, source: 1, initial: '0', exact: 'x + t', boundary: [{ kind: 'value', where: 'x < 0.5', value: 't' }, { kind: 'flux', where: 'x > 0.5', flux: 1 }] }).message).toMatch(/initial state .* at t = 0, x = /);
    const wrongFlux = checkError({ domain: interval, horizon: 1, source: 1, initial: 'x', exact: 'x + t', boundary: [{ kind: 'value', where: 'x < 0.5', value: 't' }, { kind: 'flux', where: 'x > 0.5', flux: 2 }] });
    expect(wrongFlux.message).toMatch(/boundary\[1\] \(flux\), κ ∂u\/∂n at t = [\d.]+, x = 1: 1 against 2/);
    expect(checkError({ domain: interval, horizon: 1, source: 1, initial: 'x', exact: 'x + t', boundary: [{ kind: 'value', where: 'x < 0.5', value: '2*t' }, { kind: 'flux', where: 'x > 0.5', flux: 1 }] }).message).toMatch(/boundary\[0\] \(value\) at t = [\d.]+, x = 0:/);
    expect(checkError({ domain: interval, horizon: 1, source: 1, initial: 'x', exact: 'x + t', boundary: [{ kind: 'value', where: 'x < 0.5', value: 't' }, { kind: 'convection', where: 'x > 0.5', transferCoefficient: 1, ambient: '2' }] }).message).toMatch(/boundary\[1\] \(convection\)/);
    // the default part holds u = 0, an insulated side κ ∂u/∂n = 0
    expect(checkError({ domain: interval, horizon: 1, source: 1, initial: 'x', exact: 'x + t' }).message).toMatch(/default boundary value 0/);
    expect(checkError({ domain: square, horizon: 1, insulated: 'x > 0.99', initial: 'sin(pi*x)*sin(pi*y)', exact: 'exp(-2*pi^2*t)*sin(pi*x)*sin(pi*y)' }).message).toMatch(/insulated boundary .* x = 1, y = /);
  });

  it('rejects an exact field that is not an expression', () => {
    expect(() => parseProblem({ domain: interval, horizon: 1, exact: [1] })).toThrow(/^exact: must be an expression string/);
    expect(() => parseProblem({ domain: interval, horizon: 1, exact: 'x + y' })).toThrow(/exact: unknown name 'y'/);
  });
});

describe('true errors against the known solution', () => {
  it('are the error norms of the run’s solution against the solution written out by hand, with their ratio to E', () => {
    const file = { domain: interval, horizon: 0.5, initial: 'sin(pi*x)', exact: 'exp(-pi^2*t)*sin(pi*x)', maxDofs: 1500 };
    const run = runProblem(buildProblem(parseProblem(file)));
    const ex = run.exactErrors!;
    const byHand = spaceTimeErrors(run.solution, {
      value: (t, x) => Math.exp(-PI * PI * t) * Math.sin(PI * x),
      gradient: (t, x, _y, g) => { g[0] = PI * Math.exp(-PI * PI * t) * Math.cos(PI * x); },
    });
    expect(ex.gradientL2).toBeGreaterThan(0);
    expect(Math.abs(ex.gradientL2 - byHand.gradientL2) / byHand.gradientL2).toBeLessThan(1e-12);
    expect(Math.abs(ex.valueL2 - byHand.valueL2) / byHand.valueL2).toBeLessThan(1e-12);
    const E = run.steps[run.steps.length - 1]!.estimate;
    expect(ex.ratioToEstimate).toBeCloseTo(ex.gradientL2 / E, 14);
    // the estimator's band on smooth data (docs/adaptivity.md §7: err/E 1.00–1.04 in 1D)
    expect(ex.ratioToEstimate).toBeGreaterThan(0.7);
    expect(ex.ratioToEstimate).toBeLessThan(1.6);
    // every step measured; the last one is the reported error; the band and the rate of the true error
    for (const st of run.steps) expect(st.trueError).toBeGreaterThan(0);
    expect(run.steps[run.steps.length - 1]!.trueError).toBe(ex.gradientL2);
    expect(ex.ratioRange[0]).toBeLessThanOrEqual(ex.ratioToEstimate);
    expect(ex.ratioRange[1]).toBeGreaterThanOrEqual(ex.ratioToEstimate);
    expect(ex.ratioRange[1] / ex.ratioRange[0]).toBeLessThan(3); // the band asked of the estimator
    // smooth data in 1D: the sparse-grid rate 1 (docs/adaptivity.md §7 measured 0.96–1.00)
    expect(ex.rate!).toBeGreaterThan(0.8);
    const plain = runProblem(buildProblem(parseProblem({ ...file, exact: undefined })));
    expect(plain.exactErrors).toBeNull();
    expect('trueError' in plain.steps[0]!).toBe(false);
  });

  it('reach the command line: progress lines, --json, history.csv and the plot', () => {
    const dir = mkdtempSync(join(tmpdir(), 'chronomesh-exact-'));
    const file = join(dir, 'p.json');
    writeFileSync(file, JSON.stringify({ domain: interval, horizon: 0.5, initial: 'sin(pi*x)', exact: 'exp(-pi^2*t)*sin(pi*x)', maxDofs: 400, strategy: 'sparse' }));
    const lines: string[] = [];
    const progress: string[] = [];
    const { run } = solveFile(file, { json: true, out: join(dir, 'out'), log: (l) => lines.push(l), progress: (l) => progress.push(l) });
    const doc = JSON.parse(lines[0]!) as { steps: { trueError: number }[]; exactErrors: { gradientL2: number; ratioRange: number[]; rate: number } };
    expect(doc.exactErrors.gradientL2).toBe(run.exactErrors!.gradientL2);
    expect(doc.steps.map((st) => st.trueError)).toEqual(run.steps.map((st) => st.trueError));
    expect(progress.every((l) => /true error \d\.\d{3}e-\d+/.test(l))).toBe(true);
    const csv = readFileSync(join(dir, 'out', 'history.csv'), 'utf8').trim().split('\n');
    expect(csv[0]).toBe('step,dofs,estimate,iterations,riseChecks,seconds,trueError,relativeEstimate');
    expect(Number(csv[csv.length - 1]!.split(',')[6])).toBe(run.exactErrors!.gradientL2);
    expect(Number(csv[csv.length - 1]!.split(',')[7])).toBe(run.steps[run.steps.length - 1]!.relativeEstimate);
    expect(readFileSync(join(dir, 'out', 'history.svg'), 'utf8')).toContain('true error');
    // a smooth exact solution: the quadrature check agrees
    expect(run.exactErrors!.splitCheck.agrees).toBe(true);
  });

  it('a kink of the exact solution inside elements: the quadrature check disagrees and says so', () => {
    // u = t·k(x), k = 0.63x left of x = 0.37 and 0.37(1 − x) right of it: ∂t u − Δu = k(x) + t δ(x − 0.37)
    // (k'' = −δ by hand), insulated at y = 0 and 1; the line x = 0.37 crosses the 2 × 2 mesh's elements
    const dir = mkdtempSync(join(tmpdir(), 'chronomesh-exact-'));
    const file = join(dir, 'kink2d.json');
    writeFileSync(file, JSON.stringify({
      domain: { shape: 'rectangle', from: [0, 0], to: [1, 1], cells: [2, 2] }, horizon: 1, insulated: 'y < 0.01 || y > 0.99',
      source: 'x < 0.37 ? 0.63*x : 0.37*(1 - x)', curveSources: [{ curve: [[0.37, 0], [0.37, 1]], time: 't' }],
      exact: 't*(x < 0.37 ? 0.63*x : 0.37*(1 - x))', maxDofs: 50,
    }));
    const progress: string[] = [];
    const { run } = solveFile(file, { log: () => {}, progress: (l) => progress.push(l) });
    const ex = run.exactErrors!;
    expect(ex.splitCheck.agrees).toBe(false);
    // measured: 8.8e-3 with the plain rule where a brute-force lattice gives 4.4e-2
    expect(ex.splitCheck.gradientL2).toBeGreaterThan(3 * ex.gradientL2);
    expect(progress.join('\n')).toMatch(/warning: the true error depends on the quadrature: \S+ in the energy norm with the standard rule, \S+ with every element split 3 × 3/);
  });

  it("a known solution in the discrete space: the run stops with 'rounding' and says why, without an error ratio", () => {
    // u = t(½ − |x − ½|): ∂t u − ∂xx u = ½ − |x − ½| + 2t δ(x − ½) (by hand), u = 0 at both ends
    const dir = mkdtempSync(join(tmpdir(), 'chronomesh-exact-'));
    const file = join(dir, 'kink.json');
    writeFileSync(file, JSON.stringify({
      domain: { ...interval, cells: 3 }, horizon: 1, source: '0.5 - abs(x - 0.5)', curveSources: [{ curve: [[0.5]], time: '2*t' }],
      exact: 't*(0.5 - abs(x - 0.5))', tolerance: 1e-20, maxSteps: 100,
    }));
    const lines: string[] = [];
    const progress: string[] = [];
    const { run, toleranceReached } = solveFile(file, { log: (l) => lines.push(l), progress: (l) => progress.push(l) });
    expect(run.stopReason).toBe('rounding');
    expect(run.steps.length).toBeLessThanOrEqual(3);
    expect(run.exactErrors!.gradientL2).toBeLessThan(1e-12);
    expect(toleranceReached).toBe(true); // nothing lowers E further: no warning, exit status 0
    expect(progress.join('\n')).not.toMatch(/not reached/);
    expect(lines.join('\n')).toMatch(/stopped by rounding/);
    expect(lines.join('\n')).toMatch(/at the rounding level of double precision/);
    expect(lines.join('\n')).toMatch(/both at the rounding level, where their ratio means nothing/);
    expect(progress[0]).toMatch(/estimate \S+ \(\d\.\de-\d+ × ‖u‖\)/);
  });
});

describe('a diffusion tensor in a problem file', () => {
  // u = e^{−t} sin πx sin πy with K = [[2, 0.5], [0.5, 1]]: ∇·(K∇u) = Kxx uxx + 2Kxy uxy + Kyy uyy, so
  // f = e^{−t}((3π² − 1) sin πx sin πy − π² cos πx cos πy) (differentiated by hand; common practice)
  const tensorFile = {
    domain: square, horizon: 0.5, diffusion: { xx: 2, xy: 0.5, yy: 1 }, initial: 'sin(pi*x)*sin(pi*y)',
    source: 'exp(-t)*((3*pi^2 - 1)*sin(pi*x)*sin(pi*y) - pi^2*cos(pi*x)*cos(pi*y))',
    exact: 'exp(-t)*sin(pi*x)*sin(pi*y)', maxDofs: 3000,
  };

  it('is accepted with a known solution that solves ∂t u − ∇·(K∇u) = f, and a run tracks it', () => {
    const built = buildProblem(parseProblem(tensorFile));
    expect(built.domain.anisotropic).toBe(true);
    const run = runProblem(built);
    const ex = run.exactErrors!;
    const E = run.steps.at(-1)!.estimate;
    // smooth data: the estimator tracks the true error closely (measured err/E ≈ 1.4–1.6)
    expect(ex.gradientL2 / E).toBeGreaterThan(0.5);
    expect(ex.gradientL2 / E).toBeLessThan(3);
    expect(Math.abs(run.solution.evaluate(0.25, [0.3, 0.6])[0]! - Math.exp(-0.25) * Math.sin(0.3 * PI) * Math.sin(0.6 * PI))).toBeLessThan(0.02);
  }, 60_000);

  it('is checked at absolute times when the run starts later (the cross derivative is shifted too)', () => {
    // u = e^{−t} sin πx sin πy in absolute time t ∈ [0.2, 0.7]; every expression in t is shifted
    expect(() => buildProblem(parseProblem({ ...tensorFile, start: 0.2, horizon: 0.7, initial: 'exp(-0.2)*sin(pi*x)*sin(pi*y)' }))).not.toThrow();
  });

  it('is refused with a source that misses the cross term, naming the equation and the point', () => {
    const wrong = { ...tensorFile, source: 'exp(-t)*(3*pi^2 - 1)*sin(pi*x)*sin(pi*y)' };
    expect(checkError(wrong).message).toMatch(/does not satisfy the heat equation .* at t = [\d.]+, x = [\d.]+, y = [\d.]+/);
  });

  it('checks the conormal flux n·K∇u on flux parts', () => {
    // u = x + y + t·0 on the unit square with K = [[2, 0.5], [0.5, 1]]: ∇·(K∇u) = 0, f = 0; on x = 1
    // the outward normal is (1, 0), so n·K∇u = Kxx + Kxy = 2.5 (κ ∂u/∂n alone would be 1)
    const base = { domain: square, horizon: 1, diffusion: { xx: 2, xy: 0.5, yy: 1 }, initial: 'x + y', exact: 'x + y' };
    const parts = (q: number) => [{ kind: 'value', where: 'x < 0.99', value: 'x + y' }, { kind: 'flux', where: 'x > 0.99', flux: q }];
    expect(() => buildProblem(parseProblem({ ...base, boundary: parts(2.5) }))).not.toThrow();
    expect(checkError({ ...base, boundary: parts(1) }).message).toMatch(/boundary\[1\] \(flux\), n·K∇u at t = [\d.]+, x = 1, y = [\d.]+: 2\.5 against 1/);
  });

  it('refuses malformed tensors, naming the field', () => {
    expect(() => buildProblem(parseProblem({ domain: square, horizon: 1, diffusion: { xx: 1, xy: 2, yy: 1 } }))).toThrow(/^diffusion: the tensor .* is not positive definite/);
    expect(() => parseProblem({ domain: square, horizon: 1, diffusion: { xx: 1, yy: 1, zz: 1 } })).toThrow(/diffusion/);
    expect(() => parseProblem({ domain: square, horizon: 1, diffusion: { xy: 0.1, yy: 1 } })).toThrow(/^diffusion\.xx: is required/);
    expect(() => parseProblem({ domain: square, horizon: 1, diffusion: [1, 0, 1] })).toThrow(/^diffusion: .*found a list/);
    expect(() => parseProblem({ domain: interval, horizon: 1, diffusion: { xx: 1, xy: 0, yy: 1 } })).toThrow(/^diffusion: may be a tensor .* only on a 2D domain/);
    expect(() => buildProblem(parseProblem({ domain: square, horizon: 1, diffusion: { xx: 'x - 0.5', xy: 0, yy: 1 } }))).toThrow(/diffusion\.xx/);
    expect(() => parseProblem({ domain: square, horizon: 1, diffusion: { xx: 'q', xy: 0, yy: 1 } })).toThrow(/diffusion\.xx: unknown name 'q'/);
  });
});
