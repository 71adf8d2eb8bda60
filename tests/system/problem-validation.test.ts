/** Bad input to the space-time layer produces typed errors that name the field. */
import { describe, expect, it } from 'vitest';
import { DoubleTree, HeatProblem, InvalidArgumentError, SpaceTimeSystem, intervalDomain, solveAdaptive } from '../../src/index';

describe('problem and system validation', () => {
  const domain = intervalDomain(0, 1, 2);
  it('rejects a non-positive or non-finite final time', () => {
    for (const T of [0, -1, NaN, Infinity]) {
      expect(() => new HeatProblem({ domain, T })).toThrow(InvalidArgumentError);
      expect(() => new HeatProblem({ domain, T })).toThrow(/final time T = .* must be a finite number > 0/);
    }
  });
  it('rejects a missing domain and malformed data functions', () => {
    expect(() => new HeatProblem({ domain: {} as never, T: 1 })).toThrow(/domain must be a SpatialDomain/);
    expect(() => new HeatProblem({ domain, T: 1, initial: 3 as never })).toThrow(/initial must be a function/);
    expect(() => new HeatProblem({ domain, T: 1, source: [{ time: () => 1 }] as never })).toThrow(/source\[0\] must be/);
  });
  it('reports a source or initial state returning NaN with the offending point', () => {
    const set = DoubleTree.sparseGrid(domain, 2);
    const bad = new SpaceTimeSystem(new HeatProblem({ domain, T: 1, source: (t) => (t > 0.5 ? NaN : 0) }), set);
    expect(() => bad.rightHandSide()).toThrow(/source\(0\.[0-9]+, [0-9.e-]+, 0\) returned NaN/);
    const bad0 = new SpaceTimeSystem(new HeatProblem({ domain, T: 1, initial: () => Infinity }), set);
    expect(() => bad0.rightHandSide()).toThrow(/initial\(.*\) returned Infinity/);
  });
  it('names a data function that returns a string or nothing as such, not as if it were a number', () => {
    const set = DoubleTree.sparseGrid(domain, 2);
    const asString = new HeatProblem({ domain, T: 1, initial: () => '1' as never });
    expect(() => new SpaceTimeSystem(asString, set).rightHandSide()).toThrow(/initial\(.*\) returned "1"; expected a finite number/);
    expect(() => solveAdaptive(asString, { maxUnknowns: 100 })).toThrow(/initial is "1" at \(x, y\) = /);
    const nothing = new HeatProblem({ domain, T: 1, source: (() => undefined) as never });
    expect(() => new SpaceTimeSystem(nothing, set).rightHandSide()).toThrow(/source\(.*\) returned undefined; expected a finite number/);
  });
  it('rejects a trial set of the wrong kind', () => {
    const p = new HeatProblem({ domain, T: 1 });
    expect(() => new SpaceTimeSystem(p, {} as never)).toThrow(/trialSet must be a trial DoubleTree/);
  });
});
