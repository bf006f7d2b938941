import { describe, expect, it } from 'vitest';
import Database from 'better-sqlite3';
import { readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { APPLICATION_ID, openDatabase, StoreError } from '../../src/node/store/database';
import { SCHEMA_VERSION } from '../../src/node/store/migrations';
import { listLots, loadWafer, naturalCompare, storeImport } from '../../src/node/store/repository';
import { scratchSpace } from '../support/scratch';
import type { WaferFrame } from '../../src/core/frame';

const { tmp } = scratchSpace();

function frame(lot: string, wafer: string, n: number): WaferFrame {
  const x = new Int32Array(n).map((_, i) => i % 10);
  const y = new Int32Array(n).map((_, i) => Math.floor(i / 10));
  return { lot, wafer, x, y, site: new Int32Array(n).fill(1), params: [{ name: 'Ioff_n', unit: 'A' }], values: { Ioff_n: new Float64Array(n).map((_, i) => (i + 1) * 1e-12) } };
}
const report = { status: 'imported' as const, file: 'f.csv', hash: 'h', lots: ['L'], wafers: 1, rows: 1, rejected: 0, messages: [], seconds: 0 };

describe('openDatabase', () => {
  it('creates a WAL database stamped with the application id and the schema version', () => {
    const path = join(tmp(), 'a.sqlite');
    const db = openDatabase(path);
    expect(db.pragma('journal_mode', { simple: true })).toBe('wal');
    expect(db.pragma('application_id', { simple: true })).toBe(APPLICATION_ID);
    expect(db.pragma('user_version', { simple: true })).toBe(SCHEMA_VERSION);
    db.close();
  });
  it('refuses a foreign SQLite file and leaves its bytes untouched', () => {
    const path = join(tmp(), 'foreign.sqlite');
    const other = new Database(path);
    other.exec('CREATE TABLE t (a); INSERT INTO t VALUES (1);');
    other.close();
    const before = readFileSync(path);
    expect(() => openDatabase(path)).toThrow(StoreError);
    expect(() => openDatabase(path)).toThrow(/not an Offstate database/);
    expect(readFileSync(path).equals(before)).toBe(true);
  });
  it('refuses a file that is not SQLite at all', () => {
    const path = join(tmp(), 'junk.sqlite');
    writeFileSync(path, 'this is a text file, not a database'.repeat(20));
    expect(() => openDatabase(path)).toThrow(/not a readable SQLite database/);
    expect(readFileSync(path, 'utf8')).toMatch(/^this is a text file/);
  });
  it('refuses a database written by a newer schema', () => {
    const path = join(tmp(), 'new.sqlite');
    openDatabase(path).close();
    const raw = new Database(path);
    raw.pragma(`user_version = ${SCHEMA_VERSION + 1}`);
    raw.close();
    expect(() => openDatabase(path)).toThrow(/newer Offstate/);
  });
});

describe('storeImport', () => {
  it('stores wafers as columns and reads them back bit for bit', () => {
    const db = openDatabase(':memory:');
    const f = frame('L1', '03', 25);
    storeImport(db, [f], { fileName: 'f.csv', hash: 'h1', bytes: 10, report });
    const back = loadWafer(db, 'L1', '03');
    expect(Array.from(back.x)).toEqual(Array.from(f.x));
    expect(Array.from(back.values.Ioff_n)).toEqual(Array.from(f.values.Ioff_n));
    expect(listLots(db)).toMatchObject([{ lot: 'L1', wafers: 1, dies: 25, params: [{ name: 'Ioff_n', unit: 'A' }] }]);
  });
  it('stores nothing when one wafer of the file is already in the store', () => {
    const db = openDatabase(':memory:');
    storeImport(db, [frame('L1', '01', 4)], { fileName: 'a.csv', hash: 'h1', bytes: 1, report });
    expect(() => storeImport(db, [frame('L1', '02', 4), frame('L1', '01', 4)], { fileName: 'b.csv', hash: 'h2', bytes: 1, report })).toThrow(/already stored \(from a.csv\)/);
    expect(listLots(db)[0].wafers).toBe(1);
    expect((db.prepare('SELECT count(*) AS n FROM imports').get() as { n: number }).n).toBe(1);
  });
  it('orders wafer names as people read them', () => {
    expect(['10', '2', '1'].sort(naturalCompare)).toEqual(['1', '2', '10']);
    expect(['W10', 'W02', 'W1'].sort(naturalCompare)).toEqual(['W1', 'W02', 'W10']);
  });
});
