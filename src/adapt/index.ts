/** Public exports of the adaptivity module (re-exported by src/index.ts). */
export {
  solveAdaptive,
  solveAdaptiveAsync,
  adaptiveStepBytes,
  defaultBulk,
  type AdaptiveOptions,
  type AdaptiveProgress,
  type AdaptiveResult,
  type AdaptiveStep,
} from './adaptive-solver';
export { enlargeDoubleTree, type EnlargementOptions } from './enlargement';
export { estimateResidual, residualIndicators, type ResidualIndicators } from './estimator';
export { dorflerMark } from './dorfler';
export { refineDoubleTree } from './refine';
export { embeddingMap, prolongCoefficients } from './embedding';
export type { AdaptiveCheckpointInfo } from './checkpoint';
