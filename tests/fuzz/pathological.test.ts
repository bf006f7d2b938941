// Pathological inputs named in the hardening issue, each ending in a clear error (or a correct
// import) in bounded time with nothing half-stored: a 100 MB single line, a million columns,
// all-NaN columns, a file that ends mid-record.
import { afterAll, describe, expect, it } from 'vitest';
import { closeSync, openSync, rmSync, writeFileSync, writeSync } from 'node:fs';
import { join } from 'node:path';
import { openDatabase, type Db } from '../../src/node/store/database';
import { importAnyFile } from '../../src/node/importAny';
import { listLots, loadWafer } from '../../src/node/store/repository';
import { scratchDir } from '../support/paths';

const dir = scratchDir();
afterAll(() => rmSync(dir, { recursive: true, force: true }));

function counts(db: Db) {
  return {
    imports: (db.prepare('SELECT count(*) AS n FROM imports').get() as { n: number }).n,
    wafers: (db.prepare('SELECT count(*) AS n FROM wafers').get() as { n: number }).n,
  };
}

async function outcome(path: string) {
  const db = openDatabase(':memory:');
  const started = performance.now();
  try {
    const result = await importAnyFile(db, path);
    return { result, error: undefined as Error | undefined, seconds: (performance.now() - started) / 1000, ...counts(db), db };
  } catch (error) {
    return { result: undefined, error: error as Error, seconds: (performance.now() - started) / 1000, ...counts(db), db };
  }
}

describe('pathological delimited inputs', () => {
  it('a 100 MB file with no line break is refused with a sentence, quickly, storing nothing', async () => {
    const path = join(dir, 'one-line.csv');
    const fd = openSync(path, 'w');
    const block = Buffer.alloc(1 << 20, 'x,');
    for (let i = 0; i < 100; i++) writeSync(fd, block);
    closeSync(fd);
    const o = await outcome(path);
    expect(o.error?.message).toMatch(/\w+ \w+/);
    expect(o.imports + o.wafers).toBe(0);
    expect(o.seconds).toBeLessThan(60);
    console.log(`100 MB single line: refused in ${o.seconds.toFixed(1)} s: ${o.error?.message.slice(0, 160)}`);
  }, 120_000);

  it('a header of a million columns is refused or read without crashing, in bounded time', async () => {
    const path = join(dir, 'wide.csv');
    const names = ['Lot', 'Wafer', 'X', 'Y', ...Array.from({ length: 1_000_000 }, (_, i) => `m${i}`)];
    writeFileSync(path, names.join(',') + '\n' + ['W1', '1', '0', '0', ...Array.from({ length: 1_000_000 }, () => '1')].join(',') + '\n');
    const o = await outcome(path);
    if (o.error) expect(o.imports + o.wafers).toBe(0);
    else expect(o.result?.status).toBe('imported');
    expect(o.seconds).toBeLessThan(60);
    console.log(`a million columns: ${o.error ? `refused: ${o.error.message.slice(0, 160)}` : 'imported'} in ${o.seconds.toFixed(1)} s`);
  }, 120_000);

  it('all-NaN measurement columns import as missing values, and the statistics say so', async () => {
    const path = join(dir, 'nan.csv');
    const rows = ['Lot,Wafer,X,Y,Site,Ioff_n [pA],Ion_n (uA)'];
    for (let i = 0; i < 50; i++) rows.push(`NAN1,1,${i},0,1,NaN,${700 + i}`);
    writeFileSync(path, rows.join('\n'));
    const o = await outcome(path);
    expect(o.error).toBeUndefined();
    const wafer = loadWafer(o.db, 'NAN1', '1');
    expect(Array.from(wafer.values.Ioff_n).every(Number.isNaN)).toBe(true);
    expect(listLots(o.db)[0].dies).toBe(50);
  });

  it('a file cut in the middle of a quoted record is reported with its line, and the complete rows are kept', async () => {
    const path = join(dir, 'cut.csv');
    writeFileSync(path, 'Lot,Wafer,X,Y,Ioff_n [pA]\nC1,1,0,0,20\nC1,1,1,0,21\nC1,1,2,0,"2');
    const o = await outcome(path);
    if (o.error) {
      expect(o.error.message).toMatch(/line 4|4/);
      expect(o.imports + o.wafers).toBe(0);
    } else {
      expect(o.result!.rows).toBeGreaterThanOrEqual(2);
      expect(o.result!.messages.join(' ')).toMatch(/[Ll]ine 4/);
    }
  });
});
