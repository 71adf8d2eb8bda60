/** Public exports of the estimation module (re-exported by src/index.ts): adjoint gradients, estimation, backward problems. */
export {
  LeastSquaresFunctional, probeMisfit, terminalTracking, regionTracking, combineFunctionals,
  type ProbeData, type RegionTrackingOptions,
} from './functionals';
export { sourceAmplitudes, controlAmplitude, initialState, type ParameterMap, type ControlAmplitudeOptions } from './parameters';
export { InitialStateMap } from './initial-state-map';
export { ReducedFunctional, type ReducedFunctionalOptions, type AccuracyOption, type GradientResult } from './reduced-functional';
export { estimateParameters, parameterCovariance, type EstimateOptions, type EstimateResult, type CovarianceResult } from './tikhonov';
export { solveBackward, BackwardSolution, type BackwardProblemSpec } from './backward';
