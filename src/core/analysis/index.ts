// Front door of the analysis engine.
export * from './types';
export { analyzeLot, concatFrames, methodDescription, type AnalyzeOptions } from './analyzeLot';
export { groupStats, indicesBySite } from './groupStats';
export { paramSummary } from './paramSummary';
export { tradeoffCorrelations } from './correlation';
export { siteBias } from './siteBias';
export { robustZReasons } from './robustZ';
export { reasonText } from './reasonText';
export { magnitudes, log10Magnitudes, analysisScale } from './scales';
export { jsonReport, type JsonReport } from './report';
