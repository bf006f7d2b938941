// `offstate import` then `offstate export`: the FA file is written once, never over an existing
// file without --force, and holds one row per flagged die with the caution line.
import { afterAll, describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { readFileSync, rmSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { DEMO_CSV, ROOT, scratchDir } from '../support/paths';

const dir = scratchDir();
afterAll(() => rmSync(dir, { recursive: true, force: true }));
const cli = (...args: string[]) => spawnSync(process.execPath, [join(ROOT, 'bin', 'offstate.mjs'), ...args], { encoding: 'utf8', cwd: dir, maxBuffer: 64 << 20 });

describe('offstate export', () => {
  const db = join(dir, 'fa.sqlite');
  it('imports the demo lot and reports "already imported" the second time', () => {
    const first = cli('import', DEMO_CSV, '--db', db);
    expect(first.status).toBe(0);
    expect(first.stdout).toMatch(/imported 37725 rows into 25 wafer\(s\) of lot KX2417\.1/);
    const again = cli('import', DEMO_CSV, '--db', db);
    expect(again.stdout).toMatch(/already imported; nothing changed/);
  });
  it('writes one CSV row per flagged die, refuses to overwrite, and overwrites with --force', () => {
    const analysis = JSON.parse(cli('analyze', db, '--json').stdout);
    const out = join(dir, 'fa.csv');
    const written = cli('export', 'KX2417.1', '--db', db, '--out', out);
    expect(written.status).toBe(0);
    const lines = readFileSync(out, 'utf8').trim().split('\n');
    expect(lines[0]).toMatch(/^# Flags are statistical evidence/);
    const header = lines.find((l) => l.startsWith('lot,'))!;
    expect(header.split(',').slice(0, 5)).toEqual(['lot', 'wafer', 'x', 'y', 'site']);
    const rows = lines.filter((l) => l.startsWith('KX2417.1,'));
    expect(rows.length).toBe(analysis.flagged.length);
    expect(rows.length).toBeGreaterThan(0);
    // Mechanism and cluster columns carry the same calls as the JSON (simple CSV: the demo ids hold no commas).
    const columns = header.split(',');
    const mech = columns.indexOf('mechanism');
    const cluster = columns.indexOf('cluster size');
    const path = columns.indexOf('leakage path');
    const byDie = new Map(analysis.flagged.map((f: any) => [`${f.wafer}|${f.x}|${f.y}`, f]));
    for (const row of rows) {
      const f = row.split(',');
      const die: any = byDie.get(`${f[1]}|${f[2]}|${f[3]}`);
      expect(f[mech]).toBe(die.mechanism.kind);
      expect(f[cluster]).toBe(die.cluster ? String(die.cluster.size) : '');
      expect(f[path]).toBe(die.mechanism.leakagePath ?? '');
    }
    // The demo's pinhole-like random dies raised Ig with Ioff; its edge ring did not (sample-data/README.md).
    expect(rows.some((r) => r.split(',')[path] === 'gate')).toBe(true);
    expect(rows.some((r) => r.split(',')[path] === 'other')).toBe(true);
    writeFileSync(out, 'keep me');
    const refused = cli('export', 'KX2417.1', '--db', db, '--out', out);
    expect(refused.status).toBe(1);
    expect(refused.stderr).toMatch(/already exists/);
    expect(readFileSync(out, 'utf8')).toBe('keep me');
    expect(cli('export', 'KX2417.1', '--db', db, '--out', out, '--force').status).toBe(0);
    expect(readFileSync(out, 'utf8')).toMatch(/^# Flags/);
  });
  it('names the file from the lot id safely when no --out is given', () => {
    const r = cli('export', 'KX2417.1', '--db', db, '--json');
    expect(r.status).toBe(0);
    expect(JSON.parse(readFileSync(join(dir, 'KX2417.1-flagged.json'), 'utf8')).flagged.length).toBeGreaterThan(0);
  });
});
