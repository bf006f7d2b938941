// Wafer geometry as an STDF V4 WCR record gives it, in the spatial analysis' terms: diameter and
// die size in mm (WF_UNITS 1 inch = 25.4 mm, 2 cm, 3 mm, 4 mil = 0.0254 mm), notch side (WF_FLAT),
// grid centre (CENTER_X/Y) and axis directions (POS_X, POS_Y). Fields the record leaves out stay
// out, so the spatial step infers them from the die grid.

import type { WaferGeometry as WcrGeometry } from '../stdf';
import type { NotchSide, WaferGeometry } from './geometry';

const MM_PER_UNIT = { in: 25.4, cm: 10, mm: 1, mil: 0.0254 } as const;
const NOTCH: Record<'U' | 'D' | 'L' | 'R', NotchSide> = { U: 'top', D: 'bottom', L: 'left', R: 'right' };

export function geometryFromWcr(wcr: WcrGeometry): Partial<WaferGeometry> {
  const out: Partial<WaferGeometry> = {};
  const scale = wcr.units ? MM_PER_UNIT[wcr.units] : undefined;
  if (scale !== undefined && wcr.waferSize && wcr.waferSize > 0) out.waferDiameterMm = wcr.waferSize * scale;
  if (scale !== undefined && wcr.dieWidth && wcr.dieWidth > 0) out.dieWidthMm = wcr.dieWidth * scale;
  if (scale !== undefined && wcr.dieHeight && wcr.dieHeight > 0) out.dieHeightMm = wcr.dieHeight * scale;
  if (wcr.flat && NOTCH[wcr.flat]) out.notch = NOTCH[wcr.flat];
  if (wcr.posX) out.xPositive = wcr.posX === 'L' ? 'left' : 'right';
  if (wcr.posY) out.yPositive = wcr.posY === 'D' ? 'down' : 'up';
  // STDF marks a missing centre with -32768 (the I*2 minimum).
  if (wcr.centerX !== undefined && wcr.centerX !== -32768) out.centreX = wcr.centerX;
  if (wcr.centerY !== undefined && wcr.centerY !== -32768) out.centreY = wcr.centerY;
  return out;
}
