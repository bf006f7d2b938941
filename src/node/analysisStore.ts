// Analysis of a stored lot, with the settings kept in the database.

import { analyzeLot, DEFAULT_ANALYSIS_SETTINGS, type AnalysisSettings, type LotAnalysis } from '../core/analysis';
import type { Db } from './store/database';
import { getSetting, loadLot } from './store/repository';

export function readAnalysisSettings(db: Db): AnalysisSettings {
  const text = getSetting(db, 'analysis');
  if (!text) return { ...DEFAULT_ANALYSIS_SETTINGS };
  try {
    return { ...DEFAULT_ANALYSIS_SETTINGS, ...(JSON.parse(text) as Partial<AnalysisSettings>) };
  } catch {
    return { ...DEFAULT_ANALYSIS_SETTINGS };
  }
}

export function analyzeStoredLot(db: Db, lot: string, onProgress?: (done: number, total: number) => void): LotAnalysis {
  const frames = loadLot(db, lot);
  return analyzeLot(frames, { settings: readAnalysisSettings(db), onProgress });
}
