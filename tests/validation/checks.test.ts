/** Unit tests of the shared argument checks, the name suggestions and the memory budget. */
import { afterEach, describe, expect, it } from 'vitest';
import { InvalidArgumentError, ResourceLimitError, memoryBudget, setMemoryBudget } from '../../src/index';
import {
  checkCallbackResult, checkFloat64Array, checkFunction, checkInteger, checkLinearOperator, checkMemory,
  checkNumber, checkNumberArray, checkOneOf, checkOptions, editDistance, nearestName,
} from '../../src/validation/index';

function fieldOf(f: () => unknown): string | undefined {
  try {
    f();
  } catch (e) {
    expect(e).toBeInstanceOf(InvalidArgumentError);
    return (e as InvalidArgumentError).field;
  }
  throw new Error('expected a throw');
}

describe('edit distance and suggestions', () => {
  it('matches the textbook Levenshtein examples', () => {
    // kitten → sitting needs 3 edits (the standard illustration of the Levenshtein distance; common practice).
    expect(editDistance('kitten', 'sitting')).toBe(3);
    expect(editDistance('', 'abc')).toBe(3);
    expect(editDistance('flaw', 'lawn')).toBe(2);
    expect(editDistance('same', 'same')).toBe(0);
  });
  it('suggests the nearest option name, or nothing for a far miss', () => {
    expect(nearestName('reltol', ['relTol', 'absTol', 'maxIterations'])).toBe('relTol');
    expect(nearestName('maxIter', ['relTol', 'absTol', 'maxIterations'])).toBeUndefined();
    expect(nearestName('maxIteration', ['relTol', 'absTol', 'maxIterations'])).toBe('maxIterations');
    expect(nearestName('zzz', ['theta', 'tolerance'])).toBeUndefined();
  });
});

describe('checks', () => {
  it('numbers: type, finiteness, open and closed bounds', () => {
    expect(checkNumber(0.5, 'x', { min: 0, max: 1 })).toBe(0.5);
    expect(fieldOf(() => checkNumber('0.5', 'opts.theta'))).toBe('opts.theta');
    expect(() => checkNumber(NaN, 'x')).toThrow(/x must be a finite number, received NaN/);
    expect(() => checkNumber(0, 'x', { min: 0, minOpen: true })).toThrow(/> 0/);
    expect(() => checkNumber(Infinity, 'x')).toThrow(InvalidArgumentError);
    expect(checkNumber(Infinity, 'x', { allowInfinity: true })).toBe(Infinity);
    expect(() => checkNumber(-Infinity, 'x', { allowInfinity: true })).toThrow(InvalidArgumentError);
  });
  it('integers', () => {
    expect(() => checkInteger(1.5, 'maxIterations', 1, 10)).toThrow(/maxIterations must be an integer in \[1, 10\], received 1.5/);
    expect(() => checkInteger(-1, 'n', 0, 10)).toThrow(InvalidArgumentError);
    expect(checkInteger(3, 'n', 0, 10)).toBe(3);
  });
  it('options objects: unknown keys with the nearest name, non-objects refused', () => {
    expect(checkOptions(undefined, 'opts', ['a'])).toEqual({});
    expect(() => checkOptions({ reltol: 1 }, 'opts', ['relTol', 'absTol'])).toThrow(/unknown option 'reltol' \(did you mean 'relTol'\?\)/);
    expect(fieldOf(() => checkOptions({ reltol: 1 }, 'opts', ['relTol']))).toBe('opts.reltol');
    for (const bad of ['x', 5, null, [1], () => 1]) expect(fieldOf(() => checkOptions(bad, 'opts', ['relTol']))).toBe('opts');
  });
  it('arrays: element types, lengths, finiteness; typed arrays', () => {
    expect(fieldOf(() => checkNumberArray(['0', 1], 'points'))).toBe('points[0]');
    expect(fieldOf(() => checkNumberArray([0, NaN], 'points'))).toBe('points[1]');
    expect(checkNumberArray([0, NaN], 'points', { finite: false }).length).toBe(2);
    expect(() => checkNumberArray([1, 2], 'range', { length: 3 })).toThrow(/range has length 2, expected 3/);
    expect(() => checkFloat64Array([1, 2], 'b')).toThrow(/b must be a Float64Array/);
    expect(fieldOf(() => checkFloat64Array(Float64Array.of(1, Infinity), 'b'))).toBe('b[1]');
  });
  it('functions, literals, operators and callback results', () => {
    expect(() => checkFunction(5, 'opts.onStep')).toThrow(/opts.onStep must be a function, received 5/);
    expect(() => checkOneOf('bogus', 'opts.inner.kind', ['multigrid', 'exact'])).toThrow(/one of "multigrid", "exact"/);
    expect(() => checkOneOf('exakt', 'opts.inner.kind', ['multigrid', 'exact'])).toThrow(/did you mean "exact"/);
    const rect = { inSize: 2, outSize: 3, apply: () => {} };
    expect(fieldOf(() => checkLinearOperator(rect, 'S', { square: true }))).toBe('S.outSize');
    expect(fieldOf(() => checkLinearOperator({ inSize: 2, outSize: 2 }, 'S'))).toBe('S.apply');
    expect(() => checkCallbackResult(NaN, 'exact.value', [0.5, 0.25, 0])).toThrow(/exact.value\(0.5, 0.25, 0\) returned NaN/);
  });
});

describe('memory budget', () => {
  afterEach(() => void setMemoryBudget(null));
  it('defaults to a positive budget and can be overridden and restored', () => {
    const def = memoryBudget();
    expect(def).toBeGreaterThan(0);
    expect(setMemoryBudget(1e6)).toBeNull();
    expect(memoryBudget()).toBe(1e6);
    expect(setMemoryBudget(null)).toBe(1e6);
    expect(memoryBudget()).toBe(def);
    expect(() => setMemoryBudget(-1)).toThrow(InvalidArgumentError);
    expect(() => setMemoryBudget(NaN)).toThrow(InvalidArgumentError);
  });
  it('refuses an estimate over budget with both figures', () => {
    setMemoryBudget(1024 ** 2);
    try {
      checkMemory(5 * 1024 ** 2, 'a test request', 'level');
      throw new Error('no throw');
    } catch (e) {
      expect(e).toBeInstanceOf(ResourceLimitError);
      const r = e as ResourceLimitError;
      expect(r.field).toBe('level');
      expect(r.estimateBytes).toBe(5 * 1024 ** 2);
      expect(r.budgetBytes).toBe(1024 ** 2);
      expect(r.message).toMatch(/about 5\.0 MiB, more than the memory budget of 1\.0 MiB/);
    }
  });
});
