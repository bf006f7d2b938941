// The trade-off band's width: dies that sit on a line of known slope give a width near zero;
// dies spread above and below it by a known pattern give the robust sigma of that pattern,
// (Q3 - Q1)/1.35 with type-7 quartiles (AEC-Q001 Rev-D robust sigma; Hyndman & Fan 1996).
import { describe, expect, it } from 'vitest';
import { buildBand, emptySample } from '../../../src/core/analysis/mechanism';
import { resolveSettings } from '../../../src/core/analysis/types';

const settings = resolveSettings({}).mechanism;
const cols = { device: 'n', ion: 'Ion_n', ioff: 'Ioff_n' } as Parameters<typeof buildBand>[0];

function sampleOnLine(slope: number, offsets: (i: number) => number, n = 400) {
  const s = emptySample();
  for (let i = 0; i < n; i++) {
    const lnIon = Math.log(700e-6) + (i - n / 2) * 0.001;
    s.lnIon.push(lnIon);
    s.logIoff.push(-10.6 + slope * (lnIon - Math.log(700e-6)) + offsets(i));
  }
  return s;
}

describe('trade-off band width', () => {
  it('is close to zero for dies on the band line', () => {
    // Without Vt the slope comes from the settings: (Vdd - 0.4 V) / (alpha * S).
    const slope = (settings.vdd - 0.4) / (settings.alpha * settings.swing);
    const band = buildBand(cols, sampleOnLine(slope, () => 0), settings)!;
    expect(band.slopeSource).toBe('settings');
    expect(band.residualSigmaDecades!).toBeLessThan(1e-9);
  });
  it('equals the robust sigma of the offsets when dies scatter about the line', () => {
    const slope = (settings.vdd - 0.4) / (settings.alpha * settings.swing);
    // Offsets cycle through -0.2, -0.1, 0, 0.1, 0.2 decades: quartiles -0.1 and 0.1 (type 7 on
    // 400 values, 80 of each), so the robust sigma is 0.2 / 1.35.
    const pattern = [-0.2, -0.1, 0, 0.1, 0.2];
    const band = buildBand(cols, sampleOnLine(slope, (i) => pattern[i % 5]), settings)!;
    expect(band.residualSigmaDecades!).toBeCloseTo(0.2 / 1.35, 6);
  });
});
