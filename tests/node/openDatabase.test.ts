// Switching databases in a running service: the other file's lots appear, a foreign or damaged
// file is refused with the current database left open, and the recent list keeps the order.
import { afterAll, describe, expect, it } from 'vitest';
import Database from 'better-sqlite3';
import { rmSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { OffstateService } from '../../src/node/service';
import { scratchDir } from '../support/paths';

const dir = scratchDir();
afterAll(() => rmSync(dir, { recursive: true, force: true }));

function csv(lot: string): string {
  const path = join(dir, `${lot}.csv`);
  writeFileSync(path, `Lot,Wafer,X,Y,Ioff_n [pA]\n${lot},1,0,0,20\n${lot},1,1,0,21\n`);
  return path;
}

describe('OffstateService.openDatabase', () => {
  it('switches to another database, refuses a foreign file without closing the current one, and lists recent ones first', async () => {
    const recentFile = join(dir, 'recent.json');
    const first = join(dir, 'first.sqlite');
    const second = join(dir, 'second.sqlite');
    const service = new OffstateService({ dbPath: first, mode: 'browser', recentFile });
    await service.importFile(csv('ALPHA'));
    const info = await service.openDatabase(second);
    expect(info.database).toBe(second);
    expect(await service.listLots()).toEqual([]);
    await service.importFile(csv('BETA'));
    expect((await service.listLots()).map((l) => l.lot)).toEqual(['BETA']);

    const foreign = join(dir, 'foreign.sqlite');
    const other = new Database(foreign);
    other.exec('CREATE TABLE notes (t TEXT)');
    other.close();
    await expect(service.openDatabase(foreign)).rejects.toThrow(/not an Offstate database/);
    expect((await service.getInfo()).database).toBe(second);
    expect((await service.listLots()).map((l) => l.lot)).toEqual(['BETA']);

    await service.openDatabase(first);
    expect((await service.listLots()).map((l) => l.lot)).toEqual(['ALPHA']);
    expect(await service.listDatabases()).toEqual({ current: first, recent: [first, second] });
    service.close();
  });
});
