// One sentence per reason, the same in the views, the FA CSV and the report.

import type { Reason } from './types';

export function reasonText(reason: Reason): string {
  const scale = reason.scale === 'log10' ? 'log10, ' : '';
  return `${reason.param} ${reason.direction}, robust z ${reason.score >= 0 ? '+' : ''}${reason.score.toFixed(1)} (${scale}limit ${reason.limit})`;
}
