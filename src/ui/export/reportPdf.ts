// The one-page FA report (A4 landscape): lot summary, the caution that flags are evidence and
// not a disposition, the lot's wafer maps, the open wafer's map with the FA dies outlined, its
// Ion-Ioff trade-off plot, and the FA list. Pictures are drawn on canvases and embedded as
// deflated RGB images (CompressionStream 'deflate' gives zlib data, which /FlateDecode reads).

import type { ParamInfo, WaferColumn, WaferFrame } from '../../shared/api';
import { buildDieGrid } from '../map/dieGrid';
import { layoutMap } from '../map/mapLayout';
import { colourScaleFor } from '../map/colorScale';
import { rampTable } from '../map/colorRamp';
import { drawWaferBase, type NotchSide } from '../map/drawWaferMap';
import { tradeoffPoints } from '../plot/tradeoffPoints';
import { tradeoffPairs } from '../../core/params';
import { formatEngineering, formatFixed } from '../format';
import { describeReasons } from '../flagText';
import { mechanismWord } from '../map/mechanismColours';
import { FLAG_CAUTION } from '../fa/faExport';
import { strongestScore, type FaRow, type RemovedRow } from '../fa/faList';
import { mapCanvas, PRINT_THEME } from './mapPicture';
import { PdfPage, writePdf, type PdfImage } from './pdf';

/** Canvas pixels as RGB rows composited over white, deflated to a zlib stream. */
export async function canvasImage(canvas: HTMLCanvasElement, name: string): Promise<PdfImage> {
  const context = canvas.getContext('2d') as CanvasRenderingContext2D;
  const { width, height } = canvas;
  const rgba = context.getImageData(0, 0, width, height).data;
  const rgb = new Uint8Array(width * height * 3);
  for (let i = 0, j = 0; i < rgba.length; i += 4, j += 3) {
    const a = rgba[i + 3] / 255;
    rgb[j] = Math.round(rgba[i] * a + 255 * (1 - a));
    rgb[j + 1] = Math.round(rgba[i + 1] * a + 255 * (1 - a));
    rgb[j + 2] = Math.round(rgba[i + 2] * a + 255 * (1 - a));
  }
  const stream = new Blob([rgb]).stream().pipeThrough(new CompressionStream('deflate'));
  const deflated = new Uint8Array(await new Response(stream).arrayBuffer());
  return { name, width, height, deflated };
}

/** Small maps of every wafer on one lot-wide colour range, with wafer name and FA count. */
export function overviewCanvas(columns: readonly WaferColumn[], param: ParamInfo | null, order: readonly string[],
  faCount: Map<string, number>, yUp: boolean, notch: NotchSide, labels: Map<string, string> = new Map()): HTMLCanvasElement {
  const cols = 5;
  const cell = 104;
  const label = 14;
  const byName = new Map(columns.map((c) => [c.wafer, c]));
  const list = order.map((w) => byName.get(w)).filter((c): c is WaferColumn => !!c);
  const rows = Math.max(1, Math.ceil(list.length / cols));
  const out = document.createElement('canvas');
  out.width = cols * cell;
  out.height = rows * (cell + label);
  const context = out.getContext('2d') as CanvasRenderingContext2D;
  context.fillStyle = '#ffffff';
  context.fillRect(0, 0, out.width, out.height);
  let scale: ReturnType<typeof colourScaleFor> | undefined;
  if (param) {
    const all = new Float64Array(list.reduce((n, c) => n + c.values.length, 0));
    let at = 0;
    for (const c of list) { all.set(c.values, at); at += c.values.length; }
    scale = colourScaleFor(all, param.unit);
  }
  const table = rampTable();
  const tile = document.createElement('canvas');
  list.forEach((c, k) => {
    const grid = buildDieGrid(c.x, c.y);
    const layout = layoutMap(grid, cell, cell, yUp);
    drawWaferBase(tile, cell, cell, layout, c.values, scale, table, PRINT_THEME, notch);
    const x = (k % cols) * cell;
    const y = Math.floor(k / cols) * (cell + label);
    context.drawImage(tile, x, y, cell, cell);
    context.fillStyle = '#1d2430';
    context.font = '11px sans-serif';
    context.textBaseline = 'top';
    const n = faCount.get(c.wafer) ?? 0;
    const signature = labels.get(c.wafer);
    context.fillText(`${c.wafer}${n ? ` - ${n} FA` : ''}${signature && signature !== 'none' ? ` - ${signature}` : ''}`, x + 4, y + cell, cell - 6);
  });
  return out;
}

/** Ion against log Ioff of one wafer on a plain canvas, FA dies ringed. */
export function scatterCanvas(frame: WaferFrame, chosen: ReadonlySet<number>, width = 640, height = 440): HTMLCanvasElement | null {
  const pair = tradeoffPairs(frame.params.map((p) => p.name))[0];
  if (!pair) return null;
  const points = tradeoffPoints(frame, pair.ion, pair.ioff);
  if (!points.die.length) return null;
  const out = document.createElement('canvas');
  out.width = width;
  out.height = height;
  const c = out.getContext('2d') as CanvasRenderingContext2D;
  c.fillStyle = '#ffffff';
  c.fillRect(0, 0, width, height);
  let yMin = Infinity, yMax = -Infinity;
  for (const v of points.y) { if (v < yMin) yMin = v; if (v > yMax) yMax = v; }
  const xMin = Math.floor(points.xMin * 4) / 4, xMax = Math.ceil(points.xMax * 4) / 4;
  const padY = (yMax - yMin) * 0.05 || 1;
  yMin -= padY; yMax += padY;
  const left = 70, right = 16, top = 16, bottom = 48;
  const px = (v: number) => left + ((v - xMin) / (xMax - xMin || 1)) * (width - left - right);
  const py = (v: number) => top + (1 - (v - yMin) / (yMax - yMin || 1)) * (height - top - bottom);
  c.strokeStyle = '#5b6473';
  c.strokeRect(left, top, width - left - right, height - top - bottom);
  c.fillStyle = '#1d2430';
  c.font = '12px sans-serif';
  c.textAlign = 'center';
  // Ticks at whole decades, or at five even steps of log10 when the range is under two decades.
  const decades = Math.floor(xMax) - Math.ceil(xMin) + 1;
  const xTicks = decades >= 3 ? Array.from({ length: decades }, (_, k) => Math.ceil(xMin) + k) : Array.from({ length: 5 }, (_, k) => xMin + ((xMax - xMin) * k) / 4);
  for (const d of xTicks) c.fillText(formatEngineering(10 ** d, 'A', 2), px(d), height - bottom + 16);
  c.fillText(`|${pair.ioff}| (log scale)`, (left + width - right) / 2, height - 10);
  c.textAlign = 'right';
  for (let k = 0; k <= 4; k++) {
    const v = yMin + ((yMax - yMin) * k) / 4;
    c.fillText(formatFixed(v, 0), left - 6, py(v) + 4);
  }
  c.save();
  c.translate(16, (top + height - bottom) / 2);
  c.rotate(-Math.PI / 2);
  c.textAlign = 'center';
  c.fillText(`|${pair.ion}| (uA)`, 0, 0);
  c.restore();
  c.fillStyle = 'rgba(0, 114, 178, 0.55)';
  for (let k = 0; k < points.die.length; k++) c.fillRect(px(points.x[k]) - 1.5, py(points.y[k]) - 1.5, 3, 3);
  c.strokeStyle = '#111111';
  c.lineWidth = 1.4;
  for (let k = 0; k < points.die.length; k++) {
    if (!chosen.has(points.die[k])) continue;
    c.beginPath();
    c.arc(px(points.x[k]), py(points.y[k]), 5, 0, Math.PI * 2);
    c.stroke();
  }
  return out;
}

function wrap(text: string, max: number): string[] {
  const words = text.split(/\s+/);
  const lines: string[] = [];
  let line = '';
  for (const w of words) {
    if ((line + ' ' + w).trim().length > max && line) { lines.push(line); line = w; } else line = `${line} ${w}`.trim();
  }
  if (line) lines.push(line);
  return lines;
}

export interface ReportInput {
  lot: string;
  wafers: number;
  dies: number;
  method: string;
  warnings: string[];
  rows: readonly FaRow[];
  removed: readonly RemovedRow[];
  overview: HTMLCanvasElement | null;
  frame: WaferFrame | null;
  param: ParamInfo | null;
  yUp: boolean;
  notch: NotchSide;
  createdAt: Date;
}

export const REPORT_ROWS = 20;

export async function reportPdf(input: ReportInput): Promise<Uint8Array> {
  const page = new PdfPage(842, 595);
  const m = 28;
  page.text(m, 40, 16, `Offstate FA report - lot ${input.lot}`, true);
  page.text(842 - m - 150, 40, 9, input.createdAt.toISOString().replace('T', ' ').slice(0, 16) + ' UTC', false, 0.35);
  page.rect(m, 50, 842 - 2 * m, 22, [1, 0.973, 0.882], [0.9, 0.78, 0.4]);
  page.text(m + 6, 64, 8.5, `Caution: ${FLAG_CAUTION}`, true);
  const analysed = input.rows.filter((r) => r.source === 'analysis').length;
  const manual = input.rows.length - analysed;
  let y = 88;
  page.text(m, y, 9, `${input.wafers} wafers, ${input.dies} dies. FA list: ${input.rows.length} dies (${analysed} flagged by the analysis, ${manual} added by hand); ${input.removed.length} flagged dies removed by hand.`);
  for (const line of wrap(`Method: ${input.method}`, 190).slice(0, 2)) { y += 11; page.text(m, y, 8, line, false, 0.3); }
  for (const w of input.warnings.slice(0, 2)) for (const line of wrap(`Note: ${w}`, 190).slice(0, 1)) { y += 11; page.text(m, y, 8, line, false, 0.3); }

  const picturesTop = Math.max(150, y + 24);
  const pictureHeight = 200;
  let imageNo = 0;
  if (input.overview) {
    const img = await canvasImage(input.overview, `Im${++imageNo}`);
    const w = Math.min(270, pictureHeight * (img.width / img.height));
    page.text(m, picturesTop - 4, 8, 'Lot overview (one colour range for the lot)', true);
    page.image(img, m, picturesTop, w, w * (img.height / img.width));
  }
  const chosen = input.frame ? input.rows.filter((r) => r.wafer === input.frame?.wafer).map((r) => r.index) : [];
  if (input.frame) {
    const mapImage = await canvasImage(mapCanvas({ frame: input.frame, param: input.param, chosen, yUp: input.yUp, notch: input.notch }, 420), `Im${++imageNo}`);
    const h = pictureHeight;
    page.text(316, picturesTop - 4, 8, `Wafer ${input.frame.wafer}, FA dies outlined`, true);
    page.image(mapImage, 316, picturesTop, h * (mapImage.width / mapImage.height), h);
    const scatter = scatterCanvas(input.frame, new Set(chosen));
    if (scatter) {
      const plot = await canvasImage(scatter, `Im${++imageNo}`);
      page.text(530, picturesTop - 4, 8, `Trade-off, wafer ${input.frame.wafer} (FA dies ringed)`, true);
      page.image(plot, 530, picturesTop, 284, 284 * (plot.height / plot.width));
    }
  }

  // The FA list.
  let top = picturesTop + pictureHeight + 22;
  const columns: [string, number][] = [['Wafer', m], ['x', m + 44], ['y', m + 72], ['Site', m + 100], ['Source', m + 126], ['Mechanism', m + 172], ['Score', m + 240], ['Note', m + 272], ['Why', m + 400]];
  page.line(m, top + 3, 842 - m, top + 3, 0.5);
  for (const [title, x] of columns) page.text(x, top, 8, title, true);
  const rowsThatFit = Math.max(0, Math.min(REPORT_ROWS, Math.floor((568 - top) / 9)));
  for (const row of input.rows.slice(0, rowsThatFit)) {
    top += 9;
    const cells = [row.wafer, String(row.x), String(row.y), row.site >= 0 ? String(row.site) : '-', row.source === 'manual' ? 'by hand' : 'analysis',
      mechanismWord(row.mechanism) || '-', row.reasons.length ? formatFixed(strongestScore(row), 1) : '-', row.note.slice(0, 28), describeReasons(row.reasons).slice(0, 110)];
    cells.forEach((text, k) => page.text(columns[k][1], top, 7, text));
  }
  if (input.rows.length > rowsThatFit) { top += 11; page.text(m, top, 8, `... and ${input.rows.length - rowsThatFit} more dies: see the CSV or JSON export of this FA list.`, false, 0.3); }
  if (!input.rows.length) { top += 11; page.text(m, top, 8, 'No die is on the FA list.', false, 0.3); }
  page.text(m, 585, 7, 'Made by Offstate. Flags are statistical evidence, not a disposition: the fab\'s procedures and the customer\'s specification decide.', false, 0.35);
  return writePdf(page, { title: `FA report, lot ${input.lot}`, creator: 'Offstate' });
}
