// The flagged-die list for failure analysis as CSV: one row per die with lot, wafer, die x/y,
// probe site, the mechanism call, its confidence and (extra leakage with Ig measured) the leakage
// path, the wafer's spatial pattern and the die's
// cluster, every parameter's value (SI base units, raw sign) and all reasons in words.

import type { LotAnalysis } from '../analysis/types';
import type { ParamInfo } from '../frame';
import { reasonText } from '../analysis/reasonText';
import { csvLine } from './csv';

export const FLAGGED_CSV_CAUTION =
  'Flags are statistical evidence for an engineer, not a disposition; scrapping, inking or shipping follows the fab\'s procedures and the customer\'s specification.';

export function flaggedCsv(analysis: LotAnalysis, params: ParamInfo[]): string {
  const header = ['lot', 'wafer', 'x', 'y', 'site', 'mechanism', 'confidence', 'leakage path', 'wafer pattern', 'cluster', 'cluster size',
    ...params.map((p) => (p.unit ? `${p.name} [${p.unit}]` : p.name)), 'reasons', 'mechanism evidence'];
  const lines = [`# ${FLAGGED_CSV_CAUTION}`, `# method: ${analysis.method}`, csvLine(header)];
  const patternOf = new Map(analysis.wafers.map((w) => [`${w.lot}\u0000${w.wafer}`, w.pattern?.label ?? null]));
  for (const die of analysis.flagged) {
    lines.push(csvLine([
      die.lot, die.wafer, die.x, die.y, die.site < 0 ? null : die.site,
      die.mechanism?.kind ?? null, die.mechanism ? Number(die.mechanism.confidence.toFixed(3)) : null,
      die.mechanism?.leakagePath ?? null,
      patternOf.get(`${die.lot}\u0000${die.wafer}`) ?? null,
      die.cluster ? die.cluster.id + 1 : null, die.cluster?.size ?? null,
      ...params.map((p) => die.values[p.name] ?? null),
      die.reasons.map(reasonText).join('; '),
      die.mechanism?.why ?? null,
    ]));
  }
  return lines.join('\n') + '\n';
}
