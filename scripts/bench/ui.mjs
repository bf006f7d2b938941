// UI bench: `node scripts/bench/ui.mjs`. Builds a bench page from the renderer's real components
// (Vite), serves it on 127.0.0.1 and runs it in headless Debian Chromium (no GPU); prints the
// 70,000-die map draw and hover times, the 25-wafer overview time and the 1.5-million-point
// trade-off plot time against the targets. Figures only: nothing here is a test.
import { createServer } from 'node:http';
import { createReadStream, existsSync, rmSync, statSync } from 'node:fs';
import { dirname, extname, join, normalize, sep } from 'node:path';
import { fileURLToPath } from 'node:url';
import { build } from 'vite';
import vue from '@vitejs/plugin-vue';
import { chromium } from 'playwright-core';

const root = join(dirname(fileURLToPath(import.meta.url)), '..', '..');
const outDir = join(root, '.cache', 'bench', 'ui-page');
rmSync(outDir, { recursive: true, force: true });
await build({
  root: join(root, 'scripts', 'bench', 'ui-page'), base: './', plugins: [vue()], logLevel: 'warn', publicDir: false,
  build: { outDir, emptyOutDir: true, target: 'es2022', chunkSizeWarningLimit: 4000 },
});

const types = { '.html': 'text/html', '.js': 'text/javascript', '.css': 'text/css' };
const server = createServer((req, res) => {
  const path = normalize(join(outDir, decodeURIComponent(new URL(req.url ?? '/', 'http://x').pathname.slice(1)) || 'index.html'));
  if (!path.startsWith(outDir + sep) || !existsSync(path) || !statSync(path).isFile()) { res.writeHead(404).end(); return; }
  res.writeHead(200, { 'Content-Type': types[extname(path)] ?? 'application/octet-stream' });
  createReadStream(path).pipe(res);
});
await new Promise((resolve) => server.listen(0, '127.0.0.1', resolve));
const url = `http://127.0.0.1:${server.address().port}/index.html`;

const browser = await chromium.launch({
  executablePath: '/usr/bin/chromium', headless: true,
  args: ['--headless', '--no-sandbox', '--disable-gpu', '--disable-background-networking', '--disable-component-update', '--disable-sync', '--no-first-run'],
});
try {
  const page = await browser.newPage({ viewport: { width: 1600, height: 1400 } });
  page.on('pageerror', (e) => console.error(`page error: ${e.message}`));
  await page.goto(url);
  await page.waitForFunction(() => window.__bench || window.__benchError, null, { timeout: 300_000, polling: 250 });
  const error = await page.evaluate(() => window.__benchError);
  if (error) throw new Error(error);
  const r = await page.evaluate(() => window.__bench);
  const ms = (v) => `${Number(v).toFixed(1)} ms`;
  const verdict = (v, limit) => (Number(v) <= limit ? `under ${limit} ms` : `OVER ${limit} ms`);
  console.log('Offstate UI bench (headless Chromium, no GPU, device pixel ratio 1)');
  console.log(`  wafer map, ${r.mapDies} dies: first draw ${ms(r.mapFirstDrawMs)} to the next frame (${ms(r.mapFirstPaintedMs)} until painted; canvas calls ${ms(r.mapCanvasDrawMs)}), redraw median ${ms(r.mapRedrawMedianMs)}  [first: ${verdict(r.mapFirstDrawMs, 150)}]`);
  console.log(`  opening another ${r.mapDies}-die wafer, median of 5: ${ms(r.mapOpenWaferMedianMs)}  [${verdict(r.mapOpenWaferMedianMs, 150)}]`);
  console.log(`  hover on that map: median ${ms(r.hoverMedianMs)}, worst ${ms(r.hoverMaxMs)} of 60  [${verdict(r.hoverMaxMs, 30)}]`);
  console.log(`  lot overview, ${r.overviewWafers} wafers (${r.overviewDies} dies): ${ms(r.overviewMs)} (drawing ${ms(r.overviewDrawMs)})  [${verdict(r.overviewMs, 1500)}]`);
  console.log(`  trade-off plot, ${r.tradeoffPoints} points: ${ms(r.tradeoffMs)}  [${verdict(r.tradeoffMs, 2000)}]`);
} finally {
  await browser.close();
  server.close();
}
