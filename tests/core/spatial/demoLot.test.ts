import { describe, expect, it } from 'vitest';
import { DEMO_LOT_OPTIONS, generateLot, type GeneratedWafer } from '../../../src/core/generator';
import { deviationFlags, labelWafer, type SignatureLabel } from '../../../src/core/spatial';

// End to end on the generator's demo lot: per-die values -> deviation flags (robust z of
// log10|I|, leakage being log-normal, DOMAIN.md) -> one label per wafer, checked against the
// excursions the scenario plants (the generator's truth record). The generator's 'random'
// excursions there are one or two single defective dies: an isolated defect, which in Wu, Jang &
// Chen's vocabulary is no spatial pattern (their 'random' is a wafer-wide scatter), so `none`.

const CURRENTS = ['Ioff_n', 'Ioff_p', 'Ion_n', 'Ion_p', 'Ig_n', 'Isb'];

function flagsOf(wafer: GeneratedWafer, limit: number): Uint8Array {
  const flagged = new Uint8Array(wafer.x.length);
  for (const name of CURRENTS) {
    const column = wafer.values[name];
    if (!column) continue;
    const flags = deviationFlags(column.map((v) => Math.log10(Math.abs(v))), limit);
    for (let i = 0; i < flagged.length; i++) flagged[i] |= flags[i];
  }
  return flagged;
}

describe('labelWafer on the demo lot', () => {
  const lot = generateLot(DEMO_LOT_OPTIONS);

  it('names every planted excursion and calls the other wafers none', () => {
    for (const limit of [3, 4]) {
      for (const wafer of lot.wafers) {
        const planted = lot.truth.excursions.filter((e) => e.waferName === wafer.wafer && e.shape.kind !== 'random');
        const expected: SignatureLabel = planted.length > 0 ? (planted[0].shape.kind as SignatureLabel) : 'none';
        const result = labelWafer({ x: wafer.x, y: wafer.y, flagged: flagsOf(wafer, limit), site: wafer.site });
        expect(result.label, `wafer ${wafer.wafer} at |z| > ${limit}: ${result.evidence.rule}`).toBe(expected);
      }
    }
  });
});
