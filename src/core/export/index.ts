// Front door of the exports.
export { csvField, csvLine } from './csv';
export { flaggedCsv, FLAGGED_CSV_CAUTION } from './flaggedCsv';
export { safeFileName } from './fileName';
