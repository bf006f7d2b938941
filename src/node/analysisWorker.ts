// The app's analysis thread, kept between analyses: started once (and warmed on a small invented
// lot when asked), it analyses stored lots one at a time with its own helper threads
// (parallelAnalysis.ts), so neither the app's thread nor a fresh thread's compile time is in
// the way. The result comes back encoded as the browser mode sends it (EncodedAnalysis), so the
// app's thread neither decodes nor encodes 30 MB of objects per full-size lot unless it needs
// them (exports, the desktop IPC). Cancelling the running analysis stops the thread (a
// synchronous step cannot be interrupted) and sends the analyses queued behind it to a new one.

import { Worker } from 'node:worker_threads';
import type { LotAnalysis } from '../shared/api';
import { decodePayload, encodePayload } from '../shared/codec';
import { analyzeStoredLotInParallel } from './analysisStore';
import { JobError, type RunningJob } from './jobs';
import { KeptScratch, type HelperPool } from './parallelAnalysis';
import { openDatabase } from './store/database';

/** workerData of the analysis thread started from the worker script. */
export const ANALYSIS_SERVICE_TASK = 'analysis-service';

export type AnalysisRequest =
  | { type: 'analyze'; id: number; dbPath: string; lot: string; nativeBinding?: string }
  | { type: 'drop'; id: number }
  | { type: 'warm' };

export type AnalysisReply =
  | { id: number; type: 'progress'; done: number; total: number }
  /** The result as the browser mode sends it: encodePayload({ ok: true, result }), transferred. */
  | { id: number; type: 'result'; envelope: Uint8Array }
  | { id: number; type: 'error'; name: string; message: string };

/** An analysis as its encoded envelope (codec.ts) or as objects, each form made from the other
 * only when someone asks for it. */
export class EncodedAnalysis {
  private bytes?: Uint8Array;
  private decoded?: LotAnalysis;

  static fromEnvelope(envelope: Uint8Array): EncodedAnalysis {
    const a = new EncodedAnalysis();
    a.bytes = envelope;
    return a;
  }

  static of(result: LotAnalysis): EncodedAnalysis {
    const a = new EncodedAnalysis();
    a.decoded = result;
    return a;
  }

  get envelope(): Uint8Array {
    return (this.bytes ??= encodePayload({ ok: true, result: this.decoded }));
  }

  value(): LotAnalysis {
    return (this.decoded ??= decodePayload<{ ok: true; result: LotAnalysis }>(this.bytes!).result);
  }
}

interface Pending {
  request: Extract<AnalysisRequest, { type: 'analyze' }>;
  resolve: (result: EncodedAnalysis) => void;
  reject: (error: Error) => void;
  onProgress: (done: number, total: number) => void;
}

export class AnalysisWorker {
  private worker?: Worker;
  /** In the order sent, which is the order the thread takes them: the first is running. */
  private readonly pending = new Map<number, Pending>();
  private nextId = 1;

  constructor(private readonly workerUrl: URL) {}

  private thread(): Worker {
    if (this.worker) return this.worker;
    const worker = new Worker(this.workerUrl, { workerData: { task: ANALYSIS_SERVICE_TASK } });
    worker.unref();
    worker.on('message', (m: AnalysisReply) => {
      const p = this.pending.get(m.id);
      if (!p) return;
      if (m.type === 'progress') p.onProgress(m.done, m.total);
      else {
        this.pending.delete(m.id);
        if (this.pending.size === 0) worker.unref();
        if (m.type === 'result') p.resolve(EncodedAnalysis.fromEnvelope(m.envelope));
        else p.reject(new JobError(m.name, m.message));
      }
    });
    const fail = (error: Error) => {
      if (this.worker !== worker) return;
      this.worker = undefined;
      const all = [...this.pending.values()];
      this.pending.clear();
      for (const p of all) p.reject(error);
    };
    worker.on('error', fail);
    worker.on('exit', (code) => fail(new JobError('WorkerExit', `The analysis thread stopped unexpectedly (exit code ${code}).`)));
    this.worker = worker;
    return worker;
  }

  /** Starts the thread and has it compile the analysis on a small invented lot. */
  warm(): void {
    this.thread().postMessage({ type: 'warm' } satisfies AnalysisRequest);
  }

  analyze(dbPath: string, lot: string, onProgress: (done: number, total: number) => void, nativeBinding?: string): RunningJob<EncodedAnalysis> {
    const id = this.nextId++;
    const request = { type: 'analyze', id, dbPath, lot, nativeBinding } satisfies AnalysisRequest;
    const promise = new Promise<EncodedAnalysis>((resolve, reject) => {
      this.pending.set(id, { request, resolve, reject, onProgress });
      this.send(request);
    });
    return {
      promise,
      cancel: () => {
        const p = this.pending.get(id);
        if (!p) return;
        const head = this.pending.keys().next().value === id;
        this.pending.delete(id);
        p.reject(new JobError('CancelledError', 'Cancelled; nothing was stored.'));
        if (head) {
          // Running (or about to): a synchronous step cannot be interrupted, so the thread is
          // stopped and the analyses queued behind it are sent to a new one.
          const worker = this.worker;
          this.worker = undefined;
          void worker?.terminate();
          for (const q of this.pending.values()) this.send(q.request);
        } else {
          this.worker?.postMessage({ type: 'drop', id } satisfies AnalysisRequest);
        }
        if (this.pending.size === 0) this.worker?.unref();
      },
    };
  }

  private send(request: AnalysisRequest): void {
    const thread = this.thread();
    // Kept alive while an analysis is pending; idle, it never holds the process open.
    thread.ref();
    thread.postMessage(request);
  }

  close(): void {
    const worker = this.worker;
    this.worker = undefined;
    void worker?.terminate();
  }
}

/** The analysis thread's side: one request at a time, in the order they came. */
export function serveAnalysisRequests(port: { on(event: 'message', listener: (m: AnalysisRequest) => void): void; postMessage(m: AnalysisReply, transfer?: ArrayBuffer[]): void }, pool: HelperPool): void {
  const dropped = new Set<number>();
  const kept = new KeptScratch();
  let queue: Promise<void> = Promise.resolve();
  port.on('message', (m) => {
    if (m.type === 'drop') { dropped.add(m.id); return; }
    if (m.type === 'warm') { queue = queue.then(() => pool.warm()).catch(() => undefined); return; }
    queue = queue.then(async () => {
      // Let a 'drop' sent while the previous analysis ran arrive first.
      await new Promise((resolve) => setImmediate(resolve));
      if (dropped.delete(m.id)) return;
      const db = openDatabase(m.dbPath, { nativeBinding: m.nativeBinding });
      try {
        const result = await analyzeStoredLotInParallel(db, m.lot, { pool, scratch: kept.take(), onProgress: (done, total) => port.postMessage({ id: m.id, type: 'progress', done, total }) });
        // Encoded here, in this thread: the app's thread passes the bytes on to the browser
        // without copying the structure twice (structured clone, then the encoder).
        const envelope = encodePayload({ ok: true, result });
        port.postMessage({ id: m.id, type: 'result', envelope }, [envelope.buffer as ArrayBuffer]);
      } catch (error) {
        port.postMessage({ id: m.id, type: 'error', name: (error as Error).name, message: (error as Error).message });
      } finally {
        kept.release();
        db.close();
      }
    });
  });
}
