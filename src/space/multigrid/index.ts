/** Spatial multilevel preconditioner (docs/method.md §4.3). */
export { MultilevelPreconditioner, type MultilevelOptions } from './multilevel-preconditioner';
export { CycleScratch, FIRST_CALLER_SLOT } from './cycle-scratch';
