// Imports one delimited per-die file into the store: streams it from disk (hashing as it reads),
// plans the header, validates rows, and stores everything in one transaction at the end, so a
// failure or a cancel leaves the database exactly as it was.

import { createReadStream, statSync } from 'node:fs';
import { createHash } from 'node:crypto';
import { basename, extname } from 'node:path';
import { DelimitedReader, FrameBuilder, looksLikeHeader, planHeader, type HeaderPlan } from '../core/import';
import type { ImportResult } from '../shared/api';
import type { Db } from './store/database';
import { findImportByHash, storeImport } from './store/repository';

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
}

const MAX_MESSAGES = 20;

export async function importDelimitedFile(db: Db, path: string, options: ImportOptions = {}): Promise<ImportResult> {
  const started = performance.now();
  const fileName = options.fileName ?? basename(path);
  const bytesTotal = statSync(path).size;
  const hash = createHash('sha256');
  const decoder = new TextDecoder('utf-8');
  const reader = new DelimitedReader();
  const defaultLot = basename(fileName, extname(fileName));
  let plan: HeaderPlan | undefined;
  let builder: FrameBuilder | undefined;
  let repeatedHeaders = 0;
  let bytesDone = 0;
  let lastReport = 0;
  const interval = options.progressIntervalMs ?? 100;

  const take = (records: { line: number; fields: string[] }[]) => {
    for (const record of records) {
      if (!plan) {
        plan = planHeader(record.fields);
        if (plan.errors.length > 0) {
          throw new ImportError(`${fileName}: the header on line ${record.line} cannot be read: ${plan.errors.join(' ')}`);
        }
        builder = new FrameBuilder(plan, defaultLot);
        continue;
      }
      if (looksLikeHeader(record.fields, plan)) { repeatedHeaders++; continue; }
      builder!.add(record.line, record.fields);
    }
  };

  const stream = createReadStream(path, { highWaterMark: 1 << 20 });
  try {
    for await (const chunk of stream as AsyncIterable<Buffer>) {
      if (options.signal?.aborted) throw new CancelledError();
      if (bytesDone === 0 && chunk.subarray(0, 4096).includes(0)) {
        throw new ImportError(`${fileName} looks like a binary file, not delimited text; Offstate reads CSV, TSV and semicolon-separated files here.`);
      }
      hash.update(chunk);
      bytesDone += chunk.byteLength;
      take(reader.push(decoder.decode(chunk, { stream: true })));
      const now = performance.now();
      if (options.onProgress && now - lastReport >= interval) {
        lastReport = now;
        options.onProgress({ bytesDone, bytesTotal, rows: builder?.report.rowsRead ?? 0 });
      }
    }
    take(reader.push(decoder.decode()));
    take(reader.end());
  } finally {
    stream.destroy();
  }
  if (!plan || !builder) throw new ImportError(`${fileName} is empty: no header line was found.`);
  const digest = hash.digest('hex');
  const earlier = findImportByHash(db, digest);
  if (earlier) {
    return {
      ...earlier.report,
      status: 'already-imported',
      file: fileName,
      messages: [`${fileName} was already imported on ${earlier.importedAt} (as ${earlier.fileName}); nothing changed.`],
      seconds: (performance.now() - started) / 1000,
    };
  }
  const report = builder.report;
  const frames = builder.frames();
  if (report.rowsStored === 0) {
    const first = report.rejected.slice(0, 5).map((r) => `line ${r.line}: ${r.reason}`).join('; ');
    throw new ImportError(`${fileName}: no row could be stored (${report.rejectedCount} rejected${first ? `; ${first}` : ''}).`);
  }
  const messages = [
    ...plan.warnings,
    ...(repeatedHeaders > 0 ? [`${repeatedHeaders} repeated header line(s) skipped.`] : []),
    ...(report.duplicatesReplaced > 0 ? [`${report.duplicatesReplaced} die(s) appeared twice on a wafer; the later row was kept.`] : []),
    ...report.rejected.slice(0, MAX_MESSAGES).map((r) => `Line ${r.line} rejected: ${r.reason}.`),
  ];
  if (report.rejectedCount > MAX_MESSAGES) messages.push(`... and ${report.rejectedCount - MAX_MESSAGES} more rejected rows.`);
  if (options.signal?.aborted) throw new CancelledError();
  const result: ImportResult = {
    status: 'imported',
    file: fileName,
    hash: digest,
    lots: [...new Set(frames.map((f) => f.lot))],
    wafers: frames.length,
    rows: report.rowsStored,
    rejected: report.rejectedCount,
    messages,
    seconds: 0,
  };
  storeImport(db, frames, { fileName, hash: digest, bytes: bytesTotal, report: result });
  result.seconds = (performance.now() - started) / 1000;
  options.onProgress?.({ bytesDone: bytesTotal, bytesTotal, rows: report.rowsRead });
  return result;
}
