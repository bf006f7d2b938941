// Merges two parts of one wafer: the dies already stored and the dies a file brings. Parameters
// are the union (a die lacking one has NaN); a die at an (x, y) present in both takes the newer
// values of the parameters the newer part has. Pure, so the store's merge rule can be tested here.

import type { WaferFrame } from '../frame';
import { dieKey } from './waferAccumulator';

export interface WaferPart {
  frame: WaferFrame;
  /** Per-die integer columns such as STDF bins ("hardBin", "softBin"); -1 = none. */
  extras?: Record<string, Int32Array>;
}

/** Dies of `added` whose (x, y) is already in `base`. */
export function overlappingDies(base: WaferFrame, added: WaferFrame): number {
  const keys = new Set<number>();
  for (let i = 0; i < base.x.length; i++) keys.add(dieKey(base.x[i], base.y[i]));
  let n = 0;
  for (let i = 0; i < added.x.length; i++) if (keys.has(dieKey(added.x[i], added.y[i]))) n++;
  return n;
}

export function mergeParts(base: WaferPart, added: WaferPart): WaferPart {
  const b = base.frame;
  const a = added.frame;
  const rowOf = new Map<number, number>();
  for (let i = 0; i < b.x.length; i++) rowOf.set(dieKey(b.x[i], b.y[i]), i);
  const targetRow = new Int32Array(a.x.length);
  let count = b.x.length;
  for (let i = 0; i < a.x.length; i++) {
    const k = dieKey(a.x[i], a.y[i]);
    const row = rowOf.get(k);
    if (row !== undefined) targetRow[i] = row;
    else { targetRow[i] = count; rowOf.set(k, count); count++; }
  }
  const x = new Int32Array(count); x.set(b.x);
  const y = new Int32Array(count); y.set(b.y);
  const site = new Int32Array(count); site.set(b.site);
  for (let i = 0; i < a.x.length; i++) { const r = targetRow[i]; x[r] = a.x[i]; y[r] = a.y[i]; site[r] = a.site[i]; }
  const params = [...b.params.map((p) => ({ ...p }))];
  for (const p of a.params) if (!params.some((q) => q.name === p.name)) params.push({ ...p });
  const values: Record<string, Float64Array> = {};
  for (const p of params) {
    const column = new Float64Array(count).fill(NaN);
    const old = b.values[p.name];
    if (old) column.set(old);
    const nu = a.values[p.name];
    if (nu) for (let i = 0; i < a.x.length; i++) column[targetRow[i]] = nu[i];
    values[p.name] = column;
  }
  const extras: Record<string, Int32Array> = {};
  for (const name of new Set([...Object.keys(base.extras ?? {}), ...Object.keys(added.extras ?? {})])) {
    const column = new Int32Array(count).fill(-1);
    const old = base.extras?.[name];
    if (old) column.set(old);
    const nu = added.extras?.[name];
    if (nu) for (let i = 0; i < a.x.length; i++) column[targetRow[i]] = nu[i];
    extras[name] = column;
  }
  return { frame: { lot: b.lot, wafer: b.wafer, x, y, site, params, values }, extras: Object.keys(extras).length ? extras : undefined };
}
