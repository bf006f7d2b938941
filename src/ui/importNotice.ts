// What the top bar says after an import: imported (with counts), already imported, or failed.

import type { ImportResult } from '../shared/api';
import { formatQuantity, formatSeconds } from './format';

export interface ImportNotice {
  kind: 'imported' | 'already' | 'error';
  text: string;
  details: string[];
}

export function describeImport(result: ImportResult): ImportNotice {
  if (result.status === 'already-imported') {
    return { kind: 'already', text: `${result.file} was already imported (same content); nothing changed.`, details: [] };
  }
  const lots = result.lots.length === 1 ? `lot ${result.lots[0]}` : formatQuantity(result.lots.length, 'lot');
  const rejected = result.rejected ? `, ${formatQuantity(result.rejected, 'row')} rejected` : '';
  return {
    kind: 'imported',
    text: `Imported ${result.file}: ${lots}, ${formatQuantity(result.wafers, 'wafer')}, ${formatQuantity(result.rows, 'row')}${rejected} in ${formatSeconds(result.seconds)}.`,
    details: result.messages.slice(0, 5),
  };
}
