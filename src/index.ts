/**
 * chronomesh — adaptive space-time solver for parabolic problems.
 *
 * This is the one public entry point; everything not re-exported here is internal.
 * @packageDocumentation
 */
export {
  ChronomeshError,
  ConvergenceError,
  CorruptFileError,
  type FileProblem,
  InvalidArgumentError,
  InvalidIndexSetError,
  InvalidMeshError,
  RunInterruptedError,
  SolverBreakdownError,
  NotConvergedError,
  ResourceLimitError,
  ToleranceNotReachedError,
  type ErrorDetails,
} from './errors';

export * from './time/index';
export * from './space/index';
export * from './spacetime/index';
export * from './system/index';
export * from './output/index';
export * from './adapt/index';
export { solve, type SolveResult } from './solve';
export { memoryBudget, setMemoryBudget } from './validation/budget';
export * from './estimation/index';
