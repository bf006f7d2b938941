// Result shapes of the analysis: plain data, safe to clone, to send over any transport and to print
// as the `analyze --json` contract.

import type { SignatureEvidence, SignatureLabel } from '../spatial';

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
  /** Effect size: rank-biserial correlation P(site > others) - P(site < others), in [-1, 1]. */
  rankBiserial: number;
  /** Kruskal-Wallis p-value across all sites of the group for this parameter (before any round). */
  kruskalWallisP: number;
}

/** A probe site reported off in the same direction on most wafers of a lot. */
export interface HardwareSuspect {
  param: string;
  site: number;
  /** +1 reads high, -1 reads low. */
  sign: 1 | -1;
  /** Wafers where the site was reported in that direction, of the wafers analysed. */
  wafers: number;
  of: number;
  /** Median of the reported relative shifts. */
  medianShift: number;
  text: string;
}

export interface GroupStats {
  dies: number;
  params: Record<string, ParamSummary>;
  /** Per probe site (key: site number as text). */
  sites: Record<string, Record<string, ParamSummary>>;
  correlation: Correlation[];
  correlationBySite: Record<string, Correlation[]>;
}

/** A wafer's distance from the rest of its lot and from earlier lots, used to order wafers. */
export interface ExcursionScore {
  /** Largest |median shift| over parameters, in robust sigmas ((Q3 - Q1)/1.35) of the reference. */
  score: number;
  /** Parameter giving the largest shift, and that shift with its sign. */
  param: string;
  shift: number;
  /** Per parameter: (wafer median - reference median) / reference robust sigma, analysis scale. */
  shifts: Record<string, number>;
  /** Flagged dies / dies on this wafer. */
  flaggedFraction: number;
  /** The same against the earlier lots in the store, when there are any. */
  vsHistory?: { score: number; param: string; shift: number; lots: number };
}

/** The Ion-Ioff trade-off band of one device type on a group of dies. */
export interface TradeoffBand {
  device: 'n' | 'p';
  ion: string;
  ioff: string;
  n: number;
  /** Robust centre of the band, from the unflagged dies: medians of ln|Ion| (Ion in A) and
   * log10|Ioff|; `n` counts the unflagged dies sampled (at most 2,001, evenly spread). */
  centreLnIon: number;
  centreLog10Ioff: number;
  /** Band slope in decades of Ioff per unit of ln|Ion| (exp(1/slope) - 1 is the Ion gain per decade). */
  slope: number;
  /** How the slope was found: ratio of repeated-median slopes on |Vt_sat| ("vt"), or settings. */
  slopeSource: 'vt' | 'settings';
  /** Repeated-median line of log10|Ioff| on ln|Ion| of the population itself, for comparison:
   * flatter than the band when Ion carries noise of its own (errors in variables). */
  populationFit?: { slope: number; intercept: number };
  /** Robust sigmas ((Q3 - Q1)/1.35) of ln|Ion|, log10|Ioff| and |Vt_sat| (V) of those dies. */
  sigmaLnIon: number;
  sigmaLog10Ioff: number;
  /** Robust sigma of the sample's log10|Ioff| above or below the centre line: the band's width. */
  residualSigmaDecades?: number;
  sigmaVt?: number;
  centreVt?: number;
  /** d ln|Ion| / d|Vt| and d log10|Ioff| / d|Vt| (repeated-median slopes), when Vt_sat is known. */
  ionPerVt?: number;
  ioffPerVt?: number;
  /** Medians of DIBL (mV/V) and of the swing implied by Vt_sat and Ioff (mV/decade). */
  diblMedian?: number;
  swingMedian?: number;
  /** Median and robust sigma of log10|Ig| (A) of those dies, when the device's Ig is measured. */
  centreLog10Ig?: number;
  sigmaLog10Ig?: number;
  /** The same for log10|Isb| (A), the die's standby supply current, when measured. */
  centreLog10Isb?: number;
  sigmaLog10Isb?: number;
}

export type MechanismKind = 'threshold-shift' | 'extra-leakage' | 'weak-drive' | 'unclassified';

/** Mechanism triage of one flagged die. */
export interface MechanismCall {
  kind: MechanismKind;
  /** 0..1: relative likelihood of this mechanism against the other two (0 when unclassified). */
  confidence: number;
  /** Device type whose evidence decided; absent when neither had any. */
  device?: 'n' | 'p';
  /** One sentence: why this call (for unclassified: why not). */
  why: string;
  /** log10|Ioff| above the band (decades) and the die's place along it (decades of Ioff the
   * band predicts from its Ion), both from the wafer's band centre. */
  residualDecades?: number;
  bandPositionDecades?: number;
  /** log10|Ioff| - wafer median, in decades; |Ion| / wafer median - 1. */
  ioffDecades?: number;
  ionChange?: number;
  /** |Vt_sat| - wafer median in mV; the die's DIBL (mV/V) and implied swing (mV/decade). */
  vtShiftMv?: number;
  diblMvPerV?: number;
  swingMvPerDecade?: number;
  /** log10|Ig| - wafer median, in decades and in robust sigmas, when Ig is measured. */
  igDecades?: number;
  igSigmas?: number;
  /** log10|Isb| - wafer median, in decades and in robust sigmas, when Isb is measured. */
  isbDecades?: number;
  isbSigmas?: number;
  /** extra-leakage with Ig measured: "gate" when Ig rose with Ioff (at least 3 robust sigmas),
   * else "other" (junction, GIDL or a defect in the drain). */
  leakagePath?: 'gate' | 'other';
  /** Misfit of the chosen direction in population robust sigmas. */
  misfit?: number;
  /** Chuck temperature the lot was measured at, when known. */
  temperatureC?: number;
}

export interface WaferAnalysis extends GroupStats {
  lot: string;
  wafer: string;
  siteBias: SiteBias[];
  flaggedCount: number;
  excursion: ExcursionScore;
  tradeoff: TradeoffBand[];
  /** Spatial signature of the flagged dies (Wu, Jang & Chen 2015 vocabulary). */
  pattern?: WaferPattern;
}

export interface ClusterSummary {
  id: number;
  size: number;
  centroidXMm: number;
  centroidYMm: number;
  centroidRadiusFraction: number;
  radiusMm: number;
  elongation: number;
  lengthMm: number;
  widthMm: number;
  majorAxisDeg: number;
  /** True when the cluster reads as a straight line (scratch-like). */
  line: boolean;
}

export interface WaferPattern {
  label: SignatureLabel;
  confidence: number;
  /** The rule that decided, in words. */
  rule: string;
  evidence: SignatureEvidence;
  clusters: ClusterSummary[];
}

export interface LotStats extends GroupStats {
  lot: string;
  wafers: number;
  /** Site against site over the whole lot, same rule as per wafer. */
  siteBias: SiteBias[];
  /** Sites off in the same direction on most wafers: "test hardware suspect". */
  hardwareSuspects: HardwareSuspect[];
  /** Wafer names, most excursive first. */
  waferOrder: string[];
  tradeoff: TradeoffBand[];
  /** Dynamic PAT limits of the whole lot per parameter (analysis scale). */
  patLimits: Record<string, PatLimits>;
}

/** PAT limits of one parameter on its analysis scale (log10|I| for currents). */
export interface PatLimits {
  scale: 'log10' | 'linear';
  /** Robust mean = median, robust sigma = (Q3 - Q1)/1.35 (AEC-Q001 Rev-D). */
  centre: number;
  robustSigma: number;
  low: number;
  high: number;
  /** True when a specification limit was tighter and replaced the PAT limit. */
  clippedLow: boolean;
  clippedHigh: boolean;
  /** Parts the limits were computed from (passing parts only when spec limits are given). */
  n: number;
}

/** Static PAT reference of one parameter from earlier lots (analysis scale). */
export interface StaticReference {
  centre: number;
  robustSigma: number;
  lots: number;
  n: number;
}

interface ReasonBase {
  param: string;
  /** The die's value in SI base units, raw sign. */
  value: number;
  /** Distance in robust sigmas ((Q3 - Q1)/1.35) of the method's own population, signed. */
  score: number;
  /** The |score| limit that was exceeded. */
  limit: number;
  direction: 'high' | 'low';
  scale: 'log10' | 'linear';
}

/** Part average testing (AEC-Q001): dynamic per wafer or lot, or static from earlier lots. */
export interface PatReason extends ReasonBase {
  method: 'pat-wafer' | 'pat-lot' | 'pat-static';
  /** The limits on the analysis scale. */
  low: number;
  high: number;
  /** A specification limit replaced the PAT limit on the side exceeded. */
  clipped: boolean;
}

/** Nearest-neighbour residual (Daasch et al., ITC 2001): value - median of the neighbours. */
export interface NnrReason extends ReasonBase {
  method: 'nnr';
  /** The residual on the analysis scale. */
  residual: number;
  neighbours: number;
}

/** Good die in a bad neighbourhood: a passing die most of whose neighbours are flagged. */
export interface GdbnReason extends ReasonBase {
  method: 'gdbn';
  badNeighbours: number;
  neighbours: number;
}

export type Reason = PatReason | NnrReason | GdbnReason;
export type ReasonMethod = Reason['method'];

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
  mechanism: MechanismCall;
  /** The 8-neighbour cluster of flagged dies this die belongs to, when it is in one. */
  cluster?: { id: number; size: number; line: boolean };
}

export interface SpecLimit {
  /** On magnitudes for currents (A), on the value otherwise. */
  low?: number;
  high?: number;
}

export interface MechanismSettings {
  /** Supply (V) and the drain biases of Vt_lin and Vt_sat (V) for DIBL. */
  vdd: number;
  vdLin: number;
  vdSat: number;
  /** Alpha-power index and swing (V/decade) for the band slope when Vt_sat is not measured. */
  alpha: number;
  swing: number;
  /** Constant-current threshold convention: Icc per square (A) per device, and W/L. */
  iccN: number;
  iccP: number;
  wOverL: number;
  /** A call needs the die at least this far from the population (robust sigmas) ... */
  minDisplacement: number;
  /** ... and its direction within this misfit (robust sigmas) ... */
  maxMisfit: number;
  /** ... and this much relative likelihood over the runner-up. */
  minConfidence: number;
}

export interface AnalysisSettings {
  /** PAT limit in robust sigmas (AEC-Q001: 6). */
  patLimit: number;
  methods: { patWafer: boolean; patLot: boolean; patStatic: boolean; nnr: boolean; gdbn: boolean };
  /** Specification limits per parameter; PAT limits never go past them. */
  specLimits: Record<string, SpecLimit>;
  /** NNR neighbourhood: dies within this many grid steps (1 = the 8 around, 2 = 24). */
  nnrRadius: number;
  nnrLimit: number;
  /** Which parameters NNR runs on: leakage currents (every current but Ion, the IDDQ-type data
   * Daasch et al. designed it for), every current, or every parameter. */
  nnrParams: 'leakage' | 'currents' | 'all';
  /** GDBN: a passing die with at least this fraction of its (at least minNeighbours) neighbours flagged. */
  gdbnFraction: number;
  gdbnMinNeighbours: number;
  /** Site bias is reported only when p is below this ... */
  siteBiasMaxP: number;
  /** ... and |shift| is at least this fraction. */
  siteBiasMinShift: number;
  /** A site reported in one direction on at least this fraction of a lot's wafers is named. */
  hardwareSuspectFraction: number;
  /** AEC-Q001 asks static limits from at least this many lots. */
  staticMinLots: number;
  mechanism: MechanismSettings;
  /** Chuck temperature of the data in degrees C, when known. */
  temperatureC: number | null;
}

export const DEFAULT_MECHANISM_SETTINGS: MechanismSettings = {
  vdd: 0.8,
  vdLin: 0.05,
  vdSat: 0.8,
  alpha: 1.3,
  swing: 0.085,
  iccN: 100e-9,
  iccP: 25e-9,
  wOverL: 20,
  minDisplacement: 4,
  maxMisfit: 5,
  minConfidence: 0.8,
};

export const DEFAULT_ANALYSIS_SETTINGS: AnalysisSettings = {
  patLimit: 6,
  methods: { patWafer: true, patLot: true, patStatic: true, nnr: true, gdbn: true },
  specLimits: {},
  nnrRadius: 1,
  nnrLimit: 6,
  nnrParams: 'leakage',
  gdbnFraction: 0.75,
  gdbnMinNeighbours: 4,
  siteBiasMaxP: 1e-3,
  siteBiasMinShift: 0.05,
  hardwareSuspectFraction: 0.6,
  staticMinLots: 6,
  mechanism: DEFAULT_MECHANISM_SETTINGS,
  temperatureC: null,
};

/** Settings from a partial object (stored JSON, CLI options): nested parts merged field by field. */
export function resolveSettings(partial: Partial<AnalysisSettings> = {}): AnalysisSettings {
  return {
    ...DEFAULT_ANALYSIS_SETTINGS,
    ...partial,
    methods: { ...DEFAULT_ANALYSIS_SETTINGS.methods, ...partial.methods },
    mechanism: { ...DEFAULT_MECHANISM_SETTINGS, ...partial.mechanism },
    specLimits: { ...partial.specLimits },
  };
}

export interface LotAnalysis {
  settings: AnalysisSettings;
  /** One line saying how dies were flagged, shown beside the list. */
  method: string;
  wafers: WaferAnalysis[];
  lots: LotStats[];
  flagged: FlaggedDie[];
  /** Things the engineer must know about these results (too few lots for static PAT, ...). */
  warnings?: string[];
}
