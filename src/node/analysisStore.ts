// Analysis of a stored lot, with the settings kept in the database and the earlier lots of the
// store as the reference for static PAT (AEC-Q001) and for excursion scores against history.

import {
  analyzeLot, PAT_IQR_DIVISOR, type AnalysisScratch, resolveSettings, type AnalysisHistory, type AnalysisSettings, type LotAnalysis, type StaticReference,
} from '../core/analysis';
import { isCurrentUnit } from '../core/params';
import { selectQuantilesInPlace } from '../core/stats';
import type { Db } from './store/database';
import type { WaferFrame } from '../core/frame';
import { geometryFromWcr, type WaferGeometry } from '../core/spatial';
import type { DisplaySettings } from '../shared/api';
import { loadWaferGeometry } from './importStore';
import { analyzeLotInParallel, type HelperPool } from './parallelAnalysis';
import { getSetting, listLots, listWaferNames, loadLot, loadWafer } from './store/repository';

const NOTCH_SIDE = { down: 'bottom', up: 'top', left: 'left', right: 'right' } as const;

/**
 * Geometry for the spatial step of one wafer: what its file said (STDF WCR), corrected by the
 * orientation and shot size the user saved in the settings (when saved); the rest is inferred
 * from the die grid.
 */
export function waferGeometryOf(db: Db): (frame: WaferFrame) => Partial<WaferGeometry> {
  const savedDisplay = getSetting(db, 'display');
  let user: Partial<WaferGeometry> = {};
  if (savedDisplay) {
    try {
      const d = JSON.parse(savedDisplay) as Partial<DisplaySettings>;
      user = {
        ...(d.notch && NOTCH_SIDE[d.notch] ? { notch: NOTCH_SIDE[d.notch] } : {}),
        ...(typeof d.yUp === 'boolean' ? { yPositive: d.yUp ? 'up' : 'down' } : {}),
        ...(Number.isInteger(d.shotColumns) && d.shotColumns! > 0 ? { shotX: d.shotColumns } : {}),
        ...(Number.isInteger(d.shotRows) && d.shotRows! > 0 ? { shotY: d.shotRows } : {}),
        ...(Number.isInteger(d.shotOriginX) ? { shotOriginX: d.shotOriginX } : {}),
        ...(Number.isInteger(d.shotOriginY) ? { shotOriginY: d.shotOriginY } : {}),
      };
    } catch {
      user = {};
    }
  }
  return (frame) => {
    const wcr = loadWaferGeometry(db, frame.lot, frame.wafer);
    return { ...(wcr ? geometryFromWcr(wcr) : {}), ...user };
  };
}

export function readAnalysisSettings(db: Db): AnalysisSettings {
  const text = getSetting(db, 'analysis');
  if (!text) return resolveSettings();
  try {
    return resolveSettings(JSON.parse(text) as Partial<AnalysisSettings>);
  } catch {
    return resolveSettings();
  }
}

/** Dies taken from each earlier wafer: AEC-Q001 asks at least 5 spread over the wafer; an even
 * spread of this many keeps the reference cheap on 70,000-die wafers. */
const DIES_PER_WAFER = 2000;

/**
 * Pooled robust statistics of every parameter over the lots imported before `lot` (analysis
 * scale: log10|I| for currents): robust mean = median, robust sigma = (Q3 - Q1)/1.35.
 */
export function readHistory(db: Db, lot: string): AnalysisHistory {
  const lots = listLots(db);
  const at = lots.findIndex((l) => l.lot === lot);
  const earlier = (at < 0 ? lots : lots.slice(0, at)).filter((l) => l.lot !== lot);
  const pooled = new Map<string, number[]>();
  for (const summary of earlier) {
    for (const name of listWaferNames(db, summary.lot)) {
      const frame = loadWafer(db, summary.lot, name);
      const n = frame.x.length;
      const step = Math.max(1, Math.floor(n / DIES_PER_WAFER));
      for (const p of frame.params) {
        const column = frame.values[p.name];
        const current = isCurrentUnit(p.unit);
        let list = pooled.get(p.name);
        if (!list) { list = []; pooled.set(p.name, list); }
        for (let i = 0; i < n; i += step) {
          const v = current ? Math.log10(Math.abs(column[i])) : column[i];
          if (Number.isFinite(v)) list.push(v);
        }
      }
    }
  }
  const references: Record<string, StaticReference> = {};
  for (const [name, list] of pooled) {
    if (list.length < 30) continue;
    const [q1, centre, q3] = selectQuantilesInPlace(Float64Array.from(list), [0.25, 0.5, 0.75]);
    references[name] = { centre, robustSigma: (q3 - q1) / PAT_IQR_DIVISOR, lots: earlier.length, n: list.length };
  }
  return { lots: earlier.length, references };
}

/** What the store gives an analysis of `lot` besides its frames: settings, history, geometry. */
function storedOptions(db: Db, lot: string) {
  return { settings: readAnalysisSettings(db), history: readHistory(db, lot), geometry: waferGeometryOf(db) };
}

export function analyzeStoredLot(db: Db, lot: string, onProgress?: (done: number, total: number) => void): LotAnalysis {
  return analyzeLot(loadLot(db, lot), { ...storedOptions(db, lot), onProgress });
}

/** The same analysis on several cores when a helper pool is given (parallelAnalysis.ts). */
export function analyzeStoredLotInParallel(
  db: Db, lot: string, options: { onProgress?: (done: number, total: number) => void; pool?: HelperPool; threads?: number; scratch?: AnalysisScratch } = {},
): Promise<LotAnalysis> {
  // Shared memory: the helpers read the columns where they are.
  const frames = loadLot(db, lot, { shared: options.pool !== undefined });
  return analyzeLotInParallel(frames, { ...options, ...storedOptions(db, lot) });
}
