/** Public exports of the space-time module (re-exported by src/index.ts). */
export { DoubleTree } from './double-tree';
export { FibrePool } from './fibre-pool';
export { testIndexSet } from './test-index-set';
export { TensorOperatorPlan } from './tensor-apply';
export { SpatialPlanCache } from './spatial-plan-cache';
export { SpaceTimeSolution, type TimeSlice } from './space-time-solution';
export type { GridView } from './grid-view';
