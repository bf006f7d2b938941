// Lot view of wafers: how far each wafer sits from the rest of its lot and from earlier lots,
// in robust sigmas, so that wafers can be ordered by it.

import { robustCentre } from './sortedColumn';
import type { ExcursionScore, StaticReference } from './types';

export interface WaferCentre { centre: number; sigma: number }

function medianOf(values: number[]): number {
  const sorted = Float64Array.from(values).sort();
  return robustCentre(sorted)!.centre;
}

/**
 * Per wafer: for every parameter, (wafer median - median of the other wafers' medians) divided by
 * the median of the other wafers' robust sigmas ((Q3 - Q1)/1.35), on the analysis scale; the
 * score is the largest |shift|. Against history: (wafer median - earlier lots' median) / their
 * robust sigma.
 */
export function excursionScores(
  centres: Map<string, (WaferCentre | undefined)[]>,
  flaggedFraction: number[],
  history: { lots: number; references: Record<string, StaticReference> } | undefined,
): ExcursionScore[] {
  const wafers = flaggedFraction.length;
  const out: ExcursionScore[] = [];
  for (let w = 0; w < wafers; w++) {
    const shifts: Record<string, number> = {};
    let best = { param: '', shift: 0 };
    let past: { param: string; shift: number } | undefined;
    for (const [param, list] of centres) {
      const own = list[w];
      if (!own) continue;
      const others = list.filter((c, v): c is WaferCentre => v !== w && c !== undefined);
      if (others.length > 0) {
        const sigma = medianOf(others.map((c) => c.sigma));
        if (sigma > 0) {
          const shift = (own.centre - medianOf(others.map((c) => c.centre))) / sigma;
          shifts[param] = shift;
          if (Math.abs(shift) > Math.abs(best.shift)) best = { param, shift };
        }
      }
      const reference = history?.references[param];
      if (reference && reference.robustSigma > 0) {
        const shift = (own.centre - reference.centre) / reference.robustSigma;
        if (!past || Math.abs(shift) > Math.abs(past.shift)) past = { param, shift };
      }
    }
    out.push({
      score: Math.abs(best.shift), param: best.param, shift: best.shift, shifts, flaggedFraction: flaggedFraction[w],
      ...(past && history ? { vsHistory: { score: Math.abs(past.shift), param: past.param, shift: past.shift, lots: history.lots } } : {}),
    });
  }
  return out;
}
