// One sentence per reason, the same in the views, the FA CSV and the report.

import type { Reason } from './types';

const METHOD_WORDS: Record<Reason['method'], string> = {
  'pat-wafer': 'PAT wafer',
  'pat-lot': 'PAT lot',
  'pat-static': 'PAT static',
  nnr: 'NNR',
  gdbn: 'GDBN',
};

function signed(v: number): string {
  return `${v >= 0 ? '+' : ''}${v.toFixed(1)}`;
}

export function reasonText(reason: Reason): string {
  const scale = reason.scale === 'log10' ? 'log10, ' : '';
  switch (reason.method) {
    case 'pat-wafer':
    case 'pat-lot':
    case 'pat-static':
      return `${reason.param} ${reason.direction}, ${METHOD_WORDS[reason.method]} ${signed(reason.score)} robust sigma (${scale}${reason.clipped ? 'spec limit' : `limit ${reason.limit}`})`;
    case 'nnr':
      return `${reason.param} ${reason.direction} against its ${reason.neighbours} neighbours, NNR ${signed(reason.score)} robust sigma (${scale}limit ${reason.limit})`;
    case 'gdbn':
      return `good die in a bad neighbourhood: ${reason.badNeighbours} of ${reason.neighbours} neighbours flagged (own largest: ${reason.param} ${signed(reason.score)} robust sigma)`;
    default: {
      const unknown: never = reason;
      return String((unknown as { method: string }).method);
    }
  }
}
