// The Ion-Ioff trade-off bands of a lot for mechanism triage (see mechanism.ts): per device type,
// one band for the lot and one per wafer. A wafer's band is centred on a sample of its unflagged
// dies and takes its slopes from the lot's band (steadier than one wafer's); a wafer with too few
// unflagged dies (a whole-wafer excursion) is measured against the lot's band.

import type { WaferFrame } from '../frame';
import { addToSample, buildBand, deviceColumns, emptySample, type BandSample } from './mechanism';
import type { MechanismSettings, TradeoffBand } from './types';

/** Unflagged dies per wafer (and per lot) sampled for the band. */
const BAND_SAMPLE = 2001;

export function tradeoffBands(
  frames: WaferFrame[],
  pairs: { device: 'n' | 'p' }[],
  flagged: Uint8Array[],
  settings: MechanismSettings,
): { lot: TradeoffBand[]; wafers: TradeoffBand[][] } {
  const lot: TradeoffBand[] = [];
  const wafers: TradeoffBand[][] = frames.map(() => []);
  for (const pair of pairs) {
    const lotSample: BandSample = emptySample();
    const perWafer = frames.map((frame, w) => {
      const cols = deviceColumns(frame).find((d) => d.device === pair.device);
      if (!cols) return undefined;
      const sample = emptySample();
      addToSample(sample, cols, flagged[w], BAND_SAMPLE, settings);
      addToSample(lotSample, cols, flagged[w], Math.ceil(BAND_SAMPLE / frames.length), settings);
      return { cols, sample, w };
    });
    const anyCols = perWafer.find((e) => e)?.cols;
    const lotBand = anyCols ? buildBand(anyCols, lotSample, settings) : undefined;
    if (lotBand) lot.push(lotBand);
    for (const entry of perWafer) {
      if (!entry) continue;
      const unflagged = entry.sample.lnIon.length;
      const enough = unflagged >= 100 && unflagged >= 0.2 * Math.min(BAND_SAMPLE, entry.cols.ionValues.length);
      const own = enough ? buildBand(entry.cols, entry.sample, settings, lotBand?.slopeSource === 'vt' ? lotBand : undefined) : undefined;
      const band = own ?? lotBand;
      if (band) wafers[entry.w].push(band);
    }
  }
  return { lot, wafers };
}
