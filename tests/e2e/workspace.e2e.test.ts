// End to end, the triage workspace in Debian's Chromium against the built browser-mode server:
// the lot overview, a lasso on the wafer map seen on the trade-off plot, zoom, the FA list edited
// by hand and exported (CSV, JSON, map PNG and SVG, the PDF report), a setting changed and the
// analysis following it, the sites view, keys, help and the dark theme. Oracles: the API's own
// answers fetched over HTTP; the PNG signature and IHDR layout (ISO/IEC 15948, sections 5.2 and
// 11.2.2); the PDF file structure (ISO 32000-1, 7.5) read back with poppler's pdftotext/pdfinfo.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { execFileSync } from 'node:child_process';
import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import type { Download } from 'playwright-core';
import type { FaEdit, LotAnalysis, LotSummary, StoredSettings, WaferFrame, WaferSummary } from '../../src/shared/api';
import { KEY_TABLE } from '../../src/ui/keys';
import { ARTIFACTS, DEMO_CSV, missingForE2e, openSession, parseCsv, TIMEOUT, type Session } from './harness';

if (missingForE2e.length) console.warn(`e2e workspace tests skipped: missing ${missingForE2e.join(', ')}`);
const hasPoppler = ['/usr/bin/pdftotext', '/usr/bin/pdftoppm', '/usr/bin/pdfinfo'].every(existsSync);
if (!hasPoppler) console.warn('PDF content checks skipped: poppler-utils (pdftotext, pdftoppm, pdfinfo) not installed');

let s: Session;
const page = () => s.page;
const shot = (name: string) => page().screenshot({ path: join(ARTIFACTS, name) });
const mapAttribute = async (name: string) => (await page().locator('[data-testid="wafer-map"]').getAttribute(name)) ?? '';

async function waitForWafer(wafer: string): Promise<void> {
  await page().waitForFunction((w) => {
    const canvas = document.querySelector('[data-testid="wafer-map"]');
    return canvas?.getAttribute('data-wafer') === w && Number(canvas.getAttribute('data-die-count')) > 0;
  }, wafer, { timeout: TIMEOUT });
}

/** Page point of die coordinates (fractions allowed), from the transform the map publishes. */
async function diePoint(x: number, y: number): Promise<{ x: number; y: number }> {
  const [ax, bx, ay, by] = (await mapAttribute('data-transform')).split(' ').map(Number);
  const box = await page().locator('[data-testid="wafer-map"]').boundingBox();
  if (!box) throw new Error('wafer map is not on screen');
  return { x: box.x + ax + bx * x, y: box.y + ay + by * y };
}

async function download(click: () => Promise<void>): Promise<{ name: string; path: string; bytes: Buffer }> {
  const [file] = await Promise.all([page().waitForEvent('download', { timeout: TIMEOUT }), click()]) as [Download, void];
  const path = join(ARTIFACTS, file.suggestedFilename());
  await file.saveAs(path);
  return { name: file.suggestedFilename(), path, bytes: readFileSync(path) };
}

const countText = (n: number) => n.toLocaleString('en-US');

describe.skipIf(missingForE2e.length > 0)('the triage workspace in the browser', () => {
  let lot: LotSummary;
  let wafers: WaferSummary[];
  let analysis: LotAnalysis;
  let frame: WaferFrame;
  let lassoDies: number[] = [];
  let added: number[] = [];
  let removedDie: { wafer: string; index: number } | null = null;

  beforeAll(async () => {
    s = await openSession('offstate-e2e-ws-');
    await s.upload('demo-lot.csv', readFileSync(DEMO_CSV));
    [lot] = await s.api<LotSummary[]>('listLots');
    wafers = await s.api<WaferSummary[]>('listWafers', lot.lot);
    analysis = await s.api<LotAnalysis>('analyzeLot', lot.lot);
    await page().goto(s.url);
    await waitForWafer(wafers[0].wafer);
  }, TIMEOUT * 2);

  afterAll(async () => { await s?.close(); }, TIMEOUT);

  it('shows every wafer of the lot in the overview, most excursive first, with each wafer\'s flagged count', async () => {
    await page().keyboard.press('1');
    const overview = page().locator('[data-testid="lot-overview"]');
    await expect.poll(() => overview.getAttribute('data-drawn'), { timeout: TIMEOUT }).toBe(String(wafers.length));
    // Expected order: the lot's excursion order when the analysis gives one, else by score, else wafer order.
    const stats = analysis.lots.find((l) => l.lot === lot.lot);
    const scored = analysis.wafers.filter((w) => typeof w.excursion?.score === 'number');
    const expected = stats?.waferOrder?.length
      ? stats.waferOrder
      : scored.length ? [...scored].sort((a, b) => b.excursion.score - a.excursion.score).map((w) => w.wafer) : wafers.map((w) => w.wafer);
    expect((await overview.getAttribute('data-order'))?.split(',')).toEqual(expected);
    for (const w of analysis.wafers) {
      const card = page().locator(`[data-testid="overview-card"][data-wafer="${w.wafer}"]`);
      expect(await card.locator('[data-testid="overview-flagged"]').innerText()).toBe(`${countText(w.flaggedCount)} flagged`);
      // The spatial signature label, when the analysis gives one.
      const label = (w as { pattern?: { label: string } }).pattern?.label;
      if (label) expect(await card.locator('[data-testid="overview-signature"]').getAttribute('data-label')).toBe(label);
    }
    console.log(`e2e: lot overview of ${wafers.length} wafers drawn in ${await overview.getAttribute('data-draw-ms')} ms`);
    await shot('20-lot-overview.png');
  }, TIMEOUT);

  it('opens the clicked wafer from the overview in the wafer view', async () => {
    // The least excursive wafer: its middle holds dies the analysis did not flag.
    const first = (await page().locator('[data-testid="lot-overview"]').getAttribute('data-order'))!.split(',').at(-1) as string;
    await page().locator(`[data-testid="overview-card"][data-wafer="${first}"]`).click();
    await waitForWafer(first);
    frame = await s.api<WaferFrame>('getWafer', lot.lot, first);
    expect(Number(await mapAttribute('data-die-count'))).toBe(frame.x.length);
    expect(await page().locator('[data-testid="view-wafer"]').getAttribute('aria-pressed')).toBe('true');
  }, TIMEOUT);

  it('selects with the lasso exactly the dies inside the drawn outline and shows them on the trade-off plot', async () => {
    await page().keyboard.press('l');
    expect(await mapAttribute('data-tool')).toBe('lasso');
    const cx = Math.round((Math.min(...frame.x) + Math.max(...frame.x)) / 2);
    const cy = Math.round((Math.min(...frame.y) + Math.max(...frame.y)) / 2);
    const [x0, x1, y0, y1] = [cx - 2, cx + 1, cy - 1, cy + 2];
    // The outline runs just inside the outer cell edges of the block, so it holds the block's centres.
    const corners = [[x0 - 0.4, y0 - 0.4], [x1 + 0.4, y0 - 0.4], [x1 + 0.4, y1 + 0.4], [x0 - 0.4, y1 + 0.4], [x0 - 0.4, y0 - 0.3]];
    const points = [];
    for (const [x, y] of corners) points.push(await diePoint(x, y));
    await page().mouse.move(points[0].x, points[0].y);
    await page().mouse.down();
    for (const p of points.slice(1)) await page().mouse.move(p.x, p.y, { steps: 6 });
    await page().mouse.up();
    lassoDies = [];
    for (let i = 0; i < frame.x.length; i++) if (frame.x[i] >= x0 && frame.x[i] <= x1 && frame.y[i] >= y0 && frame.y[i] <= y1) lassoDies.push(i);
    expect(lassoDies.length).toBeGreaterThan(6);
    await expect.poll(() => mapAttribute('data-selected-count'), { timeout: TIMEOUT }).toBe(String(lassoDies.length));
    const ioff = frame.values.Ioff_n, ion = frame.values.Ion_n;
    const plottable = lassoDies.filter((i) => Math.abs(ioff[i]) > 0 && Number.isFinite(ioff[i]) && Number.isFinite(ion[i]));
    await expect.poll(() => page().locator('[data-testid="tradeoff-plot"]').getAttribute('data-highlight-count'), { timeout: TIMEOUT }).toBe(String(plottable.length));
    await shot('21-lasso-selection.png');
  }, TIMEOUT);

  it('zooms the map with the keys and still names the die under the pointer', async () => {
    // "=" is the unshifted "+" key; both zoom in.
    await page().keyboard.press('=');
    await page().keyboard.press('=');
    await expect.poll(async () => Number(await mapAttribute('data-zoom')), { timeout: TIMEOUT }).toBeGreaterThan(2);
    const die = lassoDies[0];
    const point = await diePoint(frame.x[die], frame.y[die]);
    await page().mouse.move(point.x, point.y);
    const tooltip = page().locator('[data-testid="die-tooltip"]');
    await tooltip.waitFor({ timeout: TIMEOUT });
    expect(await tooltip.locator('[data-testid="tooltip-x"]').innerText()).toBe(`x ${frame.x[die]}`);
    expect(await tooltip.locator('[data-testid="tooltip-y"]').innerText()).toBe(`y ${frame.y[die]}`);
    await page().locator('[data-testid="overlay-rings"]').check();
    await page().locator('[data-testid="overlay-reticle"]').check();
    await shot('22-zoomed-map.png');
    await page().keyboard.press('0');
    await expect.poll(() => mapAttribute('data-zoom'), { timeout: TIMEOUT }).toBe('1.000');
    // Currents are coloured on log10 |I| until switched to linear; the legend says which.
    const caption = page().locator('.wafer-map-panel [data-testid="map-legend"] .caption');
    expect(await caption.innerText()).toContain('log scale');
    await page().locator('[data-testid="scale-toggle"]').click();
    await expect.poll(() => caption.innerText(), { timeout: TIMEOUT }).not.toContain('log scale');
    await page().locator('[data-testid="scale-toggle"]').click();
    await page().keyboard.press('b');
  }, TIMEOUT);

  it('adds the selected dies and removes a flagged die by hand, each with its note, and keeps the edits', async () => {
    await page().keyboard.press('4');
    const flaggedHere = new Set(analysis.flagged.filter((f) => f.wafer === frame.wafer).map((f) => f.index));
    added = lassoDies.filter((i) => !flaggedHere.has(i));
    expect(added.length).toBeGreaterThan(0);
    await page().locator('[data-testid="fa-note"]').fill('lasso block for cross-section');
    await page().locator('[data-testid="fa-add-selected"]').click();
    const afterAdd = analysis.flagged.length + added.length;
    await expect.poll(() => page().locator('[data-testid="fa-count"]').innerText(), { timeout: TIMEOUT }).toContain(`${countText(afterAdd)} dies`);

    const target = analysis.flagged[0];
    removedDie = { wafer: target.wafer, index: target.index };
    await page().locator(`[data-testid="fa-row"][data-wafer="${target.wafer}"][data-index="${target.index}"] [data-testid="fa-check"]`).check();
    await page().locator('[data-testid="fa-note"]').fill('probe mark, not a defect');
    await page().locator('[data-testid="fa-remove-checked"]').click();
    await expect.poll(() => page().locator('[data-testid="fa-removed-row"]').count(), { timeout: TIMEOUT }).toBe(1);

    const edits = await s.api<FaEdit[]>('getFaEdits', lot.lot);
    expect(edits.filter((e) => e.action === 'add').map((e) => e.index).sort((a, b) => a - b)).toEqual([...added].sort((a, b) => a - b));
    expect(edits.filter((e) => e.action === 'add').every((e) => e.note === 'lasso block for cross-section' && e.wafer === frame.wafer)).toBe(true);
    expect(edits.filter((e) => e.action === 'remove')).toMatchObject([{ wafer: target.wafer, index: target.index, note: 'probe mark, not a defect' }]);

    // A new page load reads the edits back from the database.
    await page().reload();
    await waitForWafer(wafers[0].wafer);
    await page().keyboard.press('4');
    await expect.poll(() => page().locator('[data-testid="fa-count"]').innerText(), { timeout: TIMEOUT }).toContain(`${countText(afterAdd - 1)} dies`);
    await page().locator('[data-testid="fa-filter"]').fill('manual');
    expect(await page().locator('[data-testid="fa-row"]').count()).toBe(added.length);
    await page().locator('[data-testid="fa-filter"]').fill('');
    await page().locator('[data-testid="fa-sort-score"]').click();
    const scores = analysis.flagged.filter((f) => !(f.wafer === target.wafer && f.index === target.index))
      .map((f) => Math.max(...f.reasons.map((r) => Math.abs(r.score))));
    const top = await page().locator('[data-testid="fa-row"]').first().locator('td').nth(7).innerText();
    // The column shows one decimal.
    expect(Math.abs(Number(top) - Math.max(...scores))).toBeLessThanOrEqual(0.051);
    await shot('23-fa-list-edited.png');
  }, TIMEOUT);

  it('exports the edited FA list as CSV and JSON holding exactly the listed dies and the notes', async () => {
    const keep = analysis.flagged.filter((f) => !(f.wafer === removedDie?.wafer && f.index === removedDie?.index));
    const expected = [...keep.map((f) => `${f.wafer}|${f.x}|${f.y}`), ...added.map((i) => `${frame.wafer}|${frame.x[i]}|${frame.y[i]}`)].sort();

    const csv = await download(() => page().locator('[data-testid="export-fa-csv"]').click());
    expect(csv.name).toMatch(/-fa-list\.csv$/);
    const text = csv.bytes.toString('utf8');
    expect(text.split(/\r?\n/)[0]).toContain('not a disposition');
    const [header, ...rows] = parseCsv(text).filter((r) => r.length > 1 && !r[0].startsWith('#'));
    const col = (name: string) => header.indexOf(name);
    expect(rows.map((r) => `${r[col('wafer')]}|${r[col('x')]}|${r[col('y')]}`).sort()).toEqual(expected);
    const manual = rows.filter((r) => r[col('source')] === 'manual');
    expect(manual).toHaveLength(added.length);
    expect(manual.every((r) => r[col('note')] === 'lasso block for cross-section')).toBe(true);
    // Hand-added dies carry their measured values, read from the wafer.
    const ioffCol = header.findIndex((h) => h.startsWith('Ioff_n'));
    const first = manual[0];
    const index = added.find((i) => String(frame.x[i]) === first[col('x')] && String(frame.y[i]) === first[col('y')]) as number;
    expect(Number(first[ioffCol])).toBeCloseTo(frame.values.Ioff_n[index], 20);

    const json = await download(() => page().locator('[data-testid="export-fa-json"]').click());
    const doc = JSON.parse(json.bytes.toString('utf8')) as { caution: string; lot: string; dies: { wafer: string; x: number; y: number; source: string }[]; removedByHand: { wafer: string; index: number; note: string }[] };
    expect(doc.lot).toBe(lot.lot);
    expect(doc.caution).toContain('not a disposition');
    expect(doc.dies.map((d) => `${d.wafer}|${d.x}|${d.y}`).sort()).toEqual(expected);
    expect(doc.removedByHand).toMatchObject([{ wafer: removedDie?.wafer, index: removedDie?.index, note: 'probe mark, not a defect' }]);
  }, TIMEOUT);

  it('saves the open wafer\'s map as PNG and SVG with the FA dies of that wafer marked', async () => {
    await page().keyboard.press('2');
    await waitForWafer(wafers[0].wafer);
    const wafer = wafers[0].wafer;
    const shown = await s.api<WaferFrame>('getWafer', lot.lot, wafer);
    const onWafer = analysis.flagged.filter((f) => f.wafer === wafer && !(f.wafer === removedDie?.wafer && f.index === removedDie?.index)).length
      + (frame.wafer === wafer ? added.length : 0);
    await page().keyboard.press('4');
    const png = await download(() => page().locator('[data-testid="export-map-png"]').click());
    // PNG signature, then the IHDR chunk: width and height as big-endian 32-bit integers.
    expect([...png.bytes.subarray(0, 8)]).toEqual([137, 80, 78, 71, 13, 10, 26, 10]);
    expect(png.bytes.subarray(12, 16).toString('latin1')).toBe('IHDR');
    expect(png.bytes.readUInt32BE(16)).toBeGreaterThanOrEqual(800);
    const svg = await download(() => page().locator('[data-testid="export-map-svg"]').click());
    const svgText = svg.bytes.toString('utf8');
    expect(svgText.startsWith('<svg')).toBe(true);
    expect((svgText.match(/<rect x=/g) ?? []).length).toBe(shown.x.length);
    expect((svgText.match(/class="chosen"/g) ?? []).length).toBe(onWafer);
  }, TIMEOUT);

  it('makes a one-page PDF report with the lot, the caution and the FA list', async () => {
    const pdf = await download(() => page().locator('[data-testid="export-report"]').click());
    expect(pdf.name).toMatch(/-fa-report\.pdf$/);
    expect(pdf.bytes.subarray(0, 5).toString('latin1')).toBe('%PDF-');
    expect(pdf.bytes.subarray(-6).toString('latin1')).toContain('%%EOF');
    if (!hasPoppler) return;
    expect(execFileSync('pdfinfo', [pdf.path]).toString()).toMatch(/Pages:\s+1\b/);
    const text = execFileSync('pdftotext', ['-layout', pdf.path, '-']).toString();
    expect(text).toContain(`lot ${lot.lot}`);
    expect(text).toContain('not a disposition');
    const listed = analysis.flagged.length - 1 + added.length;
    expect(text).toContain(`FA list: ${listed} dies`);
    // The page holds the first rows and says how many more the exports carry.
    const more = Number(/and (\d+) more dies/.exec(text)?.[1]);
    expect(listed - more).toBeGreaterThan(5);
    expect(listed - more).toBeLessThanOrEqual(24);
    execFileSync('pdftoppm', ['-png', '-r', '80', '-singlefile', pdf.path, join(ARTIFACTS, '24-report-page')]);
    expect(existsSync(join(ARTIFACTS, '24-report-page.png'))).toBe(true);
  }, TIMEOUT);

  it('stores a changed PAT multiplier and shows the analysis made with it', async () => {
    const before = analysis;
    await page().keyboard.press('5');
    await page().locator('[data-testid="setting-pat"]').fill('4');
    await page().locator('[data-testid="setting-shot-columns"]').fill('3');
    await shot('25-settings.png');
    await page().locator('[data-testid="settings-save"]').click();
    await expect.poll(async () => (await s.api<StoredSettings>('getSettings')).analysis.patLimit, { timeout: TIMEOUT }).toBe(4);
    const stored = await s.api<StoredSettings>('getSettings');
    expect(stored.display.shotColumns).toBe(3);
    const after = await s.api<LotAnalysis>('analyzeLot', lot.lot);
    expect(after.settings.patLimit).toBe(4);
    // A tighter PAT limit flags at least the dies the wider one flagged (AEC-Q001 limits nest).
    expect(after.flagged.length).toBeGreaterThanOrEqual(before.flagged.length);
    await page().keyboard.press('2');
    await expect.poll(() => page().locator('[data-testid="flagged-count"]').innerText(), { timeout: TIMEOUT }).toBe(countText(after.flagged.length));
    expect(await page().locator('[data-testid="flag-caution"] .method').innerText()).toBe(after.method);
    analysis = after;
  }, TIMEOUT);

  it('compares probe sites and shows the lot trend of wafer medians with the lot\'s PAT limits', async () => {
    await page().keyboard.press('v');
    await page().locator('[data-testid="site-chart"]').waitFor({ timeout: TIMEOUT });
    const wa = analysis.wafers.find((w) => w.wafer === wafers[0].wafer)!;
    const param = (await page().locator('[data-testid="sites-param"]').inputValue());
    const sites = Object.entries(wa.sites).filter(([, byParam]) => (byParam[param]?.n ?? 0) > 0);
    expect(await page().locator('[data-testid="site-row"]').count()).toBe(sites.length);
    const biased = wa.siteBias.filter((b) => b.param === param).length;
    expect(await page().locator('[data-testid="site-bias"]').count()).toBe(biased);
    const trend = page().locator('[data-testid="lot-trend"]');
    expect(await trend.getAttribute('data-wafers')).toBe(String(wafers.length));
    const limits = analysis.lots[0].patLimits?.[param];
    expect(await trend.getAttribute('data-limits')).toBe(limits ? 'yes' : 'no');
    await shot('26-sites-trend.png');
  }, TIMEOUT);

  it('lists every key in the help overlay and switches to the dark theme with t', async () => {
    await page().keyboard.press('?');
    await page().locator('[data-testid="help-overlay"]').waitFor({ timeout: TIMEOUT });
    expect(await page().locator('[data-testid="help-key"]').count()).toBe(KEY_TABLE.length);
    await shot('27-help.png');
    await page().keyboard.press('Escape');
    await page().locator('[data-testid="help-overlay"]').waitFor({ state: 'detached', timeout: TIMEOUT });
    await page().keyboard.press('t');
    expect(await page().evaluate(() => document.documentElement.dataset.theme)).toBe('dark');
    await page().keyboard.press('1');
    await expect.poll(() => page().locator('[data-testid="lot-overview"]').getAttribute('data-drawn'), { timeout: TIMEOUT }).toBe(String(wafers.length));
    await shot('28-dark-overview.png');
    await page().keyboard.press('2');
    await waitForWafer(wafers[0].wafer);
    await shot('29-dark-wafer.png');
    await page().keyboard.press('t');
    expect(await page().evaluate(() => document.documentElement.dataset.theme)).toBe('light');
  }, TIMEOUT);

  it('ran without page errors or CSP refusals', () => {
    expect(s.problems).toEqual([]);
  });
});
