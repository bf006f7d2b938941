// The FA list with hand edits, and its CSV. Oracles: the rule the product states ("edits are
// replayed in order; the last edit of a die wins"), RFC 4180 section 2 (fields holding commas,
// double quotes or line breaks are enclosed in double quotes; a double quote inside is doubled),
// and the caution every FA export carries (DOMAIN.md, "Cautions the product shows").
import { describe, expect, it } from 'vitest';
import type { FlaggedDie } from '../../src/core/analysis/types';
import type { FaEdit } from '../../src/shared/api';
import { buildFaList, filterFaRows, sortFaRows } from '../../src/ui/fa/faList';
import { csvField, faCsv, faJson } from '../../src/ui/fa/faExport';

const die = (wafer: string, index: number, score: number, kind?: string): FlaggedDie => ({
  lot: 'L1', wafer, x: index, y: -index, site: 1, index, values: { Ioff_n: 1e-10 * (index + 1) },
  reasons: [{ method: 'pat-wafer', param: 'Ioff_n', value: 1e-10, score, limit: 6, direction: 'high', scale: 'log10', low: -11, high: -9, clipped: false }],
  ...(kind ? { mechanism: { kind, confidence: 0.9, why: 'because' } } : {}),
} as FlaggedDie);
const edit = (action: 'add' | 'remove', wafer: string, index: number, note = ''): FaEdit =>
  ({ action, wafer, x: index, y: -index, index, note, at: '2026-01-01T00:00:00Z' });

const flagged = [die('01', 3, 7.5, 'extra-leakage'), die('01', 8, -12, 'threshold-shift'), die('02', 1, 6.2)];

describe('buildFaList', () => {
  it('holds the flagged dies, plus dies added by hand, minus dies removed by hand', () => {
    const { rows, removed } = buildFaList('L1', flagged, [edit('add', '02', 40, 'looks odd'), edit('remove', '01', 8, 'probe mark')]);
    expect(rows.map((r) => `${r.wafer}:${r.index}:${r.source}`)).toEqual(['01:3:analysis', '02:1:analysis', '02:40:manual']);
    expect(rows[2].note).toBe('looks odd');
    expect(removed).toEqual([{ wafer: '01', x: 8, y: -8, index: 8, note: 'probe mark' }]);
  });

  it('lets the last edit of a die win: removed and then added again is back on the list', () => {
    const { rows, removed } = buildFaList('L1', flagged, [edit('remove', '01', 8), edit('add', '01', 8, 'second look')]);
    expect(rows.find((r) => r.index === 8)).toMatchObject({ source: 'analysis', note: 'second look' });
    expect(removed).toEqual([]);
    const twice = buildFaList('L1', [], [edit('add', '03', 5), edit('remove', '03', 5)]);
    expect(twice.rows).toEqual([]);
  });

  it('carries the mechanism when the analysis gave one and none otherwise', () => {
    const { rows } = buildFaList('L1', flagged, []);
    expect(rows.map((r) => r.mechanism)).toEqual(['extra-leakage', 'threshold-shift', null]);
  });
});

describe('sorting and filtering', () => {
  const { rows } = buildFaList('L1', flagged, [edit('add', '02', 40, 'looks odd')]);
  it('sorts by the strongest |score|, largest first when descending', () => {
    expect(sortFaRows(rows, 'score', true).map((r) => r.index)).toEqual([8, 3, 1, 40]);
  });
  it('keeps rows holding every word of the filter', () => {
    expect(filterFaRows(rows, 'manual').map((r) => r.index)).toEqual([40]);
    expect(filterFaRows(rows, 'wafer 01 threshold').map((r) => r.index)).toEqual([8]);
    expect(filterFaRows(rows, '')).toHaveLength(4);
  });
});

describe('FA exports', () => {
  it('quotes CSV fields as RFC 4180 asks', () => {
    expect(csvField('plain')).toBe('plain');
    expect(csvField('a,b')).toBe('"a,b"');
    expect(csvField('say "hi"')).toBe('"say ""hi"""');
    expect(csvField('two\nlines')).toBe('"two\nlines"');
    expect(csvField(NaN)).toBe('');
  });

  it('writes the caution first and one record per die with its note', () => {
    const { rows } = buildFaList('L1', flagged, [edit('add', '02', 40, 'has, comma')]);
    const text = faCsv('L1', rows, [{ name: 'Ioff_n', unit: 'A' }]);
    const lines = text.split('\r\n');
    expect(lines[0]).toMatch(/^# Flags are statistical evidence .* not a disposition/);
    expect(lines[2].split(',')).toEqual(['lot', 'wafer', 'x', 'y', 'site', 'source', 'mechanism', 'strongest_score', 'wafer_pattern', 'cluster', 'reasons', 'note', 'Ioff_n [A]']);
    expect(lines.filter((l) => l && !l.startsWith('#'))).toHaveLength(1 + rows.length);
    expect(text).toContain('"has, comma"');
  });

  it('writes JSON with the caution, the dies and the removed dies', () => {
    const { rows, removed } = buildFaList('L1', flagged, [edit('remove', '02', 1, 'edge')]);
    const doc = JSON.parse(faJson('L1', 'method text', rows, removed, new Date('2026-01-02T00:00:00Z')));
    expect(doc.caution).toMatch(/not a disposition/);
    expect(doc.dies).toHaveLength(2);
    expect(doc.removedByHand).toEqual([{ wafer: '02', x: 1, y: -1, index: 1, note: 'edge' }]);
    expect(doc.exportedAt).toBe('2026-01-02T00:00:00.000Z');
  });
});
