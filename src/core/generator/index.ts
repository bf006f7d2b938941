// Front door of the demo-lot generator: seeded, pure, deterministic.

export { Random, SplitMix64, Xoshiro128StarStar, createRandom, deriveSeed } from './random';
export {
  LAYOUT_DEFAULTS, grossDiesApproximation, layoutWafer, positiveModulo, probeSite,
  type DieLayout, type LayoutOptions,
} from './layout';
export { DEFAULT_PROCESS, resolveProcess, type DeviceModel, type ProcessModel, type ProcessOverrides } from './process-model';
export { selectDies, type ExcursionShape, type ShapeKind } from './shapes';
export {
  generateLot, generateWaferOf, iterateWafers, prepareLot,
  type DeviceChoice, type ExcursionOptions, type ExcursionRecord, type GeneratedLot, type GeneratedWafer,
  type LotOptions, type LotTruth, type Mechanism, type PlantedDie, type PreparedLot, type SiteBiasOptions,
  type SiteBiasRecord, type WaferEffects,
} from './lot';
export { DEMO_CSV_COLUMNS, csvHeader, formatValue, lotCsvChunks, lotToCsv, type CsvColumn, type CsvOptions, type CsvSource } from './csv';
export { DEMO_LOT_OPTIONS, DEMO_SEED } from './demo-scenario';
