/** Public exports of the adaptivity module (re-exported by src/index.ts). */
export {
  solveAdaptive,
  solveAdaptiveAsync,
  defaultBulk,
} from './adaptive-solver';
export type { AdaptiveOptions, AdaptiveProgress, AdaptiveResult, AdaptiveStep } from './adaptive-options';
export { adaptiveStepBytes } from './step-memory';
export { convergenceRate, toleranceForecast, type ToleranceForecast } from './forecast';
export { enlargeDoubleTree, type EnlargementOptions } from './enlargement';
export { estimateResidual, residualIndicators, type ResidualIndicators } from './estimator';
export { dorflerMark } from './dorfler';
export { refineDoubleTree } from './refine';
export { embeddingMap, prolongCoefficients } from './embedding';
export type { AdaptiveCheckpointInfo } from './checkpoint';
