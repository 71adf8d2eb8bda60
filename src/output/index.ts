/** Public exports of the output module (re-exported by src/index.ts). */
export { spaceTimeErrors, type KnownSolution, type SpaceTimeErrors, type SpaceTimeErrorOptions } from './error-norms';
export type { ColorMapName } from './colormap';
export { sliceToVtu, vtkCollection } from './vtk';
export { spatialIntegral, regionIntegral, probeTableCsv } from './probes';
export { convergencePlotSvg, type PlotSeries, type PlotOptions } from './svg-plot';
export { sliceToSvg, type SliceSvgOptions } from './svg-slice';
export { indexSetToSvg, type IndexSetSvgOptions } from './svg-index-set';
export {
  encodeSolution,
  decodeSolution,
  SOLUTION_FORMAT,
  SOLUTION_FORMAT_VERSION,
  type EncodeSolutionOptions,
  type DecodeSolutionOptions,
  type DecodedSolution,
} from './solution-file';
