/**
 * Typed errors thrown by chronomesh. Every error carries a stable `code` and,
 * where it applies, the name of the offending field and the item (element
 * index, node, vertex) it concerns, so that callers can react programmatically.
 */

/** Details attached to every {@link ChronomeshError}. */
export interface ErrorDetails {
  /** Name of the argument or field that is wrong, e.g. `"T"` or `"triangles[12]"`. */
  field?: string;
  /** What was expected, in words, e.g. `"a finite number > 0"`. */
  expected?: string;
  /** The value that was received (kept small: numbers, short strings). */
  received?: unknown;
}

/**
 * Base class of all errors raised by the library.
 *
 * @example
 * ```ts
 * import { ChronomeshError, HeatProblem, intervalDomain } from 'chronomesh';
 * try { new HeatProblem({ domain: intervalDomain(0, 1, 2), T: -1 }); }
 * catch (e) { if (e instanceof ChronomeshError) console.log(e.code, e.field); } // → invalid-argument T
 * ```
 */
export class ChronomeshError extends Error {
  /** Stable machine-readable code, e.g. `"invalid-argument"`. */
  readonly code: string;
  readonly field: string | undefined;
  readonly expected: string | undefined;
  readonly received: unknown;
  constructor(code: string, message: string, details: ErrorDetails = {}) {
    super(message);
    this.name = new.target.name;
    this.code = code;
    this.field = details.field;
    this.expected = details.expected;
    this.received = details.received;
  }
}

/** An argument is out of range, of the wrong length, or not finite. *
 * @example
 * ```ts
 * import { InvalidArgumentError, pcg } from 'chronomesh';
 * const S = { inSize: 2, outSize: 2, apply: (x: Float64Array, y: Float64Array) => y.set(x) };
 * try { pcg(S, new Float64Array(3)); } catch (e) { console.log(e instanceof InvalidArgumentError, (e as InvalidArgumentError).field); } // → true b
 * ```
 */
export class InvalidArgumentError extends ChronomeshError {
  constructor(message: string, details: ErrorDetails = {}) {
    super('invalid-argument', message, details);
  }
}

/** A temporal tree or space-time index set is not closed (a parent is missing) or malformed. *
 * @example
 * ```ts
 * import { InvalidIndexSetError, TemporalTree } from 'chronomesh';
 * try { TemporalTree.fromNodes('trial', [3], [0]); } catch (e) { console.log(e instanceof InvalidIndexSetError); } // → true — parents missing
 * ```
 */
export class InvalidIndexSetError extends ChronomeshError {
  constructor(message: string, details: ErrorDetails = {}) {
    super('invalid-index-set', message, details);
  }
}

/** A mesh, its boundary description or its coefficients are invalid. *
 * @example
 * ```ts
 * import { InvalidMeshError, triangulatedDomain } from 'chronomesh';
 * try { triangulatedDomain([0, 0, 1, 0, 2, 0], [[0, 1, 2]]); } catch (e) { console.log(e instanceof InvalidMeshError); } // → true — zero area
 * ```
 */
export class InvalidMeshError extends ChronomeshError {
  constructor(message: string, details: ErrorDetails = {}) {
    super('invalid-mesh', message, details);
  }
}

/** An iterative solver broke down (e.g. non-positive curvature in CG). *
 * @example
 * ```ts
 * import { SolverBreakdownError, pcg } from 'chronomesh';
 * const S = { inSize: 1, outSize: 1, apply: (x: Float64Array, y: Float64Array) => { y[0] = -x[0]!; } };
 * try { pcg(S, Float64Array.of(1)); } catch (e) { console.log(e instanceof SolverBreakdownError); } // → true
 * ```
 */
export class SolverBreakdownError extends ChronomeshError {
  constructor(message: string, details: ErrorDetails = {}) {
    super('solver-breakdown', message, details);
  }
}

/**
 * A request would need more memory (or work) than the resource budget allows; the message states
 * the estimate and the budget, and `estimateBytes` / `budgetBytes` carry them. Raised before
 * anything large is allocated. See {@link setMemoryBudget}.
 *
 * @example
 * ```ts
 * import { ResourceLimitError, rectangleDomain } from 'chronomesh';
 * try { rectangleDomain(0, 1, 0, 1, 2, 2).uniformSet(40); }
 * catch (e) { if (e instanceof ResourceLimitError) console.log(e.field, e.estimateBytes > e.budgetBytes); } // level true
 * ```
 */
export class ResourceLimitError extends ChronomeshError {
  /** Estimated memory of the request, bytes. */
  readonly estimateBytes: number;
  /** The budget in force, bytes. */
  readonly budgetBytes: number;
  constructor(message: string, estimateBytes: number, budgetBytes: number, details: ErrorDetails = {}) {
    super('resource-limit', message, details);
    this.estimateBytes = estimateBytes;
    this.budgetBytes = budgetBytes;
  }
}

/**
 * A long run was cancelled (its `AbortSignal` fired) or ran out of its time budget before it had
 * any result to return. `field` names the option that stopped it (`signal` or `maxSeconds`).
 *
 * @example
 * ```ts
 * import { HeatProblem, RunInterruptedError, intervalDomain, solveAdaptive } from 'chronomesh';
 * const problem = new HeatProblem({ domain: intervalDomain(0, 1, 2), T: 1, initial: () => 1 });
 * try { solveAdaptive(problem, { signal: AbortSignal.abort() }); }
 * catch (e) { console.log(e instanceof RunInterruptedError, (e as RunInterruptedError).field); } // → true signal
 * ```
 */
export class RunInterruptedError extends ChronomeshError {
  constructor(message: string, details: ErrorDetails = {}) {
    super('interrupted', message, details);
  }
}

/**
 * An iterative solve stopped at its iteration cap before reaching the requested tolerance (for
 * example the adjoint solve of a gradient). `field` names the solve, `expected` the tolerance and
 * `received` the residual reached.
 * @example
 * ```ts
 * import { ConvergenceError } from 'chronomesh';
 * const e = new ConvergenceError('adjoint PCG did not converge', { field: 'adjoint', expected: '≤ 1e-10', received: 3e-6 });
 * console.log(e.code, e.field); // not-converged adjoint
 * ```
 */
export class ConvergenceError extends ChronomeshError {
  constructor(message: string, details: ErrorDetails = {}) {
    super('not-converged', message, details);
  }
}

/**
 * An iterative solve stopped at its iteration cap before reaching the requested accuracy: the
 * returned iterate would be an unconverged (possibly far-off) approximation. A
 * {@link ConvergenceError} (code `not-converged`) raised by the space-time solve; it carries the iteration count and the
 * achieved and requested preconditioned residual norms. `SpaceTimeSystem.solve` raises it unless
 * called with `allowUnconverged: true`.
 *
 * @example
 * ```ts
 * import { DoubleTree, HeatProblem, NotConvergedError, SpaceTimeSystem, intervalDomain } from 'chronomesh';
 * const domain = intervalDomain(0, 1, 2);
 * const system = new SpaceTimeSystem(new HeatProblem({ domain, T: 1, initial: () => 1 }), DoubleTree.sparseGrid(domain, 5));
 * try { system.solve({ maxIterations: 2 }); }
 * catch (e) { if (e instanceof NotConvergedError) console.log(e.code, e.iterations, e.residual > e.target); } // not-converged 2 true
 * ```
 */
export class NotConvergedError extends ConvergenceError {
  /** Iterations made. */
  readonly iterations: number;
  /** Preconditioned residual norm √(rᵀKr) reached. */
  readonly residual: number;
  /** The norm that was asked for. */
  readonly target: number;
  constructor(message: string, iterations: number, residual: number, target: number, details: ErrorDetails = {}) {
    super(message, details);
    this.iterations = iterations;
    this.residual = residual;
    this.target = target;
  }
}

/**
 * A solve asked for an accuracy (`tolerance` on the estimator) and a budget (unknowns, steps,
 * seconds, memory, or the deepest temporal resolution) stopped it first: the answer it has is
 * *not* as accurate as requested. `estimate` is the estimator reached, `tolerance` the one asked
 * for, `stopReason` what stopped the run; `result` carries the run's result, so the work is not
 * lost (for `solve`, a `SolveResult`). `field` is `tolerance`.
 *
 * @example
 * ```ts
 * import { HeatProblem, ToleranceNotReachedError, intervalDomain, solve, type SolveResult } from 'chronomesh';
 * const problem = new HeatProblem({ domain: intervalDomain(0, 1, 2), T: 1, initial: () => 1 });
 * try { solve(problem, { tolerance: 1e-6, maxUnknowns: 300 }); }
 * catch (e) {
 *   if (e instanceof ToleranceNotReachedError) console.log(e.stopReason, e.estimate > e.tolerance, (e.result as SolveResult).set.size <= 300); // → unknowns true true
 * }
 * ```
 */
export class ToleranceNotReachedError<R = unknown> extends ChronomeshError {
  /** The estimator the run reached. */
  readonly estimate: number;
  /** The tolerance that was asked for. */
  readonly tolerance: number;
  /** What stopped the run (a budget, e.g. `'unknowns'`, `'time'`, `'memory'`). */
  readonly stopReason: string;
  /** The run's result as it stands (the last completed step). */
  readonly result: R;
  constructor(message: string, estimate: number, tolerance: number, stopReason: string, result: R) {
    super('tolerance-not-reached', message, { field: 'tolerance', expected: `estimator ≤ ${tolerance}`, received: estimate });
    this.estimate = estimate;
    this.tolerance = tolerance;
    this.stopReason = stopReason;
    this.result = result;
  }
}

/** What is wrong with a file refused by {@link CorruptFileError}. */
export type FileProblem = 'foreign' | 'truncated' | 'checksum' | 'version' | 'malformed' | 'mismatch';

/**
 * A file (or byte array) is not a readable chronomesh file: another format (`'foreign'`), cut
 * short (`'truncated'`), altered (`'checksum'`), written by another version of the format
 * (`'version'`), internally inconsistent (`'malformed'`), or it does not replay on this build
 * (`'mismatch'`). `problem` says which; `field` names the part of the file, `offset` the byte
 * position where it was detected (when there is one), `expected` / `received` what was expected
 * and what was found.
 *
 * @example
 * ```ts
 * import { CorruptFileError, decodeSolution } from 'chronomesh';
 * try { decodeSolution(new TextEncoder().encode('{"hello": 1}')); }
 * catch (e) { if (e instanceof CorruptFileError) console.log(e.problem, e.offset); } // → foreign 0
 * ```
 */
export class CorruptFileError extends ChronomeshError {
  /** Kind of defect. */
  readonly problem: FileProblem;
  /** Byte offset where the defect was detected, if any. */
  readonly offset: number | undefined;
  constructor(message: string, problem: FileProblem, details: ErrorDetails & { offset?: number } = {}) {
    super('corrupt-file', message, details);
    this.problem = problem;
    this.offset = details.offset;
  }
}

/** Formats a value for an error message without dumping large arrays. */
export function describeValue(v: unknown): string {
  if (typeof v === 'number') return Number.isNaN(v) ? 'NaN' : String(v);
  if (typeof v === 'string') return JSON.stringify(v.length > 40 ? v.slice(0, 40) + '…' : v);
  if (v === null || v === undefined) return String(v);
  if (ArrayBuffer.isView(v)) return `${v.constructor.name}(length ${(v as unknown as { length: number }).length})`;
  if (Array.isArray(v)) return `array(length ${v.length})`;
  return typeof v;
}
