// Front door of the analysis engine.
export * from './types';
export {
  analyzeLot, analyzeLotFromGroups, analyzeParamGroup, analysisOrder, concatFrames, methodDescription, planParamGroups,
  type AnalysisHistory, type AnalyzeOptions, type ParamGroupResult,
} from './analyzeLot';
export { Buffers as AnalysisScratch } from './buffers';
export { groupStats, indicesBySite } from './groupStats';
export { paramSummary } from './paramSummary';
export { tradeoffCorrelations } from './correlation';
export { siteBias, siteBiasOfStream } from './siteBias';
export { PAT_IQR_DIVISOR } from './robustScale';
export { dynamicPatLimits, staticPatLimits, specOnScale } from './pat';
export { neighbourhood, nnrResiduals } from './neighbours';
export { classifyDie, diblMvPerV, impliedSwing } from './mechanism';
export { hardwareSuspects } from './hardwareSuspects';
export { excursionScores } from './excursion';
export { reasonText } from './reasonText';
export { magnitudes, log10Magnitudes, analysisScale } from './scales';
export { jsonReport, type JsonReport } from './report';
