// The mapping step of an import, as a user does it in the browser mode: a file whose measurement
// headers Offstate cannot place is previewed, the user names the columns and their units, saves
// the corrections as a mapping and imports; the values land under the chosen names in SI units
// (SI Brochure prefixes: p = 1e-12, u = 1e-6), and the next file with the same columns is read
// with the saved mapping without asking again.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { ARTIFACTS, missingForE2e, openSession, TIMEOUT, type Session } from './harness';
import type { LotSummary, WaferFrame } from '../../src/shared/api';

if (missingForE2e.length) console.warn(`e2e mapping test skipped: missing ${missingForE2e.join(', ')}`);

function oddFile(lot: string): string {
  const rows = ['LotID,Slot,Col,Row,LEAKN [pA],DRIVEN [uA],ChuckNote'];
  for (let i = 0; i < 40; i++) rows.push(`${lot},3,${i % 8},${Math.floor(i / 8)},${20 + (i % 5)},${700 + i},warm`);
  return rows.join('\n') + '\n';
}

describe.skipIf(missingForE2e.length > 0)('correcting the column mapping before an import', () => {
  let s: Session;
  beforeAll(async () => { s = await openSession('offstate-e2e-map-'); await s.page.goto(s.url); }, TIMEOUT * 2);
  afterAll(async () => { await s?.close(); }, TIMEOUT);

  it('saves the user\'s names and units, stores the values under them, and reuses the mapping for the next file', async () => {
    const page = s.page;
    const first = join(s.workDir, 'odd-lot.csv');
    writeFileSync(first, oddFile('ODD1'));
    await page.locator('[data-testid="import-input"]').setInputFiles(first);
    await page.locator('[data-testid="preview-columns"]').waitFor({ timeout: TIMEOUT });
    const row = (header: string) => page.locator(`[data-testid="preview-column"][data-header="${header}"]`);
    // Offstate keeps unknown measurement columns under their own names; the user names them.
    await row('LEAKN [pA]').locator('[data-testid="preview-name"]').fill('Ioff_n');
    await row('DRIVEN [uA]').locator('[data-testid="preview-name"]').fill('Ion_n');
    await row('ChuckNote').locator('[data-testid="preview-role"]').selectOption('ignored');
    await page.locator('[data-testid="mapping-name"]').fill('odd tester columns');
    await page.locator('[data-testid="preview-recheck"]').click();
    await expect.poll(async () => row('LEAKN [pA]').getAttribute('data-role'), { timeout: TIMEOUT }).toBe('measurement');
    await expect.poll(async () => row('ChuckNote').getAttribute('data-role'), { timeout: TIMEOUT }).toBe('ignored');
    await page.screenshot({ path: join(ARTIFACTS, '30-mapping-preview.png') });
    await page.locator('[data-testid="import-confirm"]').click();
    await expect.poll(async () => (await s.api<LotSummary[]>('listLots')).map((l) => l.lot), { timeout: TIMEOUT }).toContain('ODD1');

    const lot = (await s.api<LotSummary[]>('listLots')).find((l) => l.lot === 'ODD1')!;
    expect(lot.params.map((p) => p.name).sort()).toEqual(['Ioff_n', 'Ion_n']);
    const frame = await s.api<WaferFrame>('getWafer', 'ODD1', '3');
    expect(frame.x.length).toBe(40);
    expect(frame.values.Ioff_n[0]).toBeCloseTo(20e-12, 20);
    expect(frame.values.Ion_n[1]).toBeCloseTo(701e-6, 12);
    const saved = await s.api<{ name: string }[]>('listMappings');
    expect(saved.map((m) => m.name)).toContain('odd tester columns');

    // The next file with the same columns: the preview says the saved mapping is applied.
    const second = join(s.workDir, 'odd-lot-2.csv');
    writeFileSync(second, oddFile('ODD2'));
    await page.locator('[data-testid="import-input"]').setInputFiles(second);
    await page.locator('[data-testid="preview-summary"]').waitFor({ timeout: TIMEOUT });
    await expect.poll(() => page.locator('[data-testid="preview-summary"]').textContent(), { timeout: TIMEOUT }).toMatch(/saved mapping "odd tester columns" applied/);
    await page.locator('[data-testid="import-confirm"]').click();
    await expect.poll(async () => (await s.api<LotSummary[]>('listLots')).find((l) => l.lot === 'ODD2')?.params.map((p) => p.name).sort(), { timeout: TIMEOUT }).toEqual(['Ioff_n', 'Ion_n']);
    expect(s.problems).toEqual([]);
  }, TIMEOUT * 3);
});
