// Front door of the delimited-file import logic (pure; the Node side feeds it bytes).
export { DelimitedReader, detectDelimiter, type Delimiter, type LineRecord } from './delimited';
export { planHeader, looksLikeHeader, measurementOf, roleOf, type ColumnPlan, type ColumnRole, type HeaderPlan, type Layout } from './headers';
export { FrameBuilder, type BuildOptions, type BuildReport, type RejectedRow } from './frameBuilder';
export { parseValue, parseInteger } from './numbers';
export { mappingFits, mappingProblems, planWithMapping, type ColumnMapping, type ColumnOverride, type GridBounds, type TestOverride } from './mapping';
export { previewRecords, type ColumnPreview, type ImportPreview, type TestPreview } from './preview';
export { WaferAccumulator, COORD_LIMIT } from './waferAccumulator';
export { mergeParts, overlappingDies, type WaferPart } from './mergeFrames';
