// A wafer frame: one wafer's dies as columns of typed arrays, the shape every analysis takes.

/** Numeric column of one parameter, one entry per die; NaN marks a missing value. */
export type Column = Float64Array;

export interface ParamInfo {
  /** Canonical name (Ioff_n, Ion_n, ...) or the file's own header text. */
  name: string;
  /** SI base unit the values are stored in: "A", "V", or "" when unknown. */
  unit: string;
}

export interface WaferFrame {
  /** Lot identifier as written in the file. */
  lot: string;
  /** Wafer identifier as written in the file. */
  wafer: string;
  /** Die grid coordinates. */
  x: Int32Array;
  y: Int32Array;
  /** Probe site number per die; -1 when the file had no site column. */
  site: Int32Array;
  /** Parameters in file order. */
  params: ParamInfo[];
  /** Values per parameter name, in SI base units with the raw sign. */
  values: Record<string, Column>;
}

export function dieCount(frame: WaferFrame): number {
  return frame.x.length;
}

/** The frame with only the named parameters (in its own order; names it lacks are left out). */
export function withParams(frame: WaferFrame, names: readonly string[]): WaferFrame {
  return {
    lot: frame.lot, wafer: frame.wafer, x: frame.x, y: frame.y, site: frame.site,
    params: frame.params.filter((p) => names.includes(p.name)),
    values: Object.fromEntries(names.filter((n) => frame.values[n]).map((n) => [n, frame.values[n]])),
  };
}
