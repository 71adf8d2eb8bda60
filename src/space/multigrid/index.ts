/** Spatial multilevel preconditioner (docs/method.md §4.3). */
export { MultilevelPreconditioner, type MultilevelOptions } from './multilevel-preconditioner';
export { CYCLE_SLOTS } from './multilevel-preconditioner';
