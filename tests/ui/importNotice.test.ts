// The import notice of the top bar. Oracle: the meaning of ImportResult in src/shared/api.ts
// ("already-imported" = same file content seen before, rows = stored rows, rejected = refused
// rows with the first reasons in messages).
import { describe, expect, it } from 'vitest';
import type { ImportResult } from '../../src/shared/api';
import { describeImport } from '../../src/ui/importNotice';

const result = (over: Partial<ImportResult>): ImportResult => ({
  status: 'imported', file: 'lot.csv', hash: 'ab'.repeat(32), lots: ['KX0001.1'], wafers: 25, rows: 37725,
  rejected: 0, messages: [], seconds: 1.23, ...over,
});

describe('describeImport', () => {
  it('reports a new import with lot, wafer and row counts', () => {
    const notice = describeImport(result({}));
    expect(notice.kind).toBe('imported');
    expect(notice.text).toBe('Imported lot.csv: lot KX0001.1, 25 wafers, 37,725 rows in 1.2 s.');
  });

  it('says when the same content was imported before', () => {
    const notice = describeImport(result({ status: 'already-imported' }));
    expect(notice.kind).toBe('already');
    expect(notice.text).toContain('already imported');
  });

  it('counts rejected rows and passes on the first reasons', () => {
    const messages = ['line 4: no wafer', 'line 9: x is not a number', 'a', 'b', 'c', 'd', 'e'];
    const notice = describeImport(result({ rejected: 1, messages, lots: ['A', 'B'], wafers: 1 }));
    expect(notice.text).toContain('2 lots, 1 wafer');
    expect(notice.text).toContain('1 row rejected');
    expect(notice.details).toEqual(messages.slice(0, 5));
  });
});
