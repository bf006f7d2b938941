import { describe, expect, it } from 'vitest';
import { join } from 'node:path';
import { interquartileRange, mean, median, quantile, sampleStandardDeviation } from 'simple-statistics';
import { openDatabase, type Db } from '../../src/node/store/database';
import { listLots, loadLot } from '../../src/node/store/repository';
import { importAnyFile } from '../../src/node/importAny';
import { importDelimitedFile, ImportError } from '../../src/node/importDelimited';
import { loadWaferBins, loadWaferGeometry } from '../../src/node/importStore';
import { scratchSpace } from '../support/scratch';
import { inventedWafer, writeCsvLot, writeStdfLot } from '../support/stdfLot';

const { write } = scratchSpace();


const count = (db: Db, table: string) => (db.prepare(`SELECT count(*) AS n FROM ${table}`).get() as { n: number }).n;

const WAFERS = [{ id: '01', dies: inventedWafer(11, 9) }, { id: '02', dies: inventedWafer(12, 9) }, { id: '03', dies: inventedWafer(13, 9) }];

/** Statistics per wafer and parameter, computed by simple-statistics (an outside reference library). */
function stats(db: Db, lot: string) {
  return loadLot(db, lot).map((f) => ({
    wafer: f.wafer,
    params: f.params.map((p) => {
      const v = Array.from(f.values[p.name]).map((x) => (p.unit === 'A' ? Math.log10(Math.abs(x)) : x));
      return { name: p.name, unit: p.unit, median: median(v), q1: quantile(v, 0.25), q3: quantile(v, 0.75), iqr: interquartileRange(v), mean: mean(v), sd: sampleStandardDeviation(v) };
    }),
  }));
}

describe('importing STDF V4', () => {
  it('stores the same lot from STDF (either byte order) and from CSV with identical statistics', async () => {
    const fromCsv = openDatabase(':memory:');
    const fromLe = openDatabase(':memory:');
    const fromBe = openDatabase(':memory:');
    await importAnyFile(fromCsv, write('lot.csv', writeCsvLot('LOTS.1', WAFERS)));
    const le = await importAnyFile(fromLe, write('lot.stdf', writeStdfLot('LOTS.1', WAFERS, true)));
    // Routed by content, not by name: an STDF file called .csv is still read as STDF.
    const be = await importDelimitedFile(fromBe, write('odd-name.csv', writeStdfLot('LOTS.1', WAFERS, false)));
    expect(le).toMatchObject({ status: 'imported', format: 'stdf', lots: ['LOTS.1'], wafers: 3, rows: 243, rejected: 0 });
    expect(be).toMatchObject({ format: 'stdf', rows: 243 });
    const reference = stats(fromCsv, 'LOTS.1');
    expect(reference).toHaveLength(3);
    expect(stats(fromLe, 'LOTS.1')).toEqual(reference);
    expect(stats(fromBe, 'LOTS.1')).toEqual(reference);
    expect(loadLot(fromLe, 'LOTS.1')).toEqual(loadLot(fromCsv, 'LOTS.1'));
  });

  it('keeps the WCR geometry and the PRR bins with each wafer', async () => {
    const db = openDatabase(':memory:');
    const result = await importAnyFile(db, write('lot.stdf', writeStdfLot('LOTS.2', WAFERS, true)));
    expect(result.geometry).toEqual({ waferSize: 300, dieHeight: 1, dieWidth: 1, units: 'mm', flat: 'D', centerX: 3, centerY: 3, posX: 'R', posY: 'D' });
    expect(loadWaferGeometry(db, 'LOTS.2', '02')).toEqual(result.geometry);
    expect(result.messages.join('\n')).toMatch(/sites 1, 2, 3, 4 \(SDR\)/);
    expect(result.messages.join('\n')).toMatch(/Test temperature \(MIR TST_TEMP\): 25/);
    expect(Array.from(loadWaferBins(db, 'LOTS.2', '03')!.hardBin)).toEqual(WAFERS[2].dies.map((d) => d.hard));
  });

  it('stores nothing from a truncated file and names the byte offset', async () => {
    const db = openDatabase(':memory:');
    const bytes = writeStdfLot('LOTS.3', WAFERS, true);
    // Cut inside the last wafer: the first two wafers were already written inside the transaction.
    const cut = bytes.slice(0, Math.floor(bytes.length * 0.9));
    await expect(importAnyFile(db, write('cut.stdf', cut))).rejects.toThrow(/cut\.stdf: The file ends inside a record at byte offset \d+.*Nothing was stored/);
    await expect(importAnyFile(db, write('cut2.stdf', cut))).rejects.toThrow(ImportError);
    expect(listLots(db)).toEqual([]);
    expect(count(db, 'imports')).toBe(0);
    expect(count(db, 'wafer_bins')).toBe(0);
  });

  it('stores nothing from a corrupt file and names the offset of the bad record', async () => {
    const db = openDatabase(':memory:');
    const bytes = writeStdfLot('LOTS.5', WAFERS, false);
    const bad = bytes.slice();
    // Find the second WIR (type 2, subtype 10) and give it a type STDF V4 does not define.
    const view = new DataView(bad.buffer);
    let offset = 0;
    let wirs = 0;
    while (offset < bad.length) {
      if (bad[offset + 2] === 2 && bad[offset + 3] === 10 && ++wirs === 2) break;
      offset += 4 + view.getUint16(offset, false);
    }
    bad[offset + 2] = 99;
    await expect(importAnyFile(db, write('bad.stdf', bad))).rejects.toThrow(new RegExp(`byte offset ${offset} has type 99.*Nothing was stored`));
    expect(listLots(db)).toEqual([]);
    expect(count(db, 'imports')).toBe(0);
  });

  it('says "already imported" for the same STDF bytes again', async () => {
    const db = openDatabase(':memory:');
    const bytes = writeStdfLot('LOTS.4', WAFERS, true);
    await importAnyFile(db, write('a.stdf', bytes));
    const again = await importAnyFile(db, write('b.stdf', bytes));
    expect(again.status).toBe('already-imported');
    expect(count(db, 'imports')).toBe(1);
  });
});
