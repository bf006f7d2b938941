// The FA list as files: CSV (RFC 4180 quoting, a leading "#" line with the caution) and JSON
// (the same rows with every reason as data). Pure; the views turn the text into downloads.

import type { ParamInfo } from '../../shared/api';
import { describeReasons, safeFileStem } from '../flagText';
import { strongestScore, type FaRow, type RemovedRow } from './faList';

export const FLAG_CAUTION = "Flags are statistical evidence for an engineer, not a disposition. Scrapping, inking or shipping follows your fab's procedures and the customer's specification.";

/** RFC 4180 field: quoted when it holds a comma, quote, CR or LF; quotes doubled. */
export function csvField(value: string | number | null | undefined): string {
  if (value === null || value === undefined) return '';
  const text = typeof value === 'number' ? (Number.isFinite(value) ? String(value) : '') : value;
  return /[",\r\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

/**
 * @param patternOf the wafer's spatial signature label ('' when the analysis gave none)
 */
export function faCsv(lot: string, rows: readonly FaRow[], params: readonly ParamInfo[], patternOf: (wafer: string) => string = () => ''): string {
  const header = ['lot', 'wafer', 'x', 'y', 'site', 'source', 'mechanism', 'strongest_score', 'wafer_pattern', 'cluster', 'reasons', 'note',
    ...params.map((p) => (p.unit ? `${p.name} [${p.unit}]` : p.name))];
  const lines = [`# ${FLAG_CAUTION}`, `# FA list of lot ${lot}: ${rows.length} dies`, header.map(csvField).join(',')];
  for (const row of rows) {
    lines.push([
      lot, row.wafer, row.x, row.y, row.site >= 0 ? row.site : '', row.source, row.mechanism ?? '',
      row.reasons.length ? Number(strongestScore(row).toFixed(3)) : '', patternOf(row.wafer),
      row.cluster ? `${row.cluster.id} (${row.cluster.size} dies${row.cluster.line ? ', line' : ''})` : '',
      describeReasons(row.reasons), row.note,
      ...params.map((p) => row.values[p.name] ?? null),
    ].map(csvField).join(','));
  }
  return `${lines.join('\r\n')}\r\n`;
}

export interface FaJson {
  caution: string;
  lot: string;
  method: string;
  exportedAt: string;
  dies: (Omit<FaRow, 'lot'> & { strongestScore: number | null })[];
  removedByHand: RemovedRow[];
}

export function faJson(lot: string, method: string, rows: readonly FaRow[], removed: readonly RemovedRow[], now = new Date()): string {
  const doc: FaJson = {
    caution: FLAG_CAUTION,
    lot,
    method,
    exportedAt: now.toISOString(),
    dies: rows.map(({ lot: _lot, ...rest }) => ({ ...rest, strongestScore: rest.reasons.length ? strongestScore(rest as FaRow) : null })),
    removedByHand: [...removed],
  };
  return `${JSON.stringify(doc, null, 2)}\n`;
}

export function exportFileName(lot: string, what: string, extension: string): string {
  return `${safeFileStem(lot)}-${what}.${extension}`;
}
