// The FA list as the engineer sends it: the analysis' flagged dies, with the dies added or removed
// by hand (each with a note). Edits are replayed in order and the last edit of a die wins, so
// "remove, then add again" puts a die back. Pure functions: the views, the exports and the report
// all read the same rows.

import type { FlaggedDie, MechanismKind } from '../../core/analysis/types';
import type { FaEdit } from '../../shared/api';
import { describeReasons } from '../flagText';

/** A die of the FA list: where it is, its reasons and values (as a flagged die has them), and
 * how it got onto the list. */
export interface FaRow extends Pick<FlaggedDie, 'lot' | 'wafer' | 'x' | 'y' | 'site' | 'index' | 'reasons' | 'values'> {
  /** 'analysis': flagged by the analysis; 'manual': added by hand. */
  source: 'analysis' | 'manual';
  /** Mechanism call when the analysis made one. */
  mechanism: MechanismKind | null;
  mechanismWhy: string;
  /** The note of the last hand edit of this die ('' when none). */
  note: string;
  /** The 8-neighbour cluster of flagged dies the die is in, when the analysis found one. */
  cluster: { id: number; size: number; line: boolean } | null;
}

export interface RemovedRow {
  wafer: string;
  x: number;
  y: number;
  index: number;
  note: string;
}

export const dieKey = (wafer: string, index: number) => `${wafer}\u0000${index}`;

/** Mechanism of a flagged die when the analysis carries one (older results do not). */
export function mechanismOf(die: FlaggedDie): MechanismKind | null {
  const call = (die as Partial<FlaggedDie>).mechanism;
  return call && typeof call.kind === 'string' ? call.kind : null;
}

export function buildFaList(lot: string, flagged: readonly FlaggedDie[], edits: readonly FaEdit[],
  siteOf: (wafer: string, index: number) => number = () => -1): { rows: FaRow[]; removed: RemovedRow[] } {
  const last = new Map<string, FaEdit>();
  for (const edit of edits) last.set(dieKey(edit.wafer, edit.index), edit);
  const rows: FaRow[] = [];
  const removed: RemovedRow[] = [];
  const seen = new Set<string>();
  for (const die of flagged) {
    if (die.lot !== lot) continue;
    const key = dieKey(die.wafer, die.index);
    seen.add(key);
    const edit = last.get(key);
    if (edit?.action === 'remove') {
      removed.push({ wafer: die.wafer, x: die.x, y: die.y, index: die.index, note: edit.note });
      continue;
    }
    rows.push({
      lot, wafer: die.wafer, x: die.x, y: die.y, site: die.site, index: die.index, source: 'analysis',
      reasons: die.reasons, mechanism: mechanismOf(die), mechanismWhy: die.mechanism?.why ?? '',
      values: die.values, note: edit?.note ?? '', cluster: die.cluster ?? null,
    });
  }
  for (const [key, edit] of last) {
    if (seen.has(key) || edit.action !== 'add') continue;
    rows.push({
      lot, wafer: edit.wafer, x: edit.x, y: edit.y, site: siteOf(edit.wafer, edit.index), index: edit.index,
      source: 'manual', reasons: [], mechanism: null, mechanismWhy: '', values: {}, note: edit.note, cluster: null,
    });
  }
  return { rows, removed };
}

export type FaSortKey = 'wafer' | 'x' | 'y' | 'site' | 'source' | 'mechanism' | 'score' | 'note';

/** Largest |score| of a row's reasons (0 for a hand-added die). */
export function strongestScore(row: FaRow): number {
  let best = 0;
  for (const r of row.reasons) if (Math.abs(r.score) > best) best = Math.abs(r.score);
  return best;
}

const collator = new Intl.Collator('en', { numeric: true, sensitivity: 'base' });

export function sortFaRows(rows: readonly FaRow[], key: FaSortKey, descending = false): FaRow[] {
  const value = (row: FaRow): string | number => {
    switch (key) {
      case 'wafer': return row.wafer;
      case 'x': return row.x;
      case 'y': return row.y;
      case 'site': return row.site;
      case 'source': return row.source;
      case 'mechanism': return row.mechanism ?? '';
      case 'score': return strongestScore(row);
      case 'note': return row.note;
    }
  };
  const sign = descending ? -1 : 1;
  return [...rows].sort((a, b) => {
    const va = value(a), vb = value(b);
    const c = typeof va === 'number' && typeof vb === 'number' ? va - vb : collator.compare(String(va), String(vb));
    return c !== 0 ? sign * c : collator.compare(a.wafer, b.wafer) || a.index - b.index;
  });
}

/** Rows whose wafer, site, source, mechanism, reasons or note contain every word of the filter. */
export function filterFaRows(rows: readonly FaRow[], filter: string): FaRow[] {
  const words = filter.toLowerCase().split(/\s+/).filter(Boolean);
  if (!words.length) return [...rows];
  return rows.filter((row) => {
    const text = [`wafer ${row.wafer}`, `site ${row.site}`, row.source, row.mechanism ?? '', describeReasons(row.reasons), row.note, `x ${row.x}`, `y ${row.y}`]
      .join(' ').toLowerCase();
    return words.every((w) => text.includes(w));
  });
}
