// The Node-side implementation of the API contract. Both transports (Electron IPC and the local
// browser mode) wrap one instance; neither computes anything itself.

import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { rememberDatabase, readRecentDatabases } from './recentDatabases';
import { basename, dirname, join, resolve } from 'node:path';
import { randomUUID } from 'node:crypto';
import { magnitudes } from '../core/analysis';
import { flaggedCsv } from '../core/export';
import { median } from '../core/stats';
import type { AppInfo, DatabaseList, ColumnMapping, ImportFileOptions, ImportPreview, ImportResult, LotAnalysis, LotSummary, OffstateApi, ProgressEvent, SavedMapping, WaferFrame, WaferSummary } from '../shared/api';
import { openDatabase, StoreError, type Db } from './store/database';
import { listLots, listWaferNames, loadWafer, NotFoundError } from './store/repository';
import { importAnyFile, previewFile, previewHead } from './importAny';
import { listMappings, resolveMapping, saveMapping } from './importMappings';
import { analyzeStoredLot } from './analysisStore';
import { runInWorker, type RunningJob } from './jobs';
import { AnalysisWorker, EncodedAnalysis } from './analysisWorker';
import { VERSION } from './version';
import { loadLotColumn, readFaEdits, readStoredSettings, writeFaEdits, writeStoredSettings } from './viewStore';
import type { FaEdit, StoredSettings, WaferColumn } from '../shared/api';

export interface ServiceOptions {
  dbPath: string;
  mode: AppInfo['mode'];
  /** Worker script for long jobs; without it jobs run in this thread (tests, small tools). */
  workerUrl?: URL;
  nativeBinding?: string;
  /** File keeping the recently opened databases; without it only the current one is listed. */
  recentFile?: string;
  /** Start the analysis thread at once and compile the analysis on a small invented lot, so the
   * first real analysis runs at full speed (the app; not for tests or one-off tools). */
  warmAnalysis?: boolean;
}

export class OffstateService implements OffstateApi {
  private db: Db;
  private readonly listeners = new Set<(event: ProgressEvent) => void>();
  private readonly jobs = new Map<string, { kind: ProgressEvent['kind']; cancel(): void }>();
  private readonly analysisCache = new Map<string, { version: number; result: Promise<EncodedAnalysis> }>();
  /** Bumped by every import, so cached analyses of changed lots are recomputed. */
  private dataVersion = 0;
  /** Imports run one at a time: each holds the write transaction while it streams. */
  private importQueue: Promise<unknown> = Promise.resolve();

  private readonly options: ServiceOptions;
  /** The analysis thread kept between analyses (with a worker script only). */
  private readonly analysisThread?: AnalysisWorker;

  constructor(options: ServiceOptions) {
    this.options = { ...options };
    this.db = openDatabase(options.dbPath, { nativeBinding: options.nativeBinding });
    if (options.recentFile) rememberDatabase(options.recentFile, options.dbPath);
    if (options.workerUrl) this.analysisThread = new AnalysisWorker(options.workerUrl);
    if (options.warmAnalysis) this.analysisThread?.warm();
  }

  async listDatabases(): Promise<DatabaseList> {
    return { current: this.options.dbPath, recent: this.options.recentFile ? readRecentDatabases(this.options.recentFile) : [this.options.dbPath] };
  }

  async openDatabase(path: string): Promise<AppInfo> {
    if ([...this.jobs.values()].some((j) => j.kind === 'import')) throw new StoreError('An import is still running; open the other database when it has finished.');
    const target = resolve(path);
    mkdirSync(dirname(target), { recursive: true });
    // Opened (and checked) before the current one is closed: a refusal leaves everything as it was.
    const next = openDatabase(target, { nativeBinding: this.options.nativeBinding });
    // Analyses of the database being left are of no more use: they are cancelled (they store nothing).
    for (const job of this.jobs.values()) if (job.kind === 'analysis') job.cancel();
    this.db.close();
    this.db = next;
    this.options.dbPath = target;
    this.analysisCache.clear();
    this.dataVersion++;
    if (this.options.recentFile) rememberDatabase(this.options.recentFile, target);
    return this.getInfo();
  }

  close(): void {
    for (const job of this.jobs.values()) job.cancel();
    this.analysisThread?.close();
    this.db.close();
  }

  private emit(event: ProgressEvent): void {
    for (const listener of this.listeners) listener(event);
  }

  onProgress(listener: (event: ProgressEvent) => void): () => void {
    this.listeners.add(listener);
    return () => this.listeners.delete(listener);
  }

  async getInfo(): Promise<AppInfo> {
    return { version: VERSION, mode: this.options.mode, database: this.options.dbPath, readOnly: this.db.readonly };
  }

  async listLots(): Promise<LotSummary[]> {
    return listLots(this.db);
  }

  async listWafers(lot: string): Promise<WaferSummary[]> {
    const names = listWaferNames(this.db, lot);
    if (names.length === 0) throw new NotFoundError(`No lot ${lot} in this database.`);
    return names.map((wafer) => {
      const frame = loadWafer(this.db, lot, wafer);
      const medians: Record<string, number | null> = {};
      for (const p of frame.params) medians[p.name] = median(magnitudes(frame.values[p.name], p.unit)) ?? null;
      return { lot, wafer, dies: frame.x.length, medians };
    });
  }

  async getWafer(lot: string, wafer: string): Promise<WaferFrame> {
    return loadWafer(this.db, lot, wafer);
  }

  private track<T>(kind: ProgressEvent['kind'], unit: ProgressEvent['unit'], start: (report: (done: number, total: number, rows?: number) => void) => RunningJob<T>): Promise<T> {
    const jobId = randomUUID();
    const base = { jobId, kind, unit };
    this.emit({ ...base, phase: 'start', done: 0, total: 0 });
    const began = performance.now();
    const job = start((done, total, rows) => {
      const seconds = (performance.now() - began) / 1000;
      const rate = seconds > 0 ? done / seconds : 0;
      this.emit({ ...base, phase: 'progress', done, total, ...(rows !== undefined ? { rows } : {}), rate, ...(rate > 0 ? { secondsLeft: Math.max(0, (total - done) / rate) } : {}) });
    });
    this.jobs.set(jobId, { kind, cancel: () => job.cancel() });
    return job.promise.then(
      (result) => { this.jobs.delete(jobId); this.emit({ ...base, phase: 'done', done: 1, total: 1 }); return result; },
      (error: Error) => {
        this.jobs.delete(jobId);
        const phase = error.name === 'CancelledError' ? 'cancelled' : 'error';
        this.emit({ ...base, phase, done: 0, total: 0, message: error.message });
        throw error;
      },
    );
  }

  private inThread<T>(work: (signal: AbortSignal, report: (done: number, total: number, rows?: number) => void) => Promise<T> | T) {
    return (report: (done: number, total: number, rows?: number) => void): RunningJob<T> => {
      const controller = new AbortController();
      return { promise: Promise.resolve().then(() => work(controller.signal, report)), cancel: () => controller.abort() };
    };
  }

  /** options as a string is the name to record for the file (uploads keep their own name). */
  async importFile(path: string, options?: ImportFileOptions | string): Promise<ImportResult> {
    if (this.db.readonly) throw new StoreError(`${this.options.dbPath} is read-only for you; it is open for reading only, so nothing can be imported.`);
    const fileName = typeof options === 'string' ? options : basename(path);
    const given = typeof options === 'string' ? undefined : options?.mapping;
    const run = this.importQueue.then(() => this.importNow(path, fileName, given));
    this.importQueue = run.catch(() => undefined);
    return run;
  }

  private async importNow(path: string, fileName: string, given: ColumnMapping | string | undefined): Promise<ImportResult> {
    const { workerUrl, dbPath, nativeBinding } = this.options;
    const { mapping, name: mappingName } = resolveMapping(this.db, given);
    // Saved mappings that fit the headers are also found by the importer itself in the settings table.
    const result = await this.track<ImportResult>('import', 'bytes', workerUrl
      ? (report) => runInWorker<ImportResult>(workerUrl, { task: 'import', dbPath, path, fileName, nativeBinding, mapping, mappingName }, report)
      : this.inThread((signal, report) => importAnyFile(this.db, path, { fileName, signal, mapping, mappingName, onProgress: (p) => report(p.bytesDone, p.bytesTotal, p.rows) })));
    if (result.status === 'imported') { this.dataVersion++; this.analysisCache.clear(); }
    return result;
  }

  async previewImport(path: string, mapping?: ColumnMapping | string): Promise<ImportPreview> {
    const resolved = resolveMapping(this.db, mapping);
    return previewFile(this.db, path, resolved.mapping, resolved.name);
  }

  async previewBytes(_name: string, headBase64: string, mapping?: ColumnMapping | string): Promise<ImportPreview> {
    const resolved = resolveMapping(this.db, mapping);
    return previewHead(this.db, new Uint8Array(Buffer.from(headBase64, 'base64')), resolved.mapping, resolved.name);
  }

  async listMappings(): Promise<SavedMapping[]> {
    return listMappings(this.db);
  }

  async saveMapping(name: string, mapping: ColumnMapping): Promise<void> {
    saveMapping(this.db, name, mapping);
  }

  async importBytes(name: string, data: Uint8Array): Promise<ImportResult> {
    const dir = mkdtempSync(join(tmpdir(), 'offstate-upload-'));
    const safeName = basename(name).replace(/[^\w.\- ]+/g, '_') || 'upload.csv';
    const path = join(dir, safeName);
    try {
      writeFileSync(path, data);
      return await this.importFile(path, safeName);
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  }

  async analyzeLot(lot: string): Promise<LotAnalysis> {
    return (await this.analysis(lot)).value();
  }

  /** The analysis as the encoded envelope the browser mode sends (`{ ok: true, result }`). */
  async analyzeLotEnvelope(lot: string): Promise<Uint8Array> {
    return (await this.analysis(lot)).envelope;
  }

  private analysis(lot: string): Promise<EncodedAnalysis> {
    const cached = this.analysisCache.get(lot);
    if (cached && cached.version === this.dataVersion) return cached.result;
    const { dbPath, nativeBinding } = this.options;
    const thread = this.analysisThread;
    const result = this.track<EncodedAnalysis>('analysis', 'wafers', thread
      ? (report) => thread.analyze(dbPath, lot, report, nativeBinding)
      : this.inThread((_signal, report) => EncodedAnalysis.of(analyzeStoredLot(this.db, lot, report))));
    this.analysisCache.set(lot, { version: this.dataVersion, result });
    result.catch(() => this.analysisCache.delete(lot));
    return result;
  }

  async exportFlaggedCsv(lot: string): Promise<string> {
    const analysis = await this.analyzeLot(lot);
    const summary = listLots(this.db).find((l) => l.lot === lot);
    if (!summary) throw new NotFoundError(`No lot ${lot} in this database.`);
    return flaggedCsv(analysis, summary.params);
  }

  async getLotColumn(lot: string, param: string): Promise<WaferColumn[]> {
    return loadLotColumn(this.db, lot, param);
  }

  async getSettings(): Promise<StoredSettings> {
    return readStoredSettings(this.db);
  }

  /** Stores the settings; cached analyses are dropped so the next analysis uses them. */
  async saveSettings(settings: StoredSettings): Promise<StoredSettings> {
    const stored = writeStoredSettings(this.db, settings);
    this.dataVersion++;
    this.analysisCache.clear();
    return stored;
  }

  async getFaEdits(lot: string): Promise<FaEdit[]> {
    return readFaEdits(this.db, lot);
  }

  async saveFaEdits(lot: string, edits: FaEdit[]): Promise<FaEdit[]> {
    return writeFaEdits(this.db, lot, edits);
  }

  async cancelJob(jobId: string): Promise<void> {
    this.jobs.get(jobId)?.cancel();
  }
}
