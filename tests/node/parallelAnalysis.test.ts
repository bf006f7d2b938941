// The analysis on several threads (parallelAnalysis.ts, with the built worker script as the
// helper) must give exactly what one thread gives, through every front door: the store function,
// the app's analysis thread (kept between analyses, cancellable) and the CLI; kept helper threads
// and kept scratch memory change nothing. The oracle is the single-threaded
// analysis (an invariance check); its values are checked against outside sources elsewhere.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { execFileSync } from 'node:child_process';
import { existsSync, rmSync } from 'node:fs';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import { AnalysisScratch, type Reason } from '../../src/core/analysis';
import { decodePayload } from '../../src/shared/codec';
import { analyzeStoredLot, analyzeStoredLotInParallel } from '../../src/node/analysisStore';
import { AnalysisWorker } from '../../src/node/analysisWorker';
import { HelperPool, packReasons, unpackReasons } from '../../src/node/parallelAnalysis';
import { loadLot } from '../../src/node/store/repository';
import { importDelimitedFile } from '../../src/node/importDelimited';
import { OffstateService } from '../../src/node/service';
import { openDatabase } from '../../src/node/store/database';
import type { ProgressEvent } from '../../src/shared/api';
import { DEMO_CSV, ROOT, scratchDir } from '../support/paths';

const WORKER = join(ROOT, 'dist', 'node', 'worker.mjs');
const CLI = join(ROOT, 'dist', 'node', 'cli.mjs');
const dir = scratchDir();
const dbPath = join(dir, 'demo.sqlite');
afterAll(() => rmSync(dir, { recursive: true, force: true }));
if (!existsSync(WORKER)) console.log('parallel analysis test skipped: run `node scripts/build.mjs` first (npm test does).');

describe.skipIf(!existsSync(WORKER))('the analysis on several threads', () => {
  let single = '';
  beforeAll(async () => {
    const db = openDatabase(dbPath);
    try {
      await importDelimitedFile(db, DEMO_CSV);
      single = JSON.stringify(analyzeStoredLot(db, 'KX2417.1'));
    } finally {
      db.close();
    }
  });

  it('gives the single-threaded result on 2 and 3 threads, with progress up to the whole lot', async () => {
    const db = openDatabase(dbPath, { readonly: true });
    try {
      for (const threads of [2, 3]) {
        const pool = new HelperPool(pathToFileURL(WORKER));
        try {
          // Twice on the same pool and scratch: kept threads and memory change nothing.
          const scratch = new AnalysisScratch();
          for (let round = 0; round < 2; round++) {
            const seen: number[] = [];
            const result = await analyzeStoredLotInParallel(db, 'KX2417.1', { pool, threads, scratch, onProgress: (done, total) => { expect(total).toBe(25); seen.push(done); } });
            expect(JSON.stringify(result)).toBe(single);
            expect(seen.at(-1)).toBe(25);
            expect(seen.every((d, i) => i === 0 || d >= seen[i - 1])).toBe(true);
            // It moves while the groups run, not only at the end.
            expect(seen.some((d) => d > 0 && d < 25)).toBe(true);
          }
        } finally {
          pool.close();
        }
      }
    } finally {
      db.close();
    }
  });

  it('carries flag reasons between threads in columns and rebuilds them field for field', () => {
    const reasons = new Map<number, Reason[]>([
      [7, [
        { method: 'pat-wafer', param: 'Ioff_n', value: -0, score: 6.5, limit: 6, direction: 'high', scale: 'log10', low: -11, high: -9.5, clipped: true },
        { method: 'nnr', param: 'Ioff_n', value: 2e-9, score: -7.25, limit: 5, direction: 'low', scale: 'log10', residual: -0.8, neighbours: 8 },
      ]],
      [3, [{ method: 'pat-lot', param: 'Ion_p', value: 1e-4, score: NaN, limit: 6, direction: 'low', scale: 'linear', low: 1, high: 2, clipped: false }]],
    ]);
    const back = unpackReasons(structuredClone(packReasons(reasons)));
    expect([...back.keys()]).toEqual([7, 3]);
    for (const [die, list] of reasons) {
      // toEqual compares numbers with Object.is: -0 and NaN must come back as they were.
      expect(back.get(die)).toEqual(list);
      back.get(die)!.forEach((r, i) => expect(Object.keys(r)).toEqual(Object.keys(list[i])));
    }
  });

  it('reports a failure in a helper as an error, and the pool goes on', async () => {
    const db = openDatabase(dbPath, { readonly: true });
    const pool = new HelperPool(pathToFileURL(WORKER));
    try {
      const frames = loadLot(db, 'KX2417.1');
      // Frames without probe sites make the group's analysis throw in the helper's thread.
      const broken = frames.map((f) => ({ ...f, site: undefined as unknown as Int32Array }));
      await expect(pool.run(broken, ['Ioff_p', 'Ion_p'], {}, () => {})).rejects.toThrow();
      const result = await analyzeStoredLotInParallel(db, 'KX2417.1', { pool, threads: 2 });
      expect(JSON.stringify(result)).toBe(single);
    } finally {
      pool.close();
      db.close();
    }
  });

  it('cancels the running analysis of the app thread and runs the queued one on a new thread', async () => {
    const thread = new AnalysisWorker(pathToFileURL(WORKER));
    try {
      const first = thread.analyze(dbPath, 'KX2417.1', () => {});
      const queued = thread.analyze(dbPath, 'KX2417.1', () => {});
      setTimeout(() => first.cancel(), 50);
      await expect(first.promise).rejects.toMatchObject({ name: 'CancelledError' });
      // The analysis queued behind it runs on a new thread.
      expect(JSON.stringify((await queued.promise).value())).toBe(single);
      // A queued analysis cancelled before it starts is dropped; the running one goes on.
      const running = thread.analyze(dbPath, 'KX2417.1', () => {});
      const dropped = thread.analyze(dbPath, 'KX2417.1', () => {});
      dropped.cancel();
      await expect(dropped.promise).rejects.toMatchObject({ name: 'CancelledError' });
      expect(JSON.stringify((await running.promise).value())).toBe(single);
    } finally {
      thread.close();
    }
  });

  it('gives it through the service, on the app analysis thread', async () => {
    const service = new OffstateService({ dbPath, mode: 'browser', workerUrl: pathToFileURL(WORKER) });
    const events: ProgressEvent[] = [];
    service.onProgress((e) => events.push(e));
    try {
      const result = await service.analyzeLot('KX2417.1');
      expect(JSON.stringify(result)).toBe(single);
      // What the browser mode sends: the envelope encoded in the analysis thread, as it came.
      expect(JSON.stringify(decodePayload<{ ok: boolean; result: unknown }>(await service.analyzeLotEnvelope('KX2417.1')))).toBe(JSON.stringify({ ok: true, result: JSON.parse(single) }));
      expect(events.some((e) => e.kind === 'analysis' && e.phase === 'done')).toBe(true);
    } finally {
      service.close();
    }
  });

  it('cancels an analysis of the database the user leaves, and opens the other at once', async () => {
    const service = new OffstateService({ dbPath, mode: 'browser', workerUrl: pathToFileURL(WORKER) });
    try {
      const running = service.analyzeLot('KX2417.1');
      const other = join(dir, 'other.sqlite');
      const info = await service.openDatabase(other);
      expect(info.database).toBe(other);
      await expect(running).rejects.toMatchObject({ name: 'CancelledError' });
    } finally {
      service.close();
    }
  });

  it('prints the same analyze --json from the CLI on one thread and on two', () => {
    const run = (threads: string) => execFileSync(process.execPath, [CLI, 'analyze', '--json', dbPath], {
      env: { ...process.env, OFFSTATE_ANALYSIS_THREADS: threads }, maxBuffer: 256 * 2 ** 20,
    }).toString();
    const one = run('1');
    expect(JSON.parse(one).flagged.length).toBeGreaterThan(100);
    expect(run('2')).toBe(one);
  });
});
