// The flagged-die list for failure analysis as CSV: one row per die with lot, wafer, die x/y,
// probe site, every parameter's value (SI base units, raw sign) and all reasons in words.

import type { LotAnalysis } from '../analysis/types';
import type { ParamInfo } from '../frame';
import { reasonText } from '../analysis/reasonText';
import { csvLine } from './csv';

export const FLAGGED_CSV_CAUTION =
  'Flags are statistical evidence for an engineer, not a disposition; scrapping, inking or shipping follows the fab\'s procedures and the customer\'s specification.';

export function flaggedCsv(analysis: LotAnalysis, params: ParamInfo[]): string {
  const header = ['lot', 'wafer', 'x', 'y', 'site', ...params.map((p) => (p.unit ? `${p.name} [${p.unit}]` : p.name)), 'reasons'];
  const lines = [`# ${FLAGGED_CSV_CAUTION}`, `# method: ${analysis.method}`, csvLine(header)];
  for (const die of analysis.flagged) {
    lines.push(csvLine([
      die.lot, die.wafer, die.x, die.y, die.site < 0 ? null : die.site,
      ...params.map((p) => die.values[p.name] ?? null),
      die.reasons.map(reasonText).join('; '),
    ]));
  }
  return lines.join('\n') + '\n';
}
