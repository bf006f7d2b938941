// Imports through the worker thread (as the browser mode and the desktop run them): an explicit
// mapping travels with the job (progress events also carry the rows read).
import { afterAll, describe, expect, it } from 'vitest';
import { existsSync, rmSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import { OffstateService } from '../../src/node/service';
import type { ProgressEvent } from '../../src/shared/api';
import { ROOT, scratchDir } from '../support/paths';

const WORKER = join(ROOT, 'dist', 'node', 'worker.mjs');
const dir = scratchDir();
afterAll(() => rmSync(dir, { recursive: true, force: true }));
if (!existsSync(WORKER)) console.log('worker import test skipped: run `node scripts/build.mjs` first (npm test does).');

describe.skipIf(!existsSync(WORKER))('importing in the worker thread', () => {
  it('applies an explicit mapping sent with the job and reports the job done', async () => {
    const service = new OffstateService({ dbPath: join(dir, 'w.sqlite'), mode: 'browser', workerUrl: pathToFileURL(WORKER) });
    const rows = ['LotID,Slot,Col,Row,LEAKN,DRIVEN'];
    for (let i = 0; i < 3000; i++) rows.push(`WK1,1,${i % 60},${Math.floor(i / 60)},${20 + (i % 7)},${700 + (i % 11)}`);
    const file = join(dir, 'odd.csv');
    writeFileSync(file, rows.join('\n'));
    const events: ProgressEvent[] = [];
    service.onProgress((e) => events.push(e));
    const result = await service.importFile(file, {
      mapping: { columns: [{ header: 'LEAKN', role: 'measurement', name: 'Ioff_n', unit: 'pA' }, { header: 'DRIVEN', role: 'measurement', name: 'Ion_n', unit: 'uA' }] },
    });
    expect(result).toMatchObject({ status: 'imported', rows: 3000 });
    const wafer = await service.getWafer('WK1', '1');
    // SI Brochure prefixes: p = 1e-12, u = 1e-6.
    expect(wafer.values.Ioff_n[0]).toBeCloseTo(20e-12, 20);
    expect(wafer.values.Ion_n[1]).toBeCloseTo(701e-6, 12);
    expect(events.some((e) => e.phase === 'done' && e.kind === 'import')).toBe(true);
    service.close();
  });
});
