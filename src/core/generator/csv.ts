// Writes a generated lot as delimited text the way a parametric tester might: one row per die,
// mixed unit prefixes and header styles on purpose, so the importer's header and unit inference
// gets exercised by the demo file.

import type { CanonicalParam } from '../params';
import type { WaferFrame } from '../frame';

export interface CsvColumn {
  header: string;
  param: CanonicalParam;
  /** Size of the written unit in SI base units: the value written is value / unitScale. */
  unitScale: number;
}

/** The demo file's measurement columns, in file order. */
export const DEMO_CSV_COLUMNS: readonly CsvColumn[] = [
  { header: 'Ioff_n [pA]', param: 'Ioff_n', unitScale: 1e-12 },
  { header: 'Ion_n (uA)', param: 'Ion_n', unitScale: 1e-6 },
  { header: 'IOFF_P (pA)', param: 'Ioff_p', unitScale: 1e-12 },
  { header: 'Ion_p (uA)', param: 'Ion_p', unitScale: 1e-6 },
  { header: 'Vtlin_n [V]', param: 'Vtlin_n', unitScale: 1 },
  { header: 'Vtsat_n [V]', param: 'Vtsat_n', unitScale: 1 },
  { header: 'Vtlin_p [V]', param: 'Vtlin_p', unitScale: 1 },
  { header: 'Vtsat_p [V]', param: 'Vtsat_p', unitScale: 1 },
  { header: 'Ig_n [pA]', param: 'Ig_n', unitScale: 1e-12 },
  { header: 'Ig_p [pA]', param: 'Ig_p', unitScale: 1e-12 },
  { header: 'Isb [nA]', param: 'Isb', unitScale: 1e-9 },
];

export interface CsvOptions {
  columns?: readonly CsvColumn[];
  /** Significant digits per value; default 6. */
  significantDigits?: number;
  /** Line ending; default "\n". */
  newline?: string;
}

/** What the writer needs: a lot id and its wafers (an array or a lazy iterable). */
export interface CsvSource {
  lot: string;
  wafers: Iterable<WaferFrame>;
}

/** A value in the written unit, shortest text for the rounded number; NaN becomes an empty field. */
export function formatValue(value: number, unitScale: number, significantDigits: number): string {
  if (!Number.isFinite(value)) return '';
  return String(Number((value / unitScale).toPrecision(significantDigits)));
}

/** Quotes a text field when it holds a delimiter, a quote or a line break (RFC 4180 rules). */
function textField(text: string): string {
  return /[",\r\n]/.test(text) ? `"${text.replaceAll('"', '""')}"` : text;
}

/** The header line, without line ending. */
export function csvHeader(columns: readonly CsvColumn[] = DEMO_CSV_COLUMNS): string {
  return ['Lot', 'Wafer', 'X', 'Y', 'Site', ...columns.map((column) => column.header)].map(textField).join(',');
}

/** Yields the file as chunks: the header line, then one chunk per wafer. */
export function* lotCsvChunks(source: CsvSource, options: CsvOptions = {}): Generator<string> {
  const columns = options.columns ?? DEMO_CSV_COLUMNS;
  const digits = options.significantDigits ?? 6;
  const newline = options.newline ?? '\n';
  yield csvHeader(columns) + newline;
  const lot = textField(source.lot);
  for (const wafer of source.wafers) {
    const prefix = `${lot},${textField(wafer.wafer)},`;
    const data = columns.map((column) => {
      const values = wafer.values[column.param];
      if (!values) throw new RangeError(`wafer ${wafer.wafer} has no values for ${column.param}`);
      return values;
    });
    const lines: string[] = new Array(wafer.x.length);
    for (let i = 0; i < wafer.x.length; i++) {
      let line = `${prefix}${wafer.x[i]},${wafer.y[i]},${wafer.site[i]}`;
      for (let c = 0; c < columns.length; c++) line += ',' + formatValue(data[c][i], columns[c].unitScale, digits);
      lines[i] = line;
    }
    yield lines.join(newline) + newline;
  }
}

/** The whole file as one string (fine for the demo lot; use lotCsvChunks for big lots). */
export function lotToCsv(source: CsvSource, options: CsvOptions = {}): string {
  let text = '';
  for (const chunk of lotCsvChunks(source, options)) text += chunk;
  return text;
}
