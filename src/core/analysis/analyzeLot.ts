// Full analysis of a set of wafer frames: statistics per wafer, per lot and per probe site,
// Ion-Ioff correlation, probe-site bias, outliers (PAT per wafer, per lot and static; NNR; GDBN),
// mechanism triage, excursion scores and the flagged-die list. Pure; every front end calls it.
//
// For speed every parameter of every wafer is sorted exactly once (radix ordering); quartiles,
// per-site statistics, rank tests, PAT tails and ranks for Spearman are all read from that
// ordering, and the lot's ordering is a k-way merge of the wafers' (see sortedColumn.ts).
// Parameters are processed one at a time over all wafers, so only one parameter's orderings
// (two for an Ion-Ioff pair) are held at once.

import type { WaferFrame } from '../frame';
import { isCurrentUnit, tradeoffPairs } from '../params';
import { Buffers } from './buffers';
import { excursionScores, type WaferCentre } from './excursion';
import { hardwareSuspects } from './hardwareSuspects';
import { mergeSorted } from './lotMerge';
import { tradeoffBands } from './bands';
import { classifyDie, deviceColumns } from './mechanism';
import { diesBySite, sameGrid, sortKeys } from './waferTables';
import { flagGdbn, flagNnr, neighbourhood, nnrResiduals, type Neighbourhood } from './neighbours';
import { dynamicPatLimits, flagOutside, staticPatLimits } from './pat';
import { pairCorrelation, type PairSegment } from './rankCorrelation';
import { siteBiasOfStream, siteSlots } from './siteBias';
import { robustCentre, sortColumn, type SortedColumn } from './sortedColumn';
import { combineMoments, momentsOf, type Moments } from './sortedSummary';
import { scatterLotMidranks, scatterMidranks, splitBySite, streamSummary } from './streams';
import { attachPatterns } from './wafersPattern';
import type { WaferGeometry } from '../spatial';
import {
  resolveSettings, type AnalysisSettings, type Correlation, type FlaggedDie, type LotAnalysis, type LotStats,
  type ParamSummary, type PatLimits, type Reason, type SiteBias, type StaticReference, type WaferAnalysis,
} from './types';

export interface AnalysisHistory {
  /** Number of earlier lots the references come from. */
  lots: number;
  /** Per parameter, on its analysis scale: pooled median and robust sigma of the earlier lots. */
  references: Record<string, StaticReference>;
}

export interface AnalyzeOptions {
  settings?: Partial<AnalysisSettings>;
  /** Earlier lots for static PAT and excursion scores against history. */
  history?: AnalysisHistory;
  /** Called after each step with (done, total). */
  onProgress?: (done: number, total: number) => void;
  /** Known wafer geometry (from the file or the user's settings) for the spatial step; what is
   * not given is inferred from the die grid. */
  geometry?: (frame: WaferFrame) => Partial<WaferGeometry> | undefined;
}

export function methodDescription(settings: AnalysisSettings): string {
  const m = settings.methods;
  const parts: string[] = [];
  const pat = [m.patWafer && 'per wafer', m.patLot && 'per lot', m.patStatic && 'static from earlier lots'].filter(Boolean).join(', ');
  if (pat) parts.push(`PAT (AEC-Q001: median +/- ${settings.patLimit} x (Q3 - Q1)/1.35, on log10|I| for currents, within spec limits) ${pat}`);
  if (m.nnr) parts.push(`NNR (value - median of neighbours within ${settings.nnrRadius} die, |residual z| > ${settings.nnrLimit}, ${settings.nnrParams === 'leakage' ? 'leakage currents' : settings.nnrParams === 'currents' ? 'currents' : 'all parameters'})`);
  if (m.gdbn) parts.push(`GDBN (passing die with >= ${Math.round(settings.gdbnFraction * 100)} % of its neighbours flagged)`);
  return parts.join('; ');
}

/** Concatenates the frames of one lot into one frame-like set of columns. */
export function concatFrames(frames: WaferFrame[]): Pick<WaferFrame, 'params' | 'values' | 'site'> {
  const params = frames[0]?.params.map((p) => ({ ...p })) ?? [];
  for (const f of frames) for (const p of f.params) if (!params.some((q) => q.name === p.name)) params.push({ ...p });
  const total = frames.reduce((n, f) => n + f.x.length, 0);
  const site = new Int32Array(total);
  const values: Record<string, Float64Array> = {};
  for (const p of params) values[p.name] = new Float64Array(total).fill(NaN);
  let at = 0;
  for (const f of frames) {
    site.set(f.site, at);
    for (const p of f.params) values[p.name].set(f.values[p.name], at);
    at += f.x.length;
  }
  return { params, values, site };
}

export function analyzeLot(frames: WaferFrame[], options: AnalyzeOptions = {}): LotAnalysis {
  const settings = resolveSettings(options.settings);
  const lotNames = [...new Set(frames.map((f) => f.lot))];
  const wafers = new Map<WaferFrame, WaferAnalysis>();
  const lots: LotStats[] = [];
  const flagged: FlaggedDie[] = [];
  const warnings: string[] = [];
  // Progress in wafers, as the callers count it: each lot's share advances parameter by parameter.
  let before = 0;
  const total = frames.length;
  for (const lot of lotNames) {
    const ofLot = frames.filter((f) => f.lot === lot);
    const result = analyzeOneLot(ofLot, settings, options.history, (fraction) => options.onProgress?.(Math.floor(before + fraction * ofLot.length), total));
    before += ofLot.length;
    ofLot.forEach((f, i) => wafers.set(f, result.wafers[i]));
    lots.push(result.lot);
    flagged.push(...result.flagged);
  }
  if (settings.methods.patStatic) {
    const n = options.history?.lots ?? 0;
    if (n === 0) warnings.push(`Static PAT not applied: no earlier lots in the store (AEC-Q001 asks for at least ${settings.staticMinLots}).`);
    else if (n < settings.staticMinLots) warnings.push(`Static PAT limits come from ${n} earlier lot${n === 1 ? '' : 's'}; AEC-Q001 asks for at least ${settings.staticMinLots}.`);
  }
  if (settings.temperatureC === null && options.history && options.history.lots > 0) {
    warnings.push('Chuck temperature unknown: earlier lots are compared as if measured at the same temperature.');
  }
  const waferList = frames.map((f) => wafers.get(f)!);
  attachPatterns(frames, flagged, options.geometry).forEach((pattern, i) => { waferList[i].pattern = pattern; });
  return {
    settings, method: methodDescription(settings), wafers: waferList, lots, flagged,
    ...(warnings.length ? { warnings } : {}),
  };
}

interface WaferWork {
  frame: WaferFrame;
  params: Record<string, ParamSummary>;
  sites: Record<string, Record<string, ParamSummary>>;
  siteBias: SiteBias[];
  correlation: Correlation[];
  correlationBySite: Record<string, Correlation[]>;
  reasons: Map<number, Reason[]>;
  hood?: Neighbourhood;
  dies?: Map<number, Uint32Array>;
  /** The wafer's sites ascending and each die's index among them (-1 for an unknown site). */
  siteTable?: { sites: number[]; slotOfDie: Int32Array };
}

/** Slots of a sorted column's entries, from the wafer's site table (built once per wafer). */
function slotsOf(wk: WaferWork, col: SortedColumn, buffers: Buffers): { sites: number[]; slot: Int32Array } {
  if (!wk.siteTable) {
    const { sites, slot } = siteSlots(wk.frame.site);
    wk.siteTable = { sites, slotOfDie: slot };
  }
  const { sites, slotOfDie } = wk.siteTable;
  const slot = new Int32Array(buffers.u32('slots', col.order.length).buffer, 0, col.order.length);
  for (let k = 0; k < slot.length; k++) slot[k] = slotOfDie[col.order[k]];
  // Sites whose dies all lack this parameter drop out, as they would from the column's own labels.
  const present = new Uint8Array(sites.length);
  for (let k = 0; k < slot.length; k++) if (slot[k] >= 0) present[slot[k]] = 1;
  if (present.every((p) => p === 1)) return { sites, slot };
  const renumber = new Int32Array(sites.length).fill(-1);
  const kept: number[] = [];
  sites.forEach((site, i) => { if (present[i]) { renumber[i] = kept.length; kept.push(site); } });
  for (let k = 0; k < slot.length; k++) if (slot[k] >= 0) slot[k] = renumber[slot[k]];
  return { sites: kept, slot };
}

/** Ranks and the log10|Ioff| column kept for an Ion-Ioff pair until both members are done. */
interface PairRanks { wafer: Float32Array[]; site: Float32Array[]; lot: Float32Array[]; lotSite: Float32Array[]; log: Float64Array[] }

function nanRanks(n: number): Float32Array {
  return new Float32Array(n).fill(NaN);
}

function addReason(work: WaferWork, die: number, reason: Reason): void {
  const list = work.reasons.get(die);
  if (list) list.push(reason); else work.reasons.set(die, [reason]);
}

function analyzeOneLot(frames: WaferFrame[], settings: AnalysisSettings, history: AnalysisHistory | undefined, progress: (fraction: number) => void) {
  const lot = frames[0].lot;
  const allParams = frames[0].params.map((p) => ({ ...p }));
  for (const f of frames) for (const p of f.params) if (!allParams.some((q) => q.name === p.name)) allParams.push({ ...p });
  const pairs = tradeoffPairs(allParams.map((p) => p.name));
  const pairOf = new Map<string, (typeof pairs)[number]>();
  for (const pair of pairs) { pairOf.set(pair.ioff, pair); pairOf.set(pair.ion, pair); }
  // Pair members first and adjacent, so their ranks can be released as soon as the pair is done.
  const ordered = [...pairs.flatMap((p) => [p.ioff, p.ion]), ...allParams.map((p) => p.name).filter((n) => !pairOf.has(n))]
    .map((name) => allParams.find((p) => p.name === name)!);

  const work: WaferWork[] = frames.map((frame) => ({
    frame, params: {}, sites: {}, siteBias: [], correlation: [], correlationBySite: {}, reasons: new Map(),
  }));
  const lotParams: Record<string, ParamSummary> = {};
  const lotSites: Record<string, Record<string, ParamSummary>> = {};
  const lotSiteBias: SiteBias[] = [];
  const lotCorrelation: Correlation[] = [];
  const lotCorrelationBySite: Record<string, Correlation[]> = {};
  const patLimits: Record<string, PatLimits> = {};
  const centres = new Map<string, (WaferCentre | undefined)[]>();
  const kept = new Map<string, PairRanks>();
  const limit = settings.patLimit;
  const buffers = new Buffers();
  // Wafers of a lot usually share one die grid: build each distinct neighbourhood once.
  const hoods: { x: Int32Array; y: Int32Array; hood: Neighbourhood }[] = [];
  const hoodOf = (f: WaferFrame): Neighbourhood => {
    const same = hoods.find((h) => sameGrid(h.x, h.y, f.x, f.y));
    if (same) return same.hood;
    const hood = neighbourhood(f.x, f.y, settings.nnrRadius);
    hoods.push({ x: f.x, y: f.y, hood });
    return hood;
  };

  for (const [step, param] of ordered.entries()) {
    if (step > 0) progress(step / (ordered.length + 1));
    const current = isCurrentUnit(param.unit);
    const spec = settings.specLimits[param.name];
    const columns: (SortedColumn | undefined)[] = frames.map((f) =>
      f.values[param.name] ? sortColumn(f.values[param.name], param.unit, f.site, buffers) : undefined);
    const pair = pairOf.get(param.name);
    const ranks: PairRanks | undefined = pair ? { wafer: [], site: [], lot: [], lotSite: [], log: [] } : undefined;
    const waferCentres: (WaferCentre | undefined)[] = [];
    // Moments of every wafer and wafer-site group, combined below into the lot's (no extra pass).
    const groupMoments = new Map<string, { values: Moments[]; log10: Moments[] }>();
    const keep = (key: string, s: ParamSummary) => {
      let g = groupMoments.get(key);
      if (!g) { g = { values: [], log10: [] }; groupMoments.set(key, g); }
      g.values.push(momentsOf(s));
      if (s.log10) g.log10.push(momentsOf(s.log10));
    };
    const combined = (key: string) => {
      const g = groupMoments.get(key);
      return g ? { values: combineMoments(g.values), log10: combineMoments(g.log10) } : undefined;
    };

    columns.forEach((col, w) => {
      const wk = work[w];
      const raw = wk.frame.values[param.name];
      const n = wk.frame.x.length;
      if (ranks) {
        ranks.wafer[w] = nanRanks(n); ranks.site[w] = nanRanks(n); ranks.lot[w] = nanRanks(n); ranks.lotSite[w] = nanRanks(n);
        // Only Ioff's log10 column is needed later (the correlation is |Ion| on log10|Ioff|).
        if (pair!.ioff === param.name) ranks.log[w] = new Float64Array(n).fill(NaN);
      }
      if (!col) { waferCentres.push(undefined); return; }
      const scaled = current ? col.scaled : undefined;
      const summary = streamSummary(param.unit, col.sorted, scaled);
      if (summary) { wk.params[param.name] = summary; keep('lot', summary); }
      const slots = slotsOf(wk, col, buffers);
      const bySite = splitBySite(col.sorted, slots, col.zeros, scaled, buffers, 'wafer');
      for (const [site, stream] of bySite) {
        const s = streamSummary(param.unit, stream.sorted, stream.scaled);
        if (s) { (wk.sites[String(site)] ??= {})[param.name] = s; keep(`site ${site}`, s); }
        if (ranks) scatterMidranks(stream.sorted, stream.position, ranks.site[w], col.order);
      }
      wk.siteBias.push(...siteBiasOfStream(param.name, col.sorted, col.site, settings, slots, slots.sites.map((site) => bySite.get(site)?.sorted ?? new Float64Array(0))));
      const rc = robustCentre(col.scaled);
      waferCentres.push(rc ? { centre: rc.centre, sigma: rc.sigma } : undefined);

      if (settings.methods.patWafer) {
        const limits = dynamicPatLimits(col.scaled, col.scale, limit, spec);
        if (limits) flagOutside('pat-wafer', param.name, col.scaled, col.scaledOrder, raw, limits, limit, (die, r) => addReason(wk, die, r));
      }
      const wantNnr = settings.methods.nnr && (settings.nnrParams === 'all' || (current && (settings.nnrParams === 'currents' || !/^ion/i.test(param.name))));
      const keepLog = ranks !== undefined && pair!.ioff === param.name;
      if (wantNnr || keepLog) {
        const perDie = keepLog ? ranks!.log[w] : buffers.f64('perDie', n).fill(NaN);
        for (let k = 0; k < col.scaled.length; k++) perDie[col.scaledOrder[k]] = col.scaled[k];
        if (wantNnr) {
          wk.hood ??= hoodOf(wk.frame);
          flagNnr(param.name, col.scale, raw, nnrResiduals(perDie, wk.hood, buffers), settings.nnrLimit, (die, r) => addReason(wk, die, r), buffers);
        }
      }
      if (ranks) scatterMidranks(col.sorted, col.order, ranks.wafer[w]);
    });
    centres.set(param.name, waferCentres);

    // The lot: one merged stream of every wafer's sorted values.
    const present = columns.map((c, w) => ({ c, w })).filter((e): e is { c: SortedColumn; w: number } => e.c !== undefined);
    if (present.length > 0) {
      const merged = mergeSorted(present.map((e) => e.c), buffers);
      let zeros = 0;
      if (current) while (zeros < merged.sorted.length && merged.sorted[zeros] === 0) zeros++;
      let lotScaled: Float64Array | undefined;
      if (current) {
        lotScaled = buffers.f64('lotStream.scaled', merged.sorted.length - zeros);
        const partScaled = present.map((e) => e.c.scaled);
        const partZeros = Int32Array.from(present, (e) => e.c.zeros);
        const { wafer, position } = merged;
        for (let k = zeros; k < merged.sorted.length; k++) {
          const p = wafer[k];
          lotScaled[k - zeros] = partScaled[p][position[k] - partZeros[p]];
        }
      }
      const scaledLot = lotScaled ?? merged.sorted;
      const summary = streamSummary(param.unit, merged.sorted, lotScaled, combined('lot'));
      if (summary) lotParams[param.name] = summary;
      const lotSlots = siteSlots(merged.site);
      const lotBySite = splitBySite(merged.sorted, lotSlots, zeros, lotScaled, buffers, 'lot');
      for (const [site, stream] of lotBySite) {
        const s = streamSummary(param.unit, stream.sorted, stream.scaled, combined(`site ${site}`));
        if (s) (lotSites[String(site)] ??= {})[param.name] = s;
        if (ranks) scatterLotMidranks(stream.sorted, merged.wafer, merged.die, present.map((e) => ranks.lotSite[e.w]), stream.position);
      }
      if (ranks) scatterLotMidranks(merged.sorted, merged.wafer, merged.die, present.map((e) => ranks.lot[e.w]));
      lotSiteBias.push(...siteBiasOfStream(param.name, merged.sorted, merged.site, settings, lotSlots, lotSlots.sites.map((site) => lotBySite.get(site)?.sorted ?? new Float64Array(0))));
      const scale = current ? 'log10' : 'linear';
      const lotLimits = dynamicPatLimits(scaledLot, scale, limit, spec);
      if (lotLimits) patLimits[param.name] = lotLimits;
      const reference = history?.references[param.name];
      const staticLimits = settings.methods.patStatic && reference ? staticPatLimits(reference, scale, limit, spec) : undefined;
      for (const { c, w } of present) {
        const raw = work[w].frame.values[param.name];
        if (settings.methods.patLot && lotLimits) flagOutside('pat-lot', param.name, c.scaled, c.scaledOrder, raw, lotLimits, limit, (die, r) => addReason(work[w], die, r));
        if (staticLimits) flagOutside('pat-static', param.name, c.scaled, c.scaledOrder, raw, staticLimits, limit, (die, r) => addReason(work[w], die, r));
      }
    }

    if (ranks) kept.set(param.name, ranks);
    if (pair && kept.has(pair.ion) && kept.has(pair.ioff)) {
      const ri = kept.get(pair.ion)!;
      const ro = kept.get(pair.ioff)!;
      const lotSegments: PairSegment[] = [];
      const lotSiteSegments = new Map<number, PairSegment[]>();
      work.forEach((wk, w) => {
        const f = wk.frame;
        if (!f.values[pair.ion] || !f.values[pair.ioff]) return;
        const whole = { logIoff: ro.log[w], ion: f.values[pair.ion] };
        const c = pairCorrelation(pair.device, pair.ion, pair.ioff, [{ ...whole, rankIoff: ro.wafer[w], rankIon: ri.wafer[w], dies: null }]);
        if (c) wk.correlation.push(c);
        for (const [site, dies] of (wk.dies ??= diesBySite(f.site))) {
          const cs = pairCorrelation(pair.device, pair.ion, pair.ioff, [{ ...whole, rankIoff: ro.site[w], rankIon: ri.site[w], dies }]);
          if (cs) (wk.correlationBySite[String(site)] ??= []).push(cs);
          const list = lotSiteSegments.get(site) ?? [];
          list.push({ ...whole, rankIoff: ro.lotSite[w], rankIon: ri.lotSite[w], dies });
          lotSiteSegments.set(site, list);
        }
        lotSegments.push({ ...whole, rankIoff: ro.lot[w], rankIon: ri.lot[w], dies: null });
      });
      const c = pairCorrelation(pair.device, pair.ion, pair.ioff, lotSegments);
      if (c) lotCorrelation.push(c);
      for (const [site, segments] of [...lotSiteSegments].sort((a, b) => a[0] - b[0])) {
        const cs = pairCorrelation(pair.device, pair.ion, pair.ioff, segments);
        if (cs) (lotCorrelationBySite[String(site)] ??= []).push(cs);
      }
      kept.delete(pair.ion);
      kept.delete(pair.ioff);
    }
  }

  // GDBN needs every other method's flags of the wafer.
  const masks = work.map((wk) => {
    const mask = new Uint8Array(wk.frame.x.length);
    for (const die of wk.reasons.keys()) mask[die] = 1;
    return mask;
  });
  if (settings.methods.gdbn) {
    work.forEach((wk, w) => {
      wk.hood ??= hoodOf(wk.frame);
      flagGdbn(masks[w], wk.hood, settings.gdbnFraction, settings.gdbnMinNeighbours, (die) => strongest(wk.frame, die, centres, w), limit,
        (die, r) => addReason(wk, die, r));
    });
  }

  // Mechanism triage: each wafer's unflagged dies give the band's centre and spread, the lot's
  // its slopes (bands.ts).
  const bands = tradeoffBands(frames, pairs, masks, settings.mechanism);
  const lotBands = bands.lot;
  const waferBands = bands.wafers;
  const ms = settings.mechanism;

  const flagged: FlaggedDie[] = [];
  const waferResults: WaferAnalysis[] = [];
  const fractions: number[] = [];
  work.forEach((wk, w) => {
    const f = wk.frame;
    const devices = deviceColumns(f)
      .map((cols) => ({ cols, band: waferBands[w].find((b) => b.device === cols.device)! }))
      .filter((d) => d.band);
    const indices = [...wk.reasons.keys()].sort((a, b) => a - b);
    for (const index of indices) {
      const values: Record<string, number | null> = {};
      for (const p of f.params) {
        const v = f.values[p.name][index];
        values[p.name] = Number.isFinite(v) ? v : null;
      }
      flagged.push({
        lot: f.lot, wafer: f.wafer, x: f.x[index], y: f.y[index], site: f.site[index], index,
        reasons: wk.reasons.get(index)!, values, mechanism: classifyDie(index, devices, ms, settings.temperatureC),
      });
    }
    fractions.push(f.x.length ? indices.length / f.x.length : 0);
    waferResults.push({
      lot: f.lot, wafer: f.wafer, dies: f.x.length, params: wk.params, sites: sortKeys(wk.sites), correlation: wk.correlation,
      correlationBySite: sortKeys(wk.correlationBySite), siteBias: wk.siteBias, flaggedCount: indices.length,
      excursion: { score: 0, param: '', shift: 0, shifts: {}, flaggedFraction: 0 }, tradeoff: waferBands[w],
    });
  });
  progress(1);
  const scores = excursionScores(centres, fractions, history);
  waferResults.forEach((r, w) => { r.excursion = scores[w]; });
  const waferOrder = waferResults
    .map((r) => r)
    .sort((a, b) => b.excursion.score - a.excursion.score || b.excursion.flaggedFraction - a.excursion.flaggedFraction)
    .map((r) => r.wafer);
  const lotStats: LotStats = {
    lot, wafers: frames.length, dies: frames.reduce((n, f) => n + f.x.length, 0), params: lotParams, sites: sortKeys(lotSites),
    correlation: lotCorrelation, correlationBySite: sortKeys(lotCorrelationBySite), siteBias: lotSiteBias,
    hardwareSuspects: hardwareSuspects(waferResults.map((r) => r.siteBias), settings.hardwareSuspectFraction),
    waferOrder, tradeoff: lotBands, patLimits,
  };
  return { wafers: waferResults, lot: lotStats, flagged };
}

/** The parameter where the die is farthest from its wafer's median, in robust sigmas. */
function strongest(frame: WaferFrame, die: number, centres: Map<string, (WaferCentre | undefined)[]>, w: number) {
  let best = { param: frame.params[0]?.name ?? '', value: NaN, score: 0, scale: 'linear' as 'log10' | 'linear' };
  for (const p of frame.params) {
    const c = centres.get(p.name)?.[w];
    const raw = frame.values[p.name][die];
    if (!c || !(c.sigma > 0) || !Number.isFinite(raw)) continue;
    const current = isCurrentUnit(p.unit);
    const v = current ? Math.log10(Math.abs(raw)) : raw;
    if (!Number.isFinite(v)) continue;
    const z = (v - c.centre) / c.sigma;
    if (Math.abs(z) > Math.abs(best.score) || !Number.isFinite(best.value)) best = { param: p.name, value: raw, score: z, scale: current ? 'log10' : 'linear' };
  }
  return best;
}
