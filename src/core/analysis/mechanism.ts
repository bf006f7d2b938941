// Mechanism triage: why is a flagged die abnormal? Per device type, the population's Ion-Ioff
// trade-off band is found robustly, and each flagged die's displacement from the wafer's centre is
// compared with the three directions the physics gives (DOMAIN.md):
//   threshold-shift: along the band (Vt or gate length moved: Ioff and Ion up together, or down);
//   extra-leakage:   log10|Ioff| up, Ion and Vt unchanged (gate, junction, GIDL or defect path);
//   weak-drive:      |Ion| down, Ioff and Vt unchanged (series or contact resistance).
//
// The band's slope. Regressing log10|Ioff| on ln|Ion| of the population gives a line that is too
// flat, because Ion carries drive noise of its own (errors in variables). Vt_sat is the common
// cause of the two, so where it is measured the band slope is the ratio of two repeated-median
// slopes on |Vt_sat| (Siegel 1982): (d log10|Ioff| / dVt) / (d ln|Ion| / dVt), an instrumental
// variable estimate. Without Vt_sat it is the physics slope (Vdd - Vt)/(alpha S) (the inverse of
// d ln Ion / d log10 Ioff = alpha S/(Vdd - Vt), DOMAIN.md), with alpha, S and Vdd from settings.
//
// The leakage path. Where the device's gate leakage Ig is measured, an extra-leakage call says
// whether |Ig| rose with Ioff: in the off state, gate tunnelling at the gate-drain overlap flows
// through both the drain and the gate, while junction band-to-band tunnelling, GIDL and most
// defects raise the drain current alone (DOMAIN.md; the Ig split is common practice). "gate" when
// log10|Ig| is at least GATE_LEAKAGE_SIGMAS robust sigmas above the wafer's, "other" otherwise.
//
// Standby current. Where the die's standby supply current Isb is measured, every call carries its
// change too, and an extra-leakage call says when the added leakage shows in it (at least
// GATE_LEAKAGE_SIGMAS robust sigmas up): the defect then costs the product's standby current, not
// only the test device's Ioff (common practice).
//
// The call. Each coordinate (ln|Ion|, log10|Ioff|, and |Vt_sat| when measured) is scaled by the
// wafer's robust sigma; the die's displacement is projected on each mechanism's direction
// (threshold-shift either sign, extra-leakage only up, weak-drive only down), the misfit is the
// distance left over, and the confidence is the Gaussian relative likelihood
// exp(-m^2/2) / sum exp(-m_k^2/2). Unclassified, with the reason, when the die is near the
// population on both devices, when no direction fits, or when two fit about equally.

import { repeatedMedianLine } from '../stats';
import type { WaferFrame } from '../frame';
import { tradeoffPairs } from '../params';
import { robustCentre } from './sortedColumn';
import type { MechanismCall, MechanismKind, MechanismSettings, TradeoffBand } from './types';

export interface DeviceColumns {
  device: 'n' | 'p';
  ion: string;
  ioff: string;
  ionValues: Float64Array;
  ioffValues: Float64Array;
  vtSat?: Float64Array;
  vtLin?: Float64Array;
  /** Gate leakage of the device (Ig_n, Ig_p), when measured. */
  ig?: Float64Array;
  /** Standby supply current of the die (Isb, one for both devices), when measured. */
  isb?: Float64Array;
}

/** Robust sigmas of log10|Ig| above the wafer's that make an extra-leakage call a gate path (and
 * of log10|Isb| that make it show in the standby current). */
export const GATE_LEAKAGE_SIGMAS = 3;

export function deviceColumns(frame: Pick<WaferFrame, 'params' | 'values'>): DeviceColumns[] {
  const names = frame.params.map((p) => p.name);
  return tradeoffPairs(names).map((pair) => ({
    device: pair.device, ion: pair.ion, ioff: pair.ioff,
    ionValues: frame.values[pair.ion], ioffValues: frame.values[pair.ioff],
    vtSat: names.includes(`Vtsat_${pair.device}`) ? frame.values[`Vtsat_${pair.device}`] : undefined,
    vtLin: names.includes(`Vtlin_${pair.device}`) ? frame.values[`Vtlin_${pair.device}`] : undefined,
    ig: names.includes(`Ig_${pair.device}`) ? frame.values[`Ig_${pair.device}`] : undefined,
    isb: names.includes('Isb') ? frame.values.Isb : undefined,
  }));
}

/** Points of the band fit: ln|Ion|, log10|Ioff|, |Vt_sat|, log10|Ig| and log10|Isb| (NaN when absent). */
export interface BandSample { lnIon: number[]; logIoff: number[]; vt: number[]; dibl: number[]; swing: number[]; logIg: number[]; logIsb: number[] }

export function emptySample(): BandSample {
  return { lnIon: [], logIoff: [], vt: [], dibl: [], swing: [], logIg: [], logIsb: [] };
}

/** Adds up to `count` unflagged dies, evenly spread over the die order, to a band sample. */
export function addToSample(sample: BandSample, cols: DeviceColumns, flagged: Uint8Array, count: number, settings: MechanismSettings): void {
  const n = cols.ionValues.length;
  const step = Math.max(1, Math.floor(n / count));
  const icc = cols.device === 'n' ? settings.iccN : settings.iccP;
  for (let i = 0; i < n; i += step) {
    if (flagged[i]) continue;
    const ion = Math.abs(cols.ionValues[i]);
    const ioff = Math.abs(cols.ioffValues[i]);
    if (!(ion > 0) || !(ioff > 0) || !Number.isFinite(ion) || !Number.isFinite(ioff)) continue;
    const vt = cols.vtSat ? Math.abs(cols.vtSat[i]) : NaN;
    const vtLin = cols.vtLin ? Math.abs(cols.vtLin[i]) : NaN;
    sample.lnIon.push(Math.log(ion));
    sample.logIoff.push(Math.log10(ioff));
    sample.vt.push(vt);
    sample.dibl.push(diblMvPerV(vtLin, vt, settings));
    sample.swing.push(impliedSwing(vt, ioff, icc, settings));
    sample.logIg.push(cols.ig ? Math.log10(Math.abs(cols.ig[i])) : NaN);
    sample.logIsb.push(cols.isb ? Math.log10(Math.abs(cols.isb[i])) : NaN);
  }
}

export function diblMvPerV(vtLin: number, vtSat: number, settings: MechanismSettings): number {
  return (1000 * (vtLin - vtSat)) / (settings.vdSat - settings.vdLin);
}

/** Swing implied by the constant-current threshold: S = Vt / log10(Icc W/L / Ioff), in mV/decade. */
export function impliedSwing(vt: number, ioff: number, icc: number, settings: MechanismSettings): number {
  const decades = Math.log10((icc * settings.wOverL) / ioff);
  return decades > 0 ? (1000 * vt) / decades : NaN;
}

function finiteMedian(values: number[]): number | undefined {
  return robustOf(values)?.centre;
}

/** Median and (Q3 - Q1)/1.35 of the finite values. */
function robustOf(values: number[]): { centre: number; sigma: number } | undefined {
  const f = Float64Array.from(values.filter(Number.isFinite)).sort();
  if (f.length === 0) return undefined;
  const r = robustCentre(f)!;
  return { centre: r.centre, sigma: r.sigma };
}

/** Points the repeated-median fits use: an even spread of at most this many of the sample. */
const FIT_POINTS = 301;

function thin(values: number[], step: number): number[] {
  return values.filter((_, i) => i % step === 0);
}

/**
 * The band of one device from a sample of its unflagged dies: the centre and spreads are the
 * sample's medians and robust sigmas (the flagged dies are left out, so an excursion on a large
 * part of the wafer does not move the reference it is measured from), the slopes are
 * repeated-median fits on at most 301 of its points, or `slopes` (the lot's band, steadier than
 * one wafer's) when given.
 * @returns undefined when the sample has fewer than 20 dies.
 */
export function buildBand(cols: DeviceColumns, sample: BandSample, settings: MechanismSettings, slopes?: TradeoffBand): TradeoffBand | undefined {
  if (sample.lnIon.length < 20) return undefined;
  const ion = robustOf(sample.lnIon)!;
  const ioff = robustOf(sample.logIoff)!;
  const vt = robustOf(sample.vt);
  const step = Math.max(1, Math.ceil(sample.lnIon.length / FIT_POINTS));
  const fit = { lnIon: thin(sample.lnIon, step), logIoff: thin(sample.logIoff, step), vt: thin(sample.vt, step) };
  let ionPerVt = slopes?.ionPerVt;
  let ioffPerVt = slopes?.ioffPerVt;
  if (!slopes && vt) {
    const ionFit = repeatedMedianLine(fit.vt, fit.lnIon);
    const ioffFit = repeatedMedianLine(fit.vt, fit.logIoff);
    if (ionFit && ioffFit && ionFit.slope < 0 && ioffFit.slope < 0) { ionPerVt = ionFit.slope; ioffPerVt = ioffFit.slope; }
  }
  let slope: number;
  let slopeSource: TradeoffBand['slopeSource'];
  if (ionPerVt !== undefined && ioffPerVt !== undefined) {
    slope = ioffPerVt / ionPerVt;
    slopeSource = 'vt';
  } else {
    slope = (settings.vdd - (vt?.centre ?? 0.4)) / (settings.alpha * settings.swing);
    slopeSource = 'settings';
  }
  // Width of the band: robust spread of the sample's distances above or below the centre line.
  const residuals = sample.lnIon.map((x, i) => sample.logIoff[i] - (ioff.centre + slope * (x - ion.centre)));
  const residualSpread = robustOf(residuals);
  const population = repeatedMedianLine(fit.lnIon, fit.logIoff);
  const dibl = finiteMedian(sample.dibl);
  const swing = finiteMedian(sample.swing);
  const ig = robustOf(sample.logIg);
  const isb = robustOf(sample.logIsb);
  return {
    device: cols.device, ion: cols.ion, ioff: cols.ioff, n: sample.lnIon.length,
    centreLnIon: ion.centre, centreLog10Ioff: ioff.centre, slope, slopeSource,
    ...(population ? { populationFit: { slope: population.slope, intercept: population.intercept } } : {}),
    sigmaLnIon: ion.sigma, sigmaLog10Ioff: ioff.sigma,
    ...(residualSpread ? { residualSigmaDecades: residualSpread.sigma } : {}),
    ...(vt ? { sigmaVt: vt.sigma, centreVt: vt.centre } : {}),
    ...(ionPerVt !== undefined && ioffPerVt !== undefined ? { ionPerVt, ioffPerVt } : {}),
    ...(dibl !== undefined ? { diblMedian: dibl } : {}),
    ...(swing !== undefined ? { swingMedian: swing } : {}),
    ...(ig && ig.sigma > 0 ? { centreLog10Ig: ig.centre, sigmaLog10Ig: ig.sigma } : {}),
    ...(isb && isb.sigma > 0 ? { centreLog10Isb: isb.centre, sigmaLog10Isb: isb.sigma } : {}),
  };
}

interface Candidate { kind: Exclude<MechanismKind, 'unclassified'>; misfit: number }

interface DeviceEvidence {
  device: 'n' | 'p';
  displacement: number;
  candidates: Candidate[];
  detail: Omit<MechanismCall, 'kind' | 'confidence' | 'why' | 'device'>;
}

function unit(v: number[]): number[] {
  const norm = Math.hypot(...v);
  return v.map((c) => c / norm);
}

/** Distance of `d` from the ray (sign > 0), the opposite ray (sign < 0) or the line (0) along u. */
function misfitAlong(d: number[], u: number[], sign: number): number {
  let c = 0;
  for (let i = 0; i < d.length; i++) c += d[i] * u[i];
  if (sign > 0) c = Math.max(c, 0);
  if (sign < 0) c = Math.min(c, 0);
  let sum = 0;
  for (let i = 0; i < d.length; i++) sum += (d[i] - c * u[i]) ** 2;
  return Math.sqrt(sum);
}

function evidence(die: number, cols: DeviceColumns, band: TradeoffBand, settings: MechanismSettings): DeviceEvidence | undefined {
  const ion = Math.abs(cols.ionValues[die]);
  const ioff = Math.abs(cols.ioffValues[die]);
  if (!(ion > 0) || !(ioff > 0) || !Number.isFinite(ion) || !Number.isFinite(ioff)) return undefined;
  if (!(band.sigmaLnIon > 0) || !(band.sigmaLog10Ioff > 0)) return undefined;
  const dx = Math.log(ion) - band.centreLnIon;
  const dy = Math.log10(ioff) - band.centreLog10Ioff;
  const vt = cols.vtSat ? Math.abs(cols.vtSat[die]) : NaN;
  const vtLin = cols.vtLin ? Math.abs(cols.vtLin[die]) : NaN;
  const useVt = Number.isFinite(vt) && band.sigmaVt !== undefined && band.sigmaVt > 0 && band.centreVt !== undefined &&
    band.ionPerVt !== undefined && band.ioffPerVt !== undefined;
  const d = [dx / band.sigmaLnIon, dy / band.sigmaLog10Ioff];
  let along: number[];
  if (useVt) {
    d.push((vt - band.centreVt!) / band.sigmaVt!);
    along = unit([band.ionPerVt! / band.sigmaLnIon, band.ioffPerVt! / band.sigmaLog10Ioff, 1 / band.sigmaVt!]);
  } else {
    along = unit([1 / band.sigmaLnIon, band.slope / band.sigmaLog10Ioff]);
  }
  const leak = d.map((_, i) => (i === 1 ? 1 : 0));
  const drive = d.map((_, i) => (i === 0 ? 1 : 0));
  const icc = cols.device === 'n' ? settings.iccN : settings.iccP;
  const dibl = diblMvPerV(vtLin, vt, settings);
  const swing = impliedSwing(vt, ioff, icc, settings);
  const logIg = cols.ig ? Math.log10(Math.abs(cols.ig[die])) : NaN;
  const igKnown = Number.isFinite(logIg) && band.centreLog10Ig !== undefined && band.sigmaLog10Ig !== undefined;
  const logIsb = cols.isb ? Math.log10(Math.abs(cols.isb[die])) : NaN;
  const isbKnown = Number.isFinite(logIsb) && band.centreLog10Isb !== undefined && band.sigmaLog10Isb !== undefined;
  return {
    device: cols.device,
    displacement: Math.hypot(...d),
    candidates: [
      { kind: 'threshold-shift', misfit: misfitAlong(d, along, 0) },
      { kind: 'extra-leakage', misfit: misfitAlong(d, leak, 1) },
      { kind: 'weak-drive', misfit: misfitAlong(d, drive, -1) },
    ],
    detail: {
      residualDecades: dy - band.slope * dx,
      bandPositionDecades: band.slope * dx,
      ioffDecades: dy,
      ionChange: Math.exp(dx) - 1,
      ...(Number.isFinite(vt) && band.centreVt !== undefined ? { vtShiftMv: 1000 * (vt - band.centreVt) } : {}),
      ...(Number.isFinite(dibl) ? { diblMvPerV: dibl } : {}),
      ...(Number.isFinite(swing) ? { swingMvPerDecade: swing } : {}),
      ...(igKnown ? { igDecades: logIg - band.centreLog10Ig!, igSigmas: (logIg - band.centreLog10Ig!) / band.sigmaLog10Ig! } : {}),
      ...(isbKnown ? { isbDecades: logIsb - band.centreLog10Isb!, isbSigmas: (logIsb - band.centreLog10Isb!) / band.sigmaLog10Isb! } : {}),
    },
  };
}

const WORDS: Record<Exclude<MechanismKind, 'unclassified'>, string> = {
  'threshold-shift': 'along the Ion-Ioff band (Vt or gate length moved)',
  'extra-leakage': 'Ioff above the band with no matching Ion gain (extra leakage path)',
  'weak-drive': 'Ion low at normal Ioff (series or contact resistance)',
};

/** Classifies one flagged die from the bands of its wafer (one per device type). */
export function classifyDie(die: number, devices: { cols: DeviceColumns; band: TradeoffBand }[], settings: MechanismSettings, temperatureC: number | null): MechanismCall {
  const temperature = temperatureC === null ? {} : { temperatureC };
  const found = devices.map((d) => evidence(die, d.cols, d.band, settings)).filter((e): e is DeviceEvidence => e !== undefined);
  if (found.length === 0) {
    return { kind: 'unclassified', confidence: 0, why: devices.length === 0 ? 'no Ion/Ioff pair measured' : 'Ion or Ioff missing at this die', ...temperature };
  }
  const best = found.reduce((a, b) => (b.displacement > a.displacement ? b : a));
  const who = best.device === 'n' ? 'NMOS' : 'PMOS';
  const base = { device: best.device, ...best.detail, ...temperature };
  if (best.displacement < settings.minDisplacement) {
    return { kind: 'unclassified', confidence: 0, ...base, why: `Ion, Ioff${best.detail.vtShiftMv !== undefined ? ' and Vt' : ''} within ${settings.minDisplacement} robust sigmas of the wafer on every device: flagged on other evidence` };
  }
  const ranked = [...best.candidates].sort((a, b) => a.misfit - b.misfit);
  const weights = ranked.map((c) => Math.exp(-0.5 * (c.misfit * c.misfit - ranked[0].misfit * ranked[0].misfit)));
  const confidence = weights[0] / weights.reduce((s, w) => s + w, 0);
  const top = ranked[0];
  if (top.misfit > settings.maxMisfit) {
    return { kind: 'unclassified', confidence: 0, ...base, misfit: top.misfit, why: `${who}: no single mechanism fits (closest ${top.kind} leaves ${top.misfit.toFixed(1)} robust sigmas)` };
  }
  if (confidence < settings.minConfidence) {
    return { kind: 'unclassified', confidence: 0, ...base, misfit: top.misfit, why: `${who}: ${top.kind} and ${ranked[1].kind} fit about equally` };
  }
  if (top.kind === 'extra-leakage') {
    const gate = base.igSigmas !== undefined ? base.igSigmas >= GATE_LEAKAGE_SIGMAS : undefined;
    const path = gate === undefined ? ''
      : gate ? `; Ig up ${base.igDecades!.toFixed(1)} decades with it: a gate path (oxide tunnelling or breakdown)`
        : '; Ig normal: a junction, GIDL or defect path in the drain';
    const standby = base.isbSigmas !== undefined && base.isbSigmas >= GATE_LEAKAGE_SIGMAS
      ? `; Isb up ${base.isbDecades!.toFixed(1)} decades: it shows in the die's standby current` : '';
    return {
      kind: top.kind, confidence, ...base, misfit: top.misfit, ...(gate === undefined ? {} : { leakagePath: gate ? 'gate' : 'other' }),
      why: `${who}: ${WORDS[top.kind]}${path}${standby}`,
    };
  }
  return { kind: top.kind, confidence, ...base, misfit: top.misfit, why: `${who}: ${WORDS[top.kind]}` };
}
