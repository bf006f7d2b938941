// Long work runs in a worker thread so the server's event loop and the Electron main process
// stay responsive: an import as a one-off job here, an analysis on the kept analysis thread
// (analysisWorker.ts). The worker reports progress and can be cancelled.

import { Worker } from 'node:worker_threads';
import type { ColumnMapping, ImportResult } from '../shared/api';

/** A one-off job; analyses go to the app's analysis thread instead (analysisWorker.ts). */
export type JobRequest =
  { task: 'import'; dbPath: string; path: string; fileName: string; nativeBinding?: string; mapping?: ColumnMapping; mappingName?: string };

export type JobMessage =
  | { type: 'progress'; done: number; total: number; rows?: number }
  | { type: 'result'; result: ImportResult }
  | { type: 'error'; name: string; message: string };

export interface RunningJob<T> {
  promise: Promise<T>;
  cancel(): void;
}

export class JobError extends Error {
  constructor(name: string, message: string) {
    super(message);
    this.name = name;
  }
}

export function runInWorker<T>(workerUrl: URL, request: JobRequest, onProgress: (done: number, total: number, rows?: number) => void): RunningJob<T> {
  const worker = new Worker(workerUrl, { workerData: request });
  let settled = false;
  let cancelled = false;
  const promise = new Promise<T>((resolve, reject) => {
    worker.on('message', (message: JobMessage) => {
      if (message.type === 'progress') onProgress(message.done, message.total, message.rows);
      else if (message.type === 'result') { settled = true; resolve(message.result as T); void worker.terminate(); }
      else { settled = true; reject(new JobError(message.name, message.message)); void worker.terminate(); }
    });
    worker.on('error', (error) => { settled = true; reject(error); });
    worker.on('exit', (code) => {
      if (settled) return;
      settled = true;
      reject(cancelled ? new JobError('CancelledError', 'Cancelled; nothing was stored.') : new JobError('WorkerExit', `The worker stopped unexpectedly (exit code ${code}).`));
    });
  });
  return {
    promise,
    cancel() {
      cancelled = true;
      worker.postMessage({ type: 'cancel' });
      // A worker busy in a long synchronous step is stopped outright; an open SQLite
      // transaction dies with its connection and is rolled back.
      setTimeout(() => { if (!settled) void worker.terminate(); }, 250).unref();
    },
  };
}
