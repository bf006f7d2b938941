// Seeded generator of a lot of per-die parametric measurements with planted excursions and a
// probe-site tester bias, plus the truth about what was planted, to exercise the analysis.
//
// Per die and device (magnitudes; PMOS values are negated on output as testers report them):
//   |Vt_sat| = nominal + wafer offset + bowl * (r^2/R^2 - 0.5) + reticle offset + random + planted dVt
//   |Vt_lin| = |Vt_sat| + DIBL * (Vdd - Vd_lin)                  (DOMAIN.md's DIBL definition)
//   |Ioff|   = Icc * W/L * 10^(-|Vt_sat| / S) * 10^(planted decades)   (constant-current Vt)
//   |Ion|    = K * (Vdd - |Vt_sat|)^alpha * drive noise * (1 - planted loss)   (Sakurai & Newton)
//   |Ig|     = log-normal around the median, * 10^(planted decades when the excursion says so)
//   Isb      = isbDevices * (|Ioff_n| + |Ioff_p|) * log-normal noise + background
// Streams: the lot stream draws the reticle offsets, each wafer has its own stream, and each
// excursion has its own, so planting an excursion never changes any other die's draws.

import { CANONICAL_PARAMS, type CanonicalParam } from '../params';
import type { WaferFrame } from '../frame';
import { alphaPowerIon, ioffFromVt } from '../physics';
import { layoutWafer, type DieLayout, type LayoutOptions } from './layout';
import { resolveProcess, type DeviceModel, type ProcessModel, type ProcessOverrides } from './process-model';
import { createRandom } from './random';
import { selectDies, type ExcursionShape, type ShapeKind } from './shapes';

export type Mechanism = 'threshold-shift' | 'extra-leakage' | 'weak-drive';
export type DeviceChoice = 'n' | 'p' | 'both';

export interface ExcursionOptions {
  /** Wafer index, 0-based, in lot order. */
  wafer: number;
  mechanism: Mechanism;
  shape: ExcursionShape;
  /**
   * threshold-shift: dVt in V on |Vt| (negative = faster transistor, Ioff and Ion both up);
   * extra-leakage: decades added to log10 |Ioff| (Ion untouched);
   * weak-drive: fraction of |Ion| lost, 0..1 (Vt and Ioff untouched).
   */
  magnitude: number;
  /** Which devices it hits; default both. */
  device?: DeviceChoice;
  /** Die-to-die spread of the magnitude: sigma of ln(magnitude factor); default 0 (all equal). */
  spread?: number;
  /** extra-leakage only: raise |Ig| by the same decades (a gate-oxide path). */
  alsoIg?: boolean;
  /** extra-leakage only: let the extra leakage show in Isb too. */
  alsoIsb?: boolean;
}

/** A measurement offset of one probe site, not physics: the value read is multiplied by factor. */
export interface SiteBiasOptions {
  site: number;
  param: CanonicalParam;
  factor: number;
  /** Wafer indices it applies to, 0-based; default every wafer. */
  wafers?: number[];
}

export interface LotOptions {
  seed: number;
  lot: string;
  waferCount: number;
  /** Wafer ids as written in the file; default "01", "02", ... */
  waferNames?: string[];
  layout: LayoutOptions;
  process?: ProcessOverrides;
  excursions?: ExcursionOptions[];
  siteBias?: SiteBiasOptions[];
}

export interface GeneratedWafer extends WaferFrame {
  /** 0-based position in the lot. */
  index: number;
}

export interface PlantedDie {
  lot: string;
  wafer: string;
  waferIndex: number;
  /** Die index within the wafer's columns. */
  die: number;
  x: number;
  y: number;
  site: number;
  /** Index into LotTruth.excursions. */
  excursion: number;
  mechanism: Mechanism;
  shape: ShapeKind;
  device: DeviceChoice;
  /** Magnitude applied to this die, in the excursion's own unit. */
  magnitude: number;
}

export interface ExcursionRecord extends ExcursionOptions {
  waferName: string;
  device: DeviceChoice;
  dieCount: number;
  description: string;
}

export interface SiteBiasRecord {
  site: number;
  param: CanonicalParam;
  factor: number;
  wafers: string[];
}

export interface WaferEffects {
  wafer: string;
  /** Wafer mean |Vt| offsets in V. */
  vtOffsetN: number;
  vtOffsetP: number;
  /** Bowl amplitude in V: |Vt| at the usable edge minus |Vt| at the centre. */
  bowl: number;
}

export interface LotTruth {
  lot: string;
  seed: number;
  process: ProcessModel;
  /** |Vt| offset of each exposure-field position, index shotRow * shotX + shotColumn, in V. */
  reticleOffsets: number[];
  waferEffects: WaferEffects[];
  excursions: ExcursionRecord[];
  siteBias: SiteBiasRecord[];
  planted: PlantedDie[];
}

export interface GeneratedLot {
  lot: string;
  layout: DieLayout;
  wafers: GeneratedWafer[];
  truth: LotTruth;
}

// Stream labels for deriveSeed; fixed forever, or the same seed would stop giving the same lot.
const STREAM_LOT = 0;
const STREAM_WAFER = 1;
const STREAM_EXCURSION = 2;

const UNITS: Record<CanonicalParam, 'A' | 'V'> = Object.fromEntries(
  CANONICAL_PARAMS.map((name) => [name, name.startsWith('Vt') ? 'V' : 'A']),
) as Record<CanonicalParam, 'A' | 'V'>;

/** Per-die planted effects of one wafer, one array per device and effect (internal to the generator). */
export interface PlantedEffects {
  dVt: { n: Float64Array; p: Float64Array };
  ioffDecades: { n: Float64Array; p: Float64Array };
  igDecades: { n: Float64Array; p: Float64Array };
  isbDecades: { n: Float64Array; p: Float64Array };
  driveFactor: { n: Float64Array; p: Float64Array };
}

function emptyEffects(count: number): PlantedEffects {
  const pair = (fill: number) => ({ n: new Float64Array(count).fill(fill), p: new Float64Array(count).fill(fill) });
  return { dVt: pair(0), ioffDecades: pair(0), igDecades: pair(0), isbDecades: pair(0), driveFactor: pair(1) };
}

function defaultWaferName(index: number): string {
  return String(index + 1).padStart(2, '0');
}

function describe(excursion: ExcursionOptions, device: DeviceChoice, dieCount: number): string {
  const who = device === 'both' ? 'NMOS and PMOS' : device === 'n' ? 'NMOS' : 'PMOS';
  const what =
    excursion.mechanism === 'threshold-shift'
      ? `|Vt| shifted by ${(excursion.magnitude * 1000).toFixed(0)} mV`
      : excursion.mechanism === 'extra-leakage'
        ? `Ioff raised by ${excursion.magnitude.toFixed(2)} decades`
        : `Ion lowered by ${(excursion.magnitude * 100).toFixed(0)} %`;
  return `${excursion.shape.kind} ${excursion.mechanism} on ${who}: ${what}, ${dieCount} dies`;
}

function validateExcursion(excursion: ExcursionOptions, waferCount: number): void {
  if (!Number.isInteger(excursion.wafer) || excursion.wafer < 0 || excursion.wafer >= waferCount) {
    throw new RangeError(`excursion wafer index ${excursion.wafer} is outside the lot (0..${waferCount - 1})`);
  }
  if (excursion.mechanism === 'weak-drive' && !(excursion.magnitude >= 0 && excursion.magnitude < 1)) {
    throw new RangeError('weak-drive magnitude is the fraction of Ion lost and must lie in [0, 1)');
  }
}

const MAX_DRIVE_LOSS = 0.95;

/** Plants every excursion, filling per-wafer effect arrays and the truth list. */
function plantExcursions(
  options: LotOptions,
  layout: DieLayout,
  waferNames: string[],
): { records: ExcursionRecord[]; planted: PlantedDie[]; effects: Map<number, PlantedEffects> } {
  const effects = new Map<number, PlantedEffects>();
  const records: ExcursionRecord[] = [];
  const planted: PlantedDie[] = [];
  (options.excursions ?? []).forEach((excursion, index) => {
    validateExcursion(excursion, options.waferCount);
    const device = excursion.device ?? 'both';
    const random = createRandom(options.seed, STREAM_EXCURSION, index);
    const dies = selectDies(excursion.shape, layout, random);
    let target = effects.get(excursion.wafer);
    if (!target) {
      target = emptyEffects(layout.x.length);
      effects.set(excursion.wafer, target);
    }
    const devices: ('n' | 'p')[] = device === 'both' ? ['n', 'p'] : [device];
    for (const die of dies) {
      const factor = excursion.spread ? Math.exp(excursion.spread * random.normal()) : 1;
      let magnitude = excursion.magnitude * factor;
      if (excursion.mechanism === 'weak-drive') magnitude = Math.min(magnitude, MAX_DRIVE_LOSS);
      for (const d of devices) {
        if (excursion.mechanism === 'threshold-shift') target.dVt[d][die] += magnitude;
        else if (excursion.mechanism === 'weak-drive') target.driveFactor[d][die] *= 1 - magnitude;
        else {
          target.ioffDecades[d][die] += magnitude;
          if (excursion.alsoIg) target.igDecades[d][die] += magnitude;
          if (excursion.alsoIsb) target.isbDecades[d][die] += magnitude;
        }
      }
      planted.push({
        lot: options.lot,
        wafer: waferNames[excursion.wafer],
        waferIndex: excursion.wafer,
        die,
        x: layout.x[die],
        y: layout.y[die],
        site: layout.site[die],
        excursion: index,
        mechanism: excursion.mechanism,
        shape: excursion.shape.kind,
        device,
        magnitude,
      });
    }
    records.push({
      ...excursion,
      device,
      waferName: waferNames[excursion.wafer],
      dieCount: dies.length,
      description: describe(excursion, device, dies.length),
    });
  });
  return { records, planted, effects };
}

/** Draws the fixed |Vt| offsets of the exposure-field positions, shifted to zero mean. */
function drawReticleOffsets(options: LotOptions, layout: DieLayout, process: ProcessModel): number[] {
  const random = createRandom(options.seed, STREAM_LOT);
  const offsets = Array.from({ length: layout.shotX * layout.shotY }, () => random.normal(0, process.reticleSigma));
  const mean = offsets.reduce((sum, value) => sum + value, 0) / offsets.length;
  return offsets.map((value) => value - mean);
}

interface DeviceDraws {
  vt: number;
  swing: number;
  dibl: number;
  drive: number;
  ig: number;
}

function drawDevice(random: ReturnType<typeof createRandom>): DeviceDraws {
  return { vt: random.normal(), swing: random.normal(), dibl: random.normal(), drive: random.normal(), ig: random.normal() };
}

interface DeviceValues {
  vtSat: number;
  vtLin: number;
  ioff: number;
  ioffForIsb: number;
  ion: number;
  ig: number;
}

function deviceValues(
  model: DeviceModel,
  process: ProcessModel,
  vtSat: number,
  draws: DeviceDraws,
  effects: PlantedEffects,
  device: 'n' | 'p',
  die: number,
): DeviceValues {
  const swing = model.swing + model.swingSigma * draws.swing;
  const diblValue = model.dibl + model.diblSigma * draws.dibl;
  const physicalIoff = ioffFromVt({ vt: vtSat, swing, icc: model.icc, wOverL: model.wOverL });
  const ion =
    alphaPowerIon({ k: model.k, vgs: process.vdd, vt: vtSat, alpha: model.alpha }) *
    Math.exp(model.driveSigma * draws.drive) *
    effects.driveFactor[device][die];
  return {
    vtSat,
    vtLin: vtSat + diblValue * (process.vdd - process.vdLin),
    ioff: physicalIoff * 10 ** effects.ioffDecades[device][die],
    ioffForIsb: physicalIoff * 10 ** effects.isbDecades[device][die],
    ion,
    ig: model.igMedian * 10 ** (model.igLog10Sigma * draws.ig + effects.igDecades[device][die]),
  };
}

/** Generates one wafer's columns from its own stream. */
function generateWafer(
  options: LotOptions,
  layout: DieLayout,
  process: ProcessModel,
  reticleOffsets: number[],
  index: number,
  name: string,
  effects: PlantedEffects,
): { wafer: GeneratedWafer; waferEffects: WaferEffects } {
  const random = createRandom(options.seed, STREAM_WAFER, index);
  const vtOffsetN = random.normal(0, process.n.waferOffsetSigma);
  const vtOffsetP = random.normal(0, process.p.waferOffsetSigma);
  const bowl = random.normal(process.bowlMean, process.bowlSigma);

  const count = layout.x.length;
  const values = Object.fromEntries(CANONICAL_PARAMS.map((param) => [param, new Float64Array(count)])) as Record<
    CanonicalParam,
    Float64Array
  >;
  const radiusSquared = layout.usableRadiusMm * layout.usableRadiusMm;
  for (let i = 0; i < count; i++) {
    const cx = layout.centreXMm[i];
    const cy = layout.centreYMm[i];
    // Bowl and reticle terms are shared by both devices: they model gate-length variation.
    const common =
      bowl * ((cx * cx + cy * cy) / radiusSquared - 0.5) +
      reticleOffsets[layout.shotRow[i] * layout.shotX + layout.shotColumn[i]];
    // Fixed draw order per die, whatever is planted, so streams never shift.
    const drawsN = drawDevice(random);
    const drawsP = drawDevice(random);
    const isbNoise = random.normal();

    const vtN = process.n.vtSat + vtOffsetN + common + process.n.vtRandomSigma * drawsN.vt + effects.dVt.n[i];
    const vtP = process.p.vtSat + vtOffsetP + common + process.p.vtRandomSigma * drawsP.vt + effects.dVt.p[i];
    const n = deviceValues(process.n, process, vtN, drawsN, effects, 'n', i);
    const p = deviceValues(process.p, process, vtP, drawsP, effects, 'p', i);

    values.Ioff_n[i] = n.ioff;
    values.Ion_n[i] = n.ion;
    values.Vtlin_n[i] = n.vtLin;
    values.Vtsat_n[i] = n.vtSat;
    values.Ig_n[i] = n.ig;
    // Testers report PMOS thresholds and currents as negative numbers (DOMAIN.md, common practice).
    values.Ioff_p[i] = -p.ioff;
    values.Ion_p[i] = -p.ion;
    values.Vtlin_p[i] = -p.vtLin;
    values.Vtsat_p[i] = -p.vtSat;
    values.Ig_p[i] = -p.ig;
    values.Isb[i] =
      process.isbDevices * (n.ioffForIsb + p.ioffForIsb) * 10 ** (process.isbLog10Sigma * isbNoise) +
      process.isbBackground;
  }

  return {
    wafer: {
      index,
      lot: options.lot,
      wafer: name,
      x: layout.x.slice(),
      y: layout.y.slice(),
      site: layout.site.slice(),
      params: CANONICAL_PARAMS.map((param) => ({ name: param, unit: UNITS[param] })),
      values,
    },
    waferEffects: { wafer: name, vtOffsetN, vtOffsetP, bowl },
  };
}

/** Everything a lot's wafers are drawn from, computed once; wafers can then be made one at a time. */
export interface PreparedLot {
  options: LotOptions;
  layout: DieLayout;
  process: ProcessModel;
  waferNames: string[];
  reticleOffsets: number[];
  truth: Omit<LotTruth, 'waferEffects'>;
  effects: Map<number, PlantedEffects>;
  /** Shared all-neutral effects for wafers with nothing planted (never written to). */
  neutral: PlantedEffects;
}

/** Checks the options, lays out the wafer, plants the excursions and records the site bias. */
export function prepareLot(options: LotOptions): PreparedLot {
  if (!Number.isInteger(options.waferCount) || options.waferCount < 1) {
    throw new RangeError('waferCount must be a positive integer');
  }
  const layout = layoutWafer(options.layout);
  const process = resolveProcess(options.process);
  const waferNames = Array.from(
    { length: options.waferCount },
    (_, i) => options.waferNames?.[i] ?? defaultWaferName(i),
  );
  const { records, planted, effects } = plantExcursions(options, layout, waferNames);
  const reticleOffsets = drawReticleOffsets(options, layout, process);
  const siteBias = (options.siteBias ?? []).map((bias) => {
    const indices = bias.wafers ?? waferNames.map((_, i) => i);
    for (const index of indices) {
      if (!Number.isInteger(index) || index < 0 || index >= options.waferCount) {
        throw new RangeError(`site bias wafer index ${index} is outside the lot (0..${options.waferCount - 1})`);
      }
    }
    return { site: bias.site, param: bias.param, factor: bias.factor, wafers: indices.map((i) => waferNames[i]) };
  });
  return {
    options,
    layout,
    process,
    waferNames,
    reticleOffsets,
    truth: { lot: options.lot, seed: options.seed, process, reticleOffsets, excursions: records, siteBias, planted },
    effects,
    neutral: emptyEffects(layout.x.length),
  };
}

/** Generates wafer `index` of a prepared lot, tester bias included. */
export function generateWaferOf(prepared: PreparedLot, index: number): { wafer: GeneratedWafer; effects: WaferEffects } {
  const { options, layout, process, reticleOffsets, waferNames } = prepared;
  const result = generateWafer(
    options, layout, process, reticleOffsets, index, waferNames[index], prepared.effects.get(index) ?? prepared.neutral,
  );
  // The site bias is a measurement offset, applied after the physics.
  for (const bias of options.siteBias ?? []) {
    if (bias.wafers && !bias.wafers.includes(index)) continue;
    const column = result.wafer.values[bias.param];
    const site = result.wafer.site;
    for (let i = 0; i < column.length; i++) if (site[i] === bias.site) column[i] *= bias.factor;
  }
  return { wafer: result.wafer, effects: result.waferEffects };
}

/** Yields the lot's wafers one at a time, for lots too big to hold at once. */
export function* iterateWafers(prepared: PreparedLot): Generator<GeneratedWafer> {
  for (let i = 0; i < prepared.waferNames.length; i++) yield generateWaferOf(prepared, i).wafer;
}

/** Generates the lot described by options; the same options always give the same numbers. */
export function generateLot(options: LotOptions): GeneratedLot {
  const prepared = prepareLot(options);
  const wafers: GeneratedWafer[] = [];
  const waferEffects: WaferEffects[] = [];
  for (let i = 0; i < prepared.waferNames.length; i++) {
    const { wafer, effects } = generateWaferOf(prepared, i);
    wafers.push(wafer);
    waferEffects.push(effects);
  }
  return { lot: options.lot, layout: prepared.layout, wafers, truth: { ...prepared.truth, waferEffects } };
}
