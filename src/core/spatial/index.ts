// Wafer spatial analysis: the front door. Geometry (die grid -> wafer), zone and shot statistics,
// clusters of flagged dies, and one signature label per wafer. Pure; import from 'src/core/spatial'.

export {
  grossDieCheck, grossDiesPerWafer, placeDies, positionBuffers, positionDies, resolveGeometry, usableRadiusMm,
  type DiePlacement, type DiePositions, type PositionBuffers, type GrossDieCheck, type NotchSide, type ResolvedGeometry, type WaferGeometry,
} from './geometry';
export { buildDieGrid, dieAt, NEIGHBOUR_OFFSETS, type DieGrid } from './dieGrid';
export { findClusters, isLine, measureCluster, type Cluster, type ClusterOptions, type ClusterResult } from './clusters';
export { countFlagged, gridJoins, joinCount, type GridJoins, type JoinCount } from './joinCount';
export { findRepeatingPattern, residueClasses, type RepeatingPattern } from './repeatingPattern';
export { labelWafer, SIGNATURE_LABELS, type LabelInput, type SignatureEvidence, type SignatureLabel, type SignatureResult } from './signature';
export { synthesiseWafer, type SynthOptions, type SynthesisedWafer } from './synth';
export {
  deviationFlags, spatialProfile, zoneSummaries,
  type RingSummary, type SectorSummary, type ShotPositionSummary, type SpatialProfile, type ZoneSummary,
} from './zones';
export { geometryFromWcr } from './fromStdf';
