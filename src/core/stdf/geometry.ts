// Wafer geometry as the STDF WCR record gives it, with the specification's "missing" markers
// (0 for sizes, a space for characters, -32768 for centre coordinates) turned into undefined.

import type { Wcr } from './records';

export interface WaferGeometry {
  /** Wafer diameter in `units`. */
  waferSize?: number;
  dieHeight?: number;
  dieWidth?: number;
  units?: 'in' | 'cm' | 'mm' | 'mil';
  /** Where the flat or notch is, seen with the wafer face up: U(p), D(own), L(eft), R(ight). */
  flat?: 'U' | 'D' | 'L' | 'R';
  /** Die coordinates of the centre die. */
  centerX?: number;
  centerY?: number;
  /** Direction of increasing X: L(eft) or R(ight); of increasing Y: U(p) or D(own). */
  posX?: 'L' | 'R';
  posY?: 'U' | 'D';
}

const UNITS = { 1: 'in', 2: 'cm', 3: 'mm', 4: 'mil' } as const;

export function geometryOfWcr(w: Wcr): WaferGeometry {
  const g: WaferGeometry = {};
  const size = (v: number | undefined) => (v !== undefined && v > 0 && Number.isFinite(v) ? v : undefined);
  const set = <K extends keyof WaferGeometry>(k: K, v: WaferGeometry[K] | undefined) => { if (v !== undefined) g[k] = v; };
  set('waferSize', size(w.waferSize));
  set('dieHeight', size(w.dieHeight));
  set('dieWidth', size(w.dieWidth));
  set('units', UNITS[w.units as keyof typeof UNITS]);
  const flat = w.flat?.toUpperCase();
  set('flat', flat === 'U' || flat === 'D' || flat === 'L' || flat === 'R' ? flat : undefined);
  set('centerX', w.centerX !== undefined && w.centerX !== -32768 ? w.centerX : undefined);
  set('centerY', w.centerY !== undefined && w.centerY !== -32768 ? w.centerY : undefined);
  const px = w.posX?.toUpperCase();
  const py = w.posY?.toUpperCase();
  set('posX', px === 'L' || px === 'R' ? px : undefined);
  set('posY', py === 'U' || py === 'D' ? py : undefined);
  return g;
}
