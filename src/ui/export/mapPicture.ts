// Pictures of one wafer map for files: a PNG (canvas) and an SVG (one rect per die), always in the
// light theme, with the chosen dies (the FA list's dies on this wafer) outlined and a caption
// with the legend's range in engineering units.

import type { ParamInfo, WaferFrame } from '../../shared/api';
import { buildDieGrid } from '../map/dieGrid';
import { cellCorner, layoutMap } from '../map/mapLayout';
import { colourScaleFor, rampStepOf, untransformValue, type ColourScale } from '../map/colorScale';
import { rampTable, rgbToHex, viridis } from '../map/colorRamp';
import { drawWaferBase, drawWaferMarks, type MapTheme, type NotchSide } from '../map/drawWaferMap';
import { formatEngineering } from '../format';

export const PRINT_THEME: MapTheme = {
  background: '#ffffff',
  waferFill: '#e8ecf1',
  waferEdge: '#5b6473',
  missing: [169, 173, 180],
  selection: '#111111',
  selectionHalo: '#ffffff',
  flag: '#e0218a',
  flagHalo: '#ffffff',
};

export interface MapPictureInput {
  frame: WaferFrame;
  param: ParamInfo | null;
  /** Dies outlined (chosen for FA). */
  chosen: readonly number[];
  yUp: boolean;
  notch: NotchSide;
}

function caption(input: MapPictureInput, scale: ColourScale | undefined): string {
  const { frame, param } = input;
  const range = scale && scale.valid > 0
    ? `${formatEngineering(untransformValue(scale.low, scale.log), scale.unit)} to ${formatEngineering(untransformValue(scale.high, scale.log), scale.unit)}${scale.log ? ' (log)' : ''}`
    : 'no values';
  return `Lot ${frame.lot} wafer ${frame.wafer} - ${param?.name ?? 'no parameter'}: ${range} - ${input.chosen.length} dies chosen for FA (outlined)`;
}

const FOOTER = 44;

/** The map drawn into a fresh canvas of size x (size + footer) CSS pixels at the page's pixel ratio. */
export function mapCanvas(input: MapPictureInput, size = 800): HTMLCanvasElement {
  const { frame, param } = input;
  const grid = buildDieGrid(frame.x, frame.y);
  const layout = layoutMap(grid, size, size, input.yUp);
  const values = param ? frame.values[param.name] : undefined;
  const scale = values && param ? colourScaleFor(values, param.unit) : undefined;
  const base = document.createElement('canvas');
  drawWaferBase(base, size, size, layout, values, scale, rampTable(), PRINT_THEME, input.notch);
  const marks = document.createElement('canvas');
  drawWaferMarks(marks, size, size, layout, frame.x, frame.y, input.chosen, [], PRINT_THEME);
  const ratio = base.width / size;
  const out = document.createElement('canvas');
  out.width = base.width;
  out.height = Math.round((size + FOOTER) * ratio);
  const context = out.getContext('2d') as CanvasRenderingContext2D;
  context.fillStyle = '#ffffff';
  context.fillRect(0, 0, out.width, out.height);
  context.drawImage(base, 0, 0);
  context.drawImage(marks, 0, 0);
  context.setTransform(ratio, 0, 0, ratio, 0, 0);
  // Ramp strip and caption.
  for (let i = 0; i < 200; i++) {
    context.fillStyle = rgbToHex(viridis(i / 199));
    context.fillRect(12 + i, size + 6, 1.2, 10);
  }
  context.fillStyle = '#1d2430';
  context.font = '12px system-ui, sans-serif';
  context.textBaseline = 'top';
  context.fillText(caption(input, scale), 12, size + 22, size - 24);
  return out;
}

export function canvasPng(canvas: HTMLCanvasElement): Promise<Blob> {
  return new Promise((resolve, reject) => canvas.toBlob((blob) => (blob ? resolve(blob) : reject(new Error('The browser made no PNG'))), 'image/png'));
}

const escapeXml = (text: string) => text.replace(/[<>&"']/g, (c) => ({ '<': '&lt;', '>': '&gt;', '&': '&amp;', '"': '&quot;', "'": '&apos;' }[c] as string));

/** The same picture as SVG: wafer outline, one rect per die in its ramp colour, chosen dies outlined. */
export function mapSvg(input: MapPictureInput, size = 800): string {
  const { frame, param } = input;
  const grid = buildDieGrid(frame.x, frame.y);
  const layout = layoutMap(grid, size, size, input.yUp);
  const values = param ? frame.values[param.name] : undefined;
  const scale = values && param ? colourScaleFor(values, param.unit) : undefined;
  const table = rampTable();
  const hex = (step: number) => `#${[0, 1, 2].map((k) => table[step * 4 + k].toString(16).padStart(2, '0')).join('')}`;
  const missing = rgbToHex(PRINT_THEME.missing);
  const cell = layout.cell;
  const f = (v: number) => v.toFixed(2);
  const dies: string[] = [];
  for (let i = 0; i < frame.x.length; i++) {
    const c = cellCorner(layout, frame.x[i], frame.y[i]);
    const step = values && scale ? rampStepOf(values[i], scale) : -1;
    dies.push(`<rect x="${f(c.x)}" y="${f(c.y)}" width="${f(cell)}" height="${f(cell)}" fill="${step < 0 ? missing : hex(step)}"/>`);
  }
  const chosen = input.chosen.filter((i) => i >= 0 && i < frame.x.length).map((i) => {
    const c = cellCorner(layout, frame.x[i], frame.y[i]);
    return `<rect class="chosen" data-x="${frame.x[i]}" data-y="${frame.y[i]}" x="${f(c.x)}" y="${f(c.y)}" width="${f(cell)}" height="${f(cell)}"/>`;
  });
  return [
    `<svg xmlns="http://www.w3.org/2000/svg" width="${size}" height="${size + FOOTER}" viewBox="0 0 ${size} ${size + FOOTER}">`,
    `<title>${escapeXml(caption(input, scale))}</title>`,
    `<rect width="100%" height="100%" fill="#ffffff"/>`,
    `<circle cx="${f(layout.centreX)}" cy="${f(layout.centreY)}" r="${f(layout.radius)}" fill="${PRINT_THEME.waferFill}" stroke="${PRINT_THEME.waferEdge}" stroke-width="1.5"/>`,
    `<g class="dies" shape-rendering="crispEdges">${dies.join('')}</g>`,
    `<g class="chosen-dies" fill="none" stroke="#111111" stroke-width="1.5">${chosen.join('')}</g>`,
    `<text x="12" y="${size + 30}" font-family="sans-serif" font-size="12" fill="#1d2430">${escapeXml(caption(input, scale))}</text>`,
    '</svg>',
  ].join('\n');
}

/** Saves a Blob under a name through a temporary link (works in the browser mode and in Electron). */
export function saveBlob(blob: Blob, name: string): void {
  const url = URL.createObjectURL(blob);
  const link = document.createElement('a');
  link.href = url;
  link.download = name;
  document.body.append(link);
  link.click();
  link.remove();
  setTimeout(() => URL.revokeObjectURL(url), 10_000);
}
