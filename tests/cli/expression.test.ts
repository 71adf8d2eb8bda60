/**
 * Problem-file expressions against the same formulas written directly with JavaScript's Math
 * (an independent evaluation), at random points; operator conventions of mathematical notation
 * (common practice): ^ right-associative and above unary minus, comparisons as 1/0.
 */
import { describe, expect, it } from 'vitest';
import { compileExpression, nearestName } from '../../src/problem-file/index';
import { rng } from '../helpers/random';

const V = ['t', 'x', 'y'] as const;
const CASES: [string, (t: number, x: number, y: number) => number][] = [
  ['40*exp(-((x+0.5)^2+(y-0.5)^2)/0.02)*(t >= 0.25)', (t, x, y) => 40 * Math.exp(-((x + 0.5) ** 2 + (y - 0.5) ** 2) / 0.02) * (t >= 0.25 ? 1 : 0)],
  ['-x^2 + 2^3^2 - y', (_t, x, y) => -(x ** 2) + 2 ** 9 - y],
  ['x < 0.1 ? 1 : 0.05', (_t, x) => (x < 0.1 ? 1 : 0.05)],
  ['sin(pi*x)*cos(y) + tan(t/4) - log(1 + x*x) + sqrt(abs(y))', (t, x, y) => Math.sin(Math.PI * x) * Math.cos(y) + Math.tan(t / 4) - Math.log(1 + x * x) + Math.sqrt(Math.abs(y))],
  ['min(x, y) * max(x, t) + atan2(y, x) + pow(abs(x), 1.5) + e', (t, x, y) => Math.min(x, y) * Math.max(x, t) + Math.atan2(y, x) + Math.abs(x) ** 1.5 + Math.E],
  ['(x > 0 && y <= 0) || !(t != 1) ? 3 : x == y', (t, x, y) => ((x > 0 && y <= 0) || t === 1 ? 3 : x === y ? 1 : 0)],
  ['1e-3 * t / (1 + x*x + y*y)', (t, x, y) => (1e-3 * t) / (1 + x * x + y * y)],
];

describe('problem-file expressions', () => {
  it('agree with direct Math evaluation at random points', () => {
    const rnd = rng(7);
    for (const [src, ref] of CASES) {
      const f = compileExpression(src, 'source', V).fn;
      for (let k = 0; k < 200; k++) {
        const t = rnd() * 2, x = rnd() * 2 - 1, y = rnd() * 2 - 1;
        const want = ref(t, x, y);
        expect(f(t, x, y), `${src} at ${t}, ${x}, ${y}`).toBeCloseTo(want, 12);
      }
    }
  });

  it('folds constants and reports constness', () => {
    const c = compileExpression('2*pi + sin(0)', 'f', V);
    expect(c.constant).toBe(true);
    expect(c.fn(0, 0, 0)).toBe(2 * Math.PI);
    expect(compileExpression('x', 'f', V).constant).toBe(false);
    expect(compileExpression(3 as unknown as string, 'f', V).fn(0, 0, 0)).toBe(3);
  });

  it('rejects anything outside the arithmetic subset (no property access, strings, assignment, unknown names)', () => {
    const bad: [string, RegExp][] = [
      ['x.constructor', /property access is not allowed/],
      ['this', /'this' is not allowed|unknown name/],
      ['"abc"', /only numbers are allowed/],
      ['x = 1', /does not parse/],
      ['process', /unknown name 'process'/],
      ['Math.sin(x)', /property access|only calls of named functions/],
      ['[1, 2]', /an array is not allowed/],
      ['x & 1', /operator '&' is not supported/],
      ['sin(x, y)', /sin takes 1 argument, found 2/],
      ['x y', /more than one expression/],
      ['', /is empty/],
    ];
    for (const [src, re] of bad) expect(() => compileExpression(src, 'source', V), src).toThrow(re);
  });

  it('suggests the nearest name', () => {
    expect(nearestName('horizn', ['horizon', 'domain', 'source'])).toBe('horizon');
    expect(nearestName('maxdofs', ['maxDofs', 'maxSeconds'])).toBe('maxDofs');
    expect(nearestName('qqqqqq', ['horizon'])).toBeNull();
  });
});
