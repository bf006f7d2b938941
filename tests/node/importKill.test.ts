// One import is one transaction: a process killed in the middle of an import, after it has written
// wafers inside its open transaction, leaves the database exactly as it was before.
import { afterEach, describe, expect, it } from 'vitest';
import { rmSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { spawn } from 'node:child_process';
import { build } from 'esbuild';
import { openDatabase, type Db } from '../../src/node/store/database';
import { importDelimitedFile } from '../../src/node/importDelimited';
import { ROOT, scratchDir } from '../support/paths';

const dirs: string[] = [];
afterEach(() => { for (const d of dirs.splice(0)) rmSync(d, { recursive: true, force: true }); });

/** Every row of every table, as text: "exactly as before" means this is unchanged. */
function dump(db: Db): string {
  const tables = (db.prepare("SELECT name FROM sqlite_master WHERE type = 'table' ORDER BY name").all() as { name: string }[]).map((t) => t.name);
  return JSON.stringify(tables.map((t) => [t, db.prepare(`SELECT * FROM "${t}" ORDER BY rowid`).all()]), (_k, v) => (Buffer.isBuffer(v) ? v.toString('base64') : v));
}

describe('an import killed mid-way', () => {
  it('leaves the database exactly as before', async () => {
    const dir = scratchDir(); dirs.push(dir);
    const dbPath = join(dir, 'store.sqlite');
    const first = openDatabase(dbPath);
    await importDelimitedFile(first, (() => { const p = join(dir, 'small.csv'); writeFileSync(p, 'Lot,Wafer,X,Y,Ioff_n [pA]\nKEEP,1,0,0,5\nKEEP,1,1,0,6\n'); return p; })());
    first.pragma('wal_checkpoint(TRUNCATE)');
    const before = dump(first);
    first.close();

    const rows = ['Lot,Wafer,X,Y,Site,Ioff_n [pA],Ion_n [uA]'];
    for (let w = 1; w <= 40; w++) for (let i = 0; i < 2000; i++) rows.push(`GONE,${w},${i % 50},${Math.floor(i / 50)},${1 + (i % 4)},${20 + (i % 9)},${700 + (i % 13)}`);
    const csv = join(dir, 'big.csv');
    writeFileSync(csv, rows.join('\n'));

    const child = join(ROOT, '.cache', 'test', 'importChild.mjs');
    await build({ entryPoints: [join(ROOT, 'tests', 'fixtures', 'importChild.ts')], bundle: true, platform: 'node', format: 'esm', target: 'node20', packages: 'external', outfile: child, logLevel: 'warning' });
    const proc = spawn(process.execPath, [child, dbPath, csv], { cwd: ROOT, stdio: ['ignore', 'pipe', 'inherit'] });
    const said = await new Promise<string>((resolve, reject) => {
      let out = '';
      proc.stdout!.on('data', (d: Buffer) => { out += d.toString(); if (out.includes('\n')) resolve(out.trim()); });
      proc.on('exit', (code) => reject(new Error(`child exited early (${code}): ${out}`)));
    });
    const [, state, written] = said.split(' ');
    expect(state).toBe('in-transaction');
    // Half the file read: wafers were already written, uncommitted, when the process is killed.
    expect(Number(written)).toBeGreaterThan(5);
    const exited = new Promise((r) => proc.on('exit', r));
    proc.kill('SIGKILL');
    await exited;

    const after = openDatabase(dbPath);
    expect(dump(after)).toBe(before);
    after.close();
  });
});
