// Result shapes of the analysis: plain data, safe to clone, to send over any transport and to print
// as the `analyze --json` contract.

/** Location and spread of one set of values. */
export interface Summary {
  n: number;
  median: number;
  mean: number;
  /** Sample standard deviation (n - 1). NaN when n < 2. */
  sigma: number;
  /** (Q3 - Q1) / 1.349, quartiles by Hyndman-Fan type 7. */
  robustSigma: number;
  q1: number;
  q3: number;
  min: number;
  max: number;
}

/** Statistics of one parameter. For currents the values are magnitudes in amperes, and `log10`
 * holds the same statistics on log10(|I|). */
export interface ParamSummary extends Summary {
  unit: string;
  log10?: Summary;
}

export interface Correlation {
  device: 'n' | 'p';
  ion: string;
  ioff: string;
  n: number;
  /** Pearson r of |Ion| against log10|Ioff|. */
  pearson: number;
  /** Spearman rho of |Ion| against |Ioff| (rank-based, so the log makes no difference). */
  spearman: number;
  /** Least-squares line |Ion| = intercept + slope * log10|Ioff|, Ion in amperes. */
  slope: number;
  intercept: number;
}

export interface SiteBias {
  param: string;
  site: number;
  /** (m_site - m_others) / m_others on magnitudes. */
  shift: number;
  /** Two-sided Mann-Whitney p-value of this site's dies against the other sites' dies. */
  p: number;
  nSite: number;
  nOthers: number;
  medianSite: number;
  medianOthers: number;
}

export interface GroupStats {
  dies: number;
  params: Record<string, ParamSummary>;
  /** Per probe site (key: site number as text). */
  sites: Record<string, Record<string, ParamSummary>>;
  correlation: Correlation[];
  correlationBySite: Record<string, Correlation[]>;
}

export interface WaferAnalysis extends GroupStats {
  lot: string;
  wafer: string;
  siteBias: SiteBias[];
  flaggedCount: number;
}

export interface LotStats extends GroupStats {
  lot: string;
  wafers: number;
}

export interface Reason {
  method: 'robust-z';
  param: string;
  /** The die's value in SI base units, raw sign. */
  value: number;
  /** Robust z of the die (on log10 magnitude for currents). */
  score: number;
  /** The |z| threshold that was exceeded. */
  limit: number;
  direction: 'high' | 'low';
  scale: 'log10' | 'linear';
}

export interface FlaggedDie {
  lot: string;
  wafer: string;
  x: number;
  y: number;
  site: number;
  /** Index of the die in its wafer frame, for linking views. */
  index: number;
  reasons: Reason[];
  /** Every parameter's value at this die, SI base units with the raw sign (null when missing). */
  values: Record<string, number | null>;
}

export interface AnalysisSettings {
  /** |robust z| above which a die is flagged. */
  zLimit: number;
  /** Site bias is reported only when p is below this ... */
  siteBiasMaxP: number;
  /** ... and |shift| is at least this fraction. */
  siteBiasMinShift: number;
}

export const DEFAULT_ANALYSIS_SETTINGS: AnalysisSettings = {
  zLimit: 6,
  siteBiasMaxP: 1e-3,
  siteBiasMinShift: 0.05,
};

export interface LotAnalysis {
  settings: AnalysisSettings;
  /** One line saying how dies were flagged, shown beside the list. */
  method: string;
  wafers: WaferAnalysis[];
  lots: LotStats[];
  flagged: FlaggedDie[];
}
