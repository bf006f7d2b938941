// The one-page PDF writer. Oracles: ISO 32000-1 (PDF 1.7) section 7.5 file structure (header,
// cross-reference table of 20-byte entries whose offsets point at "N 0 obj", trailer /Size,
// startxref pointing at "xref") and 7.3.4.2 literal strings (backslash escapes for ( ) \ and
// octal \ddd codes); the image stream is checked by inflating it with Node's zlib (RFC 1950).
import { describe, expect, it } from 'vitest';
import { deflateSync, inflateSync } from 'node:zlib';
import { PdfPage, pdfString, writePdf } from '../../src/ui/export/pdf';

const latin1 = (bytes: Uint8Array) => Buffer.from(bytes).toString('latin1');

describe('pdfString', () => {
  it('escapes parentheses and backslashes and writes Latin-1 letters as octal codes', () => {
    expect(pdfString('a(b)c\\d')).toBe('(a\\(b\\)c\\\\d)');
    // WinAnsi/Latin-1: "é" is 0xE9 = octal 351; "°" is 0xB0 = octal 260.
    expect(pdfString('é 25°C')).toBe('(\\351 25\\260C)');
  });

  it('gives characters outside WinAnsi a plain stand-in instead of garbage', () => {
    expect(pdfString('≥ 6σ — ok')).toBe('(>= 6sigma - ok)');
    expect(pdfString('漢')).toBe('(?)');
  });
});

describe('writePdf', () => {
  const page = new PdfPage(842, 595).text(28, 40, 16, 'Lot KX (test)', true).rect(10, 10, 20, 20, [1, 0, 0]);
  const rgb = new Uint8Array([255, 0, 0, 0, 255, 0, 0, 0, 255, 255, 255, 255]);
  page.image({ name: 'Im1', width: 2, height: 2, deflated: new Uint8Array(deflateSync(rgb)) }, 100, 100, 50, 50);
  const bytes = writePdf(page, { title: 'T', creator: 'Offstate' });
  const text = latin1(bytes);

  it('starts with a PDF header and ends with %%EOF', () => {
    expect(text.startsWith('%PDF-1.4\n')).toBe(true);
    expect(text.trimEnd().endsWith('%%EOF')).toBe(true);
  });

  it('has a cross-reference table whose offsets point at each object', () => {
    const startxref = Number(/startxref\n(\d+)\n%%EOF/.exec(text)?.[1]);
    expect(text.slice(startxref, startxref + 4)).toBe('xref');
    const header = /xref\n0 (\d+)\n/.exec(text.slice(startxref));
    const count = Number(header?.[1]);
    const entriesAt = startxref + (header?.[0].length ?? 0);
    for (let id = 1; id < count; id++) {
      const entry = text.slice(entriesAt + id * 20, entriesAt + id * 20 + 20);
      expect(entry).toMatch(/^\d{10} 00000 n \n$/);
      const offset = Number(entry.slice(0, 10));
      expect(text.slice(offset, offset + `${id} 0 obj`.length)).toBe(`${id} 0 obj`);
    }
    expect(text).toContain(`/Size ${count}`);
  });

  it('declares the content stream length exactly and holds the text operators', () => {
    const match = /6 0 obj\n<< \/Length (\d+) >>\nstream\n/.exec(text);
    expect(match).not.toBeNull();
    const start = (match?.index ?? 0) + (match?.[0].length ?? 0);
    const length = Number(match?.[1]);
    expect(text.slice(start + length, start + length + 10)).toBe('\nendstream');
    expect(text.slice(start, start + length)).toContain('(Lot KX \\(test\\)) Tj');
  });

  it('embeds the image samples unchanged as a FlateDecode RGB XObject', () => {
    const match = /\/Width 2 \/Height 2 \/ColorSpace \/DeviceRGB \/BitsPerComponent 8 \/Filter \/FlateDecode \/Length (\d+) >>\nstream\n/.exec(text);
    expect(match).not.toBeNull();
    const start = (match?.index ?? 0) + (match?.[0].length ?? 0);
    const stream = Buffer.from(bytes.subarray(start, start + Number(match?.[1])));
    expect([...inflateSync(stream)]).toEqual([...rgb]);
  });
});
