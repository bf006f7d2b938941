import { describe, expect, it } from 'vitest';
import { FrameBuilder, planHeader, parseValue } from '../../../src/core/import';

describe('planHeader', () => {
  it('finds lot, wafer, x, y and site in their common spellings and measurements with units', () => {
    const plan = planHeader(['LOT_ID', 'WaferID', 'DieX', 'DieY', 'Site', 'Ioff_n [pA]', 'Ion_n (uA)', 'Vtsat_n']);
    expect(plan.errors).toEqual([]);
    expect(plan.columns.map((c) => c.role)).toEqual(['lot', 'wafer', 'x', 'y', 'site', 'measurement', 'measurement', 'measurement']);
    expect(plan.columns[5]).toMatchObject({ name: 'Ioff_n', unit: 'A', scale: 1e-12 });
    expect(plan.columns[7]).toMatchObject({ name: 'Vtsat_n', unit: 'V', scale: 1 });
  });
  it('says which required column is missing', () => {
    const plan = planHeader(['Lot', 'Wafer', 'X', 'Ioff_n']);
    expect(plan.errors.join(' ')).toMatch(/No die Y column/);
  });
  it('refuses a current parameter given a voltage unit', () => {
    expect(planHeader(['Wafer', 'X', 'Y', 'Ioff_n [mV]']).errors.join(' ')).toMatch(/Ioff_n is measured in A/);
  });
});

describe('parseValue', () => {
  it('turns missing markers into NaN and rejects words', () => {
    expect(parseValue('NA')).toBeNaN();
    expect(parseValue('')).toBeNaN();
    expect(parseValue('nan')).toBeNaN();
    expect(parseValue('-1.5e-12')).toBe(-1.5e-12);
    expect(parseValue('open')).toBeUndefined();
  });
});

describe('FrameBuilder', () => {
  const plan = planHeader(['Lot', 'Wafer', 'X', 'Y', 'Site', 'Ioff_p (pA)']);
  it('groups rows by lot and wafer, scales to base units and keeps the raw sign', () => {
    const b = new FrameBuilder(plan, 'fallback');
    b.add(2, ['L1', 'W1', '0', '0', '1', '-25']);
    b.add(3, ['L1', 'W1', '1', '0', '2', '-30']);
    b.add(4, ['L1', 'W2', '0', '0', '1', 'NA']);
    const frames = b.frames();
    expect(frames.map((f) => `${f.lot}/${f.wafer}`)).toEqual(['L1/W1', 'L1/W2']);
    expect(Array.from(frames[0].values.Ioff_p)).toEqual([-25e-12, -30e-12]);
    expect(Array.from(frames[0].site)).toEqual([1, 2]);
    expect(frames[1].values.Ioff_p[0]).toBeNaN();
  });
  it('rejects bad rows with their line number and reason, and keeps the later row of a repeated die', () => {
    const b = new FrameBuilder(plan, 'fallback');
    b.add(2, ['L1', 'W1', '0', '0', '1', '5']);
    b.add(3, ['L1', 'W1', 'a', '0', '1', '5']);
    b.add(4, ['L1', 'W1', '1', '0', '1', 'open']);
    b.add(5, ['L1', 'W1', '0', '0', '1', '7']);
    b.add(6, ['L1', 'W1']);
    expect(b.report.rejected.map((r) => r.line)).toEqual([3, 4, 6]);
    expect(b.report.rejected[1].reason).toMatch(/Ioff_p \(pA\) "open" is not a number/);
    expect(b.report.duplicatesReplaced).toBe(1);
    expect(Array.from(b.frames()[0].values.Ioff_p)).toEqual([7e-12]);
  });
});
