// Opening another database from the top bar and going back through the recent list, as a user
// does in the browser mode; a foreign file is refused with the current database kept.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import Database from 'better-sqlite3';
import { join } from 'node:path';
import { ARTIFACTS, missingForE2e, openSession, TIMEOUT, type Session } from './harness';
import type { AppInfo, LotSummary } from '../../src/shared/api';

if (missingForE2e.length) console.warn(`e2e database test skipped: missing ${missingForE2e.join(', ')}`);

const tiny = (lot: string) => new TextEncoder().encode(`Lot,Wafer,X,Y,Ioff_n [pA]\n${lot},1,0,0,20\n${lot},1,1,0,21\n`);

describe.skipIf(missingForE2e.length > 0)('switching databases', () => {
  let s: Session;
  beforeAll(async () => {
    s = await openSession('offstate-e2e-db-');
    await s.upload('first.csv', tiny('FIRSTLOT'));
    await s.page.goto(s.url);
  }, TIMEOUT * 2);
  afterAll(async () => { await s?.close(); }, TIMEOUT);

  it('opens a new database, refuses a foreign file, and goes back through the recent list', async () => {
    const page = s.page;
    const lotPicker = page.locator('header select').first();
    await expect.poll(() => lotPicker.textContent(), { timeout: TIMEOUT }).toMatch(/FIRSTLOT/);
    const firstPath = (await s.api<AppInfo>('getInfo')).database;

    const second = join(s.workDir, 'second.sqlite');
    await page.locator('[data-testid="database-button"]').click();
    await page.locator('[data-testid="database-path"]').fill(second);
    await page.locator('[data-testid="database-open"]').click();
    await expect.poll(async () => (await s.api<AppInfo>('getInfo')).database, { timeout: TIMEOUT }).toBe(second);
    await expect.poll(() => page.locator('[data-testid="database-button"]').textContent(), { timeout: TIMEOUT }).toMatch(/second\.sqlite/);
    expect(await s.api<LotSummary[]>('listLots')).toEqual([]);

    const foreign = join(s.workDir, 'foreign.sqlite');
    const other = new Database(foreign);
    other.exec('CREATE TABLE t (a)');
    other.close();
    await page.locator('[data-testid="database-button"]').click();
    await page.locator('[data-testid="database-path"]').fill(foreign);
    await page.locator('[data-testid="database-open"]').click();
    await expect.poll(() => page.locator('body').textContent(), { timeout: TIMEOUT }).toMatch(/Database not opened: .*not an Offstate database/);
    expect((await s.api<AppInfo>('getInfo')).database).toBe(second);

    await page.locator('[data-testid="database-button"]').click();
    await page.locator('[data-testid="database-recent"]', { hasText: firstPath }).click();
    await expect.poll(() => lotPicker.textContent(), { timeout: TIMEOUT }).toMatch(/FIRSTLOT/);
    await page.screenshot({ path: join(ARTIFACTS, '31-database-switched.png') });
    // The browser logs the refused call's 422 answer; nothing else may go wrong on the page.
    expect(s.problems.filter((p) => !/status of 422/.test(p))).toEqual([]);
  }, TIMEOUT * 3);
});
