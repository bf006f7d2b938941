// Benchmarks (npm run bench): prints figures, gates nothing. Demo lot and a full-size lot of
// 25 wafers x ~70,000 dies: CSV import into SQLite, loading the lot, and the full analysis.
import { existsSync, mkdirSync, openSync, writeSync, closeSync, rmSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { spawnSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import { openDatabase } from '../../src/node/store/database';
import { importDelimitedFile } from '../../src/node/importDelimited';
import { loadLot } from '../../src/node/store/repository';
import { analyzeLot } from '../../src/core/analysis';
import { DEMO_LOT_OPTIONS, lotCsvChunks, prepareLot, iterateWafers } from '../../src/core/generator';
import { projectRoot } from '../../src/node/paths';
import { benchAnalysis } from './analysis';
import { benchImport, rssChild } from './import';
import { benchSpatial } from './spatial';

const root = projectRoot();
const cacheDir = join(root, '.cache', 'bench');
mkdirSync(cacheDir, { recursive: true });

function seconds(start: number): number { return (performance.now() - start) / 1000; }

async function measure(label: string, csvPath: string): Promise<void> {
  const dbPath = join(cacheDir, `${label}.sqlite`);
  for (const suffix of ['', '-wal', '-shm']) rmSync(dbPath + suffix, { force: true });
  const db = openDatabase(dbPath);
  const bytes = statSync(csvPath).size;
  let t = performance.now();
  const result = await importDelimitedFile(db, csvPath);
  const importS = seconds(t);
  t = performance.now();
  const lot = result.lots[0];
  const frames = loadLot(db, lot);
  const loadS = seconds(t);
  t = performance.now();
  const analysis = analyzeLot(frames);
  const analyzeS = seconds(t);
  const dies = frames.reduce((n, f) => n + f.x.length, 0);
  console.log(`${label}: ${frames.length} wafers, ${dies} dies, ${frames[0].params.length} parameters, ${(bytes / 1e6).toFixed(1)} MB CSV`);
  console.log(`  import  ${importS.toFixed(2)} s  (${Math.round(result.rows / importS).toLocaleString('en')} rows/s, ${(bytes / 1e6 / importS).toFixed(1)} MB/s)`);
  console.log(`  load    ${loadS.toFixed(3)} s  (whole lot from SQLite into typed columns)`);
  console.log(`  analyze ${analyzeS.toFixed(2)} s  (statistics per wafer/lot/site, correlation, site bias, flags: ${analysis.flagged.length} flagged)`);
  console.log(`  peak RSS ${(process.memoryUsage().rss / 2 ** 20).toFixed(0)} MiB`);
  db.close();
}

async function main(): Promise<void> {
  await measure('demo lot', join(root, 'sample-data', 'demo-lot.csv'));
  const bigCsv = join(cacheDir, 'lot-25x70k.csv');
  if (!existsSync(bigCsv)) {
    const t = performance.now();
    // 0.98 mm square dies on a 300 mm wafer with 3 mm edge exclusion: about 70,000 dies a wafer.
    const prepared = prepareLot({ ...DEMO_LOT_OPTIONS, seed: 7, lot: 'BENCH.1', layout: { ...DEMO_LOT_OPTIONS.layout, dieWidthMm: 0.98, dieHeightMm: 0.98 } });
    const fd = openSync(bigCsv, 'w');
    try {
      for (const chunk of lotCsvChunks({ lot: 'BENCH.1', wafers: iterateWafers(prepared) })) writeSync(fd, chunk);
    } finally {
      closeSync(fd);
    }
    console.log(`(generated ${bigCsv} in ${seconds(t).toFixed(1)} s; cached for later runs)`);
  }
  await measure('full-size lot', bigCsv);
  benchSpatial();
  await benchImport(cacheDir, bigCsv, process.argv.includes('--big'));
  // In a process of its own, so the benches before it (their heap, their freed memory) weigh on
  // none of its figures.
  const child = spawnSync(process.execPath, ['--max-old-space-size=8192', fileURLToPath(import.meta.url), '--analysis-child', bigCsv, join(cacheDir, 'full-size lot.sqlite')], { stdio: 'inherit' });
  if (child.status !== 0) console.log(`  analysis bench failed (exit ${child.status})`);
}

const rssAt = process.argv.indexOf('--rss-child');
const analysisAt = process.argv.indexOf('--analysis-child');
if (rssAt >= 0) rssChild(process.argv[rssAt + 1], process.argv[rssAt + 2]).catch((error) => { console.error(error); process.exit(1); });
else if (analysisAt >= 0) benchAnalysis(process.argv[analysisAt + 1], process.argv[analysisAt + 2]).catch((error) => { console.error(error); process.exit(1); });
else main().catch((error) => { console.error(error); process.exit(1); });
