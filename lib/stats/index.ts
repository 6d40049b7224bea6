/**
 * Recurra's statistics: pure functions, no I/O. Each file holds one function with its
 * definition, method and published source; the checks against published values are in
 * tests/unit/stats.
 */
export { wilsonInterval, type ProportionInterval } from "./wilson-interval";
export { clopperPearsonInterval } from "./clopper-pearson-interval";
export { poissonInterval, type RateInterval } from "./poisson-interval";
export { rateRatio, type RateRatioResult } from "./rate-ratio";
export { benjaminiHochberg, type BenjaminiHochbergResult } from "./benjamini-hochberg";
export {
  gammaPoissonShrinkage,
  type GammaPoissonShrinkageResult,
  type ShrinkageCell,
  type ShrunkRate,
} from "./gamma-poisson-shrinkage";
export {
  meanCumulativeFunction,
  type McfPoint,
  type RecurrenceHistory,
  type ValuedEvent,
} from "./mean-cumulative-function";
export {
  refuelWindowTest,
  type OdometerEvent,
  type RefuelWindowResult,
} from "./refuel-window-test";
export { gammaSumInterval, type GammaTerm, type SumInterval } from "./gamma-sum-interval";
export { poissonStockLevel } from "./poisson-stock-level";
export { expectedShortfall } from "./expected-shortfall";
export { mileageBand, type MileageBand } from "./mileage-band";
export { allocateExposure } from "./allocate-exposure";
export { clipReadingsToPeriod } from "./clip-readings-to-period";
export { cleanOdometerReadings, type CleanedReadings } from "./clean-odometer-readings";
export type { OdometerReading } from "./internal/readings";
