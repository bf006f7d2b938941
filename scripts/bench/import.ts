// Import benchmark (npm run bench): the full-size lot CSV into Offstate's store, against SQLite's
// own command-line `.import` (Debian package sqlite3) and DuckDB's read_csv on the same file, in
// the same run. With --big it also writes a ~1 GB CSV (the lot repeated under five lot names) and
// imports it in a child process, printing that process's peak resident memory. Figures only.

import { spawnSync } from 'node:child_process';
import { closeSync, existsSync, openSync, readFileSync, rmSync, statSync, writeSync } from 'node:fs';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { openDatabase } from '../../src/node/store/database';
import { importAnyFile } from '../../src/node/importAny';

function seconds(start: number): number { return (performance.now() - start) / 1000; }

function removeDb(path: string): void {
  for (const suffix of ['', '-wal', '-shm']) rmSync(path + suffix, { force: true });
}

function countRows(csvPath: string): number {
  const data = readFileSync(csvPath);
  let n = 0;
  for (let i = data.indexOf(10); i !== -1; i = data.indexOf(10, i + 1)) n++;
  if (data.length > 0 && data[data.length - 1] !== 10) n++;
  return n - 1;
}

function line(label: string, s: number, rows: number, bytes: number, note = ''): void {
  console.log(`  ${label.padEnd(22)} ${s.toFixed(2).padStart(6)} s  ${Math.round(rows / s).toLocaleString('en').padStart(11)} rows/s  ${(bytes / 1e6 / s).toFixed(1).padStart(6)} MB/s${note ? `  ${note}` : ''}`);
}

async function offstateImport(csvPath: string, dbPath: string): Promise<{ s: number; rows: number }> {
  removeDb(dbPath);
  const db = openDatabase(dbPath);
  try {
    const t = performance.now();
    const result = await importAnyFile(db, csvPath);
    return { s: seconds(t), rows: result.rows };
  } finally {
    db.close();
  }
}

function sqliteCliImport(csvPath: string, dbPath: string): number | undefined {
  if (!existsSync('/usr/bin/sqlite3')) return undefined;
  removeDb(dbPath);
  const t = performance.now();
  const run = spawnSync('/usr/bin/sqlite3', [dbPath, '.mode csv', `.import '${csvPath.replace(/'/g, "''")}' dies`], { stdio: ['ignore', 'ignore', 'pipe'] });
  const s = seconds(t);
  if (run.status !== 0) { console.log(`  sqlite3 .import failed: ${run.stderr.toString().slice(0, 200)}`); return undefined; }
  return s;
}

async function duckdbImport(csvPath: string, dbPath: string): Promise<number | undefined> {
  let duck: typeof import('@duckdb/node-api');
  try { duck = await import('@duckdb/node-api'); } catch { console.log('  DuckDB (@duckdb/node-api) is not installed; skipped.'); return undefined; }
  removeDb(dbPath);
  const instance = await duck.DuckDBInstance.create(dbPath);
  const connection = await instance.connect();
  try {
    const t = performance.now();
    await connection.run(`CREATE TABLE dies AS SELECT * FROM read_csv('${csvPath.replace(/'/g, "''")}')`);
    return seconds(t);
  } finally {
    connection.closeSync();
    instance.closeSync();
  }
}

/** Writes the lot five times under different lot names: about 1 GB. */
function writeBigCsv(source: string, target: string): void {
  const text = readFileSync(source, 'latin1');
  const header = text.slice(0, text.indexOf('\n') + 1);
  const body = text.slice(header.length);
  const fd = openSync(target, 'w');
  try {
    writeSync(fd, header);
    for (let k = 1; k <= 5; k++) writeSync(fd, Buffer.from(body.replaceAll('BENCH.1,', `BIG.${k},`), 'latin1'));
  } finally {
    closeSync(fd);
  }
}

/** Child-process entry: import one file and print the peak resident memory. */
export async function rssChild(csvPath: string, dbPath: string): Promise<void> {
  const { s, rows } = await offstateImport(csvPath, dbPath);
  const maxRssMiB = process.resourceUsage().maxRSS / 1024;
  process.stdout.write(JSON.stringify({ s, rows, maxRssMiB }) + '\n');
}

export async function benchImport(cacheDir: string, csvPath: string, big: boolean): Promise<void> {
  const bytes = statSync(csvPath).size;
  const rows = countRows(csvPath);
  console.log(`\nimport comparison: ${(bytes / 1e6).toFixed(1)} MB CSV, ${rows.toLocaleString('en')} rows (${csvPath})`);
  const offstate = await offstateImport(csvPath, join(cacheDir, 'import-offstate.sqlite'));
  line('Offstate import', offstate.s, offstate.rows, bytes, '(parse, validate, columnar wafers, one transaction)');
  const sqlite = sqliteCliImport(csvPath, join(cacheDir, 'import-sqlite3.sqlite'));
  if (sqlite !== undefined) line('sqlite3 CLI .import', sqlite, rows, bytes, '(text columns, no validation)');
  const duck = await duckdbImport(csvPath, join(cacheDir, 'import-duckdb.duckdb'));
  if (duck !== undefined) line('DuckDB read_csv', duck, rows, bytes, '(typed table, all cores)');
  if (sqlite !== undefined) console.log(`  Offstate vs sqlite3 CLI: ${(sqlite / offstate.s).toFixed(2)}x ${sqlite > offstate.s ? 'faster' : 'slower'}`);
  if (duck !== undefined) console.log(`  Offstate vs DuckDB: ${(offstate.s / duck).toFixed(2)}x DuckDB's time (goal: within 3x)`);
  for (const name of ['import-offstate.sqlite', 'import-sqlite3.sqlite', 'import-duckdb.duckdb']) removeDb(join(cacheDir, name));
  if (!big) { console.log('  (run `npm run bench -- --big` to also measure memory on a ~1 GB file)'); return; }
  const bigCsv = join(cacheDir, 'lot-5x25x70k.csv');
  if (!existsSync(bigCsv)) writeBigCsv(csvPath, bigCsv);
  const bundle = fileURLToPath(import.meta.url);
  const dbPath = join(cacheDir, 'import-big.sqlite');
  const child = spawnSync(process.execPath, [bundle, '--rss-child', bigCsv, dbPath], { stdio: ['ignore', 'pipe', 'inherit'] });
  removeDb(dbPath);
  const out = child.stdout.toString().trim().split('\n').pop() ?? '';
  try {
    const r = JSON.parse(out) as { s: number; rows: number; maxRssMiB: number };
    line('Offstate, 1 GB file', r.s, r.rows, statSync(bigCsv).size, `peak RSS ${r.maxRssMiB.toFixed(0)} MiB (goal: under 1 GiB)`);
  } catch {
    console.log(`  1 GB import failed (exit ${child.status}): ${out.slice(0, 300)}`);
  }
}
