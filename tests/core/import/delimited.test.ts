import { describe, expect, it } from 'vitest';
import { DelimitedReader, detectDelimiter } from '../../../src/core/import';

function readAll(text: string, chunkSize = text.length) {
  const reader = new DelimitedReader();
  const out = [];
  for (let i = 0; i < text.length; i += chunkSize) out.push(...reader.push(text.slice(i, i + chunkSize)));
  out.push(...reader.end());
  return out;
}

describe('DelimitedReader', () => {
  it('detects comma, tab and semicolon from the header line', () => {
    expect(detectDelimiter('a,b,c')).toBe(',');
    expect(detectDelimiter('a\tb\tc')).toBe('\t');
    expect(detectDelimiter('a;b;c')).toBe(';');
  });
  it('skips a BOM, CRLF line ends, blank and comment lines, and keeps line numbers', () => {
    const records = readAll('\uFEFF# made by a tester\r\nLot,Wafer\r\n\r\nL1,1\r\n// note\r\nL1,2\r\n');
    expect(records).toEqual([
      { line: 2, fields: ['Lot', 'Wafer'] },
      { line: 4, fields: ['L1', '1'] },
      { line: 6, fields: ['L1', '2'] },
    ]);
  });
  it('gives the same records whatever the chunk size', () => {
    const text = 'Lot\tWafer\tX\nA\t1\t3\nA\t1\t4\nA\t2\t5';
    const whole = readAll(text);
    for (const size of [1, 2, 3, 7]) expect(readAll(text, size)).toEqual(whole);
    expect(whole.at(-1)).toEqual({ line: 4, fields: ['A', '2', '5'] });
  });
  // RFC 4180 section 2: fields with delimiters, doubled quotes and line breaks are enclosed in quotes.
  it('reads quoted fields with commas, doubled quotes and line breaks (RFC 4180)', () => {
    const records = readAll('a,b,c\n"x,1","say ""hi""","two\nlines"\nend,2,3\n', 5);
    expect(records[1]).toEqual({ line: 2, fields: ['x,1', 'say "hi"', 'two\nlines'] });
    expect(records[2]).toEqual({ line: 4, fields: ['end', '2', '3'] });
  });
});
