// A small invented lot written as STDF V4 (with tests/support/stdfWriter) and as CSV with the same
// values, so tests can check that both paths store the same thing.
import { StdfWriter } from './stdfWriter';

export interface Die { x: number; y: number; site: number; ioff: number; ion: number; vt: number; hard: number }

/** Deterministic dies (a small linear congruential generator), values already rounded to R*4. */
export function inventedWafer(seed: number, size = 7): Die[] {
  let s = seed;
  const rnd = () => { s = (s * 1103515245 + 12345) % 2147483648; return s / 2147483648; };
  const dies: Die[] = [];
  for (let y = 0; y < size; y++) for (let x = 0; x < size; x++) {
    dies.push({
      x, y, site: (x % 2) + 2 * (y % 2) + 1,
      ioff: Math.fround(1e-10 * Math.exp(rnd() * 2)), ion: Math.fround(7e-4 + 1e-4 * rnd()), vt: Math.fround(0.4 + 0.05 * rnd()), hard: rnd() < 0.9 ? 1 : 5,
    });
  }
  return dies;
}

export function writeStdfLot(lot: string, wafers: { id: string; dies: Die[] }[], little: boolean): Uint8Array {
  const w = new StdfWriter(little).far().mir(lot).sdr([1, 2, 3, 4])
    .wcr({ size: 300, height: 1, width: 1, units: 3, flat: 'D', cx: 3, cy: 3, posX: 'R', posY: 'D' });
  for (const wafer of wafers) {
    w.wir(wafer.id);
    let first = true;
    for (const d of wafer.dies) {
      w.pir(d.site);
      // The first PTR of each test carries its defaults; later ones stop after RESULT.
      w.ptr({ test: 100, site: d.site, result: d.ioff, text: 'Ioff_n', units: 'A', short: !first });
      w.ptr({ test: 200, site: d.site, result: d.ion, text: 'Ion_n', units: 'A', short: !first });
      w.ptr({ test: 300, site: d.site, result: d.vt, text: 'Vtsat_n', units: 'V', short: !first });
      w.prr({ site: d.site, x: d.x, y: d.y, hard: d.hard, soft: d.hard * 10, tests: 3 });
      first = false;
    }
    w.wrr(wafer.id, wafer.dies.length);
  }
  w.tsr(100, 'Ioff_n', 1).mrr();
  return w.bytes();
}

export function writeCsvLot(lot: string, wafers: { id: string; dies: Die[] }[]): string {
  const rows = ['Lot,Wafer,X,Y,Site,Ioff_n [A],Ion_n [A],Vtsat_n [V]'];
  // String(v) is the shortest text that reads back as the same double (ECMA-262 Number::toString).
  for (const wafer of wafers) for (const d of wafer.dies) rows.push([lot, wafer.id, d.x, d.y, d.site, String(d.ioff), String(d.ion), String(d.vt)].join(','));
  return rows.join('\n') + '\n';
}
