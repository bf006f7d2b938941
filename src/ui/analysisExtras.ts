// Readers for the parts of an analysis that newer back ends add (excursion score, signature
// label, spatial zones, PAT limits, trade-off bands, mechanism calls). Every reader answers null
// or an empty list when the part is absent, so the views work with older results too.

import type { LotAnalysis, LotStats, PatLimits, TradeoffBand, WaferAnalysis } from '../core/analysis/types';

type Loose = Record<string, unknown>;
const isObject = (v: unknown): v is Loose => v !== null && typeof v === 'object';

export function excursionScore(wafer: WaferAnalysis | undefined | null): number | null {
  const e = (wafer as Loose | undefined)?.excursion;
  return isObject(e) && typeof e.score === 'number' && Number.isFinite(e.score) ? e.score : null;
}

/** The wafer's signature label ("center", "edge-ring", ...) when the spatial analysis gave one. */
export function signatureLabel(wafer: WaferAnalysis | undefined | null): string | null {
  const w = wafer as Loose | undefined;
  for (const key of ['pattern', 'signature', 'spatial']) {
    const v = w?.[key];
    if (typeof v === 'string') return v;
    if (isObject(v)) {
      if (typeof v.label === 'string') return v.label;
      if (isObject(v.signature) && typeof v.signature.label === 'string') return v.signature.label;
      if (typeof v.signature === 'string') return v.signature;
    }
  }
  return null;
}

/** The rule that decided the signature label, in words, when the analysis gives it. */
export function signatureRule(wafer: WaferAnalysis | undefined | null): string | null {
  const p = (wafer as Loose | undefined)?.pattern;
  if (!isObject(p)) return null;
  const confidence = typeof p.confidence === 'number' ? ` (confidence ${p.confidence.toFixed(2)})` : '';
  return typeof p.rule === 'string' ? `${p.rule}${confidence}` : null;
}

/** Ring edges (fractions of the radius) the spatial analysis used, when it says. */
export function ringEdges(wafer: WaferAnalysis | undefined | null): number[] | null {
  const w = wafer as Loose | undefined;
  for (const key of ['spatial', 'zones', 'geometry']) {
    const v = w?.[key];
    if (isObject(v)) {
      const edges = (v.ringEdges ?? (isObject(v.geometry) ? v.geometry.ringEdges : undefined)) as unknown;
      if (Array.isArray(edges) && edges.every((e) => typeof e === 'number')) return edges as number[];
    }
  }
  return null;
}

export function lotStatsOf(analysis: LotAnalysis | null, lot: string | null): LotStats | null {
  return analysis?.lots.find((l) => l.lot === lot) ?? null;
}

export function patLimitsOf(lotStats: LotStats | null, param: string): PatLimits | null {
  const limits = (lotStats as Loose | null)?.patLimits;
  if (!isObject(limits)) return null;
  const p = limits[param];
  return isObject(p) && typeof p.low === 'number' && typeof p.high === 'number' ? (p as unknown as PatLimits) : null;
}

export function tradeoffBands(group: WaferAnalysis | LotStats | null | undefined): TradeoffBand[] {
  const bands = (group as Loose | null | undefined)?.tradeoff;
  return Array.isArray(bands) ? (bands as TradeoffBand[]).filter((b) => isObject(b) && typeof b.slope === 'number') : [];
}

/** Wafer names in overview order: the lot's excursion order, else by score, else as given. */
export function overviewOrder(wafers: readonly string[], analysis: LotAnalysis | null, lot: string | null): { order: string[]; byScore: boolean } {
  const stats = lotStatsOf(analysis, lot);
  const given = (stats as Loose | null)?.waferOrder;
  if (Array.isArray(given) && given.length) {
    const known = new Set(wafers);
    const order = (given as string[]).filter((w) => known.has(w));
    for (const w of wafers) if (!order.includes(w)) order.push(w);
    return { order, byScore: true };
  }
  const scores = new Map<string, number>();
  for (const w of analysis?.wafers ?? []) {
    const s = excursionScore(w);
    if (w.lot === lot && s !== null) scores.set(w.wafer, s);
  }
  if (!scores.size) return { order: [...wafers], byScore: false };
  const order = [...wafers].sort((a, b) => (scores.get(b) ?? -Infinity) - (scores.get(a) ?? -Infinity));
  return { order, byScore: true };
}
