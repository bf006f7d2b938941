// Analysis benchmark (part of npm run bench): the full analysis of the full-size lot (25 wafers x
// ~70,000 dies) with all its parameters (best of two runs) and with the four current parameters
// alone (best of three), wall and CPU time, in this thread; then the product's path for the four
// currents: a stored lot analysed from the database on one and on two threads, and through the
// app's analysis thread (result posted back to the app's thread), with the machine's load average beside them (other
// work on the machine slows every figure); then DuckDB (@duckdb/node-api, dev dependency) computing the same
// per-wafer median, standard deviation, quartiles and Ion-Ioff correlation on the same CSV, and
// the ratio. Prints figures only.
import { existsSync, rmSync } from 'node:fs';
import { availableParallelism, loadavg } from 'node:os';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import { openDatabase } from '../../src/node/store/database';
import { listLots, loadLot, storeImport } from '../../src/node/store/repository';
import { analyzeStoredLotInParallel } from '../../src/node/analysisStore';
import { AnalysisWorker } from '../../src/node/analysisWorker';
import { analysisThreads, HelperPool } from '../../src/node/parallelAnalysis';
import { projectRoot } from '../../src/node/paths';
import { AnalysisScratch, analyzeLot } from '../../src/core/analysis';
import { withParams, type WaferFrame } from '../../src/core/frame';

const CURRENTS = ['Ioff_n', 'Ion_n', 'Ioff_p', 'Ion_p'];

function only(frames: WaferFrame[], names: string[]): WaferFrame[] {
  return frames.map((f) => withParams(f, names));
}

function timeBest(run: () => void, times = 2): { wall: number; cpu: number } {
  let best = { wall: Infinity, cpu: Infinity };
  for (let i = 0; i < times; i++) {
    const cpu0 = process.cpuUsage();
    const t = performance.now();
    run();
    const wall = (performance.now() - t) / 1000;
    const used = process.cpuUsage(cpu0);
    if (wall < best.wall) best = { wall, cpu: (used.user + used.system) / 1e6 };
  }
  return best;
}

/** The demo lot's name in the bench's demo database (written by run.ts before this bench). */
function listDemoLot(): string {
  const db = openDatabase(join(projectRoot(), '.cache', 'bench', 'demo lot.sqlite'), { readonly: true });
  try {
    return listLots(db)[0].lot;
  } finally {
    db.close();
  }
}

async function timeBestAsync(run: () => Promise<unknown>, times: number): Promise<number> {
  let best = Infinity;
  for (let i = 0; i < times; i++) best = Math.min(best, await timeAsync(run));
  return best;
}

async function timeAsync(run: () => Promise<unknown>): Promise<number> {
  const t = performance.now();
  await run();
  return (performance.now() - t) / 1000;
}

export async function benchAnalysis(csvPath: string, dbPath: string): Promise<void> {
  const db = openDatabase(dbPath, { readonly: true });
  let frames: WaferFrame[];
  try {
    frames = loadLot(db, listLots(db)[0].lot);
  } finally {
    db.close();
  }
  const dies = frames.reduce((n, f) => n + f.x.length, 0);
  console.log(`analysis engine on the full-size lot: ${frames.length} wafers, ${dies} dies (wall / CPU of this process; 1-minute load average ${loadavg()[0].toFixed(1)} on ${availableParallelism()} cores)`);
  let flagged = 0;
  const all = timeBest(() => { flagged = analyzeLot(frames).flagged.length; });
  console.log(`  all ${frames[0].params.length} parameters, best of 2: ${all.wall.toFixed(2)} s / ${all.cpu.toFixed(2)} s CPU (${flagged} flagged)`);
  const four = only(frames, CURRENTS);
  const currents = timeBest(() => { flagged = analyzeLot(four).flagged.length; }, 3);
  console.log(`  four currents (${CURRENTS.join(', ')}), best of 3: ${currents.wall.toFixed(2)} s / ${currents.cpu.toFixed(2)} s CPU (${flagged} flagged; goal < 3 s)`);
  const scratch = new AnalysisScratch();
  const keptScratch = timeBest(() => { analyzeLot(four, { scratch }); }, 3);
  console.log(`  four currents, scratch memory kept between runs (as the app's threads keep it), best of 3: ${keptScratch.wall.toFixed(2)} s / ${keptScratch.cpu.toFixed(2)} s CPU`);

  // The product's path: from the database to the result, on one thread and on two (helpers
  // kept between runs, so the first run pays for compiling the code and the later ones not), and
  // through the app's analysis thread (result posted back to the app's thread).
  const workerScript = join(projectRoot(), 'dist', 'node', 'worker.mjs');
  if (!existsSync(workerScript)) {
    console.log('  (no dist/node/worker.mjs: run npm run build for the threaded figures)');
  } else {
    const fourDb = join(dbPath, '..', 'four-current lot.sqlite');
    for (const suffix of ['', '-wal', '-shm']) rmSync(fourDb + suffix, { force: true });
    const db4 = openDatabase(fourDb);
    const workerUrl = pathToFileURL(workerScript);
    const lot = four[0].lot;
    try {
      storeImport(db4, four, { fileName: 'four currents', hash: 'bench', bytes: 0, report: { status: 'imported', file: 'four currents', hash: 'bench', lots: [lot], wafers: four.length, rows: dies, rejected: 0, messages: [], seconds: 0 } });
      for (const threads of [1, 2]) {
        const pool = new HelperPool(workerUrl);
        const kept = new AnalysisScratch();
        try {
          const best = await timeBestAsync(() => analyzeStoredLotInParallel(db4, lot, { pool, threads, scratch: kept }), 3);
          console.log(`  four currents from the database on ${threads} thread${threads > 1 ? 's' : ''}, threads and scratch kept, best of 3: ${best.toFixed(2)} s (goal < 3 s)`);
        } finally {
          pool.close();
        }
      }
    } finally {
      db4.close();
    }
    // As the app runs it: the analysis thread started and warmed at start (as OffstateService
    // does with warmAnalysis), then the lot analysed and its result posted back to this thread,
    // encoded as the browser mode sends it.
    const thread = new AnalysisWorker(workerUrl);
    try {
      const warmS = await timeAsync(async () => { thread.warm(); await thread.analyze(join(dbPath, '..', 'demo lot.sqlite'), listDemoLot(), () => {}).promise; });
      const first = await timeAsync(() => thread.analyze(fourDb, lot, () => {}).promise);
      const best = await timeBestAsync(() => thread.analyze(fourDb, lot, () => {}).promise, 3);
      console.log(`  four currents through the app's analysis thread (${analysisThreads()} threads, result posted back encoded, as the browser mode sends it): first ${first.toFixed(2)} s, then best of 3 ${best.toFixed(2)} s (start, warm-up and the demo lot before: ${warmS.toFixed(2)} s)`);
    } finally {
      thread.close();
    }
  }

  // DuckDB on the same rows: per wafer, for each current, median, sample standard deviation and
  // type 7 quartiles (quantile_cont) of |I| and of log10|I|, and corr(|Ion|, log10|Ioff|).
  const { DuckDBInstance } = await import('@duckdb/node-api');
  for (const threads of [1, 2]) {
    const instance = await DuckDBInstance.create(':memory:', { threads: String(threads) });
    const connection = await instance.connect();
    const load = await timeAsync(() => connection.run(`CREATE TABLE lot AS SELECT * FROM read_csv('${csvPath.replace(/'/g, "''")}', header = true)`));
    const columns = { Ioff_n: '"Ioff_n [pA]"', Ion_n: '"Ion_n (uA)"', Ioff_p: '"IOFF_P (pA)"', Ion_p: '"Ion_p (uA)"' };
    const stats = Object.entries(columns).flatMap(([name, column]) => {
      const mag = `abs(${column})`;
      const log = `log10(abs(${column}))`;
      return [
        `quantile_cont(${mag}, [0.25, 0.5, 0.75]) AS ${name}_q`, `stddev_samp(${mag}) AS ${name}_sd`,
        `quantile_cont(${log}, [0.25, 0.5, 0.75]) AS ${name}_lq`, `stddev_samp(${log}) AS ${name}_lsd`,
      ];
    });
    const sql = `SELECT Wafer, count(*) AS n, ${stats.join(', ')},
      corr(abs("Ion_n (uA)"), log10(abs("Ioff_n [pA]"))) AS r_n, corr(abs("Ion_p (uA)"), log10(abs("IOFF_P (pA)"))) AS r_p
      FROM lot GROUP BY Wafer ORDER BY Wafer`;
    let rows = 0;
    const query = Math.min(
      await timeAsync(async () => { rows = (await connection.runAndReadAll(sql)).getRows().length; }),
      await timeAsync(async () => { rows = (await connection.runAndReadAll(sql)).getRows().length; }),
    );
    console.log(`  DuckDB, ${threads} thread${threads > 1 ? 's' : ''}: CSV load ${load.toFixed(2)} s; per-wafer median, sd, quartiles (|I| and log10), corr for ${rows} wafers: ${query.toFixed(2)} s`);
    console.log(`    ratio (our full analysis of the four currents / DuckDB's per-wafer statistics): ${(currents.wall / query).toFixed(1)}x`);
    connection.closeSync();
    instance.closeSync();
  }
}
