// Crash safety: the CLI is killed (SIGKILL) at random moments while importing; after every kill
// the database passes SQLite's integrity check, earlier lots are bit-for-bit intact, and each new
// lot is either wholly there or wholly absent.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { spawn, spawnSync } from 'node:child_process';
import { createHash } from 'node:crypto';
import { existsSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import Database from 'better-sqlite3';
import { DEMO_CSV, ROOT, scratchDir } from '../support/paths';

const CLI = join(ROOT, 'dist', 'node', 'cli.mjs');
const dir = scratchDir();
const db = join(dir, 'crash.sqlite');
afterAll(() => rmSync(dir, { recursive: true, force: true }));

function lotText(lot: string, wafers: number, diesPerWafer: number): string {
  const rows = ['Lot,Wafer,X,Y,Site,Ioff_n [pA],Ion_n (uA)'];
  for (let w = 1; w <= wafers; w++) for (let i = 0; i < diesPerWafer; i++) rows.push(`${lot},${w},${i % 150},${Math.floor(i / 150)},${(i % 4) + 1},${20 + ((i * 7) % 13)},${700 + (i % 50)}`);
  return rows.join('\n');
}

function fingerprint(lot: string): string {
  const conn = new Database(db, { readonly: true });
  try {
    const rows = conn.prepare(`SELECT w.name, w.x, w.y, w.site, v.param, v.data FROM wafers w JOIN lots l ON l.id = w.lot_id
      JOIN wafer_values v ON v.wafer_id = w.id WHERE l.name = ? ORDER BY w.name, v.param`).all(lot) as { name: string; x: Buffer; y: Buffer; site: Buffer; param: string; data: Buffer }[];
    const hash = createHash('sha256');
    for (const r of rows) { hash.update(r.name); hash.update(r.x); hash.update(r.y); hash.update(r.site); hash.update(r.param); hash.update(r.data); }
    return `${rows.length}:${hash.digest('hex')}`;
  } finally {
    conn.close();
  }
}

function state(): { integrity: string; lots: Map<string, number> } {
  const conn = new Database(db, { readonly: true });
  try {
    const integrity = (conn.pragma('integrity_check', { simple: true }) as string);
    const lots = new Map((conn.prepare('SELECT l.name, count(w.id) AS n FROM lots l LEFT JOIN wafers w ON w.lot_id = l.id GROUP BY l.id').all() as { name: string; n: number }[]).map((r) => [r.name, r.n]));
    return { integrity, lots };
  } finally {
    conn.close();
  }
}

beforeAll(() => {
  expect(existsSync(CLI), 'run `node scripts/build.mjs` first (npm test does)').toBe(true);
  const seeded = spawnSync(process.execPath, [CLI, 'import', DEMO_CSV, '--db', db], { encoding: 'utf8' });
  expect(seeded.status).toBe(0);
});

describe('killing the importer at random moments', () => {
  it('never leaves a damaged database, a half-stored lot or a changed earlier lot', async () => {
    const demoBefore = fingerprint('KX2417.1');
    // Calibrate: how long does one whole run take here? Kills are spread over that span.
    const calibration = join(dir, 'CAL.csv');
    writeFileSync(calibration, lotText('CAL', 6, 12000));
    const t0 = performance.now();
    expect(spawnSync(process.execPath, [CLI, 'import', calibration, '--db', db]).status).toBe(0);
    const span = performance.now() - t0;
    const cycles = 24;
    let completed = 0;
    let killed = 0;
    let killedAfterCommit = 0;
    let seed = 12345;
    const random = () => { seed = (seed * 1103515245 + 12345) % 2147483648; return seed / 2147483648; };
    for (let c = 0; c < cycles; c++) {
      const lot = `CRASH${c}`;
      const file = join(dir, `${lot}.csv`);
      writeFileSync(file, lotText(lot, 6, 12000));
      const child = spawn(process.execPath, [CLI, 'import', file, '--db', db], { stdio: 'ignore' });
      // Spread over 15 % to 140 % of a whole run, so some kills land mid-transaction and some runs finish.
      const delay = span * (0.15 + 1.25 * random());
      const timer = setTimeout(() => child.kill('SIGKILL'), delay);
      const code = await new Promise<number | null>((resolve) => child.on('exit', (code) => resolve(code)));
      clearTimeout(timer);
      const s = state();
      expect(s.integrity).toBe('ok');
      const wafers = s.lots.get(lot);
      if (code === 0) { completed++; expect(wafers).toBe(6); } else {
        killed++;
        expect(wafers === undefined || wafers === 6, `${lot} half stored: ${wafers} wafers`).toBe(true);
        if (wafers === 6) killedAfterCommit++;
      }
      expect(s.lots.get('KX2417.1')).toBe(25);
      expect(s.lots.get('CAL')).toBe(6);
    }
    expect(fingerprint('KX2417.1')).toBe(demoBefore);
    console.log(`kill-during-import: ${cycles} cycles over a ${span.toFixed(0)} ms run, ${completed} ran to the end, ${killed} killed (${killed - killedAfterCommit} before the commit: lot absent; ${killedAfterCommit} after it: lot whole); integrity ok and the earlier lot unchanged every time`);
    expect(killed).toBeGreaterThan(0);
  }, 180_000);
});

describe('killing an export at random moments', () => {
  it('leaves either no file or the whole file under the final name, and the database untouched', async () => {
    const demoBefore = fingerprint('KX2417.1');
    const whole = join(dir, 'reference.csv');
    expect(spawnSync(process.execPath, [CLI, 'export', 'KX2417.1', '--db', db, '--out', whole]).status).toBe(0);
    const expected = readFileSync(whole, 'utf8');
    const t0 = performance.now();
    expect(spawnSync(process.execPath, [CLI, 'export', 'KX2417.1', '--db', db, '--out', join(dir, 'timing.csv')]).status).toBe(0);
    const span = performance.now() - t0;
    let absent = 0;
    let complete = 0;
    for (let c = 0; c < 16; c++) {
      const out = join(dir, `fa-${c}.csv`);
      const child = spawn(process.execPath, [CLI, 'export', 'KX2417.1', '--db', db, '--out', out], { stdio: 'ignore' });
      const timer = setTimeout(() => child.kill('SIGKILL'), span * (0.2 + (c / 16) * 0.9));
      await new Promise((resolve) => child.on('exit', resolve));
      clearTimeout(timer);
      if (existsSync(out)) { expect(readFileSync(out, 'utf8')).toBe(expected); complete++; } else absent++;
    }
    expect(state().integrity).toBe('ok');
    expect(fingerprint('KX2417.1')).toBe(demoBefore);
    // The hidden temporary files of killed exports go with the next export into the folder.
    const partials = () => readdirSync(dir).filter((n) => n.endsWith('.partial'));
    const leftByKills = partials().length;
    expect(spawnSync(process.execPath, [CLI, 'export', 'KX2417.1', '--db', db, '--out', join(dir, 'after.csv')]).status).toBe(0);
    expect(partials()).toEqual([]);
    console.log(`kill-during-export: 16 kills, ${absent} left no file, ${complete} left the whole file, none a partial one; ${leftByKills} hidden temporary files, removed by the next export`);
  }, 180_000);
});
