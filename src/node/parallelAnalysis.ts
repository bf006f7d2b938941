// The analysis on several cores: the lot's parameters are split into groups (core's
// planParamGroups, never separating an Ion-Ioff pair); this thread analyses the first group and a
// helper worker thread each of the others, on a copy of just that group's columns; then this
// thread joins them (GDBN, trade-off bands, mechanism, flagged list, spatial labels). The joined
// result is exactly the single-threaded one (tests/core/analysis/paramGroups.test.ts,
// tests/node/parallelAnalysis.test.ts).
//
// Helpers are kept between analyses (HelperPool): a new thread compiles the analysis code from
// scratch, which costs about as much CPU as a fifth of a full-size analysis; a kept one has it
// optimised already, and `warm` lets a pool do that before the first real lot arrives.

import { availableParallelism } from 'node:os';
import { Worker } from 'node:worker_threads';
import {
  AnalysisScratch, analyzeLot, analyzeLotFromGroups, analyzeParamGroup, planParamGroups, resolveSettings,
  type AnalyzeOptions, type LotAnalysis, type ParamGroupResult, type PatReason, type Reason,
} from '../core/analysis';
import { withParams, type WaferFrame } from '../core/frame';
import { generateLot } from '../core/generator';

/** What a helper is asked: analyse one parameter group of one lot's frames (only its columns). */
export interface GroupRequest {
  id: number;
  frames: WaferFrame[];
  names: string[];
  options: Pick<AnalyzeOptions, 'settings' | 'history'>;
}

export type GroupMessage =
  | { id: number; type: 'progress'; fraction: number }
  | { id: number; type: 'result'; result: PackedGroupResult }
  | { id: number; type: 'error'; name: string; message: string };

/** workerData of a helper thread started from the worker script. */
export const HELPER_TASK = 'analysis-helper';

/** Threads the analysis may use: OFFSTATE_ANALYSIS_THREADS when set (1 turns the split off),
 * else every core up to four (more gives little: a lot has few parameter groups). */
export function analysisThreads(): number {
  const given = Number(process.env.OFFSTATE_ANALYSIS_THREADS);
  if (Number.isInteger(given) && given >= 1) return given;
  return Math.max(1, Math.min(availableParallelism(), 4));
}

/**
 * A group's result as it crosses threads: the flag reasons (tens of thousands of small objects on
 * a full-size lot, slow to clone one by one) in columns, rebuilt on arrival with the same fields
 * in the same order (so the joined analysis is byte for byte the single-thread one).
 */
export interface PackedGroupResult extends Omit<ParamGroupResult, 'wafers'> {
  wafers: (Omit<ParamGroupResult['wafers'][number], 'reasons'> & { reasons: PackedReasons })[];
}

interface PackedReasons {
  /** Die of each reason, a die's reasons one after another. */
  die: Int32Array;
  /** Index into METHODS and into `params`. */
  method: Uint8Array;
  param: Uint16Array;
  params: string[];
  /** value, score, limit, and low, high (PAT) or residual, NaN (NNR), five per reason. */
  numbers: Float64Array;
  /** bit 0: direction high; bit 1: scale log10; bit 2: clipped (PAT). */
  bits: Uint8Array;
  /** Neighbours (NNR). */
  neighbours: Uint8Array;
}

const METHODS = ['pat-wafer', 'pat-lot', 'pat-static', 'nnr'] as const;

export function packReasons(reasons: Map<number, Reason[]>): PackedReasons {
  let n = 0;
  for (const list of reasons.values()) n += list.length;
  const out: PackedReasons = {
    die: new Int32Array(n), method: new Uint8Array(n), param: new Uint16Array(n), params: [],
    numbers: new Float64Array(5 * n), bits: new Uint8Array(n), neighbours: new Uint8Array(n),
  };
  const paramIndex = new Map<string, number>();
  let k = 0;
  for (const [die, list] of reasons) {
    for (const r of list) {
      const m = METHODS.indexOf(r.method as (typeof METHODS)[number]);
      if (m < 0) throw new Error(`A parameter group cannot carry ${r.method} reasons.`);
      let p = paramIndex.get(r.param);
      if (p === undefined) { p = out.params.length; paramIndex.set(r.param, p); out.params.push(r.param); }
      out.die[k] = die;
      out.method[k] = m;
      out.param[k] = p;
      const at = 5 * k;
      out.numbers[at] = r.value;
      out.numbers[at + 1] = r.score;
      out.numbers[at + 2] = r.limit;
      if (r.method === 'nnr') {
        out.numbers[at + 3] = r.residual;
        out.numbers[at + 4] = NaN;
        out.neighbours[k] = r.neighbours;
      } else {
        const pat = r as PatReason;
        out.numbers[at + 3] = pat.low;
        out.numbers[at + 4] = pat.high;
        if (pat.clipped) out.bits[k] |= 4;
      }
      if (r.direction === 'high') out.bits[k] |= 1;
      if (r.scale === 'log10') out.bits[k] |= 2;
      k++;
    }
  }
  return out;
}

export function unpackReasons(packed: PackedReasons): Map<number, Reason[]> {
  const out = new Map<number, Reason[]>();
  const { die, method, param, params, numbers, bits, neighbours } = packed;
  for (let k = 0; k < die.length; k++) {
    const at = 5 * k;
    const common = {
      param: params[param[k]], value: numbers[at], score: numbers[at + 1], limit: numbers[at + 2],
      direction: bits[k] & 1 ? 'high' as const : 'low' as const, scale: bits[k] & 2 ? 'log10' as const : 'linear' as const,
    };
    const m = METHODS[method[k]];
    // Fields in the order the methods write them (pat.ts flagOutside, neighbours.ts flagNnr).
    const reason: Reason = m === 'nnr'
      ? { method: m, ...common, residual: numbers[at + 3], neighbours: neighbours[k] }
      : { method: m, ...common, low: numbers[at + 3], high: numbers[at + 4], clipped: (bits[k] & 4) !== 0 };
    const list = out.get(die[k]);
    if (list) list.push(reason); else out.set(die[k], [reason]);
  }
  return out;
}

function pack(result: ParamGroupResult): PackedGroupResult {
  return { ...result, wafers: result.wafers.map((w) => ({ ...w, reasons: packReasons(w.reasons) })) };
}

function unpack(result: PackedGroupResult): ParamGroupResult {
  return { ...result, wafers: result.wafers.map((w) => ({ ...w, reasons: unpackReasons(w.reasons) })) };
}

interface Helper { worker: Worker; busy: boolean }

/**
 * Helper threads kept for the analyses of one process (or one worker). Each answers one group
 * at a time; a helper that fails is dropped and a new one started next time.
 */
export class HelperPool {
  private readonly helpers: Helper[] = [];
  private nextId = 1;
  private closed = false;

  constructor(private readonly workerUrl: URL) {}

  /** Analyses one group on a free helper (starting one if none is free). */
  run(frames: WaferFrame[], names: string[], options: GroupRequest['options'], onFraction: (fraction: number) => void): Promise<ParamGroupResult> {
    if (this.closed) return Promise.reject(new Error('The analysis helpers are closed.'));
    let helper = this.helpers.find((h) => !h.busy);
    if (!helper) {
      const worker = new Worker(this.workerUrl, { workerData: { task: HELPER_TASK } });
      worker.unref();
      helper = { worker, busy: false };
      this.helpers.push(helper);
    }
    const h = helper;
    h.busy = true;
    h.worker.ref();
    const id = this.nextId++;
    return new Promise<ParamGroupResult>((resolve, reject) => {
      const done = () => {
        h.worker.off('message', onMessage);
        h.worker.off('error', onError);
        h.worker.off('exit', onExit);
        h.busy = false;
        h.worker.unref();
      };
      const drop = () => {
        const at = this.helpers.indexOf(h);
        if (at >= 0) this.helpers.splice(at, 1);
        void h.worker.terminate();
      };
      const onMessage = (m: GroupMessage) => {
        if (m.id !== id) return;
        if (m.type === 'progress') { onFraction(m.fraction); return; }
        done();
        if (m.type === 'result') resolve(unpack(m.result));
        else reject(Object.assign(new Error(m.message), { name: m.name }));
      };
      const onError = (error: Error) => { done(); drop(); reject(error); };
      const onExit = (code: number) => { done(); drop(); reject(new Error(`An analysis helper thread stopped unexpectedly (exit code ${code}).`)); };
      h.worker.on('message', onMessage);
      h.worker.on('error', onError);
      h.worker.on('exit', onExit);
      const request: GroupRequest = { id, frames, names, options };
      h.worker.postMessage(request);
    });
  }

  /** Starts `threads - 1` helpers and compiles the analysis code in them and in this thread on
   * a small invented lot (about a tenth of a second), so the first real analysis does not pay for
   * starting threads and compiling. */
  async warm(threads = analysisThreads()): Promise<void> {
    const lot = generateLot({
      seed: 1, lot: 'WARM-UP', waferCount: 3,
      layout: { waferDiameterMm: 200, edgeExclusionMm: 3, dieWidthMm: 2.2, dieHeightMm: 2.2, sitesX: 2, sitesY: 2, shotX: 4, shotY: 4 },
    }).wafers;
    await analyzeLotInParallel(lot, { pool: this, threads });
  }

  close(): void {
    this.closed = true;
    for (const h of this.helpers) void h.worker.terminate();
    this.helpers.length = 0;
  }
}

export interface ParallelOptions extends AnalyzeOptions {
  /** Helper threads to run the other groups on. */
  pool?: HelperPool;
  /** Threads to use, this one included (default analysisThreads()). */
  threads?: number;
}

/**
 * `analyzeLot` on up to `threads` threads for one lot's frames. Without a pool, with one thread,
 * or with too few parameters to split, it is `analyzeLot` itself.
 */
export async function analyzeLotInParallel(frames: WaferFrame[], options: ParallelOptions = {}): Promise<LotAnalysis> {
  const threads = options.threads ?? analysisThreads();
  const lots = new Set(frames.map((f) => f.lot));
  const pool = options.pool;
  const groups = pool && threads > 1 && lots.size === 1 ? planParamGroups(frames, threads) : [];
  if (groups.length < 2) return analyzeLot(frames, options);

  const settings = resolveSettings(options.settings);
  const shared = { settings, history: options.history };
  const total = frames.length;
  // Progress in wafers. The groups run at once and take about as long (planParamGroups balances
  // them), and a helper's reports only get through once this thread is free again; so this
  // thread's fraction stands for all of them until it is done, then the slowest helper's. The
  // joining is the last of (parameters + 1) steps. Never moves back.
  const fractions = groups.map(() => 0);
  const share = groups.flat().length / (groups.flat().length + 1);
  let shown = 0;
  const report = () => {
    const fraction = fractions[0] < 1 ? fractions[0] : Math.min(...fractions);
    const done = Math.floor(total * share * fraction);
    if (done > shown) { shown = done; options.onProgress?.(done, total); }
  };
  const helpers = groups.slice(1).map((names, i) => pool!.run(frames.map((f) => withParams(f, names)), names, shared, (f) => { fractions[i + 1] = f; report(); }));
  // A helper's failure is reported once all have settled, never as an unhandled rejection.
  const settled = Promise.allSettled(helpers);
  const own = analyzeParamGroup(frames, groups[0], { ...shared, scratch: options.scratch, onProgress: (f) => { fractions[0] = f; report(); } });
  const others = (await settled).map((r) => { if (r.status === 'rejected') throw r.reason; return r.value; });
  const result = analyzeLotFromGroups(frames, [own, ...others], { settings, history: options.history, geometry: options.geometry });
  options.onProgress?.(total, total);
  return result;
}

/** How long a thread keeps its scratch memory after an analysis (a full-size lot's is a few
 * hundred MB): long enough for the next analysis of a session, not for an idle app. */
const SCRATCH_KEPT_MS = 120_000;

/** One thread's scratch memory for the analysis, kept between analyses and released when idle. */
export class KeptScratch {
  private scratch?: AnalysisScratch;
  private timer?: NodeJS.Timeout;

  take(): AnalysisScratch {
    clearTimeout(this.timer);
    return (this.scratch ??= new AnalysisScratch());
  }

  release(): void {
    clearTimeout(this.timer);
    this.timer = setTimeout(() => { this.scratch = undefined; }, SCRATCH_KEPT_MS);
    this.timer.unref();
  }
}

/** The helper side: answers group requests until the thread is stopped. */
export function serveGroupRequests(port: { on(event: 'message', listener: (m: GroupRequest) => void): void; postMessage(m: GroupMessage): void }): void {
  const kept = new KeptScratch();
  port.on('message', (request) => {
    const post = (m: GroupMessage) => port.postMessage(m);
    try {
      const result = analyzeParamGroup(request.frames, request.names, { ...request.options, scratch: kept.take(), onProgress: (fraction) => post({ id: request.id, type: 'progress', fraction }) });
      post({ id: request.id, type: 'result', result: pack(result) });
    } catch (error) {
      post({ id: request.id, type: 'error', name: (error as Error).name, message: (error as Error).message });
    } finally {
      kept.release();
    }
  });
}
