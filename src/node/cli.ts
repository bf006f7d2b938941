// The command line: import files, analyse files or databases (with a JSON contract for other
// tools), serve the local browser mode, and write the demo lot.

import { parseArgs } from 'node:util';
import { mkdirSync, openSync, readSync, closeSync, existsSync } from 'node:fs';
import { dirname, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { jsonReport, reasonText, type LotAnalysis } from '../core/analysis';
import { openDatabase, type Db } from './store/database';
import { listLots } from './store/repository';
import { importAnyFile, previewFile } from './importAny';
import { resolveMapping, saveMapping } from './importMappings';
import type { ImportPreview } from '../core/import';
import { analyzeStoredLotInParallel } from './analysisStore';
import { HelperPool } from './parallelAnalysis';
import { OffstateService } from './service';
import { startServer } from './server';
import { defaultDatabasePath, demoLotPath, recentDatabasesFile, uiDir } from './paths';
import { VERSION } from './version';
import { flaggedCsv, safeFileName } from '../core/export';
import { writeNewFile } from './files';
import { formatDuration, progressLine } from './progressText';

const HELP = `Offstate ${VERSION}: per-die leakage triage

Usage:
  offstate import FILE... [--db PATH] [--mapping NAME|FILE.json]
                                               store per-die CSV/TSV or STDF V4 files (one transaction per file)
  offstate preview FILE [--mapping NAME|FILE.json] [--save-mapping NAME] [--json]
                                               show how a file's columns or tests are read; save the mapping
  offstate analyze FILE... [--json] [--db PATH] analyse data files or an Offstate database
  offstate serve [--db PATH] [--port N] [--demo] start the local browser mode on 127.0.0.1
  offstate export LOT [--out FILE] [--json] [--force] [--db PATH]
                                               write the lot's flagged dies for failure analysis
  offstate generate-demo [--out DIR] [--seed N] write the invented demo lot (CSV + truth JSON)

Default database: ${defaultDatabasePath()} (set OFFSTATE_DB or --db to change).
Flags are statistical evidence, not a disposition: scrapping or shipping follows your fab's procedures.`;

function isSqliteFile(path: string): boolean {
  const fd = openSync(path, 'r');
  try {
    const head = Buffer.alloc(16);
    const n = readSync(fd, head, 0, 16, 0);
    return n === 16 && head.toString('latin1') === 'SQLite format 3\u0000';
  } finally {
    closeSync(fd);
  }
}

function openUserDb(path: string | undefined): { db: Db; path: string } {
  const dbPath = resolve(path ?? defaultDatabasePath());
  mkdirSync(dirname(dbPath), { recursive: true });
  return { db: openDatabase(dbPath), path: dbPath };
}

async function importCommand(files: string[], dbOption: string | undefined, mappingOption: string | undefined, out: NodeJS.WriteStream): Promise<number> {
  if (files.length === 0) { process.stderr.write('offstate import: name at least one file.\n'); return 2; }
  const { db, path } = openUserDb(dbOption);
  if (db.readonly) {
    db.close();
    process.stderr.write(`offstate import: ${path} is read-only for you, so it was opened for reading only and nothing was imported.\n`);
    return 1;
  }
  let failures = 0;
  try {
    let resolved: ReturnType<typeof resolveMapping>;
    try { resolved = resolveMapping(db, mappingOption); } catch (error) { process.stderr.write(`offstate import: ${(error as Error).message}\n`); return 2; }
    for (const file of files) {
      const started = performance.now();
      try {
        const result = await importAnyFile(db, file, {
          mapping: resolved.mapping,
          mappingName: resolved.name,
          onProgress: (p) => { if (process.stderr.isTTY) process.stderr.write(`\r${progressLine(p.bytesDone, p.bytesTotal, (performance.now() - started) / 1000)}, ${p.rows.toLocaleString('en')} rows`); },
        });
        if (process.stderr.isTTY) process.stderr.write('\r\x1b[K');
        if (result.status === 'already-imported') {
          out.write(`${file}: already imported; nothing changed.\n`);
        } else {
          out.write(`${file}: imported ${result.rows} rows into ${result.wafers} wafer(s) of lot ${result.lots.join(', ')}` +
            `${result.rejected ? `, ${result.rejected} rejected` : ''} in ${formatDuration(result.seconds)} -> ${path}\n`);
        }
        for (const m of result.status === 'imported' ? result.messages : []) out.write(`  ${m}\n`);
      } catch (error) {
        failures++;
        process.stderr.write(`${file}: ${(error as Error).message}\n`);
      }
    }
  } finally {
    db.close();
  }
  return failures > 0 ? 1 : 0;
}

function previewText(p: ImportPreview): string {
  const lines = [`Format: ${p.format}${p.format === 'delimited' ? `, ${p.layout === 'long' ? 'one row per die and test' : 'one row per die'}, delimiter ${JSON.stringify(p.delimiter)}, header on line ${p.headerLine}` : ''}`];
  if (p.appliedMapping) lines.push(`Mapping applied: ${p.appliedMapping}`);
  for (const c of p.columns) {
    const what = c.role === 'measurement' ? `${c.name} [${c.unit || 'no unit'}] x ${c.scale}` : c.role;
    lines.push(`  ${String(c.index + 1).padStart(3)} ${c.header.padEnd(24)} -> ${what.padEnd(28)} ${c.samples.slice(0, 3).join(', ')}`);
  }
  for (const t of p.tests) lines.push(`  test ${t.test.padEnd(24)} -> ${(t.name || '(left out)').padEnd(16)} [${t.unit || 'no unit'}] ${t.count} result(s) seen`);
  for (const w of p.warnings) lines.push(`Note: ${w}`);
  for (const e of p.errors) lines.push(`Problem: ${e}`);
  return lines.join('\n') + '\n';
}

async function previewCommand(files: string[], dbOption: string | undefined, mappingOption: string | undefined, saveAs: string | undefined, json: boolean, out: NodeJS.WriteStream): Promise<number> {
  if (files.length !== 1) { process.stderr.write('offstate preview: name one file.\n'); return 2; }
  const { db } = openUserDb(dbOption);
  try {
    const resolved = resolveMapping(db, mappingOption);
    const preview = previewFile(db, files[0], resolved.mapping, resolved.name);
    out.write(json ? JSON.stringify(preview) + '\n' : previewText(preview));
    if (saveAs) {
      if (preview.errors.length > 0) { process.stderr.write(`offstate preview: not saved, the file cannot be read this way.\n`); return 1; }
      saveMapping(db, saveAs, preview.mapping);
      if (!json) out.write(`Saved as mapping "${saveAs}"; files with the same header line will be read this way.\n`);
    }
    return preview.errors.length > 0 ? 1 : 0;
  } catch (error) {
    process.stderr.write(`offstate preview: ${(error as Error).message}\n`);
    return 1;
  } finally {
    db.close();
  }
}

/** Helper threads for the analysis, from the worker script beside the bundled CLI
 * (dist/node/worker.mjs); none when run unbundled. */
function helperPool(): HelperPool | undefined {
  const url = new URL('./worker.mjs', import.meta.url);
  return existsSync(fileURLToPath(url)) ? new HelperPool(url) : undefined;
}

function mergeAnalyses(analyses: LotAnalysis[]): LotAnalysis {
  return {
    settings: analyses[0].settings,
    method: analyses[0].method,
    wafers: analyses.flatMap((a) => a.wafers),
    lots: analyses.flatMap((a) => a.lots),
    flagged: analyses.flatMap((a) => a.flagged),
    warnings: analyses.flatMap((a) => a.warnings ?? []),
  };
}

async function analyzeCommand(files: string[], json: boolean, dbOption: string | undefined, out: NodeJS.WriteStream): Promise<number> {
  const sources = files.length > 0 ? files : [dbOption ?? defaultDatabasePath()];
  const analyses: LotAnalysis[] = [];
  const scratch = openDatabase(':memory:');
  let scratchUsed = false;
  const pool = helperPool();
  try {
    for (const file of sources) {
      if (!existsSync(file)) { process.stderr.write(`offstate analyze: ${file} does not exist.\n`); return 2; }
      if (isSqliteFile(file)) {
        const db = openDatabase(file, { readonly: true });
        try {
          for (const lot of listLots(db)) analyses.push(await analyzeStoredLotInParallel(db, lot.lot, { pool }));
        } finally {
          db.close();
        }
      } else {
        const result = await importAnyFile(scratch, file);
        if (result.status === 'imported') {
          scratchUsed = true;
          if (result.rejected > 0 && !json) process.stderr.write(`${file}: ${result.rejected} rows rejected (first: ${result.messages[0] ?? ''})\n`);
        }
      }
    }
    if (scratchUsed) for (const lot of listLots(scratch)) analyses.push(await analyzeStoredLotInParallel(scratch, lot.lot, { pool }));
  } catch (error) {
    process.stderr.write(`offstate analyze: ${(error as Error).message}\n`);
    return 1;
  } finally {
    pool?.close();
    scratch.close();
  }
  if (analyses.length === 0) { process.stderr.write('offstate analyze: no lots found.\n'); return 1; }
  const merged = mergeAnalyses(analyses);
  if (json) {
    out.write(JSON.stringify(jsonReport(merged)) + '\n');
    return 0;
  }
  out.write(`Method: ${merged.method}\n`);
  out.write('Flags are statistical evidence, not a disposition.\n\n');
  for (const w of merged.wafers) {
    const bias = w.siteBias.map((b) => `site ${b.site} ${b.param} ${(b.shift * 100).toFixed(1)}%`).join(', ');
    out.write(`${w.lot} wafer ${w.wafer}: ${w.dies} dies, ${w.flaggedCount} flagged${bias ? `; site bias: ${bias}` : ''}\n`);
  }
  out.write(`\n${merged.flagged.length} flagged dies\n`);
  for (const d of merged.flagged.slice(0, 50)) {
    out.write(`  ${d.lot} ${d.wafer} (${d.x},${d.y}) site ${d.site}: ${d.reasons.map(reasonText).join('; ')}\n`);
  }
  if (merged.flagged.length > 50) out.write(`  ... ${merged.flagged.length - 50} more (use --json)\n`);
  return 0;
}

async function serveCommand(dbOption: string | undefined, port: number, demo: boolean): Promise<number> {
  const dbPath = resolve(dbOption ?? defaultDatabasePath());
  mkdirSync(dirname(dbPath), { recursive: true });
  const service = new OffstateService({ dbPath, mode: 'browser', workerUrl: new URL('./worker.mjs', import.meta.url), recentFile: process.env.OFFSTATE_RECENT_FILE ?? recentDatabasesFile(), warmAnalysis: true });
  if (demo) {
    const result = await service.importFile(demoLotPath());
    process.stdout.write(result.status === 'imported' ? `Demo lot imported into ${dbPath}.\n` : `Demo lot already in ${dbPath}.\n`);
  }
  const running = await startServer({ service, uiDir: uiDir(), port });
  process.stdout.write(`Offstate browser mode: ${running.url}\n`);
  const stop = () => { void running.close().then(() => { service.close(); process.exit(0); }); };
  process.on('SIGINT', stop);
  process.on('SIGTERM', stop);
  return new Promise<number>(() => undefined);
}

async function exportCommand(lot: string | undefined, outOption: string | undefined, json: boolean, force: boolean, dbOption: string | undefined, out: NodeJS.WriteStream): Promise<number> {
  if (!lot) { process.stderr.write('offstate export: name the lot.\n'); return 2; }
  const dbPath = resolve(dbOption ?? defaultDatabasePath());
  if (!existsSync(dbPath)) { process.stderr.write(`offstate export: no database at ${dbPath}.\n`); return 2; }
  const db = openDatabase(dbPath, { readonly: true });
  try {
    const summary = listLots(db).find((l) => l.lot === lot);
    if (!summary) { process.stderr.write(`offstate export: no lot ${lot} in ${dbPath}.\n`); return 1; }
    const pool = helperPool();
    const analysis = await analyzeStoredLotInParallel(db, lot, { pool }).finally(() => pool?.close());
    const text = json ? JSON.stringify(jsonReport(analysis), null, 1) + '\n' : flaggedCsv(analysis, summary.params);
    const target = resolve(outOption ?? safeFileName(`${lot}-flagged`, json ? 'json' : 'csv'));
    writeNewFile(target, text, force);
    out.write(`${target}: ${analysis.flagged.length} flagged dies of lot ${lot}.\n`);
    return 0;
  } catch (error) {
    process.stderr.write(`offstate export: ${(error as Error).message}\n`);
    return 1;
  } finally {
    db.close();
  }
}

async function generateDemoCommand(outDir: string, seed: number | undefined): Promise<number> {
  const { writeDemoLot } = await import('./demo');
  const { DEMO_LOT_OPTIONS } = await import('../core/generator');
  const written = writeDemoLot(resolve(outDir), seed === undefined ? DEMO_LOT_OPTIONS : { ...DEMO_LOT_OPTIONS, seed });
  process.stdout.write(`Wrote ${written.csv} (${written.rows} rows, ${written.diesPerWafer} dies per wafer) and ${written.truth}\n`);
  return 0;
}

export async function main(argv: string[], out: NodeJS.WriteStream = process.stdout): Promise<number> {
  const { values, positionals } = parseArgs({
    args: argv,
    allowPositionals: true,
    options: {
      db: { type: 'string' }, json: { type: 'boolean' }, port: { type: 'string' }, demo: { type: 'boolean' },
      out: { type: 'string' }, seed: { type: 'string' }, mapping: { type: 'string' }, 'save-mapping': { type: 'string' }, force: { type: 'boolean' }, help: { type: 'boolean', short: 'h' }, version: { type: 'boolean' },
    },
  });
  const [command, ...rest] = positionals;
  if (values.version) { out.write(`${VERSION}\n`); return 0; }
  if (values.help || !command) { out.write(HELP + '\n'); return command || values.help ? 0 : 2; }
  switch (command) {
    case 'import': return importCommand(rest, values.db, values.mapping, out);
    case 'preview': return previewCommand(rest, values.db, values.mapping, values['save-mapping'], values.json ?? false, out);
    case 'analyze': return analyzeCommand(rest, values.json ?? false, values.db, out);
    case 'serve': return serveCommand(values.db, Number(values.port ?? 0), values.demo ?? false);
    case 'export': return exportCommand(rest[0], values.out, values.json ?? false, values.force ?? false, values.db, out);
    case 'generate-demo': return generateDemoCommand(values.out ?? 'sample-data', values.seed === undefined ? undefined : Number(values.seed));
    default:
      process.stderr.write(`offstate: unknown command "${command}".\n\n${HELP}\n`);
      return 2;
  }
}
