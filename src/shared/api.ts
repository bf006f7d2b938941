// The one API contract between the views and the Node side. Every method returns a Promise,
// every event is an on... subscription returning an unsubscribe function, and all data is plain
// (structured-clone safe). Desktop IPC and the local browser mode both implement it.

import type { WaferFrame, ParamInfo } from '../core/frame';
import type { AnalysisSettings, LotAnalysis } from '../core/analysis/types';
import type { ColumnMapping, ImportPreview } from '../core/import';
import type { WaferGeometry } from '../core/stdf';

export type { WaferFrame, ParamInfo, LotAnalysis, ColumnMapping, ImportPreview, WaferGeometry };
export type { ColumnOverride, ColumnPreview, TestOverride, GridBounds } from '../core/import';

export interface ImportFileOptions {
  /** A mapping as plain data, or the name of a saved one. */
  mapping?: ColumnMapping | string;
}

/** A column mapping saved by name (settings table). */
export interface SavedMapping {
  name: string;
  mapping: ColumnMapping;
}

/** One parameter of one wafer, for the lot overview: die coordinates and that column only. */
export interface WaferColumn {
  lot: string;
  wafer: string;
  x: Int32Array;
  y: Int32Array;
  site: Int32Array;
  /** SI base units, raw sign; NaN when missing (all NaN when the wafer lacks the parameter). */
  values: Float64Array;
}

/** How wafer maps are drawn; stored per database beside the analysis settings. */
export interface DisplaySettings {
  /** Side of the map the notch is drawn on. */
  notch: 'down' | 'up' | 'left' | 'right';
  /** True when die y grows upwards on screen. */
  yUp: boolean;
  /** Reticle shot size in dies (columns x rows) and the die coordinate where a shot starts. */
  shotColumns: number;
  shotRows: number;
  shotOriginX: number;
  shotOriginY: number;
}

export const DEFAULT_DISPLAY_SETTINGS: DisplaySettings = {
  notch: 'down', yUp: true, shotColumns: 4, shotRows: 4, shotOriginX: 0, shotOriginY: 0,
};

/** Everything the settings view edits; `analysis` holds the full resolved analysis settings. */
export interface StoredSettings {
  analysis: AnalysisSettings;
  display: DisplaySettings;
}

/** A die added to or removed from a lot's FA list by hand, with the engineer's note. */
export interface FaEdit {
  action: 'add' | 'remove';
  wafer: string;
  x: number;
  y: number;
  /** Index of the die in its wafer frame. */
  index: number;
  note: string;
  /** ISO time of the edit. */
  at: string;
}

export interface AppInfo {
  version: string;
  mode: 'desktop' | 'browser';
  database: string;
  /** True when the database file could only be opened for reading (imports are refused). */
  readOnly?: boolean;
}

export interface DatabaseList {
  current: string;
  /** Up to ten paths opened before, most recent first, the current one included. */
  recent: string[];
}

export interface LotSummary {
  lot: string;
  wafers: number;
  dies: number;
  params: ParamInfo[];
  /** ISO time of the first import that brought this lot. */
  importedAt: string;
}

export interface WaferSummary {
  lot: string;
  wafer: string;
  dies: number;
  /** Median per parameter (magnitudes for currents), null when no value. */
  medians: Record<string, number | null>;
}

export interface ImportResult {
  status: 'imported' | 'already-imported';
  file: string;
  /** SHA-256 of the file's bytes, hex. */
  hash: string;
  lots: string[];
  wafers: number;
  /** Data rows read and stored. */
  rows: number;
  /** Data rows rejected, with the first reasons in `messages`. */
  rejected: number;
  messages: string[];
  seconds: number;
  /** Which reader took the file. */
  format?: 'delimited' | 'stdf';
  /** Delimited files: one row per die ("wide") or per die and test ("long"). */
  layout?: 'wide' | 'long';
  /** Data rows read (STDF: parts, i.e. PRR records). */
  rowsRead?: number;
  /** Rejected rows per kind of problem. */
  rejectedBy?: Record<string, number>;
  /** Dies (long layout: die and test) given twice in the file; the later one was kept. */
  duplicatesReplaced?: number;
  /** Name of the saved mapping that was applied, if any. */
  mapping?: string;
  /** STDF: wafer geometry from the WCR record. */
  geometry?: WaferGeometry;
  /** STDF: retested dies superseded, and results left out because their flags say unusable. */
  retests?: number;
  unusableResults?: number;
  unusableBy?: Record<string, number>;
}

export interface ProgressEvent {
  jobId: string;
  kind: 'import' | 'analysis';
  phase: 'start' | 'progress' | 'done' | 'error' | 'cancelled';
  done: number;
  total: number;
  unit: 'bytes' | 'wafers';
  message?: string;
  /** Imports: data rows read so far (when the import runs in the service's own thread). */
  rows?: number;
  /** Units (bytes or wafers) per second since the start. */
  rate?: number;
  /** Estimated seconds left at the current rate. */
  secondsLeft?: number;
}

export interface OffstateApi {
  getInfo(): Promise<AppInfo>;
  listLots(): Promise<LotSummary[]>;
  listWafers(lot: string): Promise<WaferSummary[]>;
  getWafer(lot: string, wafer: string): Promise<WaferFrame>;
  analyzeLot(lot: string): Promise<LotAnalysis>;
  /**
   * Import a file the Node side can read (desktop: a dropped or chosen path). options.mapping
   * (plain data, or the name of a saved one) corrects how columns or tests are read; without one,
   * a saved mapping made for the same headers is applied.
   */
  importFile(path: string, options?: ImportFileOptions): Promise<ImportResult>;
  // The mapping methods are optional in the type until every transport client implements them;
  // the service, the server's generic route and the Electron bridge all carry them already.
  /** How the file's columns (or STDF tests) would be read, with the mapping that reproduces it. */
  previewImport?(path: string, mapping?: ColumnMapping | string): Promise<ImportPreview>;
  /**
   * The same for the first bytes of a file the view holds, as base64 text so that it travels as
   * JSON too (browser mode: send the first 256 KiB of the chosen file).
   */
  previewBytes?(name: string, headBase64: string, mapping?: ColumnMapping | string): Promise<ImportPreview>;
  listMappings?(): Promise<SavedMapping[]>;
  /** Saves (or replaces) a mapping by name in the database's settings. */
  saveMapping?(name: string, mapping: ColumnMapping): Promise<void>;
  /** Import bytes sent by the view (browser mode: a dropped or chosen file). */
  importBytes(name: string, data: Uint8Array): Promise<ImportResult>;
  /** The flagged-die list of a lot as CSV text for failure analysis. */
  exportFlaggedCsv(lot: string): Promise<string>;
  cancelJob(jobId: string): Promise<void>;
  /** One parameter of every wafer of a lot (lot overview). */
  getLotColumn(lot: string, param: string): Promise<WaferColumn[]>;
  /** The settings kept in this database (defaults filled in). */
  getSettings(): Promise<StoredSettings>;
  /** Stores settings in this database; later analyses use them. Returns what was stored. */
  saveSettings(settings: StoredSettings): Promise<StoredSettings>;
  /** Hand edits of a lot's FA list, oldest first. */
  getFaEdits(lot: string): Promise<FaEdit[]>;
  /** Replaces the hand edits of a lot's FA list. Returns what was stored. */
  saveFaEdits(lot: string, edits: FaEdit[]): Promise<FaEdit[]>;
  /** The open database and the ones opened before, most recent first. */
  listDatabases(): Promise<DatabaseList>;
  /** Switches to another Offstate database (created when the file does not exist yet); a foreign
   * or newer file is refused with a sentence and the current database stays open. */
  openDatabase(path: string): Promise<AppInfo>;
  onProgress(listener: (event: ProgressEvent) => void): () => void;
}

/** Method names, for transports that route by name. */
export const API_METHODS = [
  'getInfo', 'listLots', 'listWafers', 'getWafer', 'analyzeLot',
  'importFile', 'importBytes', 'exportFlaggedCsv', 'cancelJob',
  'previewImport', 'previewBytes', 'listMappings', 'saveMapping',
  'getLotColumn', 'getSettings', 'saveSettings', 'getFaEdits', 'saveFaEdits',
  'listDatabases', 'openDatabase',
] as const satisfies readonly Exclude<keyof OffstateApi, 'onProgress'>[];
export type ApiMethod = (typeof API_METHODS)[number];
