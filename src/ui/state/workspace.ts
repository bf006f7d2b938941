// The renderer's state and the actions that change it: which lot, wafer, parameter and dies are
// chosen, what the Node side sent, and what the status line says. Components read this and call
// the actions; only this file talks to the API.

import { computed, reactive, shallowRef } from 'vue';
import type {
  AppInfo, LotAnalysis, LotSummary, OffstateApi, ProgressEvent, WaferFrame, WaferSummary,
} from '../../shared/api';
import type { FlaggedDie, WaferAnalysis } from '../../core/analysis/types';
import type { Transport } from '../transport';
import { formatQuantity } from '../format';
import { describeImport, type ImportNotice } from '../importNotice';
import { strongestFirst } from '../flagText';

export interface ProgressView {
  jobId: string;
  kind: ProgressEvent['kind'];
  fraction: number | null;
  text: string;
  finished: boolean;
}

export type { ImportNotice };

const FRAME_CACHE_SIZE = 6;

function errorText(error: unknown): string {
  return error instanceof Error ? error.message : String(error);
}

export function createWorkspace(transport: Transport) {
  const api: OffstateApi = transport.api;
  const state = reactive({
    info: null as AppInfo | null,
    lots: [] as LotSummary[],
    lotsLoaded: false,
    lot: null as string | null,
    wafers: [] as WaferSummary[],
    wafer: null as string | null,
    param: null as string | null,
    analysisRunning: false,
    analysisError: null as string | null,
    frameLoading: false,
    frameError: null as string | null,
    status: 'Starting…',
    statusIsError: false,
    importing: false,
    importNotice: null as ImportNotice | null,
    progress: null as ProgressView | null,
    yUp: true,
  });
  const analysis = shallowRef<LotAnalysis | null>(null);
  const frame = shallowRef<WaferFrame | null>(null);
  const selection = shallowRef<ReadonlySet<number>>(new Set());
  const frameCache = new Map<string, WaferFrame>();
  let lotRequest = 0;
  let waferRequest = 0;

  const setStatus = (text: string, isError = false) => { state.status = text; state.statusIsError = isError; };

  const lotSummary = computed(() => state.lots.find((l) => l.lot === state.lot) ?? null);
  const params = computed(() => frame.value?.params ?? lotSummary.value?.params ?? []);
  const paramInfo = computed(() => params.value.find((p) => p.name === state.param) ?? null);
  const waferAnalysis = computed<WaferAnalysis | null>(() =>
    analysis.value?.wafers.find((w) => w.lot === state.lot && w.wafer === state.wafer) ?? null);
  const flaggedOnWafer = computed<FlaggedDie[]>(() =>
    analysis.value?.flagged.filter((f) => f.lot === state.lot && f.wafer === state.wafer) ?? []);
  const flaggedByIndex = computed(() => new Map(flaggedOnWafer.value.map((f) => [f.index, f])));
  const flaggedCountByWafer = computed(() => {
    const counts = new Map<string, number>();
    for (const w of analysis.value?.wafers ?? []) if (w.lot === state.lot) counts.set(w.wafer, w.flaggedCount);
    return counts;
  });

  function choosePreferredParam(names: string[]): string | null {
    if (state.param && names.includes(state.param)) return state.param;
    return names.find((n) => n === 'Ioff_n') ?? names[0] ?? null;
  }

  async function loadFrame(lot: string, wafer: string): Promise<WaferFrame> {
    const key = `${lot}\u0000${wafer}`;
    const cached = frameCache.get(key);
    if (cached) {
      frameCache.delete(key);
      frameCache.set(key, cached);
      return cached;
    }
    const loaded = await api.getWafer(lot, wafer);
    frameCache.set(key, loaded);
    while (frameCache.size > FRAME_CACHE_SIZE) frameCache.delete(frameCache.keys().next().value as string);
    return loaded;
  }

  async function refreshLots(): Promise<void> {
    state.lots = await api.listLots();
    state.lotsLoaded = true;
  }

  async function selectWafer(wafer: string, selectDies: number[] = []): Promise<void> {
    if (!state.lot) return;
    const lot = state.lot;
    const request = ++waferRequest;
    state.wafer = wafer;
    state.frameLoading = true;
    state.frameError = null;
    selection.value = new Set(selectDies);
    try {
      const loaded = await loadFrame(lot, wafer);
      if (request !== waferRequest) return;
      frame.value = loaded;
      state.param = choosePreferredParam(loaded.params.map((p) => p.name));
    } catch (error) {
      if (request !== waferRequest) return;
      frame.value = null;
      state.frameError = errorText(error);
      setStatus(`Could not load wafer ${wafer}: ${errorText(error)}`, true);
    } finally {
      if (request === waferRequest) state.frameLoading = false;
    }
  }

  async function runAnalysis(lot: string, request: number): Promise<void> {
    state.analysisRunning = true;
    state.analysisError = null;
    try {
      const result = await api.analyzeLot(lot);
      if (request !== lotRequest) return;
      analysis.value = result;
      setStatus(`Lot ${lot}: ${formatQuantity(result.flagged.length, 'flagged die', 'flagged dies')}. ${result.method}`);
    } catch (error) {
      if (request !== lotRequest) return;
      state.analysisError = errorText(error);
      setStatus(`Analysis of lot ${lot} failed: ${errorText(error)}`, true);
    } finally {
      if (request === lotRequest) state.analysisRunning = false;
    }
  }

  async function selectLot(lot: string, preferWafer?: string): Promise<void> {
    const request = ++lotRequest;
    state.lot = lot;
    state.wafers = [];
    state.wafer = null;
    frame.value = null;
    analysis.value = null;
    selection.value = new Set();
    setStatus(`Loading lot ${lot}…`);
    try {
      const wafers = await api.listWafers(lot);
      if (request !== lotRequest) return;
      state.wafers = wafers;
      const analysed = runAnalysis(lot, request);
      const first = wafers.find((w) => w.wafer === preferWafer) ?? wafers[0];
      if (first) await selectWafer(first.wafer);
      await analysed;
    } catch (error) {
      if (request !== lotRequest) return;
      setStatus(`Could not open lot ${lot}: ${errorText(error)}`, true);
    }
  }

  async function start(): Promise<void> {
    api.onProgress(onProgress);
    try {
      state.info = await api.getInfo();
      await refreshLots();
      if (state.lots.length) await selectLot(state.lots[0].lot);
      else setStatus('No lot yet.');
    } catch (error) {
      setStatus(`Cannot reach Offstate's back end: ${errorText(error)}`, true);
    }
  }

  function stepWafer(step: 1 | -1): void {
    if (!state.wafers.length) return;
    const at = state.wafers.findIndex((w) => w.wafer === state.wafer);
    const next = at < 0 ? 0 : Math.min(state.wafers.length - 1, Math.max(0, at + step));
    if (next !== at) void selectWafer(state.wafers[next].wafer);
  }

  function stepParam(step: 1 | -1): void {
    const names = params.value.map((p) => p.name);
    if (!names.length) return;
    const at = names.indexOf(state.param ?? '');
    state.param = names[(at + step + names.length) % names.length];
  }

  function setParam(name: string): void { state.param = name; }

  function setSelection(dies: Iterable<number>, additive = false): void {
    const next = new Set(additive ? selection.value : []);
    for (const die of dies) next.add(die);
    selection.value = next;
  }

  function clearSelection(): void { if (selection.value.size) selection.value = new Set(); }

  async function openFlagged(die: FlaggedDie): Promise<void> {
    if (die.lot !== state.lot) await selectLot(die.lot);
    const reasonParam = strongestFirst(die.reasons)[0]?.param;
    if (state.wafer === die.wafer && frame.value) {
      setSelection([die.index]);
    } else {
      await selectWafer(die.wafer, [die.index]);
    }
    if (reasonParam && params.value.some((p) => p.name === reasonParam)) state.param = reasonParam;
  }

  async function importFiles(files: File[]): Promise<void> {
    const accepted = files.filter((f) => /\.(csv|tsv|txt)$/i.test(f.name));
    if (!accepted.length) {
      state.importNotice = { kind: 'error', text: 'Offstate imports .csv, .tsv and .txt files.', details: files.map((f) => f.name) };
      return;
    }
    state.importing = true;
    let lastLot: string | undefined;
    const changedLots = new Set<string>();
    try {
      for (const file of accepted) {
        setStatus(`Importing ${file.name}…`);
        try {
          const result = await transport.importUserFile(file);
          state.importNotice = describeImport(result);
          if (result.lots.length) lastLot = result.lots[0];
          if (result.status === 'imported') for (const l of result.lots) changedLots.add(l);
          setStatus(state.importNotice.text);
        } catch (error) {
          state.importNotice = { kind: 'error', text: `Import of ${file.name} failed: ${errorText(error)}`, details: [] };
          setStatus(state.importNotice.text, true);
        }
      }
      if (changedLots.size) frameCache.clear();
      await refreshLots();
      if (lastLot && lastLot !== state.lot) await selectLot(lastLot);
      else if (lastLot && changedLots.has(lastLot)) await selectLot(lastLot, state.wafer ?? undefined);
      else if (!state.lot && state.lots.length) await selectLot(state.lots[0].lot);
    } finally {
      state.importing = false;
    }
  }

  async function flaggedCsv(): Promise<string> {
    if (!state.lot) throw new Error('No lot is open');
    return api.exportFlaggedCsv(state.lot);
  }

  let progressTimer: ReturnType<typeof setTimeout> | undefined;
  function onProgress(event: ProgressEvent): void {
    const finished = event.phase === 'done' || event.phase === 'error' || event.phase === 'cancelled';
    const fraction = event.total > 0 ? Math.min(1, event.done / event.total) : null;
    const noun = event.kind === 'import' ? 'Import' : 'Analysis';
    const phaseText = { start: 'started', progress: 'running', done: 'done', error: 'failed', cancelled: 'cancelled' }[event.phase];
    const amount = event.unit === 'wafers' && event.total > 0 ? ` (${event.done}/${event.total} wafers)` : '';
    state.progress = {
      jobId: event.jobId,
      kind: event.kind,
      fraction: finished && event.phase === 'done' ? 1 : fraction,
      text: `${noun} ${phaseText}${amount}${event.message ? `: ${event.message}` : ''}`,
      finished,
    };
    if (progressTimer) clearTimeout(progressTimer);
    if (finished) progressTimer = setTimeout(() => { state.progress = null; }, 1500);
  }

  async function cancelProgressJob(): Promise<void> {
    const job = state.progress;
    if (!job || job.finished) return;
    try { await api.cancelJob(job.jobId); } catch (error) { setStatus(`Could not cancel: ${errorText(error)}`, true); }
  }

  return {
    state, analysis, frame, selection,
    lotSummary, params, paramInfo, waferAnalysis, flaggedOnWafer, flaggedByIndex, flaggedCountByWafer,
    start, selectLot, selectWafer, stepWafer, stepParam, setParam, setSelection, clearSelection,
    openFlagged, importFiles, flaggedCsv, cancelProgressJob, setStatus,
  };
}

export type Workspace = ReturnType<typeof createWorkspace>;
