// Full analysis of a set of wafer frames: statistics per wafer, per lot and per probe site,
// Ion-Ioff correlation, probe-site bias, outliers (PAT per wafer, per lot and static; NNR; GDBN),
// mechanism triage, excursion scores and the flagged-die list. Pure; every front end calls it.
//
// For speed every parameter of every wafer is sorted exactly once (radix ordering); quartiles,
// per-site statistics, rank tests, PAT tails and ranks for Spearman are all read from that
// ordering, and the lot's ordering is a k-way merge of the wafers' (see sortedColumn.ts).
// Parameters are processed one at a time over all wafers, so only one parameter's orderings
// (two for an Ion-Ioff pair) are held at once.

import type { ParamInfo, WaferFrame } from '../frame';
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
  /** Scratch memory kept by the caller between analyses (one per thread, never two analyses at
   * once): the next lot reuses it instead of allocating and zeroing it again. */
  scratch?: Buffers;
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
  // Progress in wafers, as the callers count it: each lot's share advances parameter by parameter.
  let before = 0;
  const total = frames.length;
  const lots = lotsOf(frames);
  const results = lots.map((ofLot) => {
    const result = analyzeOneLot(ofLot, settings, options.history, options.scratch, (fraction) => options.onProgress?.(Math.floor(before + fraction * ofLot.length), total));
    before += ofLot.length;
    return result;
  });
  return assemble(frames, lots, results, settings, options);
}

/**
 * The same analysis as `analyzeLot`, from parameter groups computed apart (`planParamGroups`,
 * `analyzeParamGroup`, typically in worker threads). Gives exactly what `analyzeLot` gives.
 */
export function analyzeLotFromGroups(frames: WaferFrame[], groups: ParamGroupResult[], options: Omit<AnalyzeOptions, 'onProgress'> = {}): LotAnalysis {
  const settings = resolveSettings(options.settings);
  const lots = lotsOf(frames);
  const results = lots.map((ofLot) => completeOneLot(ofLot, groups, settings, options.history, new NeighbourhoodCache()));
  return assemble(frames, lots, results, settings, options);
}

function lotsOf(frames: WaferFrame[]): WaferFrame[][] {
  return [...new Set(frames.map((f) => f.lot))].map((lot) => frames.filter((f) => f.lot === lot));
}

function assemble(
  frames: WaferFrame[], lots: WaferFrame[][], results: ReturnType<typeof completeOneLot>[], settings: AnalysisSettings, options: Omit<AnalyzeOptions, 'onProgress'>,
): LotAnalysis {
  const wafers = new Map<WaferFrame, WaferAnalysis>();
  lots.forEach((ofLot, l) => ofLot.forEach((f, i) => wafers.set(f, results[l].wafers[i])));
  const warnings: string[] = [];
  if (settings.methods.patStatic) {
    const n = options.history?.lots ?? 0;
    if (n === 0) warnings.push(`Static PAT not applied: no earlier lots in the store (AEC-Q001 asks for at least ${settings.staticMinLots}).`);
    else if (n < settings.staticMinLots) warnings.push(`Static PAT limits come from ${n} earlier lot${n === 1 ? '' : 's'}; AEC-Q001 asks for at least ${settings.staticMinLots}.`);
  }
  if (settings.temperatureC === null && options.history && options.history.lots > 0) {
    warnings.push('Chuck temperature unknown: earlier lots are compared as if measured at the same temperature.');
  }
  const flagged = results.flatMap((r) => r.flagged);
  const waferList = frames.map((f) => wafers.get(f)!);
  attachPatterns(frames, flagged, options.geometry).forEach((pattern, i) => { waferList[i].pattern = pattern; });
  return {
    settings, method: methodDescription(settings), wafers: waferList, lots: results.map((r) => r.lot), flagged,
    ...(warnings.length ? { warnings } : {}),
  };
}

/** One wafer's results of a parameter group. */
interface WaferPart {
  params: Record<string, ParamSummary>;
  sites: Record<string, Record<string, ParamSummary>>;
  siteBias: SiteBias[];
  correlation: Correlation[];
  correlationBySite: Record<string, Correlation[]>;
  /** Per flagged die (index in the frame): the PAT and NNR reasons, in analysis order. */
  reasons: Map<number, Reason[]>;
}

interface WaferWork extends WaferPart {
  frame: WaferFrame;
  hood?: Neighbourhood;
  dies?: Map<number, Uint32Array>;
  /** The wafer's sites ascending and each die's index among them (-1 for an unknown site). */
  siteTable?: { sites: number[]; slotOfDie: Int32Array; slotOfSite?: Int32Array };
}

/** Slots of a sorted column's entries, from the wafer's site table (built once per wafer). */
function slotsOf(wk: WaferWork, col: SortedColumn, buffers: Buffers): { sites: number[]; slot: Int32Array } {
  if (!wk.siteTable) {
    // With ordinary site numbers, the dense site -> slot table is read along the column's own site labels.
    const { sites, slot, slotOfSite } = siteSlots(wk.frame.site);
    wk.siteTable = { sites, slotOfDie: slot, slotOfSite };
  }
  const { sites, slotOfDie, slotOfSite } = wk.siteTable;
  const slot = new Int32Array(buffers.u32('slots', col.order.length).buffer, 0, col.order.length);
  // Sites whose dies all lack this parameter drop out, as they would from the column's own labels.
  const present = new Uint8Array(sites.length);
  if (slotOfSite) fillSlotsBySite(col.site, slotOfSite, slot, present);
  else fillSlotsByDie(col.order, slotOfDie, slot, present);
  if (present.every((p) => p === 1)) return { sites, slot };
  const renumber = new Int32Array(sites.length).fill(-1);
  const kept: number[] = [];
  sites.forEach((site, i) => { if (present[i]) { renumber[i] = kept.length; kept.push(site); } });
  for (let k = 0; k < slot.length; k++) if (slot[k] >= 0) slot[k] = renumber[slot[k]];
  return { sites: kept, slot };
}

function fillSlotsBySite(site: Int32Array, slotOfSite: Int32Array, slot: Int32Array, present: Uint8Array): void {
  for (let k = 0; k < slot.length; k++) {
    const s = site[k];
    const t = s >= 0 && s < slotOfSite.length ? slotOfSite[s] : -1;
    slot[k] = t;
    if (t >= 0) present[t] = 1;
  }
}

function fillSlotsByDie(order: Uint32Array, slotOfDie: Int32Array, slot: Int32Array, present: Uint8Array): void {
  for (let k = 0; k < slot.length; k++) {
    const t = slotOfDie[order[k]];
    slot[k] = t;
    if (t >= 0) present[t] = 1;
  }
}

/** Ranks and the log10|Ioff| column kept for an Ion-Ioff pair until both members are done. */
interface PairRanks { wafer: Float32Array[]; site: Float32Array[]; lot: Float32Array[]; lotSite: Float32Array[]; log: Float64Array[] }

// The per-element loops live in small functions of their own: called for every wafer, they are
// optimised at once, where a loop inside the long per-lot function would run in a slower tier
// (boxing every double) for most of a lot.

/** target[die[k]] = values[k]. */
function scatterByDie(values: Float64Array, die: Uint32Array, target: Float64Array): void {
  for (let k = 0; k < values.length; k++) target[die[k]] = values[k];
}

/** The lot's analysis-scale stream, gathered from the wafers' (the zeros, first in the merged
 * stream, have none). */
function gatherScaled(merged: { sorted: Float64Array; wafer: Uint16Array; position: Uint32Array }, zeros: number, parts: SortedColumn[], into: Float64Array): void {
  const partScaled = parts.map((c) => c.scaled);
  const partZeros = Int32Array.from(parts, (c) => c.zeros);
  const { wafer, position } = merged;
  for (let k = zeros; k < merged.sorted.length; k++) {
    const p = wafer[k];
    into[k - zeros] = partScaled[p][position[k] - partZeros[p]];
  }
}

function addReason(work: WaferWork, die: number, reason: Reason): void {
  const list = work.reasons.get(die);
  if (list) list.push(reason); else work.reasons.set(die, [reason]);
}

/** The lot's parameters in the order they are analysed: each Ion-Ioff pair first and adjacent (so
 * its ranks can be released as soon as the pair is done), then the rest in file order. Reasons,
 * summaries and site-bias entries appear in this order whatever way the work is split. */
export function analysisOrder(frames: WaferFrame[]): ParamInfo[] {
  const allParams = frames[0]?.params.map((p) => ({ ...p })) ?? [];
  for (const f of frames) for (const p of f.params) if (!allParams.some((q) => q.name === p.name)) allParams.push({ ...p });
  const pairs = tradeoffPairs(allParams.map((p) => p.name));
  const inPair = new Set(pairs.flatMap((p) => [p.ioff, p.ion]));
  return [...pairs.flatMap((p) => [p.ioff, p.ion]), ...allParams.map((p) => p.name).filter((n) => !inPair.has(n))]
    .map((name) => allParams.find((p) => p.name === name)!);
}

/**
 * Splits the lot's parameters into at most `parts` groups that can be analysed independently (in
 * separate threads) and joined by `completeLot`: contiguous runs of `analysisOrder`, never
 * separating an Ion-Ioff pair, balanced by an estimate of the work (a pair member costs more:
 * its ranks feed the Spearman correlations).
 */
export function planParamGroups(frames: WaferFrame[], parts: number): string[][] {
  const ordered = analysisOrder(frames).map((p) => p.name);
  const pairs = tradeoffPairs(ordered);
  const units: { names: string[]; weight: number }[] = [
    ...pairs.map((p) => ({ names: [p.ioff, p.ion], weight: 2 * PAIR_MEMBER_WEIGHT })),
    ...ordered.slice(pairs.length * 2).map((name) => ({ names: [name], weight: 1 })),
  ];
  const count = Math.max(1, Math.min(Math.floor(parts), units.length));
  let remaining = units.reduce((sum, u) => sum + u.weight, 0);
  const groups: string[][] = [];
  let at = 0;
  for (let g = 0; g < count; g++) {
    const left = count - g;
    const target = remaining / left;
    const group: string[] = [];
    let weight = 0;
    // Take units while the group is under its share, leaving at least one unit per later group.
    while (at < units.length && units.length - at > left - 1 && (group.length === 0 || left === 1 || weight + units[at].weight / 2 <= target)) {
      group.push(...units[at].names);
      weight += units[at].weight;
      at++;
    }
    remaining -= weight;
    groups.push(group);
  }
  return groups.filter((g) => g.length > 0);
}

/** Relative cost of analysing one member of an Ion-Ioff pair against another parameter (measured
 * on the full-size bench lot). */
const PAIR_MEMBER_WEIGHT = 1.4;

/** Neighbourhoods shared by the wafers of a lot that have one die grid, built once. */
export class NeighbourhoodCache {
  private readonly hoods: { x: Int32Array; y: Int32Array; radius: number; hood: Neighbourhood }[] = [];
  of(f: WaferFrame, radius: number): Neighbourhood {
    const same = this.hoods.find((h) => h.radius === radius && sameGrid(h.x, h.y, f.x, f.y));
    if (same) return same.hood;
    const hood = neighbourhood(f.x, f.y, radius);
    this.hoods.push({ x: f.x, y: f.y, radius, hood });
    return hood;
  }
}

/** What analysing some parameters of one lot gives, wafer by wafer and for the lot: plain data
 * (structured-clone safe), so a worker thread can compute it and post it back. */
export interface ParamGroupResult {
  lot: string;
  /** The group's parameters in analysis order. */
  names: string[];
  wafers: WaferPart[];
  lotStats: Omit<WaferPart, 'reasons'> & { patLimits: Record<string, PatLimits> };
  /** Per parameter, each wafer's robust centre and sigma on the analysis scale. */
  centres: Map<string, (WaferCentre | undefined)[]>;
}

/** A group's per-wafer and per-lot results, empty, to be filled. */
function emptyResults(frames: WaferFrame[]): { work: WaferWork[]; lotStats: ParamGroupResult['lotStats']; centres: ParamGroupResult['centres'] } {
  return {
    work: frames.map((frame) => ({ frame, params: {}, sites: {}, siteBias: [], correlation: [], correlationBySite: {}, reasons: new Map() })),
    lotStats: { params: {}, sites: {}, siteBias: [], correlation: [], correlationBySite: {}, patLimits: {} },
    centres: new Map(),
  };
}

/**
 * Statistics, site bias, correlations and the per-parameter flags (PAT, NNR) of the named
 * parameters over the wafers of one lot. Frames need only those parameters' columns.
 */
export function analyzeParamGroup(
  frames: WaferFrame[], names: readonly string[], options: Pick<AnalyzeOptions, 'settings' | 'history' | 'scratch'> & { onProgress?: (fraction: number) => void; hoods?: NeighbourhoodCache } = {},
): ParamGroupResult {
  const settings = resolveSettings(options.settings);
  const history = options.history;
  const progress = options.onProgress ?? (() => {});
  const lot = frames[0].lot;
  const wanted = new Set(names);
  const ordered = analysisOrder(frames).filter((p) => wanted.has(p.name));
  const pairs = tradeoffPairs(ordered.map((p) => p.name));
  const pairOf = new Map<string, (typeof pairs)[number]>();
  for (const pair of pairs) { pairOf.set(pair.ioff, pair); pairOf.set(pair.ion, pair); }

  const { work, lotStats, centres } = emptyResults(frames);
  const { params: lotParams, sites: lotSites, siteBias: lotSiteBias, correlation: lotCorrelation, correlationBySite: lotCorrelationBySite, patLimits } = lotStats;
  const kept = new Map<string, PairRanks>();
  const limit = settings.patLimit;
  const buffers = options.scratch ?? new Buffers();
  const hoods = options.hoods ?? new NeighbourhoodCache();
  const hoodOf = (f: WaferFrame): Neighbourhood => hoods.of(f, settings.nnrRadius);

  for (const [step, param] of ordered.entries()) {
    if (step > 0) progress(step / ordered.length);
    const current = isCurrentUnit(param.unit);
    const spec = settings.specLimits[param.name];
    // Each wafer's column lives in memory kept for that wafer, reused by the next parameter.
    const columns: (SortedColumn | undefined)[] = frames.map((f, w) =>
      f.values[param.name] ? sortColumn(f.values[param.name], param.unit, f.site, buffers, `column ${w}`) : undefined);
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
        // Kept per pair member and wafer until the pair is done, then reused by the next pair.
        const member = pair!.ioff === param.name ? 'ioff' : 'ion';
        const nan = (kind: string) => buffers.f32(`ranks ${member} ${kind} ${w}`, n).fill(NaN);
        ranks.wafer[w] = nan('wafer'); ranks.site[w] = nan('site'); ranks.lot[w] = nan('lot'); ranks.lotSite[w] = nan('lot site');
        // Only Ioff's log10 column is needed later (the correlation is |Ion| on log10|Ioff|).
        if (member === 'ioff') ranks.log[w] = buffers.f64(`log10 ioff ${w}`, n).fill(NaN);
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
        scatterByDie(col.scaled, col.scaledOrder, perDie);
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
      const zeros = present.reduce((n, e) => n + e.c.zeros, 0);
      let lotScaled: Float64Array | undefined;
      if (current) {
        lotScaled = buffers.f64('lotStream.scaled', merged.sorted.length - zeros);
        gatherScaled(merged, zeros, present.map((e) => e.c), lotScaled);
      }
      const scaledLot = lotScaled ?? merged.sorted;
      const summary = streamSummary(param.unit, merged.sorted, lotScaled, combined('lot'));
      if (summary) lotParams[param.name] = summary;
      // Scratch for the lot's mid-ranks in each wafer's stream order (streams.ts).
      const orders = present.map((e) => e.c.order);
      const byPosition = ranks ? present.map((e, i) => buffers.f32(`lot ranks by position ${i}`, e.c.order.length)) : [];
      const lotSlots = siteSlots(merged.site, new Int32Array(buffers.u32('lot.slots', merged.site.length).buffer, 0, merged.site.length));
      const lotBySite = splitBySite(merged.sorted, lotSlots, zeros, lotScaled, buffers, 'lot');
      for (const [site, stream] of lotBySite) {
        const s = streamSummary(param.unit, stream.sorted, stream.scaled, combined(`site ${site}`));
        if (s) (lotSites[String(site)] ??= {})[param.name] = s;
        if (ranks) scatterLotMidranks(stream.sorted, merged, orders, present.map((e) => ranks.lotSite[e.w]), byPosition, stream.position);
      }
      if (ranks) scatterLotMidranks(merged.sorted, merged, orders, present.map((e) => ranks.lot[e.w]), byPosition);
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

  progress(1);
  return {
    lot, names: ordered.map((p) => p.name),
    wafers: work.map((wk) => ({
      params: wk.params, sites: wk.sites, siteBias: wk.siteBias, correlation: wk.correlation,
      correlationBySite: wk.correlationBySite, reasons: wk.reasons,
    })),
    lotStats,
    centres,
  };
}

function analyzeOneLot(frames: WaferFrame[], settings: AnalysisSettings, history: AnalysisHistory | undefined, scratch: Buffers | undefined, progress: (fraction: number) => void) {
  const hoods = new NeighbourhoodCache();
  const names = analysisOrder(frames).map((p) => p.name);
  // The last of names.length + 1 steps is the joining work.
  const group = analyzeParamGroup(frames, names, { settings, history, hoods, scratch, onProgress: (f) => progress(f * names.length / (names.length + 1)) });
  const result = completeOneLot(frames, [group], settings, history, hoods);
  progress(1);
  return result;
}

/**
 * Joins the parameter groups of one lot (all of them, from `analyzeParamGroup`, in any order) and
 * does what needs every parameter at once: GDBN, the trade-off bands and mechanism triage, the
 * flagged-die list and the excursion scores. Frames need every parameter's column.
 */
function completeOneLot(frames: WaferFrame[], groups: ParamGroupResult[], settings: AnalysisSettings, history: AnalysisHistory | undefined, hoods: NeighbourhoodCache) {
  const lot = frames[0].lot;
  const ordered = analysisOrder(frames).map((p) => p.name);
  const position = (g: ParamGroupResult) => Math.min(...g.names.map((n) => ordered.indexOf(n)).filter((i) => i >= 0));
  const sorted = groups.filter((g) => g.lot === lot).sort((a, b) => position(a) - position(b));
  const covered = new Set(sorted.flatMap((g) => g.names));
  const missing = ordered.filter((n) => !covered.has(n));
  if (missing.length > 0) throw new Error(`Analysis of lot ${lot} is missing parameter${missing.length === 1 ? '' : 's'} ${missing.join(', ')}.`);
  if (sorted.some((g) => g.wafers.length !== frames.length)) throw new Error(`Analysis of lot ${lot}: a parameter group covers another set of wafers.`);
  const pairs = tradeoffPairs(ordered);
  const limit = settings.patLimit;
  const hoodOf = (f: WaferFrame): Neighbourhood => hoods.of(f, settings.nnrRadius);

  // Join the groups in analysis order, so every list reads as if one pass had made it.
  const { work, lotStats: joined, centres } = emptyResults(frames);
  const { params: lotParams, sites: lotSites, siteBias: lotSiteBias, correlation: lotCorrelation, correlationBySite: lotCorrelationBySite, patLimits } = joined;
  const joinSites = (into: Record<string, Record<string, ParamSummary>>, from: Record<string, Record<string, ParamSummary>>) => {
    for (const [site, params] of Object.entries(from)) Object.assign(into[site] ??= {}, params);
  };
  const joinBySite = (into: Record<string, Correlation[]>, from: Record<string, Correlation[]>) => {
    for (const [site, list] of Object.entries(from)) (into[site] ??= []).push(...list);
  };
  for (const g of sorted) {
    g.wafers.forEach((part, w) => {
      const wk = work[w];
      Object.assign(wk.params, part.params);
      joinSites(wk.sites, part.sites);
      wk.siteBias.push(...part.siteBias);
      wk.correlation.push(...part.correlation);
      joinBySite(wk.correlationBySite, part.correlationBySite);
      for (const [die, reasons] of part.reasons) {
        const list = wk.reasons.get(die);
        if (list) list.push(...reasons); else wk.reasons.set(die, [...reasons]);
      }
    });
    Object.assign(lotParams, g.lotStats.params);
    joinSites(lotSites, g.lotStats.sites);
    lotSiteBias.push(...g.lotStats.siteBias);
    lotCorrelation.push(...g.lotStats.correlation);
    joinBySite(lotCorrelationBySite, g.lotStats.correlationBySite);
    Object.assign(patLimits, g.lotStats.patLimits);
    for (const [name, list] of g.centres) centres.set(name, list);
  }

  // GDBN needs every other method's flags of the wafer.
  const masks = work.map((wk) => {
    const mask = new Uint8Array(wk.frame.x.length);
    for (const die of wk.reasons.keys()) mask[die] = 1;
    return mask;
  });
  if (settings.methods.gdbn) {
    work.forEach((wk, w) => {
      flagGdbn(masks[w], hoodOf(wk.frame), settings.gdbnFraction, settings.gdbnMinNeighbours, (die) => strongest(wk.frame, die, centres, w), limit,
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
