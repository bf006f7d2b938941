// Words of the FA list and the export's file name. Oracles: the reason wording of the brief
// (parameter, direction, method, score in robust sigmas with one decimal, the limit; AEC-Q001
// part average testing names the method) and Microsoft's "Naming Files,
// Paths, and Namespaces" (reserved characters < > : " / \ | ? * and device names CON, PRN, AUX,
// NUL, COM1-9, LPT1-9).
import { describe, expect, it } from 'vitest';
import type { Reason } from '../../src/core/analysis/types';
import { describeReason, describeReasons, flaggedCsvFileName, safeFileStem, summariseReasons } from '../../src/ui/flagText';

const reason = (over: Partial<Reason>): Reason => ({
  method: 'pat-wafer', param: 'Ioff_n', value: 3.2e-10, score: 8.1, limit: 6, direction: 'high', scale: 'log10',
  low: -11, high: -9.5, clipped: false, ...over,
} as Reason);

describe('reason text', () => {
  it('says parameter, direction, method, robust sigmas with one decimal and the limit', () => {
    expect(describeReason(reason({ score: 8.134 }))).toMatch(/^Ioff_n high, PAT wafer \+?8\.1 robust sigma \(log10, limit 6\)$/);
    expect(describeReason(reason({ param: 'Vtsat_n', score: -7.26, direction: 'low', scale: 'linear' })))
      .toMatch(/^Vtsat_n low, PAT wafer -7\.3 robust sigma \((linear, )?limit 6\)$/);
  });

  it('lists the strongest reason first', () => {
    const text = describeReasons([reason({ param: 'Ig_n', score: 6.5 }), reason({ param: 'Ioff_n', score: -12 })]);
    expect(text.indexOf('Ioff_n')).toBeLessThan(text.indexOf('Ig_n'));
    expect(text.split('; ')).toHaveLength(2);
  });

  it('summarises many reasons as the strongest two and a count of the rest', () => {
    const many = [6.1, 9.4, 7.7, 12.0, 6.6].map((score, k) => reason({ param: `P${k}`, score }));
    const summary = summariseReasons(many);
    expect(summary.split('; ')).toHaveLength(3);
    expect(summary).toMatch(/^P3 high, PAT wafer \+?12\.0 .*; P1 high, PAT wafer \+?9\.4 .*; \(\+3 more\)$/);
    expect(summariseReasons(many.slice(0, 2))).not.toContain('more');
  });
});

describe('export file name', () => {
  it('is "<lot>-flagged.csv" for an ordinary lot name', () => {
    expect(flaggedCsvFileName('KX2417.1')).toBe('KX2417.1-flagged.csv');
  });

  it('replaces characters that Windows forbids in file names', () => {
    const name = flaggedCsvFileName('lot<1>:"a/b\\c|d?e*');
    expect(name).not.toMatch(/[<>:"/\\|?*]/);
    expect(name.endsWith('-flagged.csv')).toBe(true);
  });

  it('cannot climb out of the download folder or hide the file', () => {
    expect(flaggedCsvFileName('../../etc/passwd')).toBe('etc_passwd-flagged.csv');
    expect(safeFileStem('.hidden')).toBe('hidden');
  });

  it('does not produce a Windows device name', () => {
    expect(safeFileStem('CON')).not.toMatch(/^con$/i);
    expect(safeFileStem('lpt1')).not.toMatch(/^lpt1$/i);
  });

  it('falls back to "lot" when nothing usable is left and stays short', () => {
    expect(safeFileStem('///')).toBe('lot');
    expect(safeFileStem('')).toBe('lot');
    expect(safeFileStem('x'.repeat(500)).length).toBeLessThanOrEqual(80);
  });
});
