// The renderer's real components in headless Chromium on invented full-size data: a 70,000-die
// wafer map (draw and hover), a 25-wafer lot overview of 70,000 dies each, and a trade-off plot of
// 1.5 million points. Results go to window.__bench for scripts/bench/ui.mjs to print.
import { createApp, h, nextTick, reactive } from 'vue';
import WaferMap from '../../../src/ui/components/WaferMap.vue';
import LotOverview from '../../../src/ui/components/LotOverview.vue';
import TradeoffPlot from '../../../src/ui/components/TradeoffPlot.vue';
import '../../../src/ui/styles.css';
import { DEFAULT_DISPLAY_SETTINGS, type WaferColumn, type WaferFrame } from '../../../src/shared/api';
import type { LotPairPoints } from '../../../src/ui/state/workspace';

declare global { interface Window { __bench?: Record<string, number | string>; __benchError?: string } }

/** Small seeded generator (mulberry32) so every run draws the same invented wafer. */
function random(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

function wafer(name: string, seed: number): WaferFrame {
  const xs: number[] = [], ys: number[] = [];
  for (let y = -150; y <= 150; y++) for (let x = -150; x <= 150; x++) {
    if ((Math.abs(x) + 0.5) ** 2 + (Math.abs(y) + 0.5) ** 2 <= 149.5 ** 2) { xs.push(x); ys.push(y); }
  }
  const n = xs.length;
  const rnd = random(seed);
  const ioff = new Float64Array(n), ion = new Float64Array(n);
  const site = new Int32Array(n);
  for (let i = 0; i < n; i++) {
    const r = Math.hypot(xs[i], ys[i]) / 150;
    const vt = (rnd() - 0.5) * 0.04 + 0.01 * r * r;
    ioff[i] = 2e-11 * 10 ** (-vt / 0.085 + (rnd() - 0.5) * 0.1);
    ion[i] = 7.3e-4 * (1 - 1.5 * vt) * (1 + (rnd() - 0.5) * 0.02);
    site[i] = ((xs[i] & 1) + 2 * (ys[i] & 1)) + 1;
  }
  return {
    lot: 'BENCH-LOT-1', wafer: name, x: Int32Array.from(xs), y: Int32Array.from(ys), site,
    params: [{ name: 'Ioff_n', unit: 'A' }, { name: 'Ion_n', unit: 'A' }], values: { Ioff_n: ioff, Ion_n: ion },
  };
}

const frame0 = () => new Promise<void>((resolve) => requestAnimationFrame(() => resolve()));
const median = (v: number[]) => { const s = [...v].sort((a, b) => a - b); return s[Math.floor(s.length / 2)]; };

async function run(): Promise<Record<string, number | string>> {
  const out: Record<string, number | string> = {};
  const host = document.getElementById('bench') as HTMLElement;
  host.style.cssText = 'width: 1000px; height: 1000px; display: flex;';

  // ---- wafer map: draw and hover ------------------------------------------------------------
  const big = wafer('W01', 1);
  out.mapDies = big.x.length;
  const props = reactive({
    frame: null as WaferFrame | null, param: big.params[0], params: big.params, selection: new Set<number>(),
    flagged: [], flaggedByIndex: new Map(), yUp: true, loading: false, tool: 'box' as const,
    display: { ...DEFAULT_DISPLAY_SETTINGS }, ringEdges: null,
  });
  const mapApp = createApp({ render: () => h(WaferMap, { ...props, style: 'flex: 1; height: 1000px' }) });
  mapApp.mount(host);
  await frame0();
  await frame0();
  const draws: number[] = [];
  const drawn: number[] = [];
  for (let k = 0; k < 6; k++) {
    const t = performance.now();
    if (k === 0) props.frame = big; else props.param = big.params[k % 2];
    await nextTick();
    // The canvas is painted by now (Vue's post-flush watchers draw synchronously) ...
    drawn.push(performance.now() - t);
    await frame0();
    // ... and on screen after the next animation frame.
    draws.push(performance.now() - t);
  }
  out.mapFirstDrawMs = draws[0];
  out.mapFirstPaintedMs = drawn[0];
  out.mapRedrawMedianMs = median(draws.slice(1));
  // Opening another 70,000-die wafer in a page that has drawn one before (the everyday case).
  const other = wafer('W02', 2);
  const opens: number[] = [];
  for (const f of [other, big, other, big, other]) {
    const t = performance.now();
    props.frame = f;
    await nextTick();
    await frame0();
    opens.push(performance.now() - t);
  }
  out.mapOpenWaferMedianMs = median(opens);
  const canvas = host.querySelector('[data-testid="wafer-map"]') as HTMLCanvasElement;
  out.mapCanvasDrawMs = Number(canvas.getAttribute('data-draw-ms'));
  const [ax, bx, ay, by] = (canvas.getAttribute('data-transform') ?? '').split(' ').map(Number);
  const box = canvas.getBoundingClientRect();
  const hovers: number[] = [];
  for (let k = 0; k < 60; k++) {
    const die = Math.floor((k * 7919) % big.x.length);
    const t = performance.now();
    canvas.dispatchEvent(new PointerEvent('pointermove', { clientX: box.left + ax + bx * big.x[die], clientY: box.top + ay + by * big.y[die], bubbles: true }));
    await nextTick();
    const tip = host.querySelector('[data-testid="die-tooltip"]');
    if (!tip || tip.getAttribute('data-die') !== String(die)) throw new Error(`hover on die ${die} did not show it`);
    hovers.push(performance.now() - t);
    await frame0();
  }
  out.hoverMedianMs = median(hovers);
  out.hoverMaxMs = Math.max(...hovers);
  mapApp.unmount();

  // ---- lot overview: 25 wafers ---------------------------------------------------------------
  const columns: WaferColumn[] = [];
  for (let w = 0; w < 25; w++) {
    const f = w === 0 ? big : wafer(`W${String(w + 1).padStart(2, '0')}`, w + 1);
    columns.push({ lot: f.lot, wafer: f.wafer, x: f.x, y: f.y, site: f.site, values: f.values.Ioff_n });
  }
  out.overviewWafers = columns.length;
  out.overviewDies = columns.reduce((n, c) => n + c.x.length, 0);
  host.style.cssText = 'width: 1600px; height: 1400px; display: flex;';
  const t0 = performance.now();
  const overviewApp = createApp({ render: () => h(LotOverview, {
    lot: 'BENCH-LOT-1', columns, param: big.params[0], params: big.params, analysis: null, current: null, loading: false, yUp: true, notch: 'down', style: 'flex: 1',
  }) });
  overviewApp.mount(host);
  for (;;) {
    await frame0();
    const el = host.querySelector('[data-testid="lot-overview"]');
    if (el && el.getAttribute('data-drawn') === '25') break;
    if (performance.now() - t0 > 60_000) throw new Error('overview never finished drawing');
  }
  out.overviewMs = performance.now() - t0;
  out.overviewDrawMs = Number(host.querySelector('[data-testid="lot-overview"]')?.getAttribute('data-draw-ms'));
  overviewApp.unmount();

  // ---- trade-off plot: 1.5 million points -----------------------------------------------------
  const total = 1_500_000;
  const x = new Float64Array(total), y = new Float64Array(total), waferIndex = new Int32Array(total);
  let at = 0;
  for (let w = 0; at < total; w++) {
    const c = columns[w % columns.length];
    const ion = w === 0 ? big.values.Ion_n : big.values.Ion_n;
    for (let i = 0; i < c.x.length && at < total; i++, at++) {
      x[at] = Math.log10(Math.abs(c.values[i])); y[at] = Math.abs(ion[i]) * 1e6; waferIndex[at] = (w % 24) + 1;
    }
  }
  const lotPairs: LotPairPoints = { lot: big.lot, ion: 'Ion_n', ioff: 'Ioff_n', x, y, wafer: waferIndex, wafers: columns.map((c) => c.wafer) };
  host.style.cssText = 'width: 900px; height: 700px; display: flex;';
  const t1 = performance.now();
  const plotApp = createApp({ render: () => h(TradeoffPlot, {
    frame: big, waferAnalysis: null, selection: new Set<number>(), flagged: [], lotPairs, initialColourBy: 'wafer', style: 'flex: 1; height: 700px',
  }) });
  plotApp.mount(host);
  const plot = () => host.querySelector('[data-testid="tradeoff-plot"]');
  for (;;) {
    await frame0();
    const el = plot();
    const finished = Number(el?.getAttribute('data-finished') ?? 0);
    if (el && Number(el.getAttribute('data-lot-points')) > 0 && finished > t1) { out.tradeoffMs = finished - t1; break; }
    if (performance.now() - t1 > 120_000) throw new Error('trade-off plot never finished');
  }
  out.tradeoffPoints = Number(plot()?.getAttribute('data-lot-points'));
  plotApp.unmount();
  return out;
}

run().then((r) => { window.__bench = r; }, (e: Error) => { window.__benchError = e.stack ?? e.message; });
