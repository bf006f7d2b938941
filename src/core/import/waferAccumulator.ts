// One wafer's dies while a file is being read: growable typed columns, a die index by (x, y) for
// the duplicate rule, and columns that can be added later (long layout, STDF) filled with NaN.

import type { ParamInfo, WaferFrame } from '../frame';

/** Die coordinates accepted without a grid from the mapping: far beyond any real die grid. */
export const COORD_LIMIT = 100_000;

export class GrowableFloat64 {
  data: Float64Array;
  length = 0;
  constructor(capacity = 1024, fillLength = 0) {
    this.data = new Float64Array(Math.max(capacity, fillLength, 16));
    if (fillLength > 0) { this.data.fill(NaN, 0, fillLength); this.length = fillLength; }
  }
  push(v: number): void {
    if (this.length === this.data.length) {
      const next = new Float64Array(this.data.length * 2);
      next.set(this.data);
      this.data = next;
    }
    this.data[this.length++] = v;
  }
  take(): Float64Array { return this.data.slice(0, this.length); }
}

export class GrowableInt32 {
  data = new Int32Array(1024);
  length = 0;
  push(v: number): void {
    if (this.length === this.data.length) {
      const next = new Int32Array(this.data.length * 2);
      next.set(this.data);
      this.data = next;
    }
    this.data[this.length++] = v;
  }
  take(): Int32Array { return this.data.slice(0, this.length); }
}

const SMALL = 16_000;
const SMALL_SPAN = 2 * SMALL + 1;

/**
 * A number unique to (x, y). Real grids fit |x|, |y| <= 16,000, whose keys stay below 2^30 and so
 * are small integers V8 hashes fast; larger coordinates get negative keys, so the two never meet.
 */
export function dieKey(x: number, y: number): number {
  if (x >= -SMALL && x <= SMALL && y >= -SMALL && y <= SMALL) return (x + SMALL) * SMALL_SPAN + (y + SMALL);
  return -1 - ((x + COORD_LIMIT) * (2 * COORD_LIMIT + 1) + (y + COORD_LIMIT));
}

export class WaferAccumulator {
  readonly x = new GrowableInt32();
  readonly y = new GrowableInt32();
  readonly site = new GrowableInt32();
  readonly columns: GrowableFloat64[] = [];
  /** Extra per-die integer columns (STDF bins), same length as x. */
  readonly extras = new Map<string, GrowableInt32>();
  private readonly index = new Map<number, number>();

  constructor(readonly lot: string, readonly wafer: string, columnCount = 0) {
    this.ensureColumns(columnCount);
  }

  get dies(): number { return this.x.length; }

  /** Row of the die at (x, y), or -1. */
  find(x: number, y: number): number {
    return this.index.get(dieKey(x, y)) ?? -1;
  }

  /** Appends a die with every value missing; returns its row. */
  addDie(x: number, y: number, site: number): number {
    const row = this.x.length;
    this.index.set(dieKey(x, y), row);
    this.x.push(x);
    this.y.push(y);
    this.site.push(site);
    for (let c = 0; c < this.columns.length; c++) this.columns[c].push(NaN);
    if (this.extras.size > 0) for (const extra of this.extras.values()) extra.push(-1);
    return row;
  }

  /** Appends a die with its values (one per column, in column order); returns its row. */
  addDieWith(x: number, y: number, site: number, values: Float64Array): number {
    const row = this.x.length;
    this.index.set(dieKey(x, y), row);
    this.x.push(x);
    this.y.push(y);
    this.site.push(site);
    const columns = this.columns;
    for (let c = 0; c < columns.length; c++) columns[c].push(values[c]);
    if (this.extras.size > 0) for (const extra of this.extras.values()) extra.push(-1);
    return row;
  }

  ensureColumns(count: number): void {
    while (this.columns.length < count) this.columns.push(new GrowableFloat64(Math.max(1024, this.x.length * 2), this.x.length));
  }

  extra(name: string): GrowableInt32 {
    let column = this.extras.get(name);
    if (!column) {
      column = new GrowableInt32();
      for (let i = 0; i < this.x.length; i++) column.push(-1);
      this.extras.set(name, column);
    }
    return column;
  }

  toFrame(params: ParamInfo[]): WaferFrame {
    const values: Record<string, Float64Array> = {};
    const kept: ParamInfo[] = [];
    params.forEach((p, c) => {
      if (c >= this.columns.length) return;
      values[p.name] = this.columns[c].take();
      kept.push({ ...p });
    });
    return { lot: this.lot, wafer: this.wafer, x: this.x.take(), y: this.y.take(), site: this.site.take(), params: kept, values };
  }
}
