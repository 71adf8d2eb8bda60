/**
 * `chronomesh/problem-file`: problem files (JSON) and their expressions, for the command line and
 * for scripts. A separate entry point, so that importing the core library does not load the
 * expression parser.
 * @packageDocumentation
 */
export { compileExpression, type CompiledExpression, type ExpressionVariable } from './expression';
export { compileWithDerivatives } from './derivative';
export { nearestName } from './nearest-name';
export { parseProblem, PROBLEM_FIELDS, PROBLEM_DEFAULTS, type ProblemSpec, type DomainSpec, type ParseProblemOptions } from './schema';
export { parseState, stateToJson, STATE_FORMAT } from './state-file';
export { buildProblem, type BuiltProblem } from './build';
export { runProblem, observedRate, type RunResult, type RunStep, type ProbeValue, type RunAdaptiveOptions, type ExactErrors } from './run';
