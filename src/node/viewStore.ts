// What the views keep in a database besides the measurements: the settings they edit (analysis
// settings under the key the analysis reads, display settings beside them), the FA list's hand
// edits per lot, and one parameter of every wafer of a lot for the lot overview. FA edits live in
// the settings table (key "fa-edits:<lot>") so no schema change is needed for them.

import { resolveSettings, type AnalysisSettings } from '../core/analysis/types';
import { DEFAULT_DISPLAY_SETTINGS, type DisplaySettings, type FaEdit, type StoredSettings, type WaferColumn } from '../shared/api';
import { ArgumentError } from '../shared/validate';
import type { Db } from './store/database';
import { getSetting, listWaferNames, NotFoundError, setSetting } from './store/repository';
import { float64Of, int32Of } from './store/blobs';

const ANALYSIS_KEY = 'analysis';
const DISPLAY_KEY = 'display';
const faKey = (lot: string) => `fa-edits:${lot}`;

function parseJson<T>(text: string | undefined): Partial<T> {
  if (!text) return {};
  try {
    const value = JSON.parse(text) as unknown;
    return value && typeof value === 'object' && !Array.isArray(value) ? (value as Partial<T>) : {};
  } catch {
    return {};
  }
}

const NOTCH_SIDES: DisplaySettings['notch'][] = ['down', 'up', 'left', 'right'];

function cleanDisplay(partial: Partial<DisplaySettings>): DisplaySettings {
  const d = { ...DEFAULT_DISPLAY_SETTINGS, ...partial };
  const whole = (v: unknown, fallback: number, min: number) => (Number.isInteger(v) && (v as number) >= min ? (v as number) : fallback);
  return {
    notch: NOTCH_SIDES.includes(d.notch) ? d.notch : DEFAULT_DISPLAY_SETTINGS.notch,
    yUp: typeof d.yUp === 'boolean' ? d.yUp : DEFAULT_DISPLAY_SETTINGS.yUp,
    shotColumns: whole(d.shotColumns, DEFAULT_DISPLAY_SETTINGS.shotColumns, 1),
    shotRows: whole(d.shotRows, DEFAULT_DISPLAY_SETTINGS.shotRows, 1),
    shotOriginX: whole(d.shotOriginX, 0, -100000),
    shotOriginY: whole(d.shotOriginY, 0, -100000),
  };
}

export function readStoredSettings(db: Db): StoredSettings {
  return {
    analysis: resolveSettings(parseJson<AnalysisSettings>(getSetting(db, ANALYSIS_KEY))),
    display: cleanDisplay(parseJson<DisplaySettings>(getSetting(db, DISPLAY_KEY))),
  };
}

/** Stores both parts; numbers that are not finite are refused with a sentence. */
export function writeStoredSettings(db: Db, settings: StoredSettings): StoredSettings {
  if (!settings || typeof settings !== 'object' || typeof settings.analysis !== 'object' || typeof settings.display !== 'object') {
    throw new ArgumentError('Settings must hold an "analysis" and a "display" part.');
  }
  const analysis = resolveSettings(settings.analysis);
  if (!(Number.isFinite(analysis.patLimit) && analysis.patLimit > 0)) throw new ArgumentError('The PAT multiplier must be a positive number.');
  const display = cleanDisplay(settings.display);
  setSetting(db, ANALYSIS_KEY, JSON.stringify(analysis));
  setSetting(db, DISPLAY_KEY, JSON.stringify(display));
  return readStoredSettings(db);
}

function cleanEdit(edit: FaEdit): FaEdit {
  if (edit.action !== 'add' && edit.action !== 'remove') throw new ArgumentError('An FA edit is "add" or "remove".');
  if (typeof edit.wafer !== 'string' || !edit.wafer) throw new ArgumentError('An FA edit names its wafer.');
  for (const k of ['x', 'y', 'index'] as const) if (!Number.isInteger(edit[k])) throw new ArgumentError(`An FA edit needs a whole-number ${k}.`);
  return {
    action: edit.action, wafer: edit.wafer, x: edit.x, y: edit.y, index: edit.index,
    note: typeof edit.note === 'string' ? edit.note.slice(0, 2000) : '',
    at: typeof edit.at === 'string' && edit.at ? edit.at.slice(0, 40) : new Date().toISOString(),
  };
}

export function readFaEdits(db: Db, lot: string): FaEdit[] {
  const text = getSetting(db, faKey(lot));
  if (!text) return [];
  try {
    const list = JSON.parse(text) as unknown;
    return Array.isArray(list) ? list.map((e) => cleanEdit(e as FaEdit)) : [];
  } catch {
    return [];
  }
}

export function writeFaEdits(db: Db, lot: string, edits: FaEdit[]): FaEdit[] {
  if (!Array.isArray(edits)) throw new ArgumentError('FA edits are a list.');
  if (listWaferNames(db, lot).length === 0) throw new NotFoundError(`No lot ${lot} in this database.`);
  setSetting(db, faKey(lot), JSON.stringify(edits.map(cleanEdit)));
  return readFaEdits(db, lot);
}



/** One parameter of every wafer (natural wafer order), reading only that parameter's blobs. */
export function loadLotColumn(db: Db, lot: string, param: string): WaferColumn[] {
  const names = listWaferNames(db, lot);
  if (names.length === 0) throw new NotFoundError(`No lot ${lot} in this database.`);
  const waferRow = db.prepare('SELECT w.id, w.x, w.y, w.site FROM wafers w JOIN lots l ON l.id = w.lot_id WHERE l.name = ? AND w.name = ?');
  const valueRow = db.prepare('SELECT data FROM wafer_values WHERE wafer_id = ? AND param = ?');
  return names.map((wafer) => {
    const row = waferRow.get(lot, wafer) as { id: number; x: Buffer; y: Buffer; site: Buffer };
    const x = int32Of(row.x);
    const data = valueRow.get(row.id, param) as { data: Buffer } | undefined;
    const values = data ? float64Of(data.data) : new Float64Array(x.length).fill(NaN);
    return { lot, wafer, x, y: int32Of(row.y), site: int32Of(row.site), values };
  });
}
