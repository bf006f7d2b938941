import { describe, expect, it } from 'vitest';
import { join } from 'node:path';
import { openDatabase } from '../../src/node/store/database';
import { listLots, loadWafer } from '../../src/node/store/repository';
import { importDelimitedFile, ImportError, CancelledError } from '../../src/node/importDelimited';
import { scratchSpace } from '../support/scratch';

const { write } = scratchSpace();


const SAMPLE = [
  'Lot,Wafer,X,Y,Site,Ioff_n [A],Ion_n (uA),IOFF_P (pA)',
  'LT1,01,0,0,1,1.5e-10,812.5,-30',
  'LT1,01,1,0,2,1.7e-10,820,-31',
  'LT1,02,0,0,1,NA,805,-29',
].join('\n');

describe('importDelimitedFile', () => {
  it('stores every row in SI units with the raw sign, one wafer per lot and wafer id', async () => {
    const db = openDatabase(':memory:');
    const result = await importDelimitedFile(db, write('lot.csv', SAMPLE));
    expect(result).toMatchObject({ status: 'imported', lots: ['LT1'], wafers: 2, rows: 3, rejected: 0 });
    expect(result.hash).toMatch(/^[0-9a-f]{64}$/);
    const w = loadWafer(db, 'LT1', '01');
    expect(w.values.Ion_n[0]).toBeCloseTo(812.5e-6, 18);
    expect(w.values.Ioff_p[1]).toBeCloseTo(-31e-12, 24);
    expect(Number.isNaN(loadWafer(db, 'LT1', '02').values.Ioff_n[0])).toBe(true);
  });
  it('says "already imported" for the same bytes again and changes nothing', async () => {
    const db = openDatabase(':memory:');
    const path = write('lot.csv', SAMPLE);
    await importDelimitedFile(db, path);
    const again = await importDelimitedFile(db, write('renamed.csv', SAMPLE));
    expect(again.status).toBe('already-imported');
    expect(again.messages[0]).toMatch(/already imported/);
    expect((db.prepare('SELECT count(*) AS n FROM imports').get() as { n: number }).n).toBe(1);
    expect(listLots(db)[0].dies).toBe(3);
  });
  it('reads tab-separated files and names the lot after the file when there is no lot column', async () => {
    const db = openDatabase(':memory:');
    await importDelimitedFile(db, write('K77.tsv', 'Wafer\tX\tY\tIoff_n (nA)\n5\t0\t0\t2\n5\t0\t1\t3\n'));
    expect(listLots(db)).toMatchObject([{ lot: 'K77', wafers: 1, dies: 2 }]);
    expect(loadWafer(db, 'K77', '5').values.Ioff_n[1]).toBeCloseTo(3e-9, 20);
  });
  it('reports rejected rows with line numbers and still stores the good ones', async () => {
    const db = openDatabase(':memory:');
    const result = await importDelimitedFile(db, write('bad.csv', `${SAMPLE}\nLT1,02,x,0,1,1e-10,800,-30\nLT1,02,1,1,1,1e-10,oops,-30\n`));
    expect(result.rows).toBe(3);
    expect(result.rejected).toBe(2);
    expect(result.messages.join('\n')).toMatch(/Line 5 rejected: die coordinates/);
    expect(result.messages.join('\n')).toMatch(/Line 6 rejected: Ion_n \(uA\) "oops" is not a number/);
  });
  it('stores nothing and says why when the header cannot be read', async () => {
    const db = openDatabase(':memory:');
    await expect(importDelimitedFile(db, write('h.csv', 'Lot,Something,Else\n1,2,3\n'))).rejects.toThrow(ImportError);
    await expect(importDelimitedFile(db, write('h2.csv', 'Lot,Something,Else\n1,2,3\n'))).rejects.toThrow(/No wafer column found/);
    expect(listLots(db)).toEqual([]);
    expect((db.prepare('SELECT count(*) AS n FROM imports').get() as { n: number }).n).toBe(0);
  });
  it('refuses binary files and empty files with a sentence', async () => {
    const db = openDatabase(':memory:');
    await expect(importDelimitedFile(db, write('b.stdf', '\u0002\u0000\u000a\u0000abc'))).rejects.toThrow(/binary file/);
    await expect(importDelimitedFile(db, write('e.csv', ''))).rejects.toThrow(/empty/);
  });
  it('stores nothing when cancelled', async () => {
    const db = openDatabase(':memory:');
    const big = [SAMPLE.split('\n')[0], ...Array.from({ length: 200_000 }, (_, i) => `LT9,01,${i % 400},${Math.floor(i / 400)},1,1e-10,800,-30`)].join('\n');
    const controller = new AbortController();
    const pending = importDelimitedFile(db, write('big.csv', big), { signal: controller.signal, onProgress: () => controller.abort(), progressIntervalMs: 0 });
    await expect(pending).rejects.toThrow(CancelledError);
    expect(listLots(db)).toEqual([]);
  });
  it('stores nothing when cancelled after wafers were already written inside the transaction', async () => {
    const db = openDatabase(':memory:');
    const rows = [SAMPLE.split('\n')[0]];
    for (let w = 1; w <= 30; w++) for (let i = 0; i < 3000; i++) rows.push(`LT8,${w},${i % 60},${Math.floor(i / 60)},1,1e-10,800,-30`);
    const controller = new AbortController();
    let sawOpenTransaction = false;
    const pending = importDelimitedFile(db, write('many.csv', rows.join('\n')), {
      signal: controller.signal, maxHeldCells: 5000, progressIntervalMs: 0,
      onProgress: (p) => { if (p.bytesDone > p.bytesTotal / 2) { sawOpenTransaction = db.inTransaction; controller.abort(); } },
    });
    await expect(pending).rejects.toThrow(CancelledError);
    expect(sawOpenTransaction).toBe(true);
    expect(db.inTransaction).toBe(false);
    expect(listLots(db)).toEqual([]);
    expect((db.prepare('SELECT count(*) AS n FROM imports').get() as { n: number }).n).toBe(0);
  });
});
