import { describe, expect, it } from 'vitest';
import { CANONICAL_PARAMS } from '../../../src/core/params';
import { csvHeader, formatValue, generateLot, lotCsvChunks, lotToCsv, type LotOptions } from '../../../src/core/generator';

const OPTIONS: LotOptions = { seed: 77, lot: 'CSV.2', waferCount: 3, layout: { dieWidthMm: 12, dieHeightMm: 12 } };
const lot = generateLot(OPTIONS);
const text = lotToCsv(lot);
const lines = text.split('\n');

// SI prefixes (SI Brochure, 9th ed., 2019, table 7): p = 1e-12, n = 1e-9, u (micro) = 1e-6.
const UNIT_FACTOR: Record<string, number> = { pA: 1e-12, nA: 1e-9, uA: 1e-6, V: 1 };

describe('lotToCsv', () => {
  it('writes the agreed header with its mixed unit styles', () => {
    expect(lines[0]).toBe(
      'Lot,Wafer,X,Y,Site,Ioff_n [pA],Ion_n (uA),IOFF_P (pA),Ion_p (uA),Vtlin_n [V],Vtsat_n [V],Vtlin_p [V],Vtsat_p [V],Ig_n [pA],Ig_p [pA],Isb [nA]',
    );
    expect(csvHeader()).toBe(lines[0]);
  });

  it('writes one line per die with "\\n" endings and the wafer ids as written', () => {
    const dies = lot.layout.x.length;
    expect(text.endsWith('\n')).toBe(true);
    expect(text.includes('\r')).toBe(false);
    expect(lines.length).toBe(1 + dies * OPTIONS.waferCount + 1); // header, rows, empty after last \n
    expect(lines[1].split(',').slice(0, 2)).toEqual(['CSV.2', '01']);
    expect(lines[1 + dies].split(',')[1]).toBe('02');
    for (const line of lines.slice(1, -1)) expect(line.split(',')).toHaveLength(16);
  });

  it('reads back to the generated values within six significant digits', () => {
    const headers = lines[0].split(',');
    const units = headers.slice(5).map((h) => /[[(]([^\])]+)[\])]/.exec(h)![1]);
    const params = ['Ioff_n', 'Ion_n', 'Ioff_p', 'Ion_p', 'Vtlin_n', 'Vtsat_n', 'Vtlin_p', 'Vtsat_p', 'Ig_n', 'Ig_p', 'Isb'] as const;
    expect([...params].sort()).toEqual([...CANONICAL_PARAMS].sort());
    let row = 1;
    for (const wafer of lot.wafers) {
      for (let i = 0; i < wafer.x.length; i++, row++) {
        const fields = lines[row].split(',');
        expect(fields.slice(2, 5).map(Number)).toEqual([wafer.x[i], wafer.y[i], wafer.site[i]]);
        params.forEach((param, c) => {
          const read = Number(fields[5 + c]) * UNIT_FACTOR[units[c]];
          const truth = wafer.values[param][i];
          // toPrecision(6) rounds to within half a unit in the 6th digit: relative error < 5e-6.
          expect(Math.abs(read - truth)).toBeLessThanOrEqual(5e-6 * Math.abs(truth));
          expect(Math.sign(read)).toBe(Math.sign(truth));
        });
      }
    }
  });

  it('is the concatenation of its chunks, one per wafer after the header', () => {
    const chunks = [...lotCsvChunks(lot)];
    expect(chunks).toHaveLength(1 + OPTIONS.waferCount);
    expect(chunks.join('')).toBe(text);
  });

  it('honours another line ending and precision', () => {
    const short = lotToCsv(lot, { newline: '\r\n', significantDigits: 3 });
    const first = short.split('\r\n')[1].split(',');
    expect(first[5]).toBe(String(Number((lot.wafers[0].values.Ioff_n[0] / 1e-12).toPrecision(3))));
  });

  it('quotes a lot id holding a comma (RFC 4180) and leaves missing values empty', () => {
    const quoted = lotToCsv({ lot: 'A,B', wafers: [lot.wafers[0]] });
    expect(quoted.split('\n')[1].startsWith('"A,B",01,')).toBe(true);
    expect(formatValue(Number.NaN, 1e-12, 6)).toBe('');
    expect(formatValue(2.29134567e-11, 1e-12, 6)).toBe('22.9135');
  });
});
