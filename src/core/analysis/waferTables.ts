// Small per-wafer tables the analysis builds once and reuses.

/** True when two wafers have the same die grid (so their neighbourhoods are the same). */
export function sameGrid(x1: Int32Array, y1: Int32Array, x2: Int32Array, y2: Int32Array): boolean {
  if (x1 === x2 && y1 === y2) return true;
  if (x1.length !== x2.length) return false;
  for (let i = 0; i < x1.length; i++) if (x1[i] !== x2[i] || y1[i] !== y2[i]) return false;
  return true;
}

/** A record with its numeric-text keys (site numbers) in ascending order. */
export function sortKeys<T>(record: Record<string, T>): Record<string, T> {
  return Object.fromEntries(Object.entries(record).sort((a, b) => Number(a[0]) - Number(b[0])));
}

/** Die indices per probe site, sites ascending (unknown sites, < 0, left out). */
export function diesBySite(site: Int32Array): Map<number, Uint32Array> {
  const counts = new Map<number, number>();
  for (let i = 0; i < site.length; i++) if (site[i] >= 0) counts.set(site[i], (counts.get(site[i]) ?? 0) + 1);
  const out = new Map<number, Uint32Array>();
  const at = new Map<number, number>();
  for (const [s, n] of [...counts].sort((a, b) => a[0] - b[0])) { out.set(s, new Uint32Array(n)); at.set(s, 0); }
  for (let i = 0; i < site.length; i++) {
    const s = site[i];
    if (s < 0) continue;
    const k = at.get(s)!;
    out.get(s)![k] = i;
    at.set(s, k + 1);
  }
  return out;
}
