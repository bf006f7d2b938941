// End to end: the built browser-mode server and the built renderer in Debian's Chromium, driven
// like an engineer would: import the demo lot through the page, read the map, hover a die,
// select dies, follow a flagged die and export the FA list. Oracles: the API's own answers
// (fetched here over HTTP with the token, decoded with the shared codec) and the SI prefixes of
// the SI Brochure (9th ed., table 7) for reading the tooltip's engineering units back.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { spawn, type ChildProcess } from 'node:child_process';
import { existsSync, mkdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { chromium, type BrowserContext, type Page } from 'playwright-core';
import { decodePayload } from '../../src/shared/codec';
import type { LotAnalysis, LotSummary, WaferFrame, WaferSummary } from '../../src/shared/api';
import { DEMO_CSV, ROOT, scratchDir } from '../support/paths';
import { parseCsv } from './harness';

const CHROMIUM = '/usr/bin/chromium';
const SERVER = join(ROOT, 'dist', 'node', 'server.mjs');
const UI_INDEX = join(ROOT, 'dist', 'ui', 'index.html');
const ARTIFACTS = join(ROOT, 'test-artifacts', 'e2e');
const TIMEOUT = 60_000;

const missing = [CHROMIUM, SERVER, UI_INDEX, DEMO_CSV].filter((path) => !existsSync(path));
if (missing.length) console.warn(`e2e triage tests skipped: missing ${missing.join(', ')} (run npm run build; install Debian's chromium)`);

let server: ChildProcess | undefined;
let serverUrl = '';
let token = '';
let origin = '';
let workDir = '';
let context: BrowserContext | undefined;
let page: Page;
const pageProblems: string[] = [];

/** Starts the built server on port 0 and resolves with the URL it prints. */
function startServer(dbPath: string): Promise<string> {
  return new Promise((resolve, reject) => {
    const child = spawn(process.execPath, [SERVER, '--db', dbPath], { cwd: ROOT, stdio: ['ignore', 'pipe', 'pipe'] });
    server = child;
    let output = '';
    const timer = setTimeout(() => reject(new Error(`server printed no URL within 60 s:\n${output}`)), TIMEOUT);
    const onData = (chunk: Buffer) => {
      output += chunk.toString();
      const match = /Offstate browser mode: (http:\/\/127\.0\.0\.1:\d+\/\?token=\S+)/.exec(output);
      if (match) { clearTimeout(timer); resolve(match[1]); }
    };
    child.stdout?.on('data', onData);
    child.stderr?.on('data', (chunk: Buffer) => { output += chunk.toString(); });
    child.on('exit', (code) => { clearTimeout(timer); reject(new Error(`server exited with ${code}:\n${output}`)); });
  });
}

/** One API call over HTTP, as the renderer makes it. */
async function api<T>(method: string, ...args: unknown[]): Promise<T> {
  const response = await fetch(`${origin}/api/call/${method}`, {
    method: 'POST',
    headers: { 'X-Offstate-Token': token, 'Content-Type': 'application/json' },
    body: JSON.stringify({ args }),
  });
  const envelope = decodePayload<{ ok: boolean; result?: T; error?: { message: string } }>(new Uint8Array(await response.arrayBuffer()));
  if (!envelope.ok) throw new Error(`${method} failed: ${envelope.error?.message}`);
  return envelope.result as T;
}

const SI_PREFIX: Record<string, number> = { a: 1e-18, f: 1e-15, p: 1e-12, n: 1e-9, u: 1e-6, 'µ': 1e-6, m: 1e-3, '': 1, k: 1e3 };

/** "24.0 pA" -> 2.40e-11 (SI Brochure prefixes); undefined for a dash (missing value). */
function readEngineering(text: string, unit: string): number | undefined {
  const trimmed = text.trim();
  if (trimmed === '—') return undefined;
  const match = new RegExp(`^(-?\\d+(?:\\.\\d+)?)\\s*([afpnuµmk]?)${unit}$`).exec(trimmed);
  if (!match) throw new Error(`cannot read "${text}" as a value in ${unit}`);
  return Number(match[1]) * SI_PREFIX[match[2]];
}

const mapCanvas = () => page.locator('[data-testid="wafer-map"]');
const plot = () => page.locator('[data-testid="tradeoff-plot"]');

async function mapAttribute(name: string): Promise<string> {
  return (await mapCanvas().getAttribute(name)) ?? '';
}

/** Page coordinates of the centre of die (x, y), from the transform the map publishes. */
async function diePoint(x: number, y: number): Promise<{ x: number; y: number }> {
  const [ax, bx, ay, by] = (await mapAttribute('data-transform')).split(' ').map(Number);
  const box = await mapCanvas().boundingBox();
  if (!box) throw new Error('wafer map is not on screen');
  return { x: box.x + ax + bx * x, y: box.y + ay + by * y };
}

async function waitForWafer(wafer: string): Promise<void> {
  await page.waitForFunction((w) => {
    const canvas = document.querySelector('[data-testid="wafer-map"]');
    return canvas?.getAttribute('data-wafer') === w && Number(canvas.getAttribute('data-die-count')) > 0;
  }, wafer, { timeout: TIMEOUT });
}

/** The column preview opens before every import: check it read the file, then confirm. */
async function confirmImport(): Promise<void> {
  await page.locator('[data-testid="import-preview"]').waitFor({ timeout: TIMEOUT });
  await page.locator('[data-testid="preview-summary"], [data-testid="preview-error"]').first().waitFor({ timeout: TIMEOUT });
  await page.locator('[data-testid="import-confirm"]').click();
}

async function shot(name: string): Promise<void> {
  await page.screenshot({ path: join(ARTIFACTS, name) });
}

describe.skipIf(missing.length > 0)('triage in the browser', () => {
  let lot: LotSummary;
  let wafers: WaferSummary[];
  let analysis: LotAnalysis;
  let frame: WaferFrame;

  beforeAll(async () => {
    mkdirSync(ARTIFACTS, { recursive: true });
    workDir = scratchDir('offstate-e2e-');
    serverUrl = await startServer(join(workDir, 'e2e.sqlite'));
    const url = new URL(serverUrl);
    origin = url.origin;
    token = url.searchParams.get('token') ?? '';
    context = await chromium.launchPersistentContext(join(workDir, 'chromium-profile'), {
      executablePath: CHROMIUM,
      headless: true,
      args: ['--headless', '--no-sandbox', '--disable-gpu', '--disable-background-networking', '--disable-component-update', '--disable-sync', '--no-first-run'],
      viewport: { width: 1600, height: 1000 },
      acceptDownloads: true,
    });
    page = context.pages()[0] ?? await context.newPage();
    page.on('pageerror', (error) => pageProblems.push(`page error: ${error.message}`));
    page.on('console', (message) => {
      // The deliberately bad upload below answers with an HTTP error status, which Chromium logs.
      if (/Failed to load resource/.test(message.text()) && message.location().url.includes('/api/upload')) return;
      if (message.type() === 'error' || /Content Security Policy|Refused to/i.test(message.text())) pageProblems.push(`console: ${message.text()}`);
    });
  }, TIMEOUT * 2);

  afterAll(async () => {
    await context?.close();
    if (server && server.exitCode === null) {
      const exited = new Promise((resolve) => server?.once('exit', resolve));
      server.kill('SIGTERM');
      await Promise.race([exited, new Promise((resolve) => setTimeout(resolve, 5000))]);
    }
    if (workDir) rmSync(workDir, { recursive: true, force: true });
  }, TIMEOUT);

  it('opens under the strict CSP, drops the token from the address and says there is no lot yet', async () => {
    const response = await page.goto(serverUrl);
    expect(response?.headers()['content-security-policy']).toMatch(/script-src 'self'/);
    await expect.poll(() => page.locator('[data-testid="empty-state"]').innerText(), { timeout: TIMEOUT })
      .toContain('No lot yet: drop a CSV file here or use Import…');
    expect(page.url()).not.toContain('token=');
    await shot('01-empty.png');
  }, TIMEOUT);

  it('imports the demo file through the file input and shows the first wafer', async () => {
    await page.locator('[data-testid="import-input"]').setInputFiles(DEMO_CSV);
    // The preview lists every column of the file's header line, die x and y among them.
    await page.locator('[data-testid="preview-columns"]').waitFor({ timeout: TIMEOUT });
    const header = readFileSync(DEMO_CSV, 'utf8').split(/\r?\n/)[0].split(',');
    expect(await page.locator('[data-testid="preview-column"]').count()).toBe(header.length);
    expect(await page.locator('[data-testid="preview-column"][data-role="x"]').count()).toBe(1);
    expect(await page.locator('[data-testid="preview-column"][data-role="y"]').count()).toBe(1);
    await shot('01b-import-preview.png');
    await page.locator('[data-testid="import-confirm"]').click();
    await page.waitForSelector('[data-testid="import-result"][data-kind="imported"]', { timeout: TIMEOUT });
    const lots = await api<LotSummary[]>('listLots');
    expect(lots).toHaveLength(1);
    lot = lots[0];
    wafers = await api<WaferSummary[]>('listWafers', lot.lot);
    analysis = await api<LotAnalysis>('analyzeLot', lot.lot);
    await waitForWafer(wafers[0].wafer);
    await page.waitForSelector('[data-testid="flagged-row"]', { timeout: TIMEOUT });
    expect(await page.locator('[data-testid="import-result"]').innerText()).toContain('Imported demo-lot.csv');
    await shot('02-imported.png');
  }, TIMEOUT);

  it('draws one map cell per die of the wafer, for this wafer and the next one (key j)', async () => {
    expect(Number(await mapAttribute('data-die-count'))).toBe(wafers[0].dies);
    await page.keyboard.press('j');
    await waitForWafer(wafers[1].wafer);
    expect(Number(await mapAttribute('data-die-count'))).toBe(wafers[1].dies);
    await page.keyboard.press('k');
    await waitForWafer(wafers[0].wafer);
    frame = await api<WaferFrame>('getWafer', lot.lot, wafers[0].wafer);
    expect(frame.x.length).toBe(wafers[0].dies);
  }, TIMEOUT);

  it('shows in the hover tooltip the die coordinates, site and every value the API holds', async () => {
    // The die nearest the middle of the grid.
    const cx = (Math.min(...frame.x) + Math.max(...frame.x)) / 2;
    const cy = (Math.min(...frame.y) + Math.max(...frame.y)) / 2;
    let die = 0;
    for (let i = 1; i < frame.x.length; i++) {
      if (Math.hypot(frame.x[i] - cx, frame.y[i] - cy) < Math.hypot(frame.x[die] - cx, frame.y[die] - cy)) die = i;
    }
    const point = await diePoint(frame.x[die], frame.y[die]);
    await page.mouse.move(point.x, point.y);
    const tooltip = page.locator('[data-testid="die-tooltip"]');
    await tooltip.waitFor({ timeout: TIMEOUT });
    expect(await tooltip.locator('[data-testid="tooltip-x"]').innerText()).toBe(`x ${frame.x[die]}`);
    expect(await tooltip.locator('[data-testid="tooltip-y"]').innerText()).toBe(`y ${frame.y[die]}`);
    expect(await tooltip.locator('[data-testid="tooltip-site"]').innerText()).toBe(`site ${frame.site[die]}`);
    const rows = tooltip.locator('[data-testid="tooltip-value"]');
    expect(await rows.count()).toBe(frame.params.length);
    for (const param of frame.params) {
      const text = await tooltip.locator(`[data-testid="tooltip-value"][data-param="${param.name}"] td`).innerText();
      const shown = readEngineering(text, param.unit);
      const stored = frame.values[param.name][die];
      if (!Number.isFinite(stored)) { expect(shown).toBeUndefined(); continue; }
      // Three significant digits: the shown value is within 0.5 % of the stored one.
      expect(shown).toBeDefined();
      expect(Math.abs((shown as number) - stored)).toBeLessThanOrEqual(Math.abs(stored) * 0.005 + 1e-30);
    }
    await shot('03-hover.png');
  }, TIMEOUT);

  it('selects the dies of a dragged rectangle and highlights the same dies on the trade-off plot', async () => {
    const cx = Math.round((Math.min(...frame.x) + Math.max(...frame.x)) / 2);
    const cy = Math.round((Math.min(...frame.y) + Math.max(...frame.y)) / 2);
    const [x0, x1, y0, y1] = [cx - 3, cx + 2, cy - 2, cy + 3];
    const inBox: number[] = [];
    for (let i = 0; i < frame.x.length; i++) {
      if (frame.x[i] >= x0 && frame.x[i] <= x1 && frame.y[i] >= y0 && frame.y[i] <= y1) inBox.push(i);
    }
    expect(inBox.length).toBeGreaterThan(10);
    const ioff = frame.values.Ioff_n;
    const ion = frame.values.Ion_n;
    const plottable = inBox.filter((i) => Math.abs(ioff[i]) > 0 && Number.isFinite(ioff[i]) && Number.isFinite(ion[i]));

    const before = await plot().screenshot();
    const from = await diePoint(x0, y1);
    const to = await diePoint(x1, y0);
    await page.mouse.move(from.x, from.y);
    await page.mouse.down();
    await page.mouse.move((from.x + to.x) / 2, (from.y + to.y) / 2, { steps: 5 });
    await page.mouse.move(to.x, to.y, { steps: 5 });
    await page.mouse.up();
    await expect.poll(() => mapAttribute('data-selected-count'), { timeout: TIMEOUT }).toBe(String(inBox.length));
    await expect.poll(() => plot().getAttribute('data-highlight-count'), { timeout: TIMEOUT }).toBe(String(plottable.length));
    await page.waitForTimeout(300);
    const after = await plot().screenshot();
    expect(after.equals(before)).toBe(false);

    // Shift-click adds one die outside the rectangle.
    const outside = [...frame.x.keys()].find((i) => frame.x[i] === x1 + 2 && frame.y[i] === y0) ?? -1;
    expect(outside).toBeGreaterThanOrEqual(0);
    const extra = await diePoint(frame.x[outside], frame.y[outside]);
    await page.keyboard.down('Shift');
    await page.mouse.click(extra.x, extra.y);
    await page.keyboard.up('Shift');
    await expect.poll(() => mapAttribute('data-selected-count'), { timeout: TIMEOUT }).toBe(String(inBox.length + 1));
    await shot('04-map-selection.png');
  }, TIMEOUT);

  it('selects on the map the dies inside a box dragged on the trade-off plot', async () => {
    const box = await plot().boundingBox();
    if (!box) throw new Error('trade-off plot is not on screen');
    await page.mouse.move(box.x + box.width * 0.2, box.y + box.height * 0.15);
    await page.mouse.down();
    await page.mouse.move(box.x + box.width * 0.6, box.y + box.height * 0.5, { steps: 6 });
    await page.mouse.move(box.x + box.width * 0.9, box.y + box.height * 0.85, { steps: 6 });
    await page.mouse.up();
    await expect.poll(async () => Number(await mapAttribute('data-selected-count')), { timeout: TIMEOUT }).toBeGreaterThan(0);
    // Every die chosen on the plot is plotted, so plot highlight and map selection agree.
    expect(await plot().getAttribute('data-highlight-count')).toBe(await mapAttribute('data-selected-count'));
    await shot('05-plot-brush.png');
  }, TIMEOUT);

  it('opens the wafer of a clicked flagged die with that die selected', async () => {
    const rows = page.locator('[data-testid="flagged-row"]');
    expect(await rows.count()).toBe(Math.min(analysis.flagged.length, 2000));
    const target = analysis.flagged.find((f) => f.wafer !== wafers[0].wafer) ?? analysis.flagged[0];
    await page.locator(`[data-testid="flagged-row"][data-wafer="${target.wafer}"][data-index="${target.index}"]`).click();
    await waitForWafer(target.wafer);
    await expect.poll(() => mapAttribute('data-selected-count'), { timeout: TIMEOUT }).toBe('1');
    // The caution stays beside the list (DOMAIN.md, "Cautions the product shows").
    expect(await page.locator('[data-testid="flag-caution"]').innerText())
      .toContain("Flags are statistical evidence for an engineer, not a disposition. Scrapping, inking or shipping follows your fab's procedures and the customer's specification.");
    await shot('06-flagged-die.png');
  }, TIMEOUT);

  it('exports the flagged list as <lot>-flagged.csv holding exactly the analysis flagged dies', async () => {
    const [download] = await Promise.all([
      page.waitForEvent('download', { timeout: TIMEOUT }),
      page.locator('[data-testid="export-flagged"]').click(),
    ]);
    expect(download.suggestedFilename()).toBe(`${lot.lot.replace(/[^A-Za-z0-9._-]+/g, '_')}-flagged.csv`);
    const saved = join(ARTIFACTS, download.suggestedFilename());
    await download.saveAs(saved);
    const records = parseCsv(readFileSync(saved, 'utf8')).filter((r) => r.length > 1 && !r[0].startsWith('#'));
    const [header, ...rows] = records;
    const column = (name: string) => header.findIndex((h) => h.trim().toLowerCase() === name);
    const [wafer, x, y] = [column('wafer'), column('x'), column('y')];
    expect(wafer).toBeGreaterThanOrEqual(0);
    const fromCsv = rows.map((r) => `${r[wafer]}|${r[x]}|${r[y]}`).sort();
    const fromApi = analysis.flagged.map((f) => `${f.wafer}|${f.x}|${f.y}`).sort();
    expect(fromCsv).toEqual(fromApi);
    await shot('07-after-export.png');
  }, TIMEOUT);

  it('says "already imported" when the same file comes again, and changes nothing', async () => {
    await page.locator('[data-testid="import-input"]').setInputFiles(DEMO_CSV);
    await confirmImport();
    await page.waitForSelector('[data-testid="import-result"][data-kind="already"]', { timeout: TIMEOUT });
    expect(await page.locator('[data-testid="import-result"]').innerText()).toContain('already imported');
    expect(await api<LotSummary[]>('listLots')).toHaveLength(1);
  }, TIMEOUT);

  it('shows the back end\'s own message when a file cannot be imported', async () => {
    const badFile = join(workDir, 'no-coordinates.csv');
    writeFileSync(badFile, 'colour,weight\nred,3\n');
    // What the API says about these bytes, asked directly.
    const response = await fetch(`${origin}/api/upload?name=${encodeURIComponent('no-coordinates.csv')}`, {
      method: 'POST', headers: { 'X-Offstate-Token': token }, body: readFileSync(badFile),
    });
    const envelope = decodePayload<{ ok: boolean; error?: { message: string } }>(new Uint8Array(await response.arrayBuffer()));
    expect(envelope.ok).toBe(false);
    await page.locator('[data-testid="import-input"]').setInputFiles(badFile);
    await confirmImport();
    await page.waitForSelector('[data-testid="import-result"][data-kind="error"]', { timeout: TIMEOUT });
    const notice = await page.locator('[data-testid="import-result"]').innerText();
    expect(notice).toContain('Import of no-coordinates.csv failed');
    expect(notice).toContain(envelope.error?.message ?? '<no message>');
    await shot('08-import-error.png');
  }, TIMEOUT);

  it('imports a file dropped anywhere on the page, showing the drop overlay while dragging', async () => {
    // A small invented lot: a 5 x 5 die grid on one wafer.
    const lines = ['Lot,Wafer,X,Y,Site,Ioff_n [pA],Ion_n (uA)'];
    for (let y = 0; y < 5; y++) for (let x = 0; x < 5; x++) lines.push(`DROP-LOT-9,W01,${x},${y},${(x % 2) + 1},${20 + x + y},${700 + 3 * x + y}`);
    const dataTransfer = await page.evaluateHandle((text) => {
      const transfer = new DataTransfer();
      transfer.items.add(new File([text], 'dropped-lot.csv', { type: 'text/csv' }));
      return transfer;
    }, `${lines.join('\n')}\n`);
    await page.dispatchEvent('main', 'dragenter', { dataTransfer });
    await page.waitForSelector('[data-testid="drop-overlay"]', { timeout: TIMEOUT });
    await shot('09-drop-overlay.png');
    await page.dispatchEvent('main', 'drop', { dataTransfer });
    await confirmImport();
    await page.waitForSelector('[data-testid="drop-overlay"]', { state: 'detached', timeout: TIMEOUT });
    await expect.poll(async () => (await api<LotSummary[]>('listLots')).map((l) => l.lot), { timeout: TIMEOUT }).toContain('DROP-LOT-9');
    await expect.poll(() => page.locator('[data-testid="lot-picker"]').inputValue(), { timeout: TIMEOUT }).toBe('DROP-LOT-9');
    await waitForWafer('W01');
    expect(Number(await mapAttribute('data-die-count'))).toBe(25);
    await shot('10-dropped-lot.png');
  }, TIMEOUT);

  it('draws every die of a 70,000-die wafer', async () => {
    // Invented lot: every unit cell whose corners lie inside a circle of radius 149.5 cells.
    const lines = ['Lot,Wafer,X,Y,Site,Ioff_n [pA],Ion_n (uA)'];
    for (let y = -150; y <= 150; y++) for (let x = -150; x <= 150; x++) {
      if ((Math.abs(x) + 0.5) ** 2 + (Math.abs(y) + 0.5) ** 2 > 149.5 ** 2) continue;
      const r = Math.hypot(x, y) / 150;
      lines.push(`BIG-LOT-3,W01,${x},${y},${((x & 1) + 2 * (y & 1)) + 1},${(20 * (1 + r * r)).toFixed(3)},${(730 + 40 * r * r).toFixed(2)}`);
    }
    const dies = lines.length - 1;
    expect(dies).toBeGreaterThan(69_000);
    const bigFile = join(workDir, 'big-lot.csv');
    writeFileSync(bigFile, `${lines.join('\n')}\n`);
    await page.locator('[data-testid="import-input"]').setInputFiles(bigFile);
    await confirmImport();
    await expect.poll(() => page.locator('[data-testid="lot-picker"]').inputValue(), { timeout: TIMEOUT }).toBe('BIG-LOT-3');
    await waitForWafer('W01');
    await expect.poll(async () => Number(await mapAttribute('data-die-count')), { timeout: TIMEOUT }).toBe(dies);
    // A figure for the reader, not a timed check (benchmarks live apart).
    console.log(`e2e: the renderer drew ${dies} dies in ${await mapAttribute('data-draw-ms')} ms`);
    await shot('11-big-wafer.png');
  }, TIMEOUT);

  it('ran without page errors or CSP refusals', () => {
    expect(pageProblems).toEqual([]);
  });
});
