// The committed demo lot (sample-data/demo-lot.csv): an invented scenario with no real company,
// fab, product or person behind it. Wafer indices below are 0-based; the file names wafers "01".."25".

import type { LotOptions } from './lot';

/** Seed of the committed demo lot; change it only together with sample-data/. */
export const DEMO_SEED = 20241;

export const DEMO_LOT_OPTIONS: LotOptions = {
  seed: DEMO_SEED,
  lot: 'KX2417.1',
  waferCount: 25,
  // 6.5 x 6.5 mm dies on a 300 mm wafer with 3 mm edge exclusion: 1,509 dies, 2 x 2 probe sites,
  // 4 x 3-die exposure field.
  layout: { waferDiameterMm: 300, edgeExclusionMm: 3, dieWidthMm: 6.5, dieHeightMm: 6.5, sitesX: 2, sitesY: 2, shotX: 4, shotY: 3 },
  excursions: [
    // Wafer 07: the centre of the wafer ran fast (|Vt| about 100 mV low, e.g. short gates):
    // Ioff up about 1.2 decades and Ion up about 35 %, along the trade-off band.
    { wafer: 6, mechanism: 'threshold-shift', device: 'both', magnitude: -0.1, spread: 0.1, shape: { kind: 'center', radiusFraction: 0.3 } },
    // Wafer 12: an NMOS junction-leakage ring at the edge, Ion unchanged, standby current up too.
    { wafer: 11, mechanism: 'extra-leakage', device: 'n', magnitude: 1.75, spread: 0.12, alsoIsb: true, shape: { kind: 'edge-ring', innerFraction: 0.9 } },
    // Wafer 16: a scratch across the wafer with contact damage: Ion down about 35 %, Ioff unchanged.
    { wafer: 15, mechanism: 'weak-drive', device: 'both', magnitude: 0.35, spread: 0.1, shape: { kind: 'scratch', xMm: -15, yMm: 20, angleDeg: 35, lengthMm: 170, widthMm: 1 } },
    // Wafer 19: a local blob of PMOS leakage in the lower right.
    { wafer: 18, mechanism: 'extra-leakage', device: 'p', magnitude: 1.5, spread: 0.12, shape: { kind: 'loc', xMm: 60, yMm: -55, radiusMm: 28 } },
    // Single-die gate-oxide defects across the lot: NMOS Ioff and Ig up about 2 decades.
    { wafer: 2, mechanism: 'extra-leakage', device: 'n', magnitude: 2, spread: 0.2, alsoIg: true, shape: { kind: 'random', count: 1 } },
    { wafer: 4, mechanism: 'extra-leakage', device: 'n', magnitude: 2, spread: 0.2, alsoIg: true, shape: { kind: 'random', count: 2 } },
    { wafer: 9, mechanism: 'extra-leakage', device: 'n', magnitude: 2, spread: 0.2, alsoIg: true, shape: { kind: 'random', count: 1 } },
    { wafer: 13, mechanism: 'extra-leakage', device: 'n', magnitude: 2, spread: 0.2, alsoIg: true, shape: { kind: 'random', count: 1 } },
    { wafer: 20, mechanism: 'extra-leakage', device: 'n', magnitude: 2, spread: 0.2, alsoIg: true, shape: { kind: 'random', count: 2 } },
    { wafer: 23, mechanism: 'extra-leakage', device: 'n', magnitude: 2, spread: 0.2, alsoIg: true, shape: { kind: 'random', count: 1 } },
  ],
  // Probe site 3 reads Ioff_n 25 % high on wafers 01-21; the probe card was changed before 22.
  siteBias: [{ site: 3, param: 'Ioff_n', factor: 1.25, wafers: Array.from({ length: 21 }, (_, i) => i) }],
};
