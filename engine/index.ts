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
// Analyses: measures, household closure, multipliers, scenarios, impacts, comparison,
// linkages, Ghosh, price, extraction, mixed model, footprints.
export {
  CAUTIONS,
  MEASURE_ABOUT,
  measureInfo,
  outputMeasure,
  valueAddedMeasure,
  labourIncomeMeasure,
  satelliteMeasure,
  jobsMeasure,
  guessJobs,
  measures,
  findMeasure,
  checkMeasure,
  valueAddedIndex,
  finalDemandIndex,
  satelliteIndex,
  multiplierUnit,
} from './measures';
export type { Measure, MeasureInfo, MeasureKind, MeasureOptions } from './measures';
export {
  HOUSEHOLD_ABOUT,
  householdClosure,
  ClosedModel,
  guessHousehold,
  guessHouseholdColumn,
  guessLabourIncomeRow,
  buildModels,
  CLOSURE_BASES,
  CLOSURE_BASIS_ABOUT,
  closureBasis,
  PLAUSIBLE_SHARE,
  inducedPlausibility,
} from './household';
export type { HouseholdOptions, HouseholdClosure, Models, ClosureBasis } from './household';
export { MULTIPLIERS_ABOUT, REQUIREMENTS_MULTIPLIERS_ABOUT, multipliers, multipliersOf, requirementsMultipliers } from './multipliers';
export type { Multipliers, RequirementsMultipliers } from './multipliers';
export { SCENARIO_ABOUT, checkScenario, resolveScenario } from './scenario';
export type { Scenario, DemandChange, ResolvedScenario, ResolvedChange } from './scenario';
export { IMPACT_ABOUT, impact, impacts } from './impact';
export type { Impact, MeasureImpact } from './impact';
export { COMPARE_ABOUT, compare, compareScenarios } from './compare';
export type { Comparison, MeasureComparison, PartTotals } from './compare';
export { LINKAGES_ABOUT, KEY_SECTOR_GROUPS, linkages } from './linkages';
export type { Linkages, KeySectorGroup } from './linkages';
export { GHOSH_ABOUT, GHOSH_CAUTION, GhoshModel, allocationCoefficients, primaryInputs, ghoshImpact } from './ghosh';
export type { GhoshImpact, PrimaryInputChange } from './ghosh';
export { PRICE_ABOUT, priceModel } from './price';
export type { PriceShock, PriceResult, ValueAddedChange, ImportPriceChange } from './price';
export { EXTRACTION_ABOUT, EXTRACTION_RANKING_ABOUT, extraction, extractEach } from './extraction';
export type { Extraction, ExtractionPart, ExtractionKind, ExtractionRanking } from './extraction';
export { MIXED_ABOUT, mixedModel } from './mixed';
export type { FixedOutput, MixedResult } from './mixed';
export { FOOTPRINT_ABOUT, FOOTPRINT_CAUTION, footprint, footprints } from './footprint';
export type { Footprint } from './footprint';
export { Random, drawStream } from './random';
export {
  SENSITIVITY_ABOUT,
  SENSITIVITY_CAUTIONS,
  checkCell,
  checkIndex,
  exactChange,
  influentialCoefficients,
  inverseEntries,
  leontiefDerivative,
  limitFor,
  resolveTarget,
  sensitivity,
  tolerableLimits,
} from './sensitivity';
export type { Cell, Influence, LimitChange, Ranking, ResolvedTarget, ResultTarget, Sensitivity, TolerableLimit } from './sensitivity';
export { WHATIF_ABOUT, WhatIf } from './whatif';
export type { WhatIfOptions } from './whatif';
export { tornado } from './tornado';
export type { TornadoBar, TornadoData, TornadoEnd } from './tornado';
export { distributionBins } from './bins';
export type { Bin } from './bins';
export {
  UNCERTAINTY_ABOUT,
  UNCERTAINTY_CAUTIONS,
  drawCoefficients,
  mergeDrawBlocks,
  monteCarlo,
  percentileSorted,
  prepareMonteCarlo,
  quantityIndex,
  runDraws,
  sampleColumn,
} from './uncertainty';
export type {
  CancelSignal,
  CoefficientCv,
  DrawBlock,
  MonteCarloMeasure,
  MonteCarloResult,
  MonteCarloScenario,
  MonteCarloSpec,
  PreparedMonteCarlo,
  ProductivityRule,
  QuantityRef,
  RejectReason,
  RejectedDraw,
  RunOptions,
  Summary,
} from './uncertainty';
// Large tables and fast kernels.
export { gemmSub, KC as GEMM_KC } from './linalg/gemm';
export { setKernel, kernelFor, kernelInfo, wasmKernel, wasmSimdAvailable, jsKernel, WASM_MIN_N } from './linalg/kernel';
export type { DenseKernel, Workspace, KernelChoice, KernelInfo } from './linalg/kernel';
export { toCSR, csrToDense, fromTriplets, csrMatVec, csrVecMat, csrTranspose, csrColSums, csrRowSums, nnz, density, SPARSE_BELOW } from './linalg/sparse';
export type { CSR } from './linalg/sparse';
export { powerSeries, gmres, denseOperator, csrOperator, scaledFlowsOperator, transposed, leontiefResidualOf, ConvergenceError } from './linalg/iterative';
export type { LinearOperator, IterativeOptions, IterativeResult, IterativeMethod } from './linalg/iterative';
export { LargeLeontief, largeOutputMultipliers, largeImpact, LARGE_ABOUT } from './large';
export type { LargeOptions, LargeSolution, LargeMethod } from './large';
export { syntheticTable, syntheticCoefficients } from './synthetic';
export type { SyntheticOptions } from './synthetic';
export { aggregate, AGGREGATE_ABOUT } from './aggregate';
export type { Concordance } from './aggregate';
// Regional tables: quotient methods, the supply-demand pool, two regions, RAS and GRAS.
export * from './regional/index';
