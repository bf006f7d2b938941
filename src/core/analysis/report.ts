// The `analyze --json` contract: per wafer, the identifiers as written, die count, per-parameter
// statistics and the reported probe-site biases; one flagged entry per die with all its reasons.
// Every flagged die carries its mechanism call (and its cluster when it is in one); every wafer
// its spatial pattern. Nothing is filled with placeholders.

import type { ClusterSummary, ExcursionScore, HardwareSuspect, LotAnalysis, MechanismCall, ParamSummary, Reason } from './types';
import type { SignatureLabel } from '../spatial';
import { reasonText } from './reasonText';

export interface JsonParam {
  unit: string;
  n: number;
  median: number;
  mean: number;
  sigma: number | null;
  robustSigma: number;
  q1: number;
  q3: number;
  log10?: Omit<JsonParam, 'unit' | 'log10'>;
}

export interface JsonReport {
  method: string;
  wafers: {
    lot: string;
    wafer: string;
    dies: number;
    params: Record<string, JsonParam>;
    siteBias: { param: string; site: number; shift: number; p: number; rankBiserial: number; kruskalWallisP: number }[];
    excursion: Omit<ExcursionScore, 'shifts'>;
    pattern?: { label: SignatureLabel; confidence: number; rule: string; clusters: ClusterSummary[] };
  }[];
  lots: {
    lot: string;
    wafers: number;
    /** Wafer names, most excursive first. */
    waferOrder: string[];
    siteBias: { param: string; site: number; shift: number; p: number }[];
    hardwareSuspects: HardwareSuspect[];
  }[];
  warnings: string[];
  flagged: {
    lot: string;
    wafer: string;
    x: number;
    y: number;
    site: number | null;
    reasons: (Reason & { text: string })[];
    values: Record<string, number | null>;
    mechanism: MechanismCall;
    cluster?: { id: number; size: number; line: boolean };
  }[];
}

function jsonParam(s: ParamSummary): JsonParam {
  const core = (v: Omit<ParamSummary, 'unit' | 'log10'>) => ({
    n: v.n, median: v.median, mean: v.mean, sigma: Number.isFinite(v.sigma) ? v.sigma : null,
    robustSigma: v.robustSigma, q1: v.q1, q3: v.q3,
  });
  return { unit: s.unit, ...core(s), ...(s.log10 ? { log10: core(s.log10) } : {}) };
}

export function jsonReport(analysis: LotAnalysis): JsonReport {
  return {
    method: analysis.method,
    wafers: analysis.wafers.map((w) => ({
      lot: w.lot,
      wafer: w.wafer,
      dies: w.dies,
      params: Object.fromEntries(Object.entries(w.params).map(([k, v]) => [k, jsonParam(v)])),
      siteBias: w.siteBias.map((b) => ({ param: b.param, site: b.site, shift: b.shift, p: b.p, rankBiserial: b.rankBiserial, kruskalWallisP: b.kruskalWallisP })),
      excursion: { score: w.excursion.score, param: w.excursion.param, shift: w.excursion.shift, flaggedFraction: w.excursion.flaggedFraction, ...(w.excursion.vsHistory ? { vsHistory: w.excursion.vsHistory } : {}) },
      ...(w.pattern ? { pattern: { label: w.pattern.label, confidence: w.pattern.confidence, rule: w.pattern.rule, clusters: w.pattern.clusters } } : {}),
    })),
    lots: analysis.lots.map((l) => ({
      lot: l.lot, wafers: l.wafers, waferOrder: l.waferOrder,
      siteBias: l.siteBias.map((b) => ({ param: b.param, site: b.site, shift: b.shift, p: b.p })),
      hardwareSuspects: l.hardwareSuspects,
    })),
    warnings: analysis.warnings ?? [],
    flagged: analysis.flagged.map((d) => ({
      lot: d.lot, wafer: d.wafer, x: d.x, y: d.y, site: d.site < 0 ? null : d.site,
      reasons: d.reasons.map((r) => ({ ...r, text: reasonText(r) })),
      values: d.values,
      mechanism: d.mechanism,
      ...(d.cluster ? { cluster: d.cluster } : {}),
    })),
  };
}
