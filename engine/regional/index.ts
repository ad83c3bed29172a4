/** Regional tables: quotient methods, the supply-demand pool, the two-region model, RAS and GRAS. */
export { BASIS_KINDS, checkBasis } from './basis';
export type { BasisKind, RegionalBasis } from './basis';
export { SLQ_ABOUT, slq } from './slq';
export { CILQ_ABOUT, cilq, crossQuotients } from './cilq';
export { FLQ_ABOUT, DEFAULT_DELTA, flq, flqLambda, regionShare, checkDelta } from './flq';
export { AFLQ_ABOUT, aflq } from './aflq';
export { SDP_ABOUT, sdp, regionalFinalDemand } from './sdp';
export type { SdpOptions } from './sdp';
export {
  REGIONAL_METHODS,
  METHOD_NAMES,
  METHOD_ABOUT,
  REGIONALISE_ABOUT,
  REGIONAL_CAUTIONS,
  REGIONAL_TABLE_NOTES,
  regionalOutput,
  regionalCoefficients,
  regionalise,
} from './regionalise';
export type { RegionalMethod, RegionaliseOptions, RegionalCoefficients, Regionalised, RegionalProvenance, CappedSector } from './regionalise';
export { TWO_REGION_ABOUT, TwoRegionModel } from './two-region';
export type { TwoRegionSplit } from './two-region';
export { RAS_ABOUT, ras } from './ras';
export { GRAS_ABOUT, gras } from './gras';
export { scale as balanceScaling, deviations as balanceDeviations } from './scaling';
export type { BalanceMethod, BalanceOptions, BalanceResult, Infeasible, InfeasibleKind } from './scaling';
