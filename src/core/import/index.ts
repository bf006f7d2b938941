// Front door of the delimited-file import logic (pure; the Node side feeds it bytes).
export { DelimitedReader, detectDelimiter, type Delimiter, type LineRecord } from './delimited';
export { planHeader, looksLikeHeader, type ColumnPlan, type ColumnRole, type HeaderPlan } from './headers';
export { FrameBuilder, parseValue, type BuildReport, type RejectedRow } from './frameBuilder';
