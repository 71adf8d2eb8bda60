/** Public exports of the space module (re-exported by src/index.ts). */
export type { Coefficient, DiffusionTensor, DomainOptions, TensorCoefficient } from './domain-options';
export type { BoundaryData, BoundarySelector, BoundaryPart, ValuePart, FluxPart, ConvectionPart } from './boundary';
export { SpatialDomain } from './domain';
export { intervalDomain, triangulatedDomain, rectangleDomain, lShapeDomain, squareWithHoleDomain } from './generators';
export { SpatialOperatorPlan } from './operator-plan';
export { loadVector } from './load';
export { evaluateAt, nodalValues } from './evaluate';
export { NodalField, type NodalFieldData } from './nodal-field';
export type { LeafMesh } from './leaf-mesh';
export type { HeldDataError } from './held-data-error';
export { MultilevelPreconditioner, type MultilevelOptions } from './multigrid/index';
