// The one API contract between the views and the Node side. Every method returns a Promise,
// every event is an on... subscription returning an unsubscribe function, and all data is plain
// (structured-clone safe). Desktop IPC and the local browser mode both implement it.

import type { WaferFrame, ParamInfo } from '../core/frame';
import type { LotAnalysis } from '../core/analysis/types';

export type { WaferFrame, ParamInfo, LotAnalysis };

export interface AppInfo {
  version: string;
  mode: 'desktop' | 'browser';
  database: string;
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
}

export interface ProgressEvent {
  jobId: string;
  kind: 'import' | 'analysis';
  phase: 'start' | 'progress' | 'done' | 'error' | 'cancelled';
  done: number;
  total: number;
  unit: 'bytes' | 'wafers';
  message?: string;
}

export interface OffstateApi {
  getInfo(): Promise<AppInfo>;
  listLots(): Promise<LotSummary[]>;
  listWafers(lot: string): Promise<WaferSummary[]>;
  getWafer(lot: string, wafer: string): Promise<WaferFrame>;
  analyzeLot(lot: string): Promise<LotAnalysis>;
  /** Import a file the Node side can read (desktop: a dropped or chosen path). */
  importFile(path: string): Promise<ImportResult>;
  /** Import bytes sent by the view (browser mode: a dropped or chosen file). */
  importBytes(name: string, data: Uint8Array): Promise<ImportResult>;
  /** The flagged-die list of a lot as CSV text for failure analysis. */
  exportFlaggedCsv(lot: string): Promise<string>;
  cancelJob(jobId: string): Promise<void>;
  onProgress(listener: (event: ProgressEvent) => void): () => void;
}

/** Method names, for transports that route by name. */
export const API_METHODS = [
  'getInfo', 'listLots', 'listWafers', 'getWafer', 'analyzeLot',
  'importFile', 'importBytes', 'exportFlaggedCsv', 'cancelJob',
] as const satisfies readonly Exclude<keyof OffstateApi, 'onProgress'>[];
export type ApiMethod = (typeof API_METHODS)[number];
