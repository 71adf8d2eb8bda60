/** Public exports of the system module (re-exported by src/index.ts). */
export type { LinearOperator } from '../numerics/linear-operator';
export { HeatProblem, type CurveSource, type HeatProblemSpec, type SeparableTerm } from './heat-problem';
export { SpaceTimeSystem, type SpaceTimeSystemOptions, type SpatialCaches, type SystemSolveOptions } from './space-time-system';
export { FibreInverseCache, type InnerSolver, type FibreInverse } from './fibre-inverse';
export { SchurOperator } from './schur-operator';
export { TestInnerProductInverse } from './test-inner-product-inverse';
export { TrialPreconditioner } from './trial-preconditioner';
export { InitialTraceOperator } from './initial-trace';
export { pcg, type PcgOptions, type PcgProgress, type PcgResult } from './pcg';
export { measureOperatorCost, type OperatorCost, type OperatorCostOptions } from './operator-cost';
export { problemFingerprint } from './problem-fingerprint';
