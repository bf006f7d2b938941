// A probe site that reads differently from the others on most wafers of a lot points at the test
// hardware (probe card, tester channel), not at the process (DOMAIN.md; common practice).

import type { HardwareSuspect, SiteBias } from './types';

export function hardwareSuspects(perWafer: SiteBias[][], fraction: number): HardwareSuspect[] {
  const wafers = perWafer.length;
  if (wafers < 3) return [];
  const tally = new Map<string, { param: string; site: number; sign: 1 | -1; shifts: number[] }>();
  for (const list of perWafer) {
    for (const b of list) {
      const sign: 1 | -1 = b.shift >= 0 ? 1 : -1;
      const key = `${b.param}|${b.site}|${sign}`;
      let t = tally.get(key);
      if (!t) { t = { param: b.param, site: b.site, sign, shifts: [] }; tally.set(key, t); }
      t.shifts.push(b.shift);
    }
  }
  const out: HardwareSuspect[] = [];
  for (const t of tally.values()) {
    if (t.shifts.length < fraction * wafers) continue;
    const sorted = [...t.shifts].sort((a, b) => a - b);
    const mid = sorted.length >> 1;
    const medianShift = sorted.length % 2 ? sorted[mid] : (sorted[mid - 1] + sorted[mid]) / 2;
    out.push({
      param: t.param, site: t.site, sign: t.sign, wafers: t.shifts.length, of: wafers, medianShift,
      text: `probe site ${t.site} reads ${t.param} ${medianShift >= 0 ? '+' : ''}${(medianShift * 100).toFixed(1)} % on ${t.shifts.length} of ${wafers} wafers: test hardware suspect`,
    });
  }
  return out.sort((a, b) => b.wafers - a.wafers || Math.abs(b.medianShift) - Math.abs(a.medianShift));
}
