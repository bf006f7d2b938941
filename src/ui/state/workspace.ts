// The renderer's state and the actions that change it: which lot, wafer, parameter and dies are
// chosen, what the Node side sent, and what the status line says. Components read this and call
// the actions; only this file talks to the API.

import { computed, reactive, shallowRef } from 'vue';
import type {
  AppInfo, ColumnMapping, DatabaseList, FaEdit, LotAnalysis, LotSummary, OffstateApi, ProgressEvent, StoredSettings, WaferColumn, WaferFrame, WaferSummary,
} from '../../shared/api';
import { buildFaList, dieKey } from '../fa/faList';
import type { ImportPreview } from '../../shared/api';
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

export type ViewName = 'overview' | 'wafer' | 'sites' | 'fa' | 'settings';
export const VIEWS: readonly { name: ViewName; title: string }[] = [
  { name: 'overview', title: 'Lot overview' },
  { name: 'wafer', title: 'Wafer' },
  { name: 'sites', title: 'Sites & trend' },
  { name: 'fa', title: 'FA list' },
  { name: 'settings', title: 'Settings' },
];
export type MapTool = 'box' | 'lasso' | 'pan';

/** Trade-off points of a whole lot: x = log10 |Ioff| (A), y = |Ion| in uA, and each point's wafer. */
export interface LotPairPoints {
  lot: string;
  ion: string;
  ioff: string;
  x: Float64Array;
  y: Float64Array;
  wafer: Int32Array;
  wafers: string[];
}
export type ThemeName = 'light' | 'dark';
const THEME_STORAGE_KEY = 'offstate.theme';

function storedTheme(): ThemeName {
  try { return localStorage.getItem(THEME_STORAGE_KEY) === 'dark' ? 'dark' : 'light'; } catch { return 'light'; }
}

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
    view: 'wafer' as ViewName,
    theme: storedTheme(),
    mapTool: 'box' as MapTool,
    settingsSaving: false,
    lotColumnsLoading: false,
  });
  const settings = shallowRef<StoredSettings | null>(null);
  /** Files waiting for the engineer to confirm the column preview. */
  const pendingImport = shallowRef<{ files: File[]; preview: ImportPreview | null; error: string | null; head?: string } | null>(null);
  const faEdits = shallowRef<FaEdit[]>([]);
  const lotColumns = shallowRef<WaferColumn[] | null>(null);
  let lotColumnsKey = '';
  /** Ion-Ioff points of every wafer of the lot, for the trade-off plot coloured by wafer. */
  const lotPairs = shallowRef<LotPairPoints | null>(null);
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

  /** Probe site of a die of a loaded wafer (-1 when that wafer is not loaded). */
  function siteOf(wafer: string, index: number): number {
    const f = frame.value?.wafer === wafer ? frame.value : frameCache.get(`${state.lot}\u0000${wafer}`);
    return f && index >= 0 && index < f.site.length ? f.site[index] : -1;
  }
  const faList = computed(() => (state.lot
    ? buildFaList(state.lot, analysis.value?.flagged ?? [], faEdits.value, siteOf)
    : { rows: [], removed: [] }));
  const faKeys = computed(() => new Set(faList.value.rows.map((r) => dieKey(r.wafer, r.index))));

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
    faEdits.value = [];
    lotColumns.value = null;
    lotColumnsKey = '';
    lotPairs.value = null;
    setStatus(`Loading lot ${lot}…`);
    api.getFaEdits(lot).then((edits) => { if (request === lotRequest) faEdits.value = edits; })
      .catch((error) => setStatus(`Could not read the FA edits of lot ${lot}: ${errorText(error)}`, true));
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

  /** The open database and the recent ones, for the database picker. */
  const databases = shallowRef<DatabaseList | null>(null);

  async function refreshDatabases(): Promise<void> {
    try { databases.value = await api.listDatabases(); } catch { databases.value = null; }
  }

  /** Opens another database; on a refusal the current one stays open and the reason is shown. */
  async function openDatabase(path: string): Promise<boolean> {
    try {
      state.info = await api.openDatabase(path);
    } catch (error) {
      setStatus(`Database not opened: ${errorText(error)}`, true);
      return false;
    }
    frameCache.clear();
    state.lot = null;
    state.wafers = [];
    state.wafer = null;
    frame.value = null;
    analysis.value = null;
    try { settings.value = await api.getSettings(); } catch { /* the old settings stay shown */ }
    await refreshLots();
    await refreshDatabases();
    if (state.lots.length) await selectLot(state.lots[0].lot);
    else setStatus(`Opened ${path}: no lot yet.`);
    return true;
  }

  async function start(): Promise<void> {
    api.onProgress(onProgress);
    try {
      state.info = await api.getInfo();
      try {
        settings.value = await api.getSettings();
        state.yUp = settings.value.display.yUp;
      } catch (error) {
        setStatus(`Could not read the settings: ${errorText(error)}`, true);
      }
      await refreshLots();
      void refreshDatabases();
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

  const IMPORTABLE = /\.(csv|tsv|txt|stdf|std)$/i;

  /** Shows how the first file's columns will be read (when the back end can say), then imports on confirm. */
  async function requestImport(files: File[]): Promise<void> {
    const accepted = files.filter((f) => IMPORTABLE.test(f.name));
    if (!accepted.length || !api.previewBytes) { await importFiles(files); return; }
    pendingImport.value = { files: accepted, preview: null, error: null };
    try {
      const bytes = new Uint8Array(await accepted[0].slice(0, 256 * 1024).arrayBuffer());
      let binary = '';
      for (let i = 0; i < bytes.length; i += 0x8000) binary += String.fromCharCode(...bytes.subarray(i, i + 0x8000));
      const head = btoa(binary);
      const preview = await api.previewBytes(accepted[0].name, head);
      if (pendingImport.value?.files === accepted) pendingImport.value = { files: accepted, preview, error: null, head };
    } catch (error) {
      if (pendingImport.value?.files === accepted) pendingImport.value = { files: accepted, preview: null, error: errorText(error) };
    }
  }

  /** Reads the first file again with the user's corrected mapping, so the dialog shows the result. */
  async function recheckImport(mapping: ColumnMapping): Promise<void> {
    const pending = pendingImport.value;
    if (!pending?.head || !api.previewBytes) return;
    try {
      const preview = await api.previewBytes(pending.files[0].name, pending.head, mapping);
      if (pendingImport.value === pending) pendingImport.value = { ...pending, preview, error: null };
    } catch (error) {
      if (pendingImport.value === pending) pendingImport.value = { ...pending, error: errorText(error) };
    }
  }

  /**
   * Imports the pending files. A corrected mapping is saved under the given name first: the back
   * end applies a saved mapping to every file with the same header line, in both transports and
   * in the command line (--mapping NAME), so the correction holds for the next file too.
   */
  async function confirmImport(correction?: { mapping: ColumnMapping; name: string }): Promise<void> {
    const pending = pendingImport.value;
    pendingImport.value = null;
    if (!pending) return;
    if (correction && api.saveMapping) {
      try {
        await api.saveMapping(correction.name, correction.mapping);
        setStatus(`Mapping "${correction.name}" saved; it is used for every file with these columns.`);
      } catch (error) {
        state.importNotice = { kind: 'error', text: `The mapping could not be saved: ${errorText(error)}`, details: [] };
        return;
      }
    }
    await importFiles(pending.files);
  }

  function cancelImport(): void {
    if (pendingImport.value) setStatus('Import cancelled.');
    pendingImport.value = null;
  }

  async function importFiles(files: File[]): Promise<void> {
    const accepted = files.filter((f) => IMPORTABLE.test(f.name));
    if (!accepted.length) {
      state.importNotice = { kind: 'error', text: 'Offstate imports .csv, .tsv, .txt and STDF (.stdf, .std) files.', details: files.map((f) => f.name) };
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

  function setView(view: ViewName): void {
    state.view = view;
    if (view === 'overview') void loadLotColumns();
  }

  function stepView(step: 1 | -1): void {
    const at = VIEWS.findIndex((v) => v.name === state.view);
    setView(VIEWS[(at + step + VIEWS.length) % VIEWS.length].name);
  }

  function setTheme(theme: ThemeName): void {
    state.theme = theme;
    try { localStorage.setItem(THEME_STORAGE_KEY, theme); } catch { /* kept for this page only */ }
  }

  /** One parameter of every wafer of the lot, for the overview (cached per lot and parameter). */
  async function loadLotColumns(): Promise<void> {
    const lot = state.lot;
    const param = state.param ?? lotSummary.value?.params[0]?.name;
    if (!lot || !param) return;
    const key = `${lot}\u0000${param}`;
    if (key === lotColumnsKey) return;
    lotColumnsKey = key;
    state.lotColumnsLoading = true;
    try {
      const columns = await api.getLotColumn(lot, param);
      if (lotColumnsKey === key) lotColumns.value = columns;
    } catch (error) {
      if (lotColumnsKey === key) { lotColumnsKey = ''; setStatus(`Could not load the lot overview: ${errorText(error)}`, true); }
    } finally {
      if (lotColumnsKey === key || lotColumnsKey === '') state.lotColumnsLoading = false;
    }
  }

  async function loadLotPairs(ion: string, ioff: string): Promise<void> {
    const lot = state.lot;
    if (!lot) return;
    const have = lotPairs.value;
    if (have && have.lot === lot && have.ion === ion && have.ioff === ioff) return;
    try {
      const [ions, ioffs] = await Promise.all([api.getLotColumn(lot, ion), api.getLotColumn(lot, ioff)]);
      if (state.lot !== lot) return;
      const total = ions.reduce((n, c) => n + c.values.length, 0);
      const x = new Float64Array(total), y = new Float64Array(total), wafer = new Int32Array(total);
      let count = 0;
      ions.forEach((c, w) => {
        const off = ioffs[w]?.values;
        if (!off) return;
        for (let i = 0; i < c.values.length; i++) {
          const a = Math.abs(off[i]), b = Math.abs(c.values[i]);
          if (!(a > 0) || !Number.isFinite(a) || !Number.isFinite(b)) continue;
          x[count] = Math.log10(a); y[count] = b * 1e6; wafer[count] = w; count++;
        }
      });
      lotPairs.value = { lot, ion, ioff, x: x.slice(0, count), y: y.slice(0, count), wafer: wafer.slice(0, count), wafers: ions.map((c) => c.wafer) };
    } catch (error) {
      setStatus(`Could not load the lot's trade-off points: ${errorText(error)}`, true);
    }
  }

  /** Stores settings in the database and analyses the open lot again with them. */
  async function saveSettings(next: StoredSettings): Promise<void> {
    state.settingsSaving = true;
    try {
      settings.value = await api.saveSettings(next);
      state.yUp = settings.value.display.yUp;
      setStatus('Settings saved; analysing again…');
      if (state.lot) await runAnalysis(state.lot, lotRequest);
    } catch (error) {
      setStatus(`Could not save the settings: ${errorText(error)}`, true);
    } finally {
      state.settingsSaving = false;
    }
  }

  async function storeFaEdits(edits: FaEdit[]): Promise<void> {
    if (!state.lot) return;
    const lot = state.lot;
    try {
      const stored = await api.saveFaEdits(lot, edits);
      if (state.lot === lot) faEdits.value = stored;
    } catch (error) {
      setStatus(`Could not save the FA list edit: ${errorText(error)}`, true);
    }
  }

  /** Adds dies of the open wafer to the FA list by hand. */
  async function addToFa(dies: Iterable<number>, note: string): Promise<void> {
    const f = frame.value;
    if (!f || !state.lot) return;
    const at = new Date().toISOString();
    const added: FaEdit[] = [];
    for (const index of dies) {
      if (index < 0 || index >= f.x.length || faKeys.value.has(dieKey(f.wafer, index))) continue;
      added.push({ action: 'add', wafer: f.wafer, x: f.x[index], y: f.y[index], index, note, at });
    }
    if (!added.length) { setStatus('Those dies are on the FA list already.'); return; }
    await storeFaEdits([...faEdits.value, ...added]);
    setStatus(`Added ${formatQuantity(added.length, 'die', 'dies')} to the FA list.`);
  }

  /** Takes dies off the FA list by hand. */
  async function removeFromFa(dies: { wafer: string; index: number; x: number; y: number }[], note: string): Promise<void> {
    const at = new Date().toISOString();
    const removed: FaEdit[] = dies.map((d) => ({ action: 'remove', wafer: d.wafer, x: d.x, y: d.y, index: d.index, note, at }));
    if (!removed.length) return;
    await storeFaEdits([...faEdits.value, ...removed]);
    setStatus(`Removed ${formatQuantity(removed.length, 'die', 'dies')} from the FA list.`);
  }

  /** Puts a removed die back (an "add" edit that undoes the removal). */
  async function restoreToFa(die: { wafer: string; index: number; x: number; y: number }): Promise<void> {
    await storeFaEdits([...faEdits.value, { action: 'add', wafer: die.wafer, x: die.x, y: die.y, index: die.index, note: 'restored', at: new Date().toISOString() }]);
  }

  /** Every loaded or loadable frame of the lot's FA rows' wafers (for exports that need values). */
  async function framesFor(wafers: Iterable<string>): Promise<Map<string, WaferFrame>> {
    const out = new Map<string, WaferFrame>();
    if (!state.lot) return out;
    for (const w of new Set(wafers)) out.set(w, await loadFrame(state.lot, w));
    return out;
  }

  return {
    settings, faEdits, faList, faKeys, lotColumns, lotPairs, loadLotPairs, pendingImport, requestImport, confirmImport, cancelImport,
    setView, stepView, setTheme, loadLotColumns, saveSettings, addToFa, removeFromFa, restoreToFa, framesFor,
    state, analysis, frame, selection,
    lotSummary, params, paramInfo, waferAnalysis, flaggedOnWafer, flaggedByIndex, flaggedCountByWafer,
    start, selectLot, selectWafer, stepWafer, stepParam, setParam, setSelection, clearSelection,
    openFlagged, importFiles, recheckImport, databases, openDatabase, refreshDatabases, flaggedCsv, cancelProgressJob, setStatus,
  };
}

export type Workspace = ReturnType<typeof createWorkspace>;
