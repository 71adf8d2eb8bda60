/** Spatial multilevel preconditioner (DESIGN.md §4.3). */
export { MultilevelPreconditioner, type MultilevelOptions } from './multilevel-preconditioner';
