/** Public exports of the time module (re-exported by src/index.ts). */
export { MAX_TEMPORAL_LEVEL, type TemporalBasisKind } from './levels';
export { nodeSupport, nodeParents, nodeChildren } from './nodes';
export type { TemporalForm } from './single-scale';
export { TemporalTree, type TreeFromNodesOptions } from './tree';
export { TreeOperatorPlan, type LevelPart } from './plan';
export { evaluateTemporal, traceVector, derivativeNorms } from './evaluate';
