// Two Offstate processes on one database (say the desktop and a CLI import): WAL lets readers go
// on while one writer imports, and the busy timeout makes a second writer wait, not fail.
import { afterEach, describe, expect, it } from 'vitest';
import { rmSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { openDatabase } from '../../src/node/store/database';
import { listLots } from '../../src/node/store/repository';
import { importDelimitedFile } from '../../src/node/importDelimited';
import { spawn } from 'node:child_process';
import { ROOT, scratchDir } from '../support/paths';

const dirs: string[] = [];
afterEach(() => { for (const d of dirs.splice(0)) rmSync(d, { recursive: true, force: true }); });

function lotFile(dir: string, lot: string, dies: number): string {
  const rows = ['Lot,Wafer,X,Y,Site,Ioff_n [pA]'];
  for (let i = 0; i < dies; i++) rows.push(`${lot},1,${i % 300},${Math.floor(i / 300)},${(i % 4) + 1},${20 + (i % 7)}`);
  const path = join(dir, `${lot}.csv`);
  writeFileSync(path, rows.join('\n'));
  return path;
}

describe('two connections on one database', () => {
  it('a reader sees the last committed state while the other connection imports, then sees both lots', async () => {
    const dir = scratchDir(); dirs.push(dir);
    const path = join(dir, 'shared.sqlite');
    const a = openDatabase(path);
    const b = openDatabase(path);
    await importDelimitedFile(a, lotFile(dir, 'FIRST', 2000));
    const importing = importDelimitedFile(a, lotFile(dir, 'SECOND', 60000));
    expect(listLots(b).map((l) => l.lot)).toEqual(['FIRST']);
    await importing;
    expect(listLots(b).map((l) => l.lot).sort()).toEqual(['FIRST', 'SECOND']);
    a.close();
    b.close();
  });
  it('a second writer in another process waits for the first one instead of failing', async () => {
    const dir = scratchDir(); dirs.push(dir);
    const path = join(dir, 'shared.sqlite');
    openDatabase(path).close();
    // Another process holds the write lock for 400 ms.
    const holder = spawn(process.execPath, ['-e', `
      const Database = require('better-sqlite3');
      const db = new Database(${JSON.stringify(path)});
      db.exec('BEGIN IMMEDIATE');
      process.stdout.write('locked\\n');
      Atomics.wait(new Int32Array(new SharedArrayBuffer(4)), 0, 0, 400);
      db.exec('COMMIT');
      db.close();
    `], { cwd: ROOT, stdio: ['ignore', 'pipe', 'inherit'] });
    await new Promise<void>((resolve) => holder.stdout!.on('data', (d: Buffer) => { if (d.toString().includes('locked')) resolve(); }));
    const b = openDatabase(path);
    const started = performance.now();
    const result = await importDelimitedFile(b, lotFile(dir, 'THIRD', 10));
    const waited = performance.now() - started;
    expect(result.status).toBe('imported');
    expect(waited).toBeGreaterThan(100);
    expect(listLots(b).map((l) => l.lot)).toEqual(['THIRD']);
    b.close();
    await new Promise((r) => holder.on('exit', r));
  });
});
