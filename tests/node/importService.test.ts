import { describe, expect, it } from 'vitest';
import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { OffstateService } from '../../src/node/service';
import { validateArgs } from '../../src/shared/validate';
import type { ProgressEvent } from '../../src/shared/api';
import { scratchSpace } from '../support/scratch';
import { inventedWafer, writeStdfLot } from '../support/stdfLot';

const { tmp } = scratchSpace();

describe('the service import API', () => {
  it('previews, saves a mapping by name and imports with it, reporting progress with rate and time left', async () => {
    const dir = tmp();
    const service = new OffstateService({ dbPath: join(dir, 'db.sqlite'), mode: 'browser' });
    const path = join(dir, 'odd.csv');
    const rows = ['W,C,R,LEAK'];
    for (let i = 0; i < 30000; i++) rows.push(`1,${i % 200},${Math.floor(i / 200)},${1 + (i % 5)}`);
    writeFileSync(path, rows.join('\n'));
    const preview = await service.previewImport(path);
    expect(preview.errors.length).toBeGreaterThan(0);
    const mapping = { columns: [{ header: 'W', role: 'wafer' as const }, { header: 'C', role: 'x' as const }, { header: 'R', role: 'y' as const }, { header: 'LEAK', role: 'measurement' as const, name: 'Isb', unit: 'nA' }] };
    expect(() => validateArgs('saveMapping', ['probe room', mapping])).not.toThrow();
    expect(() => validateArgs('importFile', [path, { mapping: 'probe room' }])).not.toThrow();
    expect(() => validateArgs('importFile', [path, { mapping: { columns: 'x' } }])).toThrow(/not a valid mapping/);
    expect(() => validateArgs('previewBytes', ['a.csv', 'not base64!'])).toThrow(/base64/);
    await service.saveMapping('probe room', mapping);
    expect((await service.listMappings()).map((m) => m.name)).toEqual(['probe room']);
    const events: ProgressEvent[] = [];
    service.onProgress((e) => events.push(e));
    const result = await service.importFile(path, { mapping: 'probe room' });
    expect(result).toMatchObject({ status: 'imported', rows: 30000, mapping: 'probe room' });
    expect(events.at(-1)?.phase).toBe('done');
    const progress = events.filter((e) => e.phase === 'progress');
    expect(progress.length).toBeGreaterThan(0);
    expect(progress.at(-1)).toMatchObject({ unit: 'bytes', rows: 30000 });
    expect(progress.at(-1)!.rate).toBeGreaterThan(0);
    expect(progress.at(-1)!.secondsLeft).toBeGreaterThanOrEqual(0);
    service.close();
  });

  it('previews the tests of an STDF file from its first bytes sent as base64', async () => {
    const dir = tmp();
    const service = new OffstateService({ dbPath: join(dir, 'db.sqlite'), mode: 'browser' });
    const bytes = writeStdfLot('PV.1', [{ id: '1', dies: inventedWafer(3, 4) }], false);
    const head = Buffer.from(bytes.subarray(0, 400)).toString('base64');
    expect(() => validateArgs('previewBytes', ['lot.stdf', head])).not.toThrow();
    const preview = await service.previewBytes('lot.stdf', head);
    expect(preview.format).toBe('stdf');
    expect(preview.tests.map((t) => [t.number, t.name, t.unit])).toEqual([[100, 'Ioff_n', 'A'], [200, 'Ion_n', 'A'], [300, 'Vtsat_n', 'V']]);
    expect(preview.mapping.tests).toEqual([{ test: '#100', name: 'Ioff_n' }, { test: '#200', name: 'Ion_n' }, { test: '#300', name: 'Vtsat_n' }]);
    service.close();
  });
});
