// The analysis on several threads (parallelAnalysis.ts, with the built worker script as the
// helper) must give exactly what one thread gives, through every front door: the store function,
// the service's job worker (as the app runs it) and the CLI. The oracle is the single-threaded
// analysis (an invariance check); its values are checked against outside sources elsewhere.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { execFileSync } from 'node:child_process';
import { existsSync, rmSync } from 'node:fs';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import { analyzeStoredLot, analyzeStoredLotInParallel } from '../../src/node/analysisStore';
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
        const seen: number[] = [];
        const result = await analyzeStoredLotInParallel(db, 'KX2417.1', { workerUrl: pathToFileURL(WORKER), threads, onProgress: (done, total) => { expect(total).toBe(25); seen.push(done); } });
        expect(JSON.stringify(result)).toBe(single);
        expect(seen.at(-1)).toBe(25);
        expect(seen.every((d, i) => i === 0 || d >= seen[i - 1])).toBe(true);
      }
    } finally {
      db.close();
    }
  });

  it('gives it through the service job worker, as the app runs it', async () => {
    const service = new OffstateService({ dbPath, mode: 'browser', workerUrl: pathToFileURL(WORKER) });
    const events: ProgressEvent[] = [];
    service.onProgress((e) => events.push(e));
    try {
      const result = await service.analyzeLot('KX2417.1');
      expect(JSON.stringify(result)).toBe(single);
      expect(events.some((e) => e.kind === 'analysis' && e.phase === 'done')).toBe(true);
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
