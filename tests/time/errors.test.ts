/** Bad input to the time module raises typed errors that say what is wrong and where (RULES 4). */
import { describe, expect, it } from 'vitest';
import { InvalidArgumentError, InvalidIndexSetError } from '../../src/errors';
import { TemporalTree, TreeOperatorPlan, derivativeNorms, evaluateTemporal, traceVector } from '../../src/time/index';

describe('time module input validation', () => {
  const sigma = TemporalTree.full('trial', 3);
  const psi = TemporalTree.full('test', 3);

  it('interval length T must be finite and > 0', () => {
    for (const T of [-1, 0, Number.NaN, Number.POSITIVE_INFINITY]) {
      expect(() => new TreeOperatorPlan('mass', sigma, psi, 'full', T)).toThrow(InvalidArgumentError);
      expect(() => traceVector(sigma, 0, T)).toThrow(InvalidArgumentError);
      expect(() => derivativeNorms(sigma, T)).toThrow(InvalidArgumentError);
      expect(() => evaluateTemporal('trial', 0, 0, 0, 0, T)).toThrow(InvalidArgumentError);
    }
    expect(() => new TreeOperatorPlan('mass', sigma, psi, 'full', -2)).toThrow('T must be a finite number > 0; received -2');
    expect(() => traceVector(sigma, 0, Number.NaN)).toThrow('T must be a finite number > 0; received NaN');
    // The error object itself names the field and the value (a try/catch alone would pass
    // when nothing is thrown, so the thrown value is captured and checked unconditionally).
    let thrown: unknown = null;
    try {
      derivativeNorms(sigma, Number.POSITIVE_INFINITY);
    } catch (e) {
      thrown = e;
    }
    expect(thrown).toBeInstanceOf(InvalidArgumentError);
    expect((thrown as InvalidArgumentError).field).toBe('T');
    expect((thrown as InvalidArgumentError).received).toBe(Number.POSITIVE_INFINITY);
  });

  it('levels, indices, slots and points out of range', () => {
    expect(() => TemporalTree.fromNodes('trial', [60], [0])).toThrow('levels[0] must be an integer in [0, 52]; received 60');
    expect(() => TemporalTree.fromNodes('trial', [0, 2], [0, 2])).toThrow('indices[1] of a trial node on level 2 must be an integer in [0, 1]; received 2');
    expect(() => TemporalTree.fromNodes('test', [0, 1], [0, -1])).toThrow('indices[1] of a test node on level 1 must be an integer in [0, 0]; received -1');
    expect(() => TemporalTree.fromNodes('test', [0], [Number.NaN])).toThrow(InvalidArgumentError);
    expect(() => TemporalTree.fromNodes('test', [1.5], [0])).toThrow(InvalidArgumentError);
    expect(() => TemporalTree.fromNodes('trial', [52], [2 ** 51])).toThrow(`indices[0] of a trial node on level 52 must be an integer in [0, ${2 ** 51 - 1}]`);
    expect(() => evaluateTemporal('trial', 0, 0, 1, 0.5)).toThrow('slot of a trial node must be an integer in [0, 0]; received 1');
    expect(() => evaluateTemporal('test', 3, 0, 0, 1.5)).toThrow('t must be a finite number in [0, 1]; received 1.5');
    expect(() => evaluateTemporal('test', 3, 9, 0, 0.5)).toThrow('index of a test node on level 3 must be an integer in [0, 3]; received 9');
    expect(() => TemporalTree.full('trial', 27)).toThrow('maxLevel must be an integer in [-1, 26]; received 27');
    expect(() => TemporalTree.fromNodes('spline' as never, [0], [0])).toThrow("kind must be 'trial' or 'test'; received \"spline\"");
  });

  it('mismatched array lengths', () => {
    expect(() => TemporalTree.fromNodes('trial', [0, 0], [0])).toThrow('levels and indices must have the same length; received 2 and 1');
    const plan = new TreeOperatorPlan('derivIn', sigma, psi, 'lower');
    expect(() => plan.apply(new Float64Array(8), new Float64Array(16))).toThrow(
      'x must be a Float64Array of length ≥ 9 (input functions × batch); received Float64Array(length 8)',
    );
    expect(() => plan.apply(new Float64Array(9), new Float64Array(15))).toThrow(
      'y must be a Float64Array of length ≥ 16 (output functions × batch); received Float64Array(length 15)',
    );
    expect(() => plan.apply(new Float64Array(18), new Float64Array(32), 3)).toThrow('x must be a Float64Array of length ≥ 27');
    expect(() => plan.apply(new Float64Array(9), new Float64Array(16), 0)).toThrow('batch must be an integer ≥ 1; received 0');
    expect(() => plan.apply([1, 2] as never, new Float64Array(16))).toThrow(InvalidArgumentError);
  });

  it('non-closed trees and wrong plan arguments', () => {
    expect(() => TemporalTree.fromNodes('test', [0, 2], [0, 1])).toThrow(InvalidIndexSetError);
    expect(() => TemporalTree.fromNodes('test', [0, 2], [0, 1])).toThrow('node (level 2, index 1) of test tree has missing parent (level 1, index 0)');
    expect(() => new TreeOperatorPlan('laplace' as never, sigma, psi, 'full')).toThrow('form must be one of mass, derivIn, derivOut, stiffness; received "laplace"');
    expect(() => new TreeOperatorPlan('mass', sigma, psi, 'middle' as never)).toThrow('part must be one of lower, upper, full; received "middle"');
    expect(() => new TreeOperatorPlan('mass', {} as never, psi, 'full')).toThrow('inTree must be a TemporalTree');
    expect(() => traceVector(sigma, 2 as never)).toThrow('side must be 0 (t = 0) or 1 (t = T); received 2');
  });
});
