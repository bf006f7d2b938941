// What every importer shares: its errors, options, progress reports and the file's opening bytes.

import { closeSync, openSync, readSync } from 'node:fs';
import type { ColumnMapping } from '../core/import';

export class ImportError extends Error {
  override name = 'ImportError';
}

export class CancelledError extends Error {
  override name = 'CancelledError';
  constructor() { super('Import cancelled; nothing was stored.'); }
}

export interface ImportProgress {
  bytesDone: number;
  bytesTotal: number;
  rows: number;
}

export interface ImportOptions {
  /** Name recorded in the journal (defaults to the file's base name). */
  fileName?: string;
  onProgress?: (progress: ImportProgress) => void;
  signal?: AbortSignal;
  /** Milliseconds between progress reports. */
  progressIntervalMs?: number;
  /** Corrections to how columns or tests are read. Without one, a saved mapping fitting the headers is used. */
  mapping?: ColumnMapping;
  /** Name of the saved mapping given as `mapping`, for the report. */
  mappingName?: string;
  /** false: read every line through the string reader (tests compare both paths). */
  fastPath?: boolean;
  /** Values held in memory before a wafer is written early (tests set it low). */
  maxHeldCells?: number;
}

export const MAX_MESSAGES = 20;
export const CHUNK_BYTES = 1 << 20;
/** Longest line read: a per-die table has one die per line, so a longer one is not such a table. */
export const MAX_LINE_BYTES = 16 << 20;
/** Most columns read: far beyond any tester's export, well below what would exhaust memory. */
export const MAX_COLUMNS = 10_000;

/** The first bytes of a file, to route it by content. */
export function readHead(path: string, bytes = 4096): Uint8Array {
  const fd = openSync(path, 'r');
  try {
    const head = Buffer.alloc(bytes);
    const n = readSync(fd, head, 0, bytes, 0);
    return head.subarray(0, n);
  } finally {
    closeSync(fd);
  }
}

export function throttle(options: ImportOptions): (progress: ImportProgress) => void {
  const interval = options.progressIntervalMs ?? 100;
  let last = 0;
  return (progress) => {
    const now = performance.now();
    if (options.onProgress && now - last >= interval) { last = now; options.onProgress(progress); }
  };
}
