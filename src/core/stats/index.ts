// Statistics primitives: the front door. Import from 'src/core/stats', not from the files.
//
// Missing-data rule for the whole family: a value counts only when Number.isFinite(v) is true;
// NaN, +Infinity, -Infinity, null and undefined are skipped wherever they appear. Paired
// functions (pearson, spearman, linearFit, polynomialFit, leastSquares) use only the rows where
// every variable counts. Inputs are ArrayLike (Float64Array columns mostly) and never modified.
//
// Too little data: functions returning one number (or one result object) return `undefined`
// when fewer valid values remain than the method needs; each function's JSDoc states its
// minimum. Exceptions, documented where they occur: constant data gives NaN correlations,
// summarize() reports sigma = NaN for n = 1, and all-tied samples give rank tests z = 0 / h = 0
// with p = 1. Distribution functions (normal*, chiSquareSurvival, gamma functions) take plain
// numbers and return NaN for NaN.
//
// Bad arguments that are programming errors (a probability outside [0, 1], paired inputs of
// different lengths, a non-positive degrees of freedom) throw a RangeError with a sentence.

export { completePairs, countFinite, finiteValues, isFiniteNumber, type NumericInput } from './finite';
export { compensatedSum, mean } from './mean';
export { standardDeviation, variance } from './variance';
export { selectInPlace, selectManyInPlace } from './select';
export { quantile, quantiles, quantileSorted, selectQuantilesInPlace } from './quantile';
export { median } from './median';
export { IQR_PER_SIGMA, MAD_TO_SIGMA, iqrSigma, madSigma, medianAbsoluteDeviation } from './robustSigma';
export { midranksOfFinite, rank, rankWithTies, type Ranking } from './ranks';
export { ascendingOrder } from './sortOrder';
export { ascendingOrderByHighWord } from './ascendingOrderByHighWord';
export { pearson } from './pearson';
export { spearman } from './spearman';
export { normalCdf, normalQuantile, normalSurvival } from './normal';
export { chiSquareSurvival, logGamma, regularizedGammaP, regularizedGammaQ } from './gamma';
export { mannWhitney, type MannWhitneyResult } from './mannWhitney';
export { kruskalWallis, type KruskalWallisResult } from './kruskalWallis';
export {
  leastSquares,
  linearFit,
  polynomialFit,
  type LeastSquaresFit,
  type LeastSquaresOptions,
  type LinearFit,
} from './leastSquares';
export { summarize, type SummaryStatistics } from './summarize';
export { repeatedMedianLine, type RobustLine } from './repeatedMedianLine';
export { theilSenLine } from './theilSen';
