// The analysis on several cores: the lot's parameters are split into groups (core's
// planParamGroups, never separating an Ion-Ioff pair); this thread analyses the first group and a
// helper worker thread each of the others, on a copy of just that group's columns; then this
// thread joins them (GDBN, trade-off bands, mechanism, flagged list, spatial labels). The joined
// result is exactly the single-threaded one (tests/core/analysis/paramGroups.test.ts,
// tests/node/parallelAnalysis.test.ts).

import { availableParallelism } from 'node:os';
import { Worker } from 'node:worker_threads';
import {
  analyzeLot, analyzeLotFromGroups, analyzeParamGroup, planParamGroups, resolveSettings,
  type AnalyzeOptions, type LotAnalysis, type ParamGroupResult,
} from '../core/analysis';
import type { WaferFrame } from '../core/frame';

/** What a helper worker is given: one lot's frames with only the group's columns. */
export interface GroupRequest {
  task: 'analyze-group';
  frames: WaferFrame[];
  names: string[];
  options: Pick<AnalyzeOptions, 'settings' | 'history'>;
}

export type GroupMessage =
  | { type: 'progress'; fraction: number }
  | { type: 'result'; result: ParamGroupResult }
  | { type: 'error'; name: string; message: string };

/** Threads the analysis may use: OFFSTATE_ANALYSIS_THREADS when set (1 turns the split off),
 * else every core up to four (more gives little: a lot has few parameter groups). */
export function analysisThreads(): number {
  const given = Number(process.env.OFFSTATE_ANALYSIS_THREADS);
  if (Number.isInteger(given) && given >= 1) return given;
  return Math.max(1, Math.min(availableParallelism(), 4));
}

function withOnly(frames: WaferFrame[], names: string[]): WaferFrame[] {
  return frames.map((f) => ({
    lot: f.lot, wafer: f.wafer, x: f.x, y: f.y, site: f.site,
    params: f.params.filter((p) => names.includes(p.name)),
    values: Object.fromEntries(names.filter((n) => f.values[n]).map((n) => [n, f.values[n]])),
  }));
}

function runGroup(workerUrl: URL, request: GroupRequest, onFraction: (fraction: number) => void): { promise: Promise<ParamGroupResult>; stop: () => void } {
  const worker = new Worker(workerUrl, { workerData: request });
  let settled = false;
  const promise = new Promise<ParamGroupResult>((resolve, reject) => {
    worker.on('message', (m: GroupMessage) => {
      if (m.type === 'progress') onFraction(m.fraction);
      else if (m.type === 'result') { settled = true; resolve(m.result); }
      else { settled = true; reject(Object.assign(new Error(m.message), { name: m.name })); }
    });
    worker.on('error', (error) => { settled = true; reject(error); });
    worker.on('exit', (code) => { if (!settled) reject(new Error(`An analysis helper thread stopped unexpectedly (exit code ${code}).`)); });
  });
  return { promise, stop: () => void worker.terminate() };
}

export interface ParallelOptions extends AnalyzeOptions {
  /** The worker script that answers GroupRequest (dist/node/worker.mjs). */
  workerUrl?: URL;
  /** Threads to use, this one included (default analysisThreads()). */
  threads?: number;
}

/**
 * `analyzeLot` on up to `threads` threads for one lot's frames. Without a worker script, with one
 * thread, or with too few parameters to split, it is `analyzeLot` itself.
 */
export async function analyzeLotInParallel(frames: WaferFrame[], options: ParallelOptions = {}): Promise<LotAnalysis> {
  const threads = options.threads ?? analysisThreads();
  const lots = new Set(frames.map((f) => f.lot));
  const groups = options.workerUrl && threads > 1 && lots.size === 1 ? planParamGroups(frames, threads) : [];
  if (groups.length < 2) return analyzeLot(frames, options);

  const settings = resolveSettings(options.settings);
  const shared = { settings, history: options.history };
  const total = frames.length;
  // Progress in wafers: each group's fraction weighted by its parameters; the joining is the last step.
  const fractions = groups.map(() => 0);
  const weights = groups.map((g) => g.length / (groups.flat().length + 1));
  const report = () => options.onProgress?.(Math.floor(total * fractions.reduce((s, f, i) => s + f * weights[i], 0)), total);
  const helpers = groups.slice(1).map((names, i) =>
    runGroup(options.workerUrl!, { task: 'analyze-group', frames: withOnly(frames, names), names, options: shared }, (f) => { fractions[i + 1] = f; report(); }));
  try {
    const own = analyzeParamGroup(frames, groups[0], { ...shared, onProgress: (f) => { fractions[0] = f; report(); } });
    const others = await Promise.all(helpers.map((h) => h.promise));
    const result = analyzeLotFromGroups(frames, [own, ...others], { settings, history: options.history, geometry: options.geometry });
    options.onProgress?.(total, total);
    return result;
  } finally {
    for (const h of helpers) h.stop();
  }
}

/** The helper side: analyses the group it was given and posts the result. */
export function answerGroupRequest(request: GroupRequest, post: (m: GroupMessage) => void): void {
  try {
    const result = analyzeParamGroup(request.frames, request.names, { ...request.options, onProgress: (fraction) => post({ type: 'progress', fraction }) });
    post({ type: 'result', result });
  } catch (error) {
    post({ type: 'error', name: (error as Error).name, message: (error as Error).message });
  }
}
