// Full analysis of a set of wafer frames: statistics per wafer, per lot and per probe site,
// Ion-Ioff correlation, probe-site bias and the flagged-die list. Pure; every front end calls it.

import type { WaferFrame } from '../frame';
import { groupStats } from './groupStats';
import { robustZReasons } from './robustZ';
import { siteBias } from './siteBias';
import { DEFAULT_ANALYSIS_SETTINGS, type AnalysisSettings, type FlaggedDie, type LotAnalysis, type LotStats, type WaferAnalysis } from './types';

export interface AnalyzeOptions {
  settings?: Partial<AnalysisSettings>;
  /** Called after each wafer with (done, total). */
  onProgress?: (done: number, total: number) => void;
}

export function methodDescription(settings: AnalysisSettings): string {
  return `robust z per wafer and parameter, |z| > ${settings.zLimit}, z = (value - median) / ((Q3 - Q1)/1.349), on log10|I| for currents`;
}

/** Concatenates the frames of one lot into one frame-like set of columns. */
export function concatFrames(frames: WaferFrame[]): Pick<WaferFrame, 'params' | 'values' | 'site'> {
  const params = frames[0]?.params.map((p) => ({ ...p })) ?? [];
  for (const f of frames) for (const p of f.params) if (!params.some((q) => q.name === p.name)) params.push({ ...p });
  const total = frames.reduce((n, f) => n + f.x.length, 0);
  const site = new Int32Array(total);
  const values: Record<string, Float64Array> = {};
  for (const p of params) values[p.name] = new Float64Array(total).fill(NaN);
  let at = 0;
  for (const f of frames) {
    site.set(f.site, at);
    for (const p of f.params) values[p.name].set(f.values[p.name], at);
    at += f.x.length;
  }
  return { params, values, site };
}

export function analyzeLot(frames: WaferFrame[], options: AnalyzeOptions = {}): LotAnalysis {
  const settings: AnalysisSettings = { ...DEFAULT_ANALYSIS_SETTINGS, ...options.settings };
  const wafers: WaferAnalysis[] = [];
  const flagged: FlaggedDie[] = [];
  frames.forEach((frame, done) => {
    const reasons = robustZReasons(frame, settings.zLimit);
    const indices = [...reasons.keys()].sort((a, b) => a - b);
    for (const index of indices) {
      const values: Record<string, number | null> = {};
      for (const p of frame.params) {
        const v = frame.values[p.name][index];
        values[p.name] = Number.isFinite(v) ? v : null;
      }
      flagged.push({ lot: frame.lot, wafer: frame.wafer, x: frame.x[index], y: frame.y[index], site: frame.site[index], index, reasons: reasons.get(index)!, values });
    }
    wafers.push({ lot: frame.lot, wafer: frame.wafer, ...groupStats(frame), siteBias: siteBias(frame, settings), flaggedCount: indices.length });
    options.onProgress?.(done + 1, frames.length);
  });
  const lots: LotStats[] = [];
  for (const lot of [...new Set(frames.map((f) => f.lot))]) {
    const ofLot = frames.filter((f) => f.lot === lot);
    lots.push({ lot, wafers: ofLot.length, ...groupStats(concatFrames(ofLot)) });
  }
  return { settings, method: methodDescription(settings), wafers, lots, flagged };
}
