/** The public face of the engine: pure numerics, no I/O. */
export * from './errors';
export * from './findings';
export * from './linalg/matrix';
export { LU } from './linalg/lu';
export type { LUOptions } from './linalg/lu';
export { conditionEstimate, inverseNorm1Estimate } from './linalg/condition';
export { relativeResidual, leontiefResidual } from './linalg/residual';
export { perronRoot } from './linalg/perron';
export type { PerronRoot, PerronOptions } from './linalg/perron';
export { stronglyConnected } from './linalg/graph';
export * from './table';
export { checks } from './checks';
export type { CheckOptions } from './checks';
export { LeontiefModel } from './leontief';
export type { Solution } from './leontief';
export { supplyUse, REQUIREMENTS_KINDS } from './supply-use';
export type { SupplyUseInput, SupplyUseModel, RequirementsKind, Technology } from './supply-use';
