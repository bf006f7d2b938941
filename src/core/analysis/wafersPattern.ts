// Spatial signature of each wafer's flagged dies (src/core/spatial), attached to the analysis:
// the label with its confidence and evidence per wafer, and the cluster each flagged die sits in.

import type { WaferFrame } from '../frame';
import { labelWafer, type SignatureResult, type WaferGeometry } from '../spatial';
import type { ClusterSummary, FlaggedDie, WaferPattern } from './types';

function summariseCluster(c: SignatureResult['clusters'][number]): ClusterSummary {
  return {
    id: c.id, size: c.size, centroidXMm: c.centroidXMm, centroidYMm: c.centroidYMm,
    centroidRadiusFraction: c.centroidRadiusFraction, radiusMm: c.radiusMm, elongation: c.elongation,
    lengthMm: c.lengthMm, widthMm: c.widthMm, majorAxisDeg: c.majorAxisDeg, line: c.line,
  };
}

/** Labels every wafer and marks each flagged die with its cluster (mutates `flagged`). */
export function attachPatterns(frames: WaferFrame[], flagged: FlaggedDie[], geometry?: (frame: WaferFrame) => Partial<WaferGeometry> | undefined): WaferPattern[] {
  const byWafer = new Map<string, FlaggedDie[]>();
  for (const die of flagged) {
    const key = `${die.lot}\u0000${die.wafer}`;
    const list = byWafer.get(key);
    if (list) list.push(die); else byWafer.set(key, [die]);
  }
  return frames.map((frame) => {
    const dies = byWafer.get(`${frame.lot}\u0000${frame.wafer}`) ?? [];
    const mask = new Uint8Array(frame.x.length);
    for (const d of dies) mask[d.index] = 1;
    const result = labelWafer({ x: frame.x, y: frame.y, flagged: mask, site: frame.site, geometry: geometry?.(frame) });
    const clusterOf = new Map<number, SignatureResult['clusters'][number]>();
    for (const c of result.clusters) for (const i of c.dies) clusterOf.set(i, c);
    for (const d of dies) {
      const c = clusterOf.get(d.index);
      if (c) d.cluster = { id: c.id, size: c.size, line: c.line };
    }
    return { label: result.label, confidence: result.confidence, rule: result.evidence.rule, evidence: result.evidence, clusters: result.clusters.map(summariseCluster) };
  });
}
