/** Public exports of the output module (re-exported by src/index.ts). */
export { SpaceTimeSolution, type TimeSlice } from './space-time-solution';
export { spaceTimeErrors, type KnownSolution, type SpaceTimeErrors } from './error-norms';
